// A checked surface cannot be swapped afterwards (issue 11's probe): the upload URL stays valid for
// minutes after registration, but registration copies the file to a key no upload URL names, and
// every later read (the check job, the download, a groom's creation, its exports) uses that copy.
import { callRoute, expectJson, signedInAccount, uploadFile } from './studio-helpers';
import { readFile } from 'node:fs/promises';
import { afterAll, describe, expect, it } from 'vitest';
import { closeDb, db } from '@/lib/platform/db';
import * as surfacesRoute from '@/app/api/studio/surfaces/route';
import * as surfaceRoute from '@/app/api/studio/surfaces/[surfaceId]/route';
import * as groomsRoute from '@/app/api/studio/grooms/route';
import type { SurfaceDetail } from '@/lib/studio/types';
import { checkRegisteredSurface } from '@/lib/studio/surface-check';

afterAll(closeDb);

describe('a registered surface', () => {
  it('keeps the checked bytes when the old upload URL is used again', async () => {
    const groomer = await signedInAccount('groomer', 'swap');
    const cube = new Uint8Array(await readFile(new URL('../fixtures/surfaces/uv-split-cube.obj', import.meta.url)));
    const ticket = await uploadFile(groomer, 'cube.obj', cube);
    const registered = await callRoute(surfacesRoute, 'POST', '/api/studio/surfaces', { cookie: groomer.cookie, body: { uploadId: ticket.uploadId, name: 'Cube', units: 'cm' } });
    const surface = (await expectJson(registered, 202)).data.surface;

    // The same length (the URL is signed for it), but not a mesh: "# swapped" and spaces; sent
    // before the check job runs, so even the check must read the registered bytes.
    const swapped = new TextEncoder().encode('# swapped'.padEnd(cube.byteLength, ' '));
    const put = await fetch(ticket.url, { method: 'PUT', body: new Blob([swapped as BlobPart]) });
    expect(put.status).toBe(200);
    await checkRegisteredSurface({ surfaceId: surface.id });

    const row = await db()('growth_surfaces').where({ id: surface.id }).first('object_key');
    expect(row.object_key).not.toBe((await db()('surface_uploads').where({ id: ticket.uploadId }).first('object_key'))?.object_key ?? null);
    const detail: SurfaceDetail = (await expectJson(await callRoute(surfaceRoute, 'GET', `/api/studio/surfaces/${surface.id}`, { cookie: groomer.cookie, params: { surfaceId: surface.id } }), 200)).data.surface;
    expect(new Uint8Array(await (await fetch(detail.fileUrl)).arrayBuffer())).toEqual(cube);

    const created = await callRoute(groomsRoute, 'POST', '/api/studio/grooms', { cookie: groomer.cookie, body: { surfaceId: surface.id, name: 'Cube coat' } });
    expect((await expectJson(created, 201)).data.groom.surfaceId).toBe(surface.id);
  });
});
