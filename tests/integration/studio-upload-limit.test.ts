// The size limit of growth surface files, with SURFACE_MAX_BYTES set low for this file only (each
// test file has its own module instances, and the configuration is read on first use).
import { callRoute, expectJson, signedInAccount, uploadFile, type TestAccount } from './studio-helpers';
import { ListObjectsV2Command } from '@aws-sdk/client-s3';
import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import { closeDb, db } from '@/lib/platform/db';
import { env } from '@/lib/platform/env';
import { storageClient } from '@/lib/platform/storage';
import { DEMO_GROOMS, surfaceToObj } from '@/lib/groom/demo';
import * as uploadsRoute from '@/app/api/studio/uploads/route';
import * as surfacesRoute from '@/app/api/studio/surfaces/route';

const LIMIT = 4000;

let groomer: TestAccount;

beforeAll(async () => {
  vi.stubEnv('SURFACE_MAX_BYTES', String(LIMIT));
  groomer = await signedInAccount('groomer', 'upload-limit');
});

afterAll(async () => {
  vi.unstubAllEnvs();
  await closeDb();
});

describe('the size limit', () => {
  it('refuses to hand out an upload for a declared size over it', async () => {
    const response = await callRoute(uploadsRoute, 'POST', '/api/studio/uploads', { cookie: groomer.cookie, body: { fileName: 'big.obj', byteSize: LIMIT + 1 } });
    const { error } = await expectJson(response, 400);
    expect(error.fields.byteSize).toBe('The file is 4,001 bytes; growth surfaces may be at most 4,000 bytes. Decimate it before uploading.');
    expect(await db()('surface_uploads').where({ owner_id: groomer.userId })).toHaveLength(0);
  });

  it('rejects a stored file over it even when a smaller size was declared, and removes it', async () => {
    const bytes = new TextEncoder().encode(surfaceToObj(DEMO_GROOMS[1].surface(), 'too large for this limit'));
    expect(bytes.byteLength).toBeGreaterThan(LIMIT);
    const ticket = await uploadFile(groomer, 'cat.obj', bytes, 1000);
    expect(ticket.maxBytes).toBe(LIMIT);
    const response = await callRoute(surfacesRoute, 'POST', '/api/studio/surfaces', { cookie: groomer.cookie, body: { uploadId: ticket.uploadId, name: 'Cat', units: 'cm' } });
    const { error } = await expectJson(response, 422);
    expect(error.code).toBe('surface-rejected');
    expect(error.details.problems).toEqual([expect.objectContaining({ code: 'file-too-large', severity: 'error', where: 'file' })]);
    expect(error.details.problems[0].message).toMatch(/at most 4 kB/);
    expect(await db()('surface_uploads').where({ owner_id: groomer.userId })).toHaveLength(0);
    expect(await db()('growth_surfaces').where({ owner_id: groomer.userId })).toHaveLength(0);
    const listing = await storageClient().send(new ListObjectsV2Command({ Bucket: env().S3_BUCKET, Prefix: `surfaces/${groomer.userId}/` }));
    expect(listing.Contents ?? []).toEqual([]);
  });
});
