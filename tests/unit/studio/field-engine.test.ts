import { beforeAll, describe, expect, it } from 'vitest';
import { DEMO_GROOMS } from '@/lib/groom/demo/grooms';
import { surfaceToObj } from '@/lib/groom/demo/obj';
import { parseGroomSpec, type GroomSpec } from '@/lib/groom/spec/spec';
import { growGuides, solveGroomField } from '@/lib/groom';
import { readSurface } from '@/lib/field';
import { FieldEngine } from '@/lib/studio/client/field-engine';
import type { OpenedSurface, ProgressReport } from '@/lib/studio/client/protocol';

const display = { drawing: 'strokes', density: 2000 } as const;

describe('the field engine on Bramble the fox', () => {
  const progress: ProgressReport[] = [];
  const engine = new FieldEngine((report) => progress.push(report));
  const demo = DEMO_GROOMS[0];
  const spec: GroomSpec = parseGroomSpec(demo.spec);
  let opened: OpenedSurface;

  beforeAll(async () => {
    const bytes = new TextEncoder().encode(surfaceToObj(demo.surface(), 'Bramble')).buffer as ArrayBuffer;
    opened = await engine.open({ kind: 'bytes', bytes, fileName: 'bramble.obj' }, 'free');
  });

  it('reads and prepares the surface, saying what it is doing', () => {
    expect(opened.faceCount).toBe(demo.surface().triangles.length / 3);
    expect(opened.components).toEqual([expect.objectContaining({ eulerCharacteristic: 2, genus: 0, boundaryLoopCount: 0 })]);
    expect(opened.groups).toEqual(expect.arrayContaining(['muzzle', 'ears', 'crown', 'neck']));
    expect(progress.map((p) => p.stage)).toEqual(expect.arrayContaining(['reading the surface file', expect.stringMatching(/^preparing the field solver/)]));
  });

  it('assembles the field request the spec asks for, feature by feature, in the surface’s own vertices and faces', () => {
    // Places given as file vertices and a stroke inside one face, so the request can be written
    // out by hand from the spec and the fox's mesh (not from the groom library the engine calls).
    const mesh = demo.surface();
    const [a, b, c] = mesh.triangles.subarray(0, 3);
    const far = mesh.triangles[3 * 200];
    const face = 5;
    const corner = (k: number) => Array.from(mesh.positions.subarray(3 * mesh.triangles[3 * face + k], 3 * mesh.triangles[3 * face + k] + 3));
    const centroid = [0, 1, 2].map((axis) => (corner(0)[axis] + corner(1)[axis] + corner(2)[axis]) / 3) as [number, number, number];
    const handMade: GroomSpec = parseGroomSpec({
      ...demo.spec,
      upAxis: 'z',
      field: {
        ...demo.spec.field,
        rotation: 90,
        referenceDirection: undefined,
        singularities: [
          { vertex: a, index: 1 },
          { vertex: far, index: -1, twist: 30, handedness: 'clockwise' },
        ],
        partings: [{ vertices: [b, c] }],
        crests: [{ vertices: [a, b] }],
        // One sample: the stroke is far shorter than the sampling step (two mean edges).
        strokes: [{ points: [centroid, [centroid[0] + 1e-4, centroid[1], centroid[2]]] }],
      },
    });
    expect(engine.requestFor(handMade)).toEqual({
      order: 1,
      rotation: Math.PI / 2,
      referenceDirection: [0, 0, -1], // straight down when z is up
      singularities: [
        { vertex: a, index: 1 },
        { vertex: far, index: -1, orientation: -Math.PI / 6 }, // 30° clockwise
      ],
      curves: [
        { kind: 'parting', vertices: [b, c] },
        { kind: 'crest', vertices: [a, b] },
      ],
      strokes: [[{ face, direction: [1, 0, 0] }]],
    });
  });

  it('a full solve proves the field has exactly the placed singularities', () => {
    const report = engine.solve(spec, display, false);
    expect(report.error).toBeNull();
    expect(report.budget).toMatchObject({ balanced: true, pieces: [{ piece: 0, component: 0, borderedBy: [], demanded: 2, placed: 2, remainder: 0 }] });
    expect(report.singularities.map((s) => [s.requested, s.measured])).toEqual([[1, expect.closeTo(1, 6)], [1, expect.closeTo(1, 6)], [1, expect.closeTo(1, 6)], [-1, expect.closeTo(-1, 6)]]);
    expect(report.proof).toMatchObject({ strays: 0, mismatches: 0, nonZeroCount: 4, measuredSum: 2 });
    expect(report.pinVertices).toHaveLength(3);
    // Strokes: two end points per stroke, each a finite point.
    expect(report.lines!.length % 6).toBe(0);
    expect(report.lines!.length / 6).toBeGreaterThan(500);
    expect(report.lines!.every(Number.isFinite)).toBe(true);
  });

  it('a quick solve while dragging skips the measurement; a moved whorl moves the field', () => {
    const before = engine.solve(spec, display, true).lines!;
    const s0 = spec.field.singularities[3];
    const target = Array.from(opened.positions.subarray(3 * 100, 3 * 100 + 3)) as [number, number, number];
    const moved: GroomSpec = { ...spec, field: { ...spec.field, singularities: spec.field.singularities.map((s, i) => (i === 3 ? { ...s0, point: target } : s)) } };
    const quick = engine.solve(moved, display, true);
    expect(quick.error).toBeNull();
    expect(quick.proof).toBeNull();
    expect(quick.singularities[3]).toMatchObject({ vertex: 100, requested: -1, measured: null });
    expect(quick.lines).not.toEqual(before);
    const full = engine.solve(moved, display, false);
    expect(full.singularities[3].measured).toBeCloseTo(-1, 6);
    expect(full.proof?.strays).toBe(0);
  });

  it('an unbalanced spec comes back with the budget and the reason, not a thrown error', () => {
    const unbalanced: GroomSpec = { ...spec, field: { ...spec.field, singularities: spec.field.singularities.slice(0, 3) } };
    const report = engine.solve(unbalanced, display, false);
    expect(report.lines).toBeNull();
    expect(report.error?.code).toBe('index-budget');
    expect(report.budget?.pieces[0]).toMatchObject({ demanded: 2, placed: 3, remainder: -1 });
  });

  it('a place off the surface is named by its path in the whole spec', () => {
    const off: GroomSpec = { ...spec, field: { ...spec.field, singularities: spec.field.singularities.map((s, i) => (i === 2 ? { ...s, point: [50, 50, 50] as [number, number, number] } : s)) } };
    const report = engine.solve(off, display, false);
    expect(report.error).toMatchObject({ code: 'point-off-surface', path: 'field.singularities[2].point' });
    expect(report.error?.message).toMatch(/^field\.singularities\[2\]\.point/);
  });

  it('draws streamlines and grows the same guides as the groom library', async () => {
    const stream = engine.solve(spec, { drawing: 'streamlines', density: 3000 }, false);
    expect(stream.lines!.length).toBeGreaterThan(0);
    expect(stream.lineShade!.length * 3).toBe(stream.lines!.length);
    const grown = await engine.grow(spec);
    expect(grown.count).toBe(Math.round(spec.guides.density! * grown.areaSquareCm));
    expect(grown.points.length).toBe(3 * grown.count * grown.pointsPerGuide);
    expect(progress.some((p) => /^growing about/.test(p.stage) && (p.expectedMilliseconds ?? 0) > 0)).toBe(true);
  });

  it('joins the points of a curve being drawn along mesh edges', () => {
    const a = spec.field.singularities[0].point!, b = spec.field.singularities[1].point!;
    const path = engine.curvePath([a, b], false);
    expect(path.length / 3).toBeGreaterThan(3);
  });
});

describe('the field engine on a groom moved onto a new sculpt', () => {
  it('grows the preview from the roots on the earlier sculpt, as exports do: each root sits at the same polygon and weights, on the new skin', async () => {
    // A sculpt pass: the fox's vertices pushed out along a bump, triangles unchanged.
    const demo = DEMO_GROOMS[0];
    const before = demo.surface();
    const after = { ...before, positions: before.positions.map((value, i) => (i % 3 === 1 ? value * 1.15 + 0.02 * Math.sin(7 * before.positions[i - 1]) : value)) };
    const bytesOf = (mesh: typeof before, name: string) => ({ kind: 'bytes', bytes: new TextEncoder().encode(surfaceToObj(mesh, name)).buffer as ArrayBuffer, fileName: `${name}.obj` }) as const;
    const spec = parseGroomSpec({ ...demo.spec, guides: { ...demo.spec.guides, density: undefined, count: 300 } });
    const engine = new FieldEngine();
    await engine.open(bytesOf(after, 'after'), 'free');
    const own = await engine.grow(spec);
    const rooted = await engine.grow(spec, { key: 'before', source: bytesOf(before, 'before') });
    const byLibrary = growGuides(engine.prepared!, solveGroomField(spec, engine.prepared!), spec, { rootsFrom: readSurface(new TextEncoder().encode(surfaceToObj(before, 'before')), 'before.obj').mesh }).guides;
    expect(rooted.count).toBe(byLibrary.count);
    expect(Array.from(rooted.points.subarray(0, 3 * rooted.pointsPerGuide))).toEqual(Array.from(Float32Array.from(byLibrary.points.subarray(0, 3 * byLibrary.pointsPerGuide))));
    // The roots differ from the ones sampled on the sculpt itself (the areas changed), so the option mattered.
    expect(Array.from(rooted.points.subarray(0, 3))).not.toEqual(Array.from(own.points.subarray(0, 3)));
    // Once read, the earlier sculpt is kept: the same key does not read it again.
    const again = await engine.grow(spec, { key: 'before', source: { kind: 'demo', demoId: 'not read' } });
    expect(Array.from(again.points)).toEqual(Array.from(rooted.points));
  });
});

describe('the field engine on a demo character built in the worker', () => {
  it('opens Loop the plush ring (genus 1) and solves its spec', async () => {
    const engine = new FieldEngine();
    const demo = DEMO_GROOMS.find((d) => d.id.includes('loop') || d.character === 'Loop')!;
    const opened = await engine.open({ kind: 'demo', demoId: demo.id }, 'free');
    expect(opened.components[0].genus).toBe(1);
    const report = engine.solve(parseGroomSpec(demo.spec), display, false);
    expect(report.error).toBeNull();
    expect(report.proof?.strays).toBe(0);
    await expect(engine.open({ kind: 'demo', demoId: 'nobody' }, 'free')).rejects.toThrow(/no demo character/);
  });
});
