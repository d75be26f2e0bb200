// Moving a groom onto another surface through the studio's route handlers: the transfer report
// first (nothing written), then the move as one transaction that keeps the groom as it was as a
// version on its old surface; a refused transfer and a stale revision write nothing; a version
// made before the move opens on its own surface; a new groom can start from one on another surface.
import { callRoute, createSurface, expectJson, studioCast, type TestAccount } from './studio-helpers';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { closeDb, db } from '@/lib/platform/db';
import { startJobsWorkerProcess, type JobsWorkerProcess } from '@/services/jobs-worker-process';
import * as groomsRoute from '@/app/api/studio/grooms/route';
import * as groomRoute from '@/app/api/studio/grooms/[groomId]/route';
import * as specRoute from '@/app/api/studio/grooms/[groomId]/spec/route';
import * as previewRoute from '@/app/api/studio/grooms/[groomId]/surface/preview/route';
import * as moveRoute from '@/app/api/studio/grooms/[groomId]/surface/route';
import * as duplicateRoute from '@/app/api/studio/grooms/[groomId]/duplicate/route';
import * as exportsRoute from '@/app/api/studio/grooms/[groomId]/exports/route';
import * as exportRoute from '@/app/api/studio/exports/[exportId]/route';
import * as restoreRoute from '@/app/api/studio/grooms/[groomId]/versions/[versionId]/restore/route';
import * as surfaceRoute from '@/app/api/studio/surfaces/[surfaceId]/route';
import * as versionsRoute from '@/app/api/studio/grooms/[groomId]/versions/route';
import { strFromU8, unzipSync } from 'fflate';
import { createListing } from '@/lib/market/listings';
import { listLicences } from '@/lib/market/licences';
import { getObjectBytes } from '@/lib/platform/storage';
import type { ExportJob, GroomDetail, ReadySurface, SurfaceMovePreview } from '@/lib/studio/types';
import { STALE_MOVE_MS, sweepStaleSurfaceMoves } from '@/lib/studio/surface-change';
import { SURFACE_MOVE_QUEUE } from '@/lib/studio/jobs';
import { multiply3, onUnitSphere as at, transferSphere, rotationAbout } from '@/tests/fixtures/transfer-sphere';

const encode = (text: string) => new TextEncoder().encode(text);
const first = transferSphere(12, 16);
const sculpted = transferSphere(12, 16, { sculpt: ([x, y, z]) => { const k = 1 + 0.06 * Math.sin(3 * x) * Math.cos(2 * y); return [k * x, k * y, k * z]; } });
const turned = transferSphere(12, 16, { split: 'bc', asTriangles: true, shift: 5, scale: 2.54, rotation: multiply3(rotationAbout('z', 35), rotationAbout('x', 50)), translation: [3, -1, 2] });

const SPEC = { specVersion: 2, units: 'cm', upAxis: 'z', field: { singularities: [{ point: at(40, 30), index: 1 }, { point: at(130, 200), index: 1 }] }, guides: { count: 40, length: 0.3 } };

let pip: TestAccount;
let rival: TestAccount;
let surfaces: { first: ReadySurface; sculpted: ReadySurface; turned: ReadySurface };
let groom: GroomDetail;

const path = (id: string, rest = '') => `/api/studio/grooms/${id}${rest}`;
const call = (account: TestAccount, module: object, method: 'GET' | 'POST' | 'PUT', id: string, rest: string, body?: unknown, extra: Record<string, string> = {}) =>
  callRoute(module, method, path(id, rest), { cookie: account.cookie, body, params: { groomId: id, ...extra } });
const detail = async (id: string): Promise<GroomDetail> => (await expectJson(await call(pip, groomRoute, 'GET', id, ''), 200)).data.groom;

// The transfer is a job: the requests wait for a job worker, as beside the app.
let worker: JobsWorkerProcess;

beforeAll(async () => {
  worker = await startJobsWorkerProcess();
  ({ owner: pip, rival } = await studioCast('move'));
  surfaces = {
    first: await createSurface(pip, 'pip-1.obj', encode(first.obj), 'Pip, first sculpt'),
    sculpted: await createSurface(pip, 'pip-2.obj', encode(sculpted.obj), 'Pip, second sculpt'),
    turned: await createSurface(pip, 'pip-export.obj', encode(turned.obj), 'Pip, exported turned'),
  };
  const created = await callRoute(groomsRoute, 'POST', '/api/studio/grooms', { cookie: pip.cookie, body: { surfaceId: surfaces.first.id, name: 'Pip coat' } });
  groom = (await expectJson(created, 201)).data.groom;
  await expectJson(await call(pip, specRoute, 'PUT', groom.id, '/spec', { spec: SPEC, baseRevision: groom.revision }), 200);
  groom = await detail(groom.id);
});

afterAll(async () => {
  await worker.stop();
  await closeDb();
});

/** The guides' binding primvars (ids, root polygons, weights) of a USD export of the groom as saved. */
async function exportedBinding(groomId: string): Promise<string[]> {
  const started = await callRoute(exportsRoute, 'POST', `/api/studio/grooms/${groomId}/exports`, { cookie: pip.cookie, body: { format: 'usda' }, params: { groomId } });
  let job: ExportJob = (await expectJson(started, 202)).data.export;
  const deadline = Date.now() + 120_000;
  while (job.status !== 'done' && job.status !== 'failed') {
    if (Date.now() > deadline) throw new Error(`export ${job.id} still ${job.status}`);
    await new Promise((resolve) => setTimeout(resolve, 100));
    job = (await expectJson(await callRoute(exportRoute, 'GET', `/api/studio/exports/${job.id}`, { cookie: pip.cookie, params: { exportId: job.id } }), 200)).data.export;
  }
  expect(job.status, job.error ?? '').toBe('done');
  const usda = await (await fetch(job.downloadUrl!)).text();
  return ['guideId', 'rootFace', 'rootBarycentric'].map((name) => usda.match(new RegExp(`primvars:whorlwind:${name} = (\\[[^\\]]*\\])`))![1]);
}

describe('moving a groom onto a new sculpt of its character', () => {
  it('shows the transfer report first and writes nothing but the transfer it keeps for the accept', async () => {
    const response = await call(pip, previewRoute, 'POST', groom.id, '/surface/preview', { surfaceId: surfaces.sculpted.id });
    const preview: SurfaceMovePreview = (await expectJson(response, 200)).data.preview;
    expect(preview.revision).toBe(groom.revision);
    expect(preview.to).toEqual({ id: surfaces.sculpted.id, name: 'Pip, second sculpt' });
    expect(preview.report.features.map((f) => [f.path, f.to !== null])).toEqual([['field.singularities[0]', true], ['field.singularities[1]', true]]);
    expect(preview.report.field).toEqual({ solved: true });
    expect((await detail(groom.id)).surface.id).toBe(surfaces.first.id);
    // The job's row is kept, done, for the accept to take (the groom itself is unchanged above).
    expect(await db()('groom_surface_moves').where({ groom_id: groom.id }).select('id', 'status')).toEqual([{ id: preview.moveId, status: 'done' }]);
    const rivalAsks = await call(rival, previewRoute, 'POST', groom.id, '/surface/preview', { surfaceId: surfaces.sculpted.id });
    expect(rivalAsks.status).toBe(404);
  });

  it('refuses collinear landmarks in words and a stale revision, writing nothing either time', async () => {
    const line = [0, 1, 2].map((k) => ({ from: [k, 0, 0], to: [0, 0, k] }));
    const refused = await call(pip, moveRoute, 'PUT', groom.id, '/surface', { surfaceId: surfaces.turned.id, landmarks: line, baseRevision: groom.revision });
    const body = await expectJson(refused, 422);
    expect(body.error).toMatchObject({ code: 'transfer-refused', message: expect.stringMatching(/cannot be moved onto Pip, exported turned: landmarks: .* lie on one line/) });
    const stale = await call(pip, moveRoute, 'PUT', groom.id, '/surface', { surfaceId: surfaces.sculpted.id, baseRevision: groom.revision - 1 });
    expect((await expectJson(stale, 409)).error.code).toBe('stale-revision');
    const after = await detail(groom.id);
    expect(after).toMatchObject({ revision: groom.revision, surface: { id: surfaces.first.id } });
    expect(after.versions).toEqual([]);
  });

  it('moves it, keeping the groom as it was as a version on the old surface, which opens there again', async () => {
    const bindingBefore = await exportedBinding(groom.id);
    const preview: SurfaceMovePreview = (await expectJson(await call(pip, previewRoute, 'POST', groom.id, '/surface/preview', { surfaceId: surfaces.sculpted.id }), 200)).data.preview;
    const moveJobs = async () => Number((await db().raw('SELECT count(*) AS n FROM pgboss.job WHERE name = ?', [SURFACE_MOVE_QUEUE])).rows[0].n);
    const jobsBefore = await moveJobs();
    const moved: GroomDetail = (await expectJson(await call(pip, moveRoute, 'PUT', groom.id, '/surface', { surfaceId: surfaces.sculpted.id, baseRevision: groom.revision, moveId: preview.moveId }), 200)).data.groom;
    // Accepting took the previewed transfer: no job carried the groom over again, and its row is gone.
    expect(await moveJobs()).toBe(jobsBefore);
    expect(await db()('groom_surface_moves').where({ id: preview.moveId }).first()).toBeUndefined();
    expect(moved.surface.id).toBe(surfaces.sculpted.id);
    expect(moved.revision).toBe(groom.revision + 1);
    for (const s of moved.spec.field.singularities) expect(s.surface).toBeDefined();
    expect(moved.versions).toEqual([expect.objectContaining({ number: 1, name: 'Before moving to Pip, second sculpt', surfaceId: surfaces.first.id })]);
    const { count } = await db()('groom_versions').where({ groom_id: groom.id }).count<{ count: string }[]>('* as count').first() as { count: string };
    expect(Number(count)).toBe(1);
    // A sculpt pass: the exported guides keep their ids, polygons and weights (the roots are still
    // sampled on the first sculpt and placed by polygon on the second).
    expect(await exportedBinding(groom.id)).toEqual(bindingBefore);
    // …and the editor is told where the roots are, so its preview grows the same guides.
    expect(moved.rootsSurface).toMatchObject({ id: surfaces.first.id, fileName: 'pip-1.obj' });
    expect(await (await fetch(moved.rootsSurface!.fileUrl)).text()).toBe(first.obj);

    // The first sculpt now holds a version: it cannot be deleted from under it.
    const deleting = await callRoute(surfaceRoute, 'DELETE', `/api/studio/surfaces/${surfaces.first.id}`, { cookie: pip.cookie, params: { surfaceId: surfaces.first.id } });
    expect((await expectJson(deleting, 409)).error.message).toMatch(/Versions of “Pip coat” were made on this surface/);

    const version = moved.versions[0];
    const restored = await call(pip, restoreRoute, 'POST', groom.id, `/versions/${version.id}/restore`, undefined, { versionId: version.id });
    expect((await expectJson(restored, 200)).data).toMatchObject({ surfaceId: surfaces.first.id });
    const back = await detail(groom.id);
    expect(back.surface.id).toBe(surfaces.first.id);
    expect(back.rootsSurface).toBeNull();
    expect(back.spec.field.singularities.map((s) => s.point)).toEqual(groom.spec.field.singularities.map((s) => s.point));
  });

  it('sells a version kept after the move with the same guides as the studio exports: the market package grows from the roots on the earlier sculpt', async () => {
    const now = await detail(groom.id);
    if (now.surface.id !== surfaces.sculpted.id) {
      await expectJson(await call(pip, moveRoute, 'PUT', groom.id, '/surface', { surfaceId: surfaces.sculpted.id, baseRevision: now.revision }), 200);
    }
    const kept = (await expectJson(await call(pip, versionsRoute, 'POST', groom.id, '/versions', { name: 'On the second sculpt' }), 201)).data.version;
    const studioBinding = await exportedBinding(groom.id);
    const listing = await createListing({ userId: pip.userId, roles: ['groomer'], email: pip.email }, {
      groomId: groom.id,
      versionId: kept.id,
      title: 'Pip coat on the second sculpt',
      description: 'A coat for Pip, moved onto the second sculpt.',
      tags: { animal: 'toy', coatLength: 'short', style: 'plush', bodyRegion: 'full-body' },
      priceCents: 900,
      currency: 'eur',
      licenceSlug: (await listLicences())[0].slug,
      formats: ['usda'],
      rightsConfirmed: true,
      shipsSurface: false,
    });
    const deadline = Date.now() + 120_000;
    let row = await db()('listings').where({ id: listing.id }).first('assets_status', 'assets_error', 'roots_surface_key');
    while (row.assets_status === 'pending') {
      if (Date.now() > deadline) throw new Error('the listing’s files were not made');
      await new Promise((resolve) => setTimeout(resolve, 200));
      row = await db()('listings').where({ id: listing.id }).first('assets_status', 'assets_error', 'roots_surface_key');
    }
    expect(row.assets_status, row.assets_error ?? '').toBe('ready');
    expect(row.roots_surface_key).toMatch(/\/roots-surface\.obj$/);
    const stored = await db()('listing_packages').where({ listing_id: listing.id }).first('object_key');
    const zip = unzipSync(await getObjectBytes(stored.object_key));
    const usda = strFromU8(Object.entries(zip).find(([path]) => path.endsWith('/guides.usda'))![1]);
    const packaged = ['guideId', 'rootFace', 'rootBarycentric'].map((name) => usda.match(new RegExp(`primvars:whorlwind:${name} = (\\[[^\\]]*\\])`))![1]);
    expect(packaged).toEqual(studioBinding);
  });

  it('starts a new groom from this one on another surface, by landmarks', async () => {
    const landmarks = [at(10, 0), at(90, 0), at(90, 90), at(170, 200)].map((p) => ({ from: p, to: turned.place(p) }));
    const response = await call(pip, duplicateRoute, 'POST', groom.id, '/duplicate', { surfaceId: surfaces.turned.id, landmarks });
    const started: GroomDetail = (await expectJson(response, 201)).data.groom;
    expect(started).toMatchObject({ name: 'Pip coat on Pip, exported turned', surface: { id: surfaces.turned.id }, rootsSurface: null });
    const whorl = started.spec.field.singularities[0].point!;
    const expected = turned.place(at(40, 30));
    expect(Math.hypot(whorl[0] - expected[0], whorl[1] - expected[1], whorl[2] - expected[2])).toBeLessThan(1.5);
  });
});

describe('transfers nobody takes', () => {
  it('are swept once stale: a preview never accepted, a request whose process stopped; a fresh one stays', async () => {
    const input = JSON.stringify({ surfaceId: surfaces.sculpted.id });
    const [stale, fresh] = await db()('groom_surface_moves')
      .insert([
        { groom_id: groom.id, target_surface_id: surfaces.sculpted.id, input, status: 'done', updated_at: new Date(Date.now() - STALE_MOVE_MS - 60_000) },
        { groom_id: groom.id, target_surface_id: surfaces.sculpted.id, input, status: 'queued' },
      ])
      .returning('id');
    expect(await sweepStaleSurfaceMoves()).toBeGreaterThanOrEqual(1);
    expect(await db()('groom_surface_moves').where({ id: stale.id }).first()).toBeUndefined();
    expect(await db()('groom_surface_moves').where({ id: fresh.id }).first()).toBeDefined();
    await db()('groom_surface_moves').where({ id: fresh.id }).delete();
  });
});
