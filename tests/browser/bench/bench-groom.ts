// What the studio's browser benchmarks share: the studio API as the pages call it, waiting for the
// server's queued work, and the benches' groom — two twisted whorls on a UV sphere of radius 10 cm.
import { expect, type Page } from '@playwright/test';
import { db } from '../../../lib/platform/db';
import { surfaceToObj } from '../../../lib/groom/demo/obj';
import { uvSphere } from '../../fixtures/shapes';

/**
 * Waits until the server's queued work (the surface check, thumbnails) is done: in use it runs on the
 * server, but here the app, its jobs and the browser share two cores.
 */
export async function serverIdle(timeout = 600_000) {
  await expect
    .poll(async () => Number((await db().raw(`SELECT count(*) AS n FROM pgboss.job WHERE state IN ('created', 'retry', 'active') AND start_after <= now()`)).rows[0].n), { timeout, intervals: [1000] })
    .toBe(0);
}

export async function api<T>(page: Page, method: 'get' | 'post' | 'put', url: string, data?: unknown): Promise<T> {
  const response = await page.request[method](url, { ...(data === undefined ? {} : { data }), timeout: 300_000 });
  const body = await response.json();
  if (!response.ok()) throw new Error(`${method.toUpperCase()} ${url}: ${response.status()} ${JSON.stringify(body)}`);
  return body.data as T;
}

export type SphereGroom = { groomId: string; faces: number; objBytes: number };

/** Uploads the sphere's OBJ, waits for its check, and starts a groom on it with the benches' two whorls. */
export async function sphereGroom(page: Page, obj: Buffer<ArrayBuffer>, faces: number, what: string): Promise<SphereGroom> {
  const ticket = await api<{ uploadId: string; url: string }>(page, 'post', '/api/studio/uploads', { fileName: `sphere-${faces}.obj`, byteSize: obj.byteLength });
  const put = await fetch(ticket.url, { method: 'PUT', body: obj });
  expect(put.ok).toBe(true);
  const { surface } = await api<{ surface: { id: string } }>(page, 'post', '/api/studio/surfaces', { uploadId: ticket.uploadId, name: `Sphere, ${faces} faces`, units: 'cm' });
  await expect
    .poll(async () => (await api<{ surface: { state: string } }>(page, 'get', `/api/studio/surfaces/${surface.id}`)).surface.state, { timeout: 600_000, intervals: [1000] })
    .toBe('ready');
  const { groom } = await api<{ groom: { id: string; revision: number } }>(page, 'post', '/api/studio/grooms', { surfaceId: surface.id, name: `${what} coat` });
  await api(page, 'put', `/api/studio/grooms/${groom.id}/spec`, {
    baseRevision: groom.revision,
    spec: {
      specVersion: 2,
      units: 'cm',
      upAxis: 'z',
      field: { singularities: [{ point: [10, 0, 0], index: 1, twist: 0 }, { point: [-10, 0, 0], index: 1, twist: 180 }] },
      guides: { density: 2, length: 1.5 },
    },
  });
  return { groomId: groom.id, faces, objBytes: obj.byteLength };
}

/** A UV sphere of radius 10 cm and its OBJ file. */
export function sphereObj(rings: number, segments: number, what: string) {
  const mesh = uvSphere(rings, segments, 10);
  return { mesh, faces: mesh.triangles.length / 3, obj: Buffer.from(surfaceToObj(mesh, `uv sphere ${rings} × ${segments}, for the ${what}`)) };
}
