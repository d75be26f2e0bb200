// Exports made by a job-worker process (started as the test stack starts it) from the saved spec, stored in the S3
// stand-in and downloaded through presigned URLs; each file is read back by an independent reader.
import { callRoute, createSurface, expectJson, studioCast, type TestAccount } from './studio-helpers';
import { validateBytes } from 'gltf-validator';
import { OBJLoader } from 'three/examples/jsm/loaders/OBJLoader.js';
import { USDAParser } from 'three/examples/jsm/loaders/usd/USDAParser.js';
import type { LineSegments } from 'three';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { closeDb, db } from '@/lib/platform/db';
import { readSurface } from '@/lib/field';
import { parseGroomSpec, parseGroomSpecJson } from '@/lib/groom';
import { DEMO_GROOMS, surfaceToObj } from '@/lib/groom/demo';
import { startJobsWorkerProcess, type JobsWorkerProcess } from '@/services/jobs-worker-process';
import * as groomsRoute from '@/app/api/studio/grooms/route';
import * as groomRoute from '@/app/api/studio/grooms/[groomId]/route';
import * as specRoute from '@/app/api/studio/grooms/[groomId]/spec/route';
import * as exportsRoute from '@/app/api/studio/grooms/[groomId]/exports/route';
import * as exportRoute from '@/app/api/studio/exports/[exportId]/route';
import { EXPORT_FORMATS, type ExportFormat, type ExportJob, type GroomDetail } from '@/lib/studio/types';

const cat = DEMO_GROOMS[1];
const catMesh = cat.surface();
const catObj = new TextEncoder().encode(surfaceToObj(catMesh, 'long cat'));

let worker: JobsWorkerProcess;
let wren: TestAccount;
let rival: TestAccount;
let buyer: TestAccount;
let groom: GroomDetail;
let surfaceId: string;

beforeAll(async () => {
  worker = await startJobsWorkerProcess();
  ({ owner: wren, rival, buyer } = await studioCast('export'));
  surfaceId = (await createSurface(wren, 'brisquette.obj', catObj, 'Brisquette body')).id;
  // Only read from here on: a test that changes or deletes a groom makes its own.
  groom = await brisquette('Brisquette — short velvet');
});

/** A groom of the cat's spec, saved once (revision 2). */
async function brisquette(name: string): Promise<GroomDetail> {
  const created = await callRoute(groomsRoute, 'POST', '/api/studio/grooms', { cookie: wren.cookie, body: { surfaceId, name } });
  const { id } = (await expectJson(created, 201)).data.groom;
  await expectJson(await callRoute(specRoute, 'PUT', `/api/studio/grooms/${id}/spec`, { cookie: wren.cookie, body: { spec: cat.spec, baseRevision: 1 }, params: { groomId: id } }), 200);
  return (await expectJson(await callRoute(groomRoute, 'GET', `/api/studio/grooms/${id}`, { cookie: wren.cookie, params: { groomId: id } }), 200)).data.groom;
}

afterAll(async () => {
  await worker.stop();
  await closeDb();
});

function requestExport(account: TestAccount | null, groomId: string, format: string) {
  return callRoute(exportsRoute, 'POST', `/api/studio/grooms/${groomId}/exports`, { cookie: account?.cookie, body: { format }, params: { groomId } });
}

function readExport(account: TestAccount | null, exportId: string) {
  return callRoute(exportRoute, 'GET', `/api/studio/exports/${exportId}`, { cookie: account?.cookie, params: { exportId } });
}

/** Polls the export until its job has finished; every state seen on the way is kept. */
async function finished(exportId: string, seen: ExportJob[] = []): Promise<ExportJob> {
  const deadline = Date.now() + 60_000;
  for (;;) {
    const job: ExportJob = (await expectJson(await readExport(wren, exportId), 200)).data.export;
    seen.push(job);
    if (job.status === 'done' || job.status === 'failed') return job;
    if (Date.now() > deadline) throw new Error(`export ${exportId} still ${job.status} (${job.stage}) after 60 s`);
    await new Promise((resolve) => setTimeout(resolve, 100));
  }
}

async function download(job: ExportJob): Promise<{ bytes: Uint8Array; disposition: string | null }> {
  const response = await fetch(job.downloadUrl!);
  expect(response.status).toBe(200);
  return { bytes: new Uint8Array(await response.arrayBuffer()), disposition: response.headers.get('content-disposition') };
}

const text = (bytes: Uint8Array) => new TextDecoder().decode(bytes);

/** Counts the polylines in a set of line segments: a segment that does not start where the last one ended starts a new one. */
function polylines(position: ArrayLike<number>): number {
  let count = 0;
  for (let s = 0; s < position.length; s += 6) {
    const continues = s > 0 && [0, 1, 2].every((k) => position[s + k] === position[s - 3 + k]);
    if (!continues) count++;
  }
  return count;
}

describe('each format', () => {
  const jobs = new Map<ExportFormat, ExportJob>();
  const stagesSeen: ExportJob[] = [];

  beforeAll(async () => {
    for (const format of EXPORT_FORMATS) {
      const response = await requestExport(wren, groom.id, format);
      const queued: ExportJob = (await expectJson(response, 202)).data.export;
      expect(queued).toMatchObject({ groomId: groom.id, format, status: 'queued', progress: 0, stage: 'waiting in the queue', downloadUrl: null, specRevision: 2 });
      jobs.set(format, queued);
    }
    for (const format of EXPORT_FORMATS) jobs.set(format, await finished(jobs.get(format)!.id, stagesSeen));
  });

  it('is made by the job, with the file named after the groom and its revision', () => {
    for (const [format, job] of jobs) {
      expect(job, format).toMatchObject({ status: 'done', progress: 1, stage: 'done', error: null });
      expect(job.fileName).toMatch(/^brisquette-short-velvet-r2(-bspline|-guides|-field)?\.(usda|gltf|glb|obj|json|ply)$/);
    }
    // Progress only ever moves forward while a job runs.
    for (const format of EXPORT_FORMATS) {
      const progress = stagesSeen.filter((job) => job.format === format).map((job) => job.progress);
      expect(progress).toEqual([...progress].sort((a, b) => a - b));
    }
  });

  it('downloads through a presigned URL that names the file', async () => {
    const job = jobs.get('usda')!;
    expect(new URL(job.downloadUrl!).searchParams.get('X-Amz-Expires')).toBe('600');
    const { disposition } = await download(job);
    expect(disposition).toBe(`attachment; filename="${job.fileName}"`);
  });

  it('json: the saved spec, each place with where it sits on the surface in the file’s numbering', async () => {
    const { bytes } = await download(jobs.get('json')!);
    const written = parseGroomSpecJson(text(bytes));
    // Without the positions, it is the saved spec exactly.
    const withoutPositions = JSON.parse(JSON.stringify(written), (key, value) => (key === 'surface' ? undefined : value));
    expect(withoutPositions).toEqual(groom.spec);
    expect(withoutPositions).toEqual(parseGroomSpec(cat.spec));
    expect(written.field.singularities.length).toBeGreaterThan(0);
    for (const s of written.field.singularities) expect(s.surface).toMatchObject({ polygon: expect.any(Number), barycentric: expect.any(Array) });
    for (const pin of written.pins) expect(pin.surface?.polygon).toEqual(expect.any(Number));
  });

  it('usda and usda-bspline: BasisCurves that three.js’s USDA parser reads', async () => {
    for (const [format, type] of [['usda', 'linear'], ['usda-bspline', 'cubic']] as const) {
      const { bytes } = await download(jobs.get(format)!);
      const { specsByPath } = new USDAParser().parseData(text(bytes)) as { specsByPath: Record<string, { fields: Record<string, unknown> }> };
      expect(specsByPath['/Groom/Guides'].fields.typeName).toBe('BasisCurves');
      expect(specsByPath['/Groom/Guides.type'].fields.default).toBe(type);
      const counts = specsByPath['/Groom/Guides.curveVertexCounts'].fields.default as number[];
      expect(counts.length).toBeGreaterThan(100);
      expect(counts.every((n) => n === cat.spec.guides!.pointsPerGuide)).toBe(true);
    }
  });

  it('gltf and glb: no errors from the Khronos validator', async () => {
    for (const format of ['gltf', 'glb'] as const) {
      const { bytes } = await download(jobs.get(format)!);
      const report = await validateBytes(bytes, { format, maxIssues: 0 });
      expect(report.issues.numErrors, format).toBe(0);
    }
  });

  it('obj: one polyline per guide, as three.js’s OBJ loader reads it', async () => {
    const { bytes } = await download(jobs.get('obj')!);
    const usda = text((await download(jobs.get('usda')!)).bytes);
    const guides = (new USDAParser().parseData(usda) as { specsByPath: Record<string, { fields: Record<string, unknown> }> }).specsByPath['/Groom/Guides.curveVertexCounts'].fields.default as number[];
    const group = new OBJLoader().parse(text(bytes));
    const lines = group.children.filter((child) => (child as LineSegments).isLineSegments) as LineSegments[];
    expect(polylines(lines[0].geometry.getAttribute('position').array)).toBe(guides.length);
  });

  it('ply: the field on the surface, read back by lib/field', async () => {
    const { bytes } = await download(jobs.get('ply')!);
    const { mesh } = readSurface(bytes, jobs.get('ply')!.fileName);
    expect(mesh.triangles.length).toBe(catMesh.triangles.length);
    const header = text(bytes.subarray(0, 400));
    expect(header).toMatch(/element face \d+[\s\S]*property float dx/);
  });
});

describe('the growth surface beside the guides', () => {
  it('is written when asked for, with the groom and revision it came from, and every root rebuilds on it', async () => {
    const response = await callRoute(exportsRoute, 'POST', `/api/studio/grooms/${groom.id}/exports`, {
      cookie: wren.cookie,
      body: { format: 'usda', withSurface: true },
      params: { groomId: groom.id },
    });
    const queued: ExportJob = (await expectJson(response, 202)).data.export;
    expect(queued.withSurface).toBe(true);
    const job = await finished(queued.id);
    expect(job.status).toBe('done');
    const usda = text((await download(job)).bytes);
    // three.js's USDA parser (r187) reads the Mesh prim, the per-curve primvars and the header.
    const parser = new USDAParser();
    const { specsByPath } = parser.parseData(usda);
    expect(specsByPath['/Groom/Surface'].fields.typeName).toBe('Mesh');
    const attr = (name: string) => specsByPath[name]?.fields.default as number[];
    const counts = attr('/Groom/Surface.faceVertexCounts');
    const indices = attr('/Groom/Surface.faceVertexIndices');
    const points = attr('/Groom/Surface.points');
    // The demo's OBJ writer writes triangles, one polygon per face, numbered as in the file.
    expect(counts.length).toBe(catMesh.triangles.length / 3);
    const curves = attr('/Groom/Guides.points');
    const n = attr('/Groom/Guides.curveVertexCounts')[0];
    const face = attr('/Groom/Guides.primvars:whorlwind:rootFace');
    const corners = attr('/Groom/Guides.primvars:whorlwind:rootCorners');
    const weights = attr('/Groom/Guides.primvars:whorlwind:rootBarycentric');
    const extent = attr('/Groom/Surface.extent');
    const size = Math.hypot(extent[3] - extent[0], extent[4] - extent[1], extent[5] - extent[2]);
    for (let g = 0; g < face.length; g++) {
      for (let a = 0; a < 3; a++) {
        let root = 0;
        for (let i = 0; i < 3; i++) root += weights[3 * g + i] * points[3 * indices[3 * face[g] + corners[3 * g + i]] + a];
        expect(Math.abs(root - curves[3 * n * g + a]) / size).toBeLessThan(1e-5);
      }
    }
    const header = (parser.parseText(usda) as Record<string, Record<string, Record<string, Record<string, string>>>>)['#usda 1.0'];
    const provenance = header.customLayerData['dictionary whorlwind'];
    expect(JSON.parse(provenance['string groomId'])).toBe(groom.id);
    expect(Number(provenance['int specRevision'])).toBe(2);
  });

  it('is never asked of a format without guides', async () => {
    const response = await callRoute(exportsRoute, 'POST', `/api/studio/grooms/${groom.id}/exports`, {
      cookie: wren.cookie,
      body: { format: 'json', withSurface: true },
      params: { groomId: groom.id },
    });
    expect((await expectJson(response, 202)).data.export.withSurface).toBe(false);
  });
});

describe('what the file is made from', () => {
  it('is the spec saved when the export was asked for, even if it changes before the job runs', async () => {
    const changing = await brisquette('Brisquette — changing');
    await worker.stop();
    const queued: ExportJob = (await expectJson(await requestExport(wren, changing.id, 'json'), 202)).data.export;
    const current = (await expectJson(await callRoute(groomRoute, 'GET', `/api/studio/grooms/${changing.id}`, { cookie: wren.cookie, params: { groomId: changing.id } }), 200)).data.groom;
    const later = { ...current.spec, guides: { ...current.spec.guides, length: 9 } };
    await expectJson(await callRoute(specRoute, 'PUT', `/api/studio/grooms/${changing.id}/spec`, { cookie: wren.cookie, body: { spec: later, baseRevision: current.revision }, params: { groomId: changing.id } }), 200);
    worker = await startJobsWorkerProcess();
    const job = await finished(queued.id);
    expect(job.specRevision).toBe(current.revision);
    const { bytes } = await download(job);
    expect(parseGroomSpecJson(text(bytes)).guides.length).toBe(current.spec.guides.length);
  });

  it('writes each guide set of the saved spec as its own curve prim, read back by three.js’s USDA parser', async () => {
    const sets = await brisquette('Brisquette — two coats');
    const { regions: _regions, ...block } = sets.spec.guides;
    const spec = {
      ...sets.spec,
      guideSets: [
        { name: 'Head', region: { groups: ['head'] }, guides: { ...block, length: 0.4 } },
        { name: 'Back fur', region: { groups: ['back'] }, guides: { ...block, length: 1.6 } },
      ],
    };
    await expectJson(await callRoute(specRoute, 'PUT', `/api/studio/grooms/${sets.id}/spec`, { cookie: wren.cookie, body: { spec, baseRevision: sets.revision }, params: { groomId: sets.id } }), 200);
    const job = await finished((await expectJson(await requestExport(wren, sets.id, 'usda'), 202)).data.export.id);
    expect(job.status).toBe('done');
    // three/examples/jsm/loaders/usd/USDAParser.js; prim names per lib/groom/README.md ("Guide sets").
    const { specsByPath } = new USDAParser().parseData(text((await download(job)).bytes)) as { specsByPath: Record<string, { fields: Record<string, unknown> }> };
    expect(specsByPath['/Groom/Guides'].fields.typeName).toBe('Scope');
    const mean = (prim: string) => {
      expect(specsByPath[`/Groom/Guides/${prim}`].fields.typeName).toBe('BasisCurves');
      const lengths = specsByPath[`/Groom/Guides/${prim}.primvars:whorlwind:length`].fields.default as number[];
      expect(lengths.length).toBeGreaterThan(10);
      return lengths.reduce((a, b) => a + b, 0) / lengths.length;
    };
    expect(specsByPath['/Groom/Guides/Back_fur.whorlwind:guideSet'].fields.default).toBe('Back fur');
    expect(mean('Back_fur') / mean('Head')).toBeGreaterThan(2);
  });

  it('fails with lib/field’s words when the saved spec cannot be solved', async () => {
    const created = await callRoute(groomsRoute, 'POST', '/api/studio/grooms', { cookie: wren.cookie, body: { surfaceId: groom.surfaceId, name: 'Unbalanced' } });
    const unbalanced: GroomDetail = (await expectJson(created, 201)).data.groom;
    const oneWhorl = { ...unbalanced.spec, field: { ...unbalanced.spec.field, singularities: unbalanced.spec.field.singularities.slice(0, 1) } };
    await expectJson(await callRoute(specRoute, 'PUT', `/api/studio/grooms/${unbalanced.id}/spec`, { cookie: wren.cookie, body: { spec: oneWhorl, baseRevision: 1 }, params: { groomId: unbalanced.id } }), 200);
    const queued: ExportJob = (await expectJson(await requestExport(wren, unbalanced.id, 'glb'), 202)).data.export;
    const job = await finished(queued.id);
    expect(job).toMatchObject({ status: 'failed', stage: 'failed', downloadUrl: null });
    expect(job.error).toMatch(/index|Euler|sum/i);
    expect((await db()('groom_exports').where({ id: job.id }).first()).object_key).toBeNull();
  });

  it('refuses a format lib/groom does not write', async () => {
    const { error } = await expectJson(await requestExport(wren, groom.id, 'fbx'), 400);
    expect(error.fields.format).toBe(`Choose one of ${EXPORT_FORMATS.join(', ')}.`);
  });
});

describe('who may export and download', () => {
  let done: ExportJob;
  let groom: GroomDetail; // this block's own: its last test deletes it

  beforeAll(async () => {
    groom = await brisquette('Brisquette — guarded');
    done = await finished((await expectJson(await requestExport(wren, groom.id, 'json'), 202)).data.export.id);
  });

  it('answers 404 to another groomer, for the groom’s exports and for an export', async () => {
    expect((await expectJson(await requestExport(rival, groom.id, 'json'), 404)).error.message).toBe('There is no such groom in your studio.');
    expect((await expectJson(await readExport(rival, done.id), 404)).error.message).toBe('There is no such export in your studio.');
  });

  it('answers 404 to a buyer (who works in the studio on their own grooms only) and 401 to a visitor', async () => {
    expect((await expectJson(await requestExport(buyer, groom.id, 'json'), 404)).error.code).toBe('not-found');
    expect((await expectJson(await readExport(buyer, done.id), 404)).error.code).toBe('not-found');
    expect((await expectJson(await readExport(null, done.id), 401)).error.code).toBe('not-signed-in');
  });

  it('takes the exports with the groom when it is deleted', async () => {
    const key = (await db()('groom_exports').where({ id: done.id }).first()).object_key;
    expect(key).toBeTruthy();
    await expectJson(await callRoute(groomRoute, 'DELETE', `/api/studio/grooms/${groom.id}`, { cookie: wren.cookie, params: { groomId: groom.id } }), 200);
    expect((await expectJson(await readExport(wren, done.id), 404)).error.code).toBe('not-found');
    expect((await fetch(done.downloadUrl!)).status).toBe(404);
  });
});
