// The file size of an upload is held to what was declared (and checked against the limit) when the
// upload began. The presigned PUT signs Content-Length (AWS Signature Version 4 signs every header
// named in X-Amz-SignedHeaders, and S3 refuses a request whose signed headers differ with 403
// SignatureDoesNotMatch); the local stand-in (s3rver) does not verify signed headers, so
// registration compares the stored size with the declared one, which holds with any store.
import { callRoute, expectJson, signedInAccount } from './studio-helpers';
import { ListObjectsV2Command } from '@aws-sdk/client-s3';
import { afterAll, describe, expect, it } from 'vitest';
import { closeDb, db } from '@/lib/platform/db';
import { env } from '@/lib/platform/env';
import { storageClient } from '@/lib/platform/storage';
import * as uploadsRoute from '@/app/api/studio/uploads/route';
import * as surfacesRoute from '@/app/api/studio/surfaces/route';

afterAll(closeDb);

describe('a presigned surface upload', () => {
  it('signs the declared length, and a stored file of another length is refused at registration and removed', async () => {
    const groomer = await signedInAccount('groomer', 'upload-length');
    const response = await callRoute(uploadsRoute, 'POST', '/api/studio/uploads', { cookie: groomer.cookie, body: { fileName: 'small.obj', byteSize: 10 } });
    const { url, uploadId } = (await expectJson(response, 201)).data;
    expect(new URL(url).searchParams.get('X-Amz-SignedHeaders')?.split(';')).toContain('content-length');

    await fetch(url, { method: 'PUT', body: new Blob([new Uint8Array(1000).fill(0x20)]) });
    const register = await callRoute(surfacesRoute, 'POST', '/api/studio/surfaces', { cookie: groomer.cookie, body: { uploadId, name: 'Small', units: 'cm' } });
    const { error } = await expectJson(register, 422);
    expect(error.details.problems).toEqual([
      expect.objectContaining({ code: 'size-mismatch', message: 'The stored file is 1,000 bytes, but 10 were declared when the upload began. Upload the file again.' }),
    ]);
    expect(await db()('surface_uploads').where({ owner_id: groomer.userId })).toHaveLength(0);
    const listing = await storageClient().send(new ListObjectsV2Command({ Bucket: env().S3_BUCKET, Prefix: `surfaces/${groomer.userId}/` }));
    expect(listing.Contents ?? []).toEqual([]);
  });
});
