// services/jobs-worker.ts run as a process of its own, as the task scripts run it beside the app:
// it takes queued jobs (a surface's check, a groom's thumbnail); SIGTERM drains it (a running export is stopped and marked failed, never
// left "running"); a heavy job past its time or memory budget is stopped and its export marked
// failed in words a groomer understands.
import { callRoute, createSurface, expectJson, signedInAccount, uploadFile, type TestAccount } from './studio-helpers';
import { readFile } from 'node:fs/promises';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { closeDb, db } from '@/lib/platform/db';
import { stopJobs } from '@/lib/platform/jobs';
import { MAX_GUIDE_POINTS } from '@/lib/groom';
import { DEMO_GROOMS, surfaceToObj } from '@/lib/groom/demo';
import { startJobsWorkerProcess, type JobsWorkerProcess } from '@/services/jobs-worker-process';
import * as groomsRoute from '@/app/api/studio/grooms/route';
import * as surfacesRoute from '@/app/api/studio/surfaces/route';
import * as specRoute from '@/app/api/studio/grooms/[groomId]/spec/route';
import * as exportsRoute from '@/app/api/studio/grooms/[groomId]/exports/route';
import type { ExportJob } from '@/lib/studio/types';

afterAll(async () => {
  await stopJobs();
  await closeDb();
});

/** Polls a row until the check passes or the deadline (generous: two cores shared) passes. */
async function until<T>(read: () => Promise<T>, done: (value: T) => boolean, what: string, seconds = 90): Promise<T> {
  const deadline = Date.now() + seconds * 1000;
  for (;;) {
    const value = await read();
    if (done(value)) return value;
    if (Date.now() > deadline) throw new Error(`gave up waiting for ${what}: last ${JSON.stringify(value)}`);
    await new Promise((resolve) => setTimeout(resolve, 100));
  }
}

const exportRow = (id: string) => db()('groom_exports').where({ id }).first('status', 'stage', 'error');

describe('the stand-alone job worker', () => {
  it('checks a registered surface (checking → ready), renders the queued thumbnail of a groom on it, and exits 0 on SIGTERM', async () => {
    const groomer = await signedInAccount('groomer', 'worker-process');
    const cube = new Uint8Array(await readFile(new URL('../fixtures/surfaces/uv-split-cube.obj', import.meta.url)));
    const ticket = await uploadFile(groomer, 'cube.obj', cube);
    const registered = await callRoute(surfacesRoute, 'POST', '/api/studio/surfaces', { cookie: groomer.cookie, body: { uploadId: ticket.uploadId, name: 'Cube', units: 'cm' } });
    const surface = (await expectJson(registered, 202)).data.surface;
    expect(surface.state).toBe('checking');

    const worker = await startJobsWorkerProcess();
    try {
      const checked = await until(() => db()('growth_surfaces').where({ id: surface.id }).first('state', 'face_count', 'check_progress'), (r) => r.state !== 'checking', 'the check', 45);
      expect(checked, worker.output()).toEqual({ state: 'ready', face_count: 12, check_progress: 1 });
      const created = await callRoute(groomsRoute, 'POST', '/api/studio/grooms', { cookie: groomer.cookie, body: { surfaceId: surface.id, name: 'Cube coat' } });
      const groom = (await expectJson(created, 201)).data.groom;
      const row = await until(() => db()('grooms').where({ id: groom.id }).first('thumbnail_key'), (r) => r.thumbnail_key !== null, 'the thumbnail', 45);
      expect(row.thumbnail_key, worker.output()).toMatch(new RegExp(`^grooms/${groom.id}/thumbnail-`));
    } finally {
      expect(await worker.stop(), worker.output()).toBe(0);
    }
    expect(worker.output()).toMatch(/\[jobs-worker\] ready: working on .*studio-surface-check.*studio-export.*studio-thumbnail.*market-listing-assets/);
  });
});

describe('the heaviest export the budget allows', () => {
  const cat = DEMO_GROOMS[1];
  let groomer: TestAccount;
  let groomId: string;

  beforeAll(async () => {
    groomer = await signedInAccount('groomer', 'worker-budget');
    const surface = await createSurface(groomer, 'cat.obj', new TextEncoder().encode(surfaceToObj(cat.surface(), 'cat')), 'Cat');
    const created = await callRoute(groomsRoute, 'POST', '/api/studio/grooms', { cookie: groomer.cookie, body: { surfaceId: surface.id, name: 'Dense cat' } });
    groomId = (await expectJson(created, 201)).data.groom.id;
    // 250,000 guides × 16 points: exactly the budget (lib/groom/README.md, "Budgets").
    const { density: _density, ...guides } = cat.spec.guides as Record<string, unknown>;
    const spec = { ...cat.spec, guides: { ...guides, count: MAX_GUIDE_POINTS / 16, pointsPerGuide: 16 } };
    await expectJson(await callRoute(specRoute, 'PUT', `/api/studio/grooms/${groomId}/spec`, { cookie: groomer.cookie, body: { spec, baseRevision: 1 }, params: { groomId } }), 200);
  });

  async function requestUsda(): Promise<string> {
    const response = await callRoute(exportsRoute, 'POST', `/api/studio/grooms/${groomId}/exports`, { cookie: groomer.cookie, body: { format: 'usda' }, params: { groomId } });
    return ((await expectJson(response, 202)).data.export as ExportJob).id;
  }

  it('is stopped and marked failed when its worker is told to stop (SIGTERM drains), and the worker exits 0', async () => {
    const worker = await startJobsWorkerProcess({ ...process.env, WHORLWIND_DRAIN_SECONDS: '0' });
    const exportId = await requestUsda();
    // Growing 250,000 guides takes seconds; the stop comes as soon as the job has started.
    await until(() => exportRow(exportId), (row) => row.status === 'running', 'the export to start');
    expect(await worker.stop(), worker.output()).toBe(0);
    const row = await exportRow(exportId);
    expect(row).toMatchObject({ status: 'failed', stage: 'failed' });
    expect(row.error).toBe('The export was stopped because the server running it shut down. Ask for it again.');
    expect(worker.output()).toContain('SIGTERM: taking no new jobs');
  });

  it('fails with the time budget in the groomer’s words when it runs too long', async () => {
    const worker = await startJobsWorkerProcess({ ...process.env, WHORLWIND_JOB_SECONDS: '3' });
    try {
      const exportId = await requestUsda();
      const row = await until(() => exportRow(exportId), (r) => r.status === 'failed' || r.status === 'done', 'the export to end');
      expect(row.error, worker.output()).toBe('The export took longer than the 3 seconds a job may run, so it was stopped. Fewer guides or fewer points per guide make it lighter.');
    } finally {
      expect(await worker.stop()).toBe(0);
    }
  });

  it('fails with the memory budget in the groomer’s words when it needs more memory, and the worker lives on', async () => {
    const worker = await startJobsWorkerProcess({ ...process.env, WHORLWIND_JOB_MEMORY_MB: '300' });
    try {
      const exportId = await requestUsda();
      const row = await until(() => exportRow(exportId), (r) => r.status === 'failed' || r.status === 'done', 'the export to end');
      expect(row.error, worker.output()).toBe('The export needed more than the 300 MB of memory a job may use, so it was stopped. Fewer guides or fewer points per guide make it lighter.');
      // The worker took the next job after the stopped one: a small export of the spec file.
      const spec = await callRoute(exportsRoute, 'POST', `/api/studio/grooms/${groomId}/exports`, { cookie: groomer.cookie, body: { format: 'json' }, params: { groomId } });
      const next = ((await expectJson(spec, 202)).data.export as ExportJob).id;
      expect((await until(() => exportRow(next), (r) => r.status === 'done' || r.status === 'failed', 'the next export')).status).toBe('done');
    } finally {
      expect(await worker.stop()).toBe(0);
    }
  });

  it('refuses a surface whose check needs more memory than its budget, in words, and the worker lives on', async () => {
    // Node with tsx alone needs more than 60 MB: the check's child is stopped as soon as it starts.
    const worker = await startJobsWorkerProcess({ ...process.env, WHORLWIND_JOB_MEMORY_MB: '60' });
    try {
      const ticket = await uploadFile(groomer, 'cube.obj', new Uint8Array(await readFile(new URL('../fixtures/surfaces/uv-split-cube.obj', import.meta.url))));
      const registered = await callRoute(surfacesRoute, 'POST', '/api/studio/surfaces', { cookie: groomer.cookie, body: { uploadId: ticket.uploadId, name: 'Starved cube', units: 'cm' } });
      const { id } = (await expectJson(registered, 202)).data.surface;
      const row = await until(() => db()('growth_surfaces').where({ id }).first('state', 'problems'), (r) => r.state !== 'checking', 'the check to end');
      expect(row, worker.output()).toEqual({
        state: 'refused',
        problems: [expect.objectContaining({ code: 'check-stopped', severity: 'error', message: 'The check of the surface needed more than the 60 MB of memory a job may use, so it was stopped. A surface with fewer faces (decimated) is lighter to check.' })],
      });
    } finally {
      expect(await worker.stop()).toBe(0);
    }
  });
});
