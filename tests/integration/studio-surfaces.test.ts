// Growth surfaces through the studio's route handlers, against the real PostgreSQL and the S3
// stand-in: presigned upload, registration with the check of lib/field, rejection that leaves
// nothing behind, and who may see what.
import { callRoute, createSurface, expectJson, registerAndCheck, signedInAccount, signedInAdmin, studioCast, uploadFile, type TestAccount } from './studio-helpers';
import { readFile } from 'node:fs/promises';
import { ListObjectsV2Command } from '@aws-sdk/client-s3';
import sharp from 'sharp';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { closeDb, db } from '@/lib/platform/db';
import { env } from '@/lib/platform/env';
import { storageClient } from '@/lib/platform/storage';
import { sweepAbandonedUploads } from '@/lib/studio/surfaces';
import { DEMO_GROOMS, surfaceToObj } from '@/lib/groom/demo';
import * as uploadsRoute from '@/app/api/studio/uploads/route';
import * as surfacesRoute from '@/app/api/studio/surfaces/route';
import * as surfaceRoute from '@/app/api/studio/surfaces/[surfaceId]/route';
import * as preparedRoute from '@/app/api/studio/surfaces/[surfaceId]/prepared/route';
import { prepareSurface, readPreparedSurface, readSurface } from '@/lib/field';
import * as groomsRoute from '@/app/api/studio/grooms/route';
import type { ReadySurface, SurfaceDetail, SurfaceSummary, UncheckedSurface } from '@/lib/studio/types';

afterAll(closeDb);

const [fox, , ring] = DEMO_GROOMS;
const objBytes = (mesh: ReturnType<typeof fox.surface>) => new TextEncoder().encode(surfaceToObj(mesh, 'test surface'));
const fixture = (name: string) => readFile(new URL(`../fixtures/surfaces/${name}`, import.meta.url)).then((buffer) => new Uint8Array(buffer));

async function storedKeys(prefix: string): Promise<string[]> {
  const listing = await storageClient().send(new ListObjectsV2Command({ Bucket: env().S3_BUCKET, Prefix: prefix }));
  return (listing.Contents ?? []).map((object) => object.Key!);
}

let wren: TestAccount;
let rival: TestAccount;
let buyer: TestAccount;

beforeAll(async () => {
  ({ owner: wren, rival, buyer } = await studioCast('surface'));
});

describe('registering an uploaded surface', () => {
  let ringSurface: ReadySurface;
  const ringBytes = objBytes(ring.surface());

  beforeAll(async () => {
    ringSurface = await createSurface(wren, 'loop-ring.obj', ringBytes, 'Loop — plush ring', 'mm');
  });

  it('stores the facts lib/field measured', async () => {
    const mesh = ring.surface();
    expect(ringSurface).toMatchObject({
      name: 'Loop — plush ring',
      fileName: 'loop-ring.obj',
      format: 'obj',
      units: 'mm',
      vertexCount: mesh.positions.length / 3,
      faceCount: mesh.triangles.length / 3,
      componentCount: 1,
      boundaryLoopCount: 0,
      genus: 1,
      eulerCharacteristic: 0,
      groups: ['top', 'underside'],
      // The demo's OBJ writer writes no vt.
      uvs: { present: false, overlapFraction: 0 },
      warnings: [],
    });
    // The ring's area is about 31,930 mm², which is 319.3 cm².
    expect(ringSurface.areaCm2).toBeCloseTo(319.3, 0);
  });

  it('measures a closed head as a sphere: χ = 2, genus 0', async () => {
    const surface = await createSurface(wren, 'bramble.obj', objBytes(fox.surface()), 'Bramble head');
    expect(surface).toMatchObject({ eulerCharacteristic: 2, genus: 0, boundaryLoopCount: 0, groups: ['ears', 'crown', 'muzzle', 'neck'] });
  });

  it('reads the other formats: a binary PLY cube and a binary STL tetrahedron', async () => {
    const cube = await createSurface(wren, 'cube-big-endian.ply', await fixture('cube-big-endian.ply'), 'Test cube');
    expect(cube).toMatchObject({ format: 'ply', vertexCount: 8, faceCount: 12, eulerCharacteristic: 2, genus: 0 });
    const tetra = await createSurface(wren, 'tetra.STL', await fixture('tetra-solid-header.stl'), 'Test tetrahedron');
    expect(tetra).toMatchObject({ format: 'stl', vertexCount: 4, faceCount: 4, eulerCharacteristic: 2 });
  });

  it('reads polygons and groups of an open sheet, area in cm² for the declared units', async () => {
    const open = await createSurface(wren, 'ngons-and-groups.obj', await fixture('ngons-and-groups.obj'), 'Open sheet', 'in');
    expect(open).toMatchObject({ boundaryLoopCount: 1, eulerCharacteristic: 1, genus: 0, groups: ['default', 'left part', 'right'] });
    expect(open.areaCm2).toBeCloseTo(12 * 2.54 ** 2, 9);
  });

  it('keeps the warnings of a surface that is accepted', async () => {
    const twoPieces = 'v 0 0 0\nv 1 0 0\nv 0 1 0\nv 5 0 0\nv 6 0 0\nv 5 1 0\nf 1 2 3\nf 4 5 6\n';
    const surface = await createSurface(wren, 'two-pieces.obj', new TextEncoder().encode(twoPieces), 'Two pieces');
    expect(surface).toMatchObject({ componentCount: 2, boundaryLoopCount: 2, eulerCharacteristic: 2 });
    expect(surface.warnings).toEqual([expect.objectContaining({ code: 'several-components', severity: 'warning', count: 2 })]);
  });

  it('lists the groomer’s surfaces newest first, with thumbnails that are images', async () => {
    // A groomer of its own: the list holds exactly what this test made, whatever ran before.
    const lister = await signedInAccount('groomer', 'surface-lister');
    await createSurface(lister, 'loop-ring.obj', ringBytes, 'Older ring', 'mm');
    await createSurface(lister, 'two-pieces.obj', new TextEncoder().encode('v 0 0 0\nv 1 0 0\nv 0 1 0\nf 1 2 3\n'), 'Newer triangle');
    const { data } = await expectJson<{ data: { surfaces: SurfaceSummary[] } }>(await callRoute(surfacesRoute, 'GET', '/api/studio/surfaces', { cookie: lister.cookie }), 200);
    expect(data.surfaces.map((surface) => surface.name)).toEqual(['Newer triangle', 'Older ring']);
    const thumbnail = await fetch(data.surfaces[1].thumbnailUrl!);
    expect(thumbnail.status).toBe(200);
    const metadata = await sharp(new Uint8Array(await thumbnail.arrayBuffer())).metadata();
    expect(metadata).toMatchObject({ format: 'webp', width: 512, height: 512 });
  });

  it('gives the details with a download of the file as uploaded', async () => {
    const response = await callRoute(surfaceRoute, 'GET', `/api/studio/surfaces/${ringSurface.id}`, { cookie: wren.cookie, params: { surfaceId: ringSurface.id } });
    const { surface } = (await expectJson<{ data: { surface: SurfaceDetail } }>(response, 200)).data;
    expect(surface).toMatchObject({ id: ringSurface.id, byteSize: ringBytes.byteLength, components: [{ eulerCharacteristic: 0, genus: 1, boundaryLoopCount: 0 }] });
    const file = await fetch(surface.fileUrl);
    expect(new Uint8Array(await file.arrayBuffer())).toEqual(ringBytes);
    expect(file.headers.get('content-disposition')).toBe('attachment; filename="loop-ring.obj"');
  });

  it('keeps the surface read once, in its prepared form: the same reading as the file, served to the owner only, cached for good', async () => {
    const detail = (await expectJson<{ data: { surface: SurfaceDetail } }>(await callRoute(surfaceRoute, 'GET', `/api/studio/surfaces/${ringSurface.id}`, { cookie: wren.cookie, params: { surfaceId: ringSurface.id } }), 200)).data.surface;
    expect(detail.prepared).toEqual({ url: `/api/studio/surfaces/${ringSurface.id}/prepared`, fileName: `${ringSurface.id}.wwsurf` });
    const answer = await callRoute(preparedRoute, 'GET', detail.prepared!.url, { cookie: wren.cookie, params: { surfaceId: ringSurface.id } });
    expect(answer.status).toBe(200);
    expect(answer.headers.get('cache-control')).toBe('private, max-age=31536000, immutable');
    const prepared = readPreparedSurface(new Uint8Array(await answer.arrayBuffer()));
    const fromFile = readSurface(ringBytes, 'loop-ring.obj');
    expect(Array.from(prepared.mesh.positions)).toEqual(Array.from(fromFile.mesh.positions));
    expect(Array.from(prepared.mesh.triangles)).toEqual(Array.from(fromFile.mesh.triangles));
    expect(Array.from(prepared.mesh.fileVertexToVertex!)).toEqual(Array.from(fromFile.mesh.fileVertexToVertex!));
    expect(prepared.sourceVertexCount).toBe(fromFile.sourceVertexCount);
    // What the check worked out for the editor (format version 2): its mark, and the field's ring
    // ordering as prepareSurface works it out from the file (the ring is closed: one serves every mode).
    expect(prepared.groundwork?.checked).toBe(true);
    expect(Object.keys(prepared.groundwork!.ringOrderings)).toEqual(['free']);
    expect(Array.from(prepared.groundwork!.ringOrderings.free!)).toEqual(Array.from(prepareSurface(fromFile.mesh).solver.ordering));
    const rivalAsks = await callRoute(preparedRoute, 'GET', detail.prepared!.url, { cookie: rival.cookie, params: { surfaceId: ringSurface.id } });
    expect(rivalAsks.status).toBe(404);
  });

  it('keeps both ring orderings of a surface with a boundary (free and held) in its prepared form', async () => {
    const surface = await createSurface(wren, 'ngons.obj', await fixture('ngons-and-groups.obj'), 'Tiled patch');
    const row = await db()('growth_surfaces').where({ id: surface.id }).first();
    const answer = await callRoute(preparedRoute, 'GET', `/api/studio/surfaces/${surface.id}/prepared`, { cookie: wren.cookie, params: { surfaceId: surface.id } });
    expect(answer.status).toBe(200);
    const prepared = readPreparedSurface(new Uint8Array(await answer.arrayBuffer()));
    expect(row.prepared_key).toMatch(/\.wwsurf$/);
    const fromFile = readSurface(await fixture('ngons-and-groups.obj'), 'ngons.obj');
    expect(prepared.groundwork?.checked).toBe(true);
    expect(Array.from(prepared.groundwork!.ringOrderings.free!)).toEqual(Array.from(prepareSurface(fromFile.mesh, { boundary: 'free' }).solver.ordering));
    expect(Array.from(prepared.groundwork!.ringOrderings.held!)).toEqual(Array.from(prepareSurface(fromFile.mesh, { boundary: 'tangent' }).solver.ordering));
  });

  it('deletes a surface with its file, thumbnail and prepared form', async () => {
    const surface = await createSurface(wren, 'short-lived.obj', await fixture('uv-split-cube.obj'), 'Short-lived cube');
    const row = await db()('growth_surfaces').where({ id: surface.id }).first();
    const folder = row.object_key.slice(0, row.object_key.lastIndexOf('/') + 1);
    // The file, its thumbnail and its prepared form.
    expect(await storedKeys(folder)).toHaveLength(3);
    const response = await callRoute(surfaceRoute, 'DELETE', `/api/studio/surfaces/${surface.id}`, { cookie: wren.cookie, params: { surfaceId: surface.id } });
    expect(await expectJson(response, 200)).toEqual({ data: { deleted: true } });
    expect(await db()('growth_surfaces').where({ id: surface.id })).toHaveLength(0);
    expect(await storedKeys(folder)).toEqual([]);
  });
});

describe('a surface that fails the checks', () => {
  it('is refused by its check with its problems: the row says why, the file is gone, no groom can grow on it', async () => {
    const groomer = await signedInAccount('groomer', 'bowtie');
    const surface = (await registerAndCheck(groomer, 'bowtie.obj', await fixture('bowtie.obj'), 'Bowtie', 'cm')) as UncheckedSurface;
    expect(surface).toMatchObject({ state: 'refused', check: { stage: 'checked', progress: 1 }, thumbnailUrl: null });
    expect(surface.problems).toEqual([
      expect.objectContaining({ code: 'non-manifold-vertex', severity: 'error', count: 1, examples: [2], where: 'vertex', message: expect.stringMatching(/touch at a single point/) }),
      expect.objectContaining({ code: 'several-components', severity: 'warning' }),
    ]);
    expect(await db()('surface_uploads').where({ owner_id: groomer.userId })).toHaveLength(0);
    expect(await storedKeys(`surfaces/${groomer.userId}/`)).toEqual([]);
    const groom = await callRoute(groomsRoute, 'POST', '/api/studio/grooms', { cookie: groomer.cookie, body: { surfaceId: surface.id, name: 'On a bowtie' } });
    expect((await expectJson(groom, 409)).error).toEqual({ code: 'surface-not-ready', message: 'Bowtie was refused by its check and cannot carry a groom.' });
  });

  it('names every problem with counts and first examples', async () => {
    const surface = (await registerAndCheck(wren, 'strip.obj', await fixture('misoriented-strip.obj'), 'Strip', 'cm')) as UncheckedSurface;
    expect(surface.problems).toEqual([
      expect.objectContaining({ code: 'inconsistent-orientation', count: 2, examples: [2, 3, 3, 4], where: 'edge' }),
    ]);
  });

  it('says so when the file cannot be read at all', async () => {
    const surface = (await registerAndCheck(wren, 'truncated.stl', await fixture('truncated-binary.stl'), 'Truncated', 'cm')) as UncheckedSurface;
    expect(surface.problems).toEqual([expect.objectContaining({ code: 'truncated-file', severity: 'error', where: 'file' })]);
  });
});

describe('a surface being checked', () => {
  it('is listed as checking, and no groom can be started on it yet', async () => {
    const groomer = await signedInAccount('groomer', 'checking');
    const ticket = await uploadFile(groomer, 'cube.obj', await fixture('uv-split-cube.obj'));
    const registered = await callRoute(surfacesRoute, 'POST', '/api/studio/surfaces', { cookie: groomer.cookie, body: { uploadId: ticket.uploadId, name: 'Cube', units: 'cm' } });
    const { surface } = (await expectJson(registered, 202)).data;
    const { data } = await expectJson<{ data: { surfaces: SurfaceSummary[] } }>(await callRoute(surfacesRoute, 'GET', '/api/studio/surfaces', { cookie: groomer.cookie }), 200);
    expect(data.surfaces).toEqual([expect.objectContaining({ id: surface.id, state: 'checking', problems: [], check: { stage: 'waiting for its check', progress: 0 } })]);
    const groom = await callRoute(groomsRoute, 'POST', '/api/studio/grooms', { cookie: groomer.cookie, body: { surfaceId: surface.id, name: 'Too soon' } });
    expect((await expectJson(groom, 409)).error).toEqual({ code: 'surface-not-ready', message: 'Cube is still being checked; start a groom on it once it is ready.' });
  });
});

describe('uploads', () => {
  it('refuses a file that is not a surface format', async () => {
    const response = await callRoute(uploadsRoute, 'POST', '/api/studio/uploads', { cookie: wren.cookie, body: { fileName: 'coat.fbx', byteSize: 1000 } });
    const { error } = await expectJson(response, 400);
    expect(error).toMatchObject({ code: 'invalid-input', fields: { fileName: expect.stringMatching(/OBJ, PLY, STL, glTF or GLB/) } });
  });

  it('refuses a declared size over the limit, naming the limit', async () => {
    const response = await callRoute(uploadsRoute, 'POST', '/api/studio/uploads', { cookie: wren.cookie, body: { fileName: 'huge.obj', byteSize: 300_000_000 } });
    const { error } = await expectJson(response, 400);
    expect(error.fields.byteSize).toBe('The file is 300 MB; growth surfaces may be at most 200 MB. Decimate it before uploading.');
  });

  it('hands out a PUT valid for ten minutes', async () => {
    const before = Date.now();
    const ticket = await uploadFile(wren, 'cube.obj', await fixture('uv-split-cube.obj'));
    expect(ticket).toMatchObject({ method: 'PUT', maxBytes: 200_000_000 });
    expect(Date.parse(ticket.expiresAt) - before).toBeGreaterThan(9.9 * 60_000);
    expect(new URL(ticket.url).searchParams.get('X-Amz-Expires')).toBe('600');
  });

  it('answers registration before the file arrived with upload-missing, and keeps the upload', async () => {
    const response = await callRoute(uploadsRoute, 'POST', '/api/studio/uploads', { cookie: wren.cookie, body: { fileName: 'later.obj', byteSize: 10 } });
    const { uploadId } = (await expectJson(response, 201)).data;
    const register = await callRoute(surfacesRoute, 'POST', '/api/studio/surfaces', { cookie: wren.cookie, body: { uploadId, name: 'Later', units: 'cm' } });
    expect((await expectJson(register, 409)).error.code).toBe('upload-missing');
    expect(await db()('surface_uploads').where({ id: uploadId })).toHaveLength(1);
  });

  it('sweeps away uploads that were never registered, a day after their URL expired', async () => {
    const abandoned = await uploadFile(wren, 'abandoned.obj', await fixture('uv-split-cube.obj'));
    const recent = await uploadFile(wren, 'recent.obj', await fixture('uv-split-cube.obj'));
    await db()('surface_uploads').where({ id: abandoned.uploadId }).update({ expires_at: new Date(Date.now() - 25 * 3600_000) });
    const key = (await db()('surface_uploads').where({ id: abandoned.uploadId }).first()).object_key;
    expect(await sweepAbandonedUploads()).toBe(1);
    expect(await db()('surface_uploads').whereIn('id', [abandoned.uploadId, recent.uploadId]).pluck('id')).toEqual([recent.uploadId]);
    expect(await storedKeys(key)).toEqual([]);
  });

  it('checks the registration fields', async () => {
    const response = await callRoute(surfacesRoute, 'POST', '/api/studio/surfaces', { cookie: wren.cookie, body: { uploadId: 'nope', name: ' ', units: 'furlong' } });
    expect(Object.keys((await expectJson(response, 400)).error.fields).sort()).toEqual(['name', 'units', 'uploadId']);
  });
});

describe('who may see and change surfaces', () => {
  let surface: SurfaceSummary;

  beforeAll(async () => {
    surface = await createSurface(wren, 'cube.obj', await fixture('uv-split-cube.obj'), 'Private cube');
  });

  const one = (account: TestAccount | null, method: 'GET' | 'DELETE', id = surface.id) =>
    callRoute(surfaceRoute, method, `/api/studio/surfaces/${id}`, { cookie: account?.cookie, params: { surfaceId: id } });

  it('hides one groomer’s surfaces from another: 404, and not in their list', async () => {
    expect((await expectJson(await one(rival, 'GET'), 404)).error.code).toBe('not-found');
    expect((await expectJson(await one(rival, 'DELETE'), 404)).error.code).toBe('not-found');
    expect(await db()('growth_surfaces').where({ id: surface.id })).toHaveLength(1);
    const list = await expectJson(await callRoute(surfacesRoute, 'GET', '/api/studio/surfaces', { cookie: rival.cookie }), 200);
    expect(list.data.surfaces).toEqual([]);
  });

  it('does not let another groomer register someone else’s upload', async () => {
    const ticket = await uploadFile(wren, 'cube.obj', await fixture('uv-split-cube.obj'));
    const response = await callRoute(surfacesRoute, 'POST', '/api/studio/surfaces', { cookie: rival.cookie, body: { uploadId: ticket.uploadId, name: 'Mine now', units: 'cm' } });
    expect((await expectJson(response, 404)).error.code).toBe('not-found');
  });

  it('answers 404 to an id that is no id at all', async () => {
    expect((await expectJson(await one(wren, 'GET', 'not-a-uuid'), 404)).error.code).toBe('not-found');
  });

  it('refuses admins with 403 and visitors with 401; a buyer has surfaces of their own and sees no one else’s', async () => {
    const admin = await signedInAdmin();
    expect((await expectJson(await one(admin, 'GET'), 403)).error.code).toBe('forbidden');
    expect((await callRoute(uploadsRoute, 'POST', '/api/studio/uploads', { cookie: admin.cookie, body: { fileName: 'a.obj', byteSize: 10 } })).status).toBe(403);
    expect((await callRoute(surfacesRoute, 'GET', '/api/studio/surfaces', { cookie: admin.cookie })).status).toBe(403);
    expect((await expectJson(await one(buyer, 'GET'), 404)).error.code).toBe('not-found');
    expect((await callRoute(uploadsRoute, 'POST', '/api/studio/uploads', { cookie: buyer.cookie, body: { fileName: 'a.obj', byteSize: 10 } })).status).toBe(201);
    expect((await expectJson(await callRoute(surfacesRoute, 'GET', '/api/studio/surfaces', { cookie: buyer.cookie }), 200)).data.surfaces).toEqual([]);
    expect((await expectJson(await one(null, 'GET'), 401)).error.code).toBe('not-signed-in');
  });
});
