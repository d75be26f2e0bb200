// The editor's opening (issue 15): the surface shown as soon as it is read, the stages the page
// shows a line for, the worker started by the page's inline script and adopted by the editor, and
// the worker bundled into one classic script.
import { runInNewContext } from 'node:vm';
import { build } from 'esbuild';
import { BufferAttribute, BufferGeometry, Mesh, MeshBasicMaterial, Ray, Raycaster, Vector3, DoubleSide } from 'three';
import { MeshBVH } from 'three-mesh-bvh';
import { describe, expect, it } from 'vitest';
import { surfaceToObj } from '@/lib/groom/demo/obj';
import { uvSphere } from '@/lib/groom/demo/primitives';
import { FieldClient, type WorkerLike } from '@/lib/studio/client/field-client';
import { FieldEngine } from '@/lib/studio/client/field-engine';
import { EARLY_OPEN_ID, FIELD_WORKER_URL, earlyFieldScript, groomSurfaceSource, openingKey } from '@/lib/studio/client/field-start';
import { OPENING_STAGES, endStage, enterStage, stageOfReport, type OpeningStages } from '@/lib/studio/client/opening-stages';
import type { OpenedSurface, ProgressReport, SurfaceSource, WorkerReply, WorkerRequest } from '@/lib/studio/client/protocol';
import { fieldWorkerBuildOptions } from '../../../scripts/lib/field-worker-bundle';

/** A worker that keeps what it is sent until the test answers. */
class FakeWorker implements WorkerLike {
  readonly received: WorkerRequest[] = [];
  onmessage: ((event: MessageEvent<WorkerReply>) => void) | null = null;
  onerror: ((event: ErrorEvent) => void) | null = null;
  postMessage(message: WorkerRequest) {
    this.received.push(message);
  }
  reply(reply: WorkerReply) {
    this.onmessage?.({ data: reply } as MessageEvent<WorkerReply>);
  }
  terminate() {}
}

// A UV sphere of radius 10 about the origin (rings × segments), written as an OBJ file.
const RADIUS = 10;
const sphere = uvSphere(24, 32, RADIUS);
const sphereBytes = () => new TextEncoder().encode(surfaceToObj(sphere, 'sphere')).buffer as ArrayBuffer;

describe('opening a surface in the field engine', () => {
  it('sends the surface as read before the preparation starts, and it is the surface the preparation gives', async () => {
    const reports: ProgressReport[] = [];
    const engine = new FieldEngine((report) => reports.push(report));
    const opened = await engine.open({ kind: 'bytes', bytes: sphereBytes(), fileName: 'sphere.obj' }, 'free');
    const at = reports.findIndex((report) => report.preview);
    expect(at).toBeGreaterThanOrEqual(0);
    expect(reports.filter((report) => report.preview)).toHaveLength(1);
    // Before the solver's preparation is announced: the page can draw while it runs.
    expect(reports.findIndex((report) => report.stage.startsWith('preparing'))).toBeGreaterThan(at);
    const preview = reports[at].preview!;
    expect(preview.faceCount).toBe(opened.faceCount);
    expect(Array.from(preview.triangles)).toEqual(Array.from(opened.triangles));
    expect(Array.from(preview.positions)).toEqual(Array.from(Float32Array.from(opened.positions)));
    // The same framing as the prepared surface, so the view does not move when it replaces the preview.
    expect(preview.center).toEqual(opened.center);
    expect(preview.radius).toBe(opened.radius);
    // On a sphere about the origin, the unit normal at a vertex is its position over the radius
    // (elementary geometry); the area-weighted normals of a 24 × 32 sphere are within a degree or so.
    for (let v = 0; v < preview.vertexCount; v++) {
      const n = preview.vertexNormals.subarray(3 * v, 3 * v + 3);
      const p = preview.positions.subarray(3 * v, 3 * v + 3);
      expect(Math.hypot(n[0], n[1], n[2])).toBeCloseTo(1, 5);
      expect((n[0] * p[0] + n[1] * p[1] + n[2] * p[2]) / RADIUS).toBeGreaterThan(Math.cos((2 * Math.PI) / 180));
    }
  });

  it('sends the picking hierarchy it built: the page picks the same faces with it as three finds testing every face', async () => {
    const engine = new FieldEngine();
    const opened = await engine.open({ kind: 'bytes', bytes: sphereBytes(), fileName: 'sphere.obj' }, 'free');
    // The page's geometry (components/studio/scene/SurfaceMesh.tsx): single-precision positions, the triangles as index.
    const geometry = new BufferGeometry();
    geometry.setAttribute('position', new BufferAttribute(Float32Array.from(opened.positions), 3));
    geometry.setIndex(new BufferAttribute(opened.triangles, 1));
    const h = opened.pickHierarchy!;
    const bvh = MeshBVH.deserialize({ version: 1, roots: h.roots, index: opened.triangles, indirectBuffer: h.indirectBuffer } as never, geometry, { setIndex: false });
    // The reference: three's own Mesh.raycast, which tests every triangle (no hierarchy).
    const plain = new Mesh(geometry, new MeshBasicMaterial({ side: DoubleSide }));
    const raycaster = new Raycaster();
    let hits = 0;
    for (let i = 0; i < 200; i++) {
      // Rays from outside toward points spread over the sphere (a fixed spiral, no randomness).
      const t = (i + 0.5) / 200, phi = Math.acos(1 - 2 * t), theta = i * 2.399963;
      const target = new Vector3(Math.sin(phi) * Math.cos(theta), Math.sin(phi) * Math.sin(theta), Math.cos(phi)).multiplyScalar(RADIUS * 0.5);
      const origin = new Vector3(3 * RADIUS, 0.37 * RADIUS, -0.21 * RADIUS).applyAxisAngle(new Vector3(0, 0, 1), i);
      raycaster.set(origin, target.clone().sub(origin).normalize());
      const reference = raycaster.intersectObject(plain, false)[0];
      const picked = bvh.raycastFirst(new Ray(origin, raycaster.ray.direction), DoubleSide);
      expect(picked?.faceIndex).toBe(reference?.faceIndex);
      if (reference) hits++;
    }
    expect(hits).toBe(200);
  });

  it('names every report of an opening as one of the four stages, in order', async () => {
    const reports: ProgressReport[] = [];
    const engine = new FieldEngine((report) => reports.push(report));
    await engine.open({ kind: 'bytes', bytes: sphereBytes(), fileName: 'sphere.obj' }, 'free');
    const named = reports.filter((report) => !report.preview).map((report) => stageOfReport(report.stage));
    expect(named).not.toContain(null);
    expect(named).toEqual([...named].sort((a, b) => OPENING_STAGES.indexOf(a!) - OPENING_STAGES.indexOf(b!)));
    expect(new Set(named)).toEqual(new Set(['read', 'prepare']));
  });
});

describe('the opening stages', () => {
  it('move forward only, each earlier stage ending where the next begins', () => {
    let stages: OpeningStages = {};
    stages = enterStage(stages, 'download', 0);
    stages = enterStage(stages, 'download', 50);
    stages = enterStage(stages, 'prepare', 100);
    stages = enterStage(stages, 'read', 120);
    stages = endStage(stages, 'solve', 900);
    expect(stages).toEqual({
      download: { startedAt: 0, endedAt: 100 },
      prepare: { startedAt: 100, endedAt: 900 },
      solve: { startedAt: 900, endedAt: 900 },
    });
  });
});

describe('the worker started by the page', () => {
  const source: SurfaceSource = { kind: 'url', url: '/api/studio/surfaces/1/prepared', fileName: '1.wwsurf', fallback: { kind: 'url', url: 'http://store/a.obj?x=1', fileName: 'a.obj' } };

  it('is started from the bundled script and asked once to open the surface, and its script is safe in HTML', () => {
    const posted: unknown[] = [];
    const made: { url: string; options: unknown }[] = [];
    const hostile: SurfaceSource = { kind: 'url', url: '/x', fileName: '</script><script>alert(1)</script>\u2028.obj' };
    const text = earlyFieldScript(hostile, 'tangent');
    // An HTML parser ends a script element at the first "</script" whatever the case (HTML, 4.12.1.3).
    expect(text.toLowerCase()).not.toContain('</script');
    const window: Record<string, unknown> = {};
    class Worker {
      onmessage: ((event: { data: unknown }) => void) | null = null;
      constructor(url: string, options: unknown) {
        made.push({ url, options });
      }
      postMessage(message: unknown) {
        posted.push(message);
      }
    }
    runInNewContext(text, { window, Worker, performance: { mark() {} } });
    expect(made).toEqual([{ url: FIELD_WORKER_URL, options: { name: 'whorlwind-field' } }]);
    expect(posted).toEqual([{ id: EARLY_OPEN_ID, type: 'open', source: hostile, boundary: 'tangent' }]);
    expect(Object.values(window)).toEqual([expect.objectContaining({ key: openingKey(hostile, 'tangent'), held: [] })]);
  });

  it('is adopted by the editor with its opening: the progress so far replayed, nothing sent again', async () => {
    const worker = new FakeWorker();
    const held: WorkerReply[] = [{ id: EARLY_OPEN_ID, type: 'progress', progress: { stage: 'downloading the surface', fraction: 0.5 } }];
    const client = new FieldClient(worker, { key: openingKey(source, 'free'), held });
    // A reply that comes after the client started, before the editor asks for the opening.
    worker.reply({ id: EARLY_OPEN_ID, type: 'progress', progress: { stage: 'reading the surface file', fraction: null } });
    const seen: string[] = [];
    const opening = client.open({ type: 'open', source, boundary: 'free' }, (progress) => seen.push(progress.stage));
    worker.reply({ id: EARLY_OPEN_ID, type: 'done', result: { faceCount: 7 } as unknown as OpenedSurface });
    await expect(opening).resolves.toEqual({ faceCount: 7 });
    expect(seen).toEqual(['downloading the surface', 'reading the surface file']);
    expect(worker.received).toEqual([]);
    // The page's own requests are numbered apart from the inline script's.
    void client.request({ type: 'find-mirror' });
    expect(worker.received[0].id).not.toBe(EARLY_OPEN_ID);
  });

  it('is asked again when the editor opens something else (another boundary), and the first opening’s answer is ignored', async () => {
    const worker = new FakeWorker();
    const client = new FieldClient(worker, { key: openingKey(source, 'free'), held: [] });
    const opening = client.open({ type: 'open', source, boundary: 'normal' });
    expect(worker.received).toEqual([expect.objectContaining({ type: 'open', boundary: 'normal' })]);
    worker.reply({ id: EARLY_OPEN_ID, type: 'done', result: { faceCount: 1 } as unknown as OpenedSurface });
    worker.reply({ id: worker.received[0].id, type: 'done', result: { faceCount: 2 } as unknown as OpenedSurface });
    await expect(opening).resolves.toEqual({ faceCount: 2 });
  });

  it('opens what the editor opens: the page and the editor build the same source for a groom', () => {
    const surface = { id: 's', fileUrl: 'http://store/f.obj', fileName: 'f.obj', prepared: { url: '/api/studio/surfaces/s/prepared', fileName: 's.wwsurf' } };
    const a = groomSurfaceSource({ surface } as never);
    const b = groomSurfaceSource({ surface: { ...surface, prepared: { fileName: 's.wwsurf', url: '/api/studio/surfaces/s/prepared' } } } as never);
    expect(openingKey(a, 'free')).toBe(openingKey(b, 'free'));
    expect(a).toEqual({ kind: 'url', url: surface.prepared.url, fileName: 's.wwsurf', fallback: { kind: 'url', url: surface.fileUrl, fileName: 'f.obj' } });
    expect(groomSurfaceSource({ surface: { ...surface, prepared: null } } as never)).toEqual({ kind: 'url', url: surface.fileUrl, fileName: 'f.obj' });
  });
});

describe('the field worker bundle', () => {
  it('is one classic script (no imports, no require) that reaches nothing of Node', async () => {
    const result = await build({ ...fieldWorkerBuildOptions(false), outfile: undefined, write: false, metafile: true });
    expect(result.errors).toEqual([]);
    expect(result.outputFiles).toHaveLength(1);
    const code = result.outputFiles![0].text;
    expect(code).not.toMatch(/\brequire\(|^\s*import[\s{]|^\s*export\s/m);
    const inputs = Object.keys(result.metafile!.inputs);
    expect(inputs).toContain('lib/studio/client/field-worker.ts');
    expect(inputs.filter((file) => /^node:|\/(pg|knex|sharp|nodemailer|stripe|@aws-sdk)\//.test(file))).toEqual([]);
  });
});
