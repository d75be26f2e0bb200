// Moving a spec onto another surface (lib/groom/README.md, "Transfer"): by polygon on the same
// topology, by UV, and by alignment along the normal; the report; refusals.
import { describe, expect, it } from 'vitest';
import { measureIndices } from '@/lib/field';
import {
  GroomError,
  alignPoint,
  alignSurfaces,
  fieldRequestFromSpec,
  identityOfMesh,
  parseGroomSpec,
  prepareGroomSurface,
  specToJson,
  transferSpec,
  validateGroomSpec,
  vertexOfPlace,
  withoutUv,
  type GroomSpec,
  type GroomSurface,
  type SurfaceIdentity,
} from '@/lib/groom';
import { SKIN_QUERY_SIZE } from '@/lib/groom/place/skin';
import { mirrorPoint, planeOfSymmetry } from '@/lib/groom/spec/symmetry';
import { multiply3, onUnitSphere as at, transferSphere, rotationAbout, type TransferSphere } from '@/tests/fixtures/transfer-sphere';
import { withGroups } from './support';

const RINGS = 16, SEGMENTS = 24;
// The second file: re-triangulated along the other diagonals, ×2.54 and turned about two axes.
const TURN = multiply3(rotationAbout('z', 35), rotationAbout('x', 50));
const MOVED = { split: 'bc' as const, asTriangles: true, shift: 5, scale: 2.54, rotation: TURN, translation: [3, -1, 2] as [number, number, number] };


/** Two whorls (a sphere's χ = 2), a flow stroke, a pin, an open parting balanced by a saddle. */
const SPEC = parseGroomSpec({
  specVersion: 2,
  units: 'cm',
  upAxis: 'z',
  field: {
    singularities: [
      { point: at(40, 30), index: 1 },
      { point: at(130, 200), index: 1, twist: 180 },
      { point: at(100, 300), index: -1 },
    ],
    partings: [{ points: [at(70, 250), at(75, 265), at(80, 280)] }],
    strokes: [{ points: [at(60, 80), at(65, 95), at(70, 110)] }],
  },
  pins: [{ point: at(110, 60), attribute: 'length', value: 2 }],
});

function side(sphere: TransferSphere, identity: SurfaceIdentity = sphere.identity) {
  return { surface: prepareGroomSurface(sphere.mesh), identity };
}

/** Mean edge length of a surface. */
function edgeLength(surface: GroomSurface): number {
  return surface.meanEdge;
}

/** Each singularity of `result` within one edge of where `expected` (unit-sphere points) says, and the field proves exactly them. */
function expectSingularitiesLanded(spec: GroomSpec, target: GroomSurface, expected: [number, number, number][], solvedIndex: Float64Array | undefined) {
  expect(spec.field.singularities).toHaveLength(expected.length);
  spec.field.singularities.forEach((s, i) => {
    const v = vertexOfPlace(target, s, `field.singularities[${i}]`);
    const p = target.mesh.positions;
    const d = Math.hypot(p[3 * v] - expected[i][0], p[3 * v + 1] - expected[i][1], p[3 * v + 2] - expected[i][2]);
    expect(d, `singularity ${i}`).toBeLessThan(edgeLength(target));
  });
  // The field on the new surface, measured from positions and face vectors alone (lib/field's
  // measureIndices), has an index exactly at the carried singularities and nowhere else.
  expect(solvedIndex).toBeDefined();
  const placed = new Map(spec.field.singularities.map((s, i) => [vertexOfPlace(target, s, `s${i}`), s.index]));
  // The open parting's +1 sits on its own vertices (the ends), never anywhere else.
  const onCurves = new Set(fieldRequestFromSpec(spec, target).curves!.flatMap((c) => c.vertices));
  const elsewhere: number[] = [];
  solvedIndex!.forEach((index, v) => {
    if (placed.has(v)) expect(index, `vertex ${v}`).toBeCloseTo(placed.get(v)!, 9);
    else if (Math.abs(index) > 1e-9 && !onCurves.has(v)) elsewhere.push(v);
  });
  expect(elsewhere).toEqual([]);
}

function measured(target: GroomSurface, solved: { field: { faceDirection: Float64Array } } | undefined, order = 1): Float64Array | undefined {
  return solved ? measureIndices(target.field, solved.field.faceDirection, order).index : undefined;
}

describe('a spec carried to the same character in another file', () => {
  const a = transferSphere(RINGS, SEGMENTS);
  const b = transferSphere(RINGS, SEGMENTS, MOVED);
  const from = side(a);
  const expectedOnB = SPEC.field.singularities.map((s, i) => {
    const v = vertexOfPlace(from.surface, s, `s${i}`);
    return b.place(Array.from(a.mesh.positions.subarray(3 * v, 3 * v + 3)));
  });

  it('by UV: every singularity lands within one edge of its place, and the field there has exactly them', () => {
    const to = side(b);
    const { spec, report, solved } = transferSpec(SPEC, from, to);
    expect(report.method).toBe('uv');
    expect(report.notCarried).toEqual([]);
    expect(report.field).toEqual({ solved: true });
    expectSingularitiesLanded(spec, to.surface, expectedOnB, measured(to.surface, solved as never));
    expect(report.budget).toEqual([{ piece: 0, demanded: 2, placed: 2, remainder: 0 }]);
    // Moved is measured against the similarity that lays the old places onto the new (the file is
    // turned and scaled ×2.54): a turned character does not read as every feature having moved.
    expect(report.alignment.kind).toBe('features');
    expect(report.alignment.scale).toBeCloseTo(2.54, 1);
    for (const f of report.features) expect(f.moved!).toBeLessThan(0.01);
    // Positions on the new surface name its own polygons, with the UV they were found by.
    for (const s of spec.field.singularities) expect(s.surface?.uv).toBeDefined();
  });

  it('with UVs stripped, by landmarks: the same, through the similarity fit and the normal', () => {
    const to = side(b, withoutUv(b.identity));
    const landmarks = [at(10, 0), at(90, 0), at(90, 90), at(170, 200), at(60, 300)].map((p) => ({ from: p, to: b.place(p) }));
    const { spec, report, solved } = transferSpec(SPEC, side(a, withoutUv(a.identity)), to, { landmarks });
    expect(report.method).toBe('alignment');
    expect(report.alignment.kind).toBe('landmarks');
    expect(report.alignment.scale).toBeCloseTo(2.54, 9);
    expect(report.notCarried).toEqual([]);
    expectSingularitiesLanded(spec, to.surface, expectedOnB, measured(to.surface, solved as never));
    for (const f of report.features) expect(f.moved!).toBeLessThan(1e-3);
  });

  it('carries the editor’s mirror plane with the similarity: mirror images on the old surface are mirror images on the new', () => {
    const to = side(b, withoutUv(b.identity));
    const landmarks = [at(10, 0), at(90, 0), at(90, 90), at(170, 200), at(60, 300)].map((p) => ({ from: p, to: b.place(p) }));
    const { spec } = transferSpec(parseGroomSpec({ ...SPEC, symmetry: { axis: 'x', seam: 0.05 } }), side(a, withoutUv(a.identity)), to, { landmarks });
    const plane = planeOfSymmetry(spec.symmetry!);
    expect(spec.symmetry!.seam).toBeCloseTo(0.05 * 2.54, 6);
    for (const p of [at(30, 40), at(120, 75), at(80, 200)]) {
      const image = mirrorPoint(plane, b.place(p));
      const expected = b.place([-p[0], p[1], p[2]]);
      expect(Math.hypot(image[0] - expected[0], image[1] - expected[1], image[2] - expected[2])).toBeLessThan(1e-6);
    }
  });

  it('with UVs stripped and no landmarks, by bounding boxes, when the file is only scaled and moved', () => {
    const c = transferSphere(RINGS, SEGMENTS, { split: 'bc', asTriangles: true, shift: 7, scale: 2.54, translation: [3, -1, 2] });
    const to = side(c, withoutUv(c.identity));
    const { spec, report, solved } = transferSpec(SPEC, side(a, withoutUv(a.identity)), to);
    expect(report.alignment.kind).toBe('bounding-box');
    const expected = SPEC.field.singularities.map((s, i) => {
      const v = vertexOfPlace(from.surface, s, `s${i}`);
      return c.place(Array.from(a.mesh.positions.subarray(3 * v, 3 * v + 3)));
    });
    expectSingularitiesLanded(spec, to.surface, expected, measured(to.surface, solved as never));
  });

  it('takes the file polygons and UVs the surface reader records beside the mesh', () => {
    const asRead = (q: TransferSphere) => ({
      ...q.mesh,
      facePolygon: q.identity.polygonOfFace,
      faceCorners: q.identity.faceCorner,
      polygons: { start: q.identity.polygonStart, corners: q.identity.cornerFileVertex!, uvs: Float32Array.from(q.identity.cornerUv!) },
    });
    const b = transferSphere(RINGS, SEGMENTS, MOVED);
    const identity = identityOfMesh(asRead(b));
    expect(identity.polygonStart).toEqual(b.identity.polygonStart);
    expect(identity.cornerVertex).toEqual(b.identity.cornerVertex);
    expect(identity.faceCorner).toEqual(b.identity.faceCorner);
    identity.cornerUv!.forEach((x, i) => expect(x).toBeCloseTo(b.identity.cornerUv![i], 6));
    // Without the reader's record each triangle is its own polygon and there are no UVs.
    expect(identityOfMesh(b.mesh).polygonStart).toHaveLength(b.mesh.triangles.length / 3 + 1);
    expect(identityOfMesh(b.mesh).cornerUv).toBeUndefined();
    const { report } = transferSpec(SPEC, { surface: from.surface, identity: identityOfMesh(asRead(a)) }, { surface: prepareGroomSurface(b.mesh), identity });
    expect(report.method).toBe('uv');
    expect(report.notCarried).toEqual([]);
  });

  it('a parting given by file vertices becomes points on another topology, and stays vertices on the same one', () => {
    // Circle of latitude 4 (45° from the pole) as file vertices: a closed parting (no index of its own)
    // splits the sphere into a cap and the rest, each needing a whorl.
    const ring = Array.from({ length: SEGMENTS }, (_, j) => 1 + 3 * SEGMENTS + j);
    const spec = parseGroomSpec({
      specVersion: 2, units: 'cm', upAxis: 'z',
      field: { singularities: [{ point: at(0, 0), index: 1 }, { point: at(180, 0), index: 1 }], partings: [{ vertices: ring, closed: true }] },
    });
    const b = transferSphere(RINGS, SEGMENTS, MOVED);
    const landmarks = [at(10, 0), at(90, 0), at(90, 90), at(170, 200)].map((p) => ({ from: p, to: b.place(p) }));
    const other = transferSpec(spec, side(a, withoutUv(a.identity)), side(b, withoutUv(b.identity)), { landmarks });
    expect(other.report.notCarried).toEqual([]);
    expect(other.spec.field.partings[0].points).toHaveLength(SEGMENTS);
    expect(other.spec.field.partings[0].vertices).toBeUndefined();
    expect(other.report.field).toEqual({ solved: true });
    const same = transferSpec(spec, from, side(a));
    expect(same.spec.field.partings[0].vertices).toEqual(ring);
  });

  it('a twist’s own direction (twistFrom) turns with the surface, as the reference direction does', () => {
    const twisted = parseGroomSpec({ ...JSON.parse(specToJson(SPEC)), field: { ...JSON.parse(specToJson(SPEC)).field, singularities: SPEC.field.singularities.map((x, i) => (i === 1 ? { ...x, twistFrom: [0.2, -0.3, 1] } : x)) } });
    // The same sphere declared Z up on one side and Y up on the other: a quarter turn about x.
    const { spec, report } = transferSpec(twisted, from, { ...side(a), upAxis: 'y' }, { method: 'alignment' });
    const r = report.alignment.rotation;
    const turned = [0, 1, 2].map((i) => r[3 * i] * 0.2 + r[3 * i + 1] * -0.3 + r[3 * i + 2] * 1);
    expect(Math.abs(r[4])).toBeLessThan(1e-12); // y and z exchanged: a real turn, not the identity
    spec.field.singularities[1].twistFrom!.forEach((c, k) => expect(c).toBeCloseTo(turned[k], 12));
    expect(spec.field.singularities[0].twistFrom).toBeUndefined();
  });

  it('a sculpt pass (same polygons, moved vertices): every feature keeps its polygon, corners and barycentric', () => {
    const sculpted = transferSphere(RINGS, SEGMENTS, { sculpt: ([x, y, z]) => { const k = 1 + 0.08 * Math.sin(3 * x) * Math.cos(2 * y); return [k * x, k * y, k * z]; } });
    const first = transferSpec(SPEC, from, side(a)).spec; // positions stated on the original
    const to = side(sculpted);
    const { spec, report } = transferSpec(first, from, to);
    expect(report.method).toBe('topology');
    const positions = (s: GroomSpec) => [
      ...s.field.singularities.map((x) => x.surface),
      ...s.field.partings.flatMap((c) => c.surface),
      ...s.field.strokes.flatMap((c) => c.surface),
      ...s.pins.map((x) => x.surface),
    ];
    expect(positions(spec)).toEqual(positions(first));
    expect(positions(spec).every((p) => p !== undefined)).toBe(true);
  });
});

describe('alignment', () => {
  it('recovers a known similarity from landmarks (Horn 1987: the exact answer for exact pairs)', () => {
    const truth = { scale: 2.54, rotation: TURN, translation: [3, -1, 2] };
    const from = [[1, 0, 0], [0, 1, 0], [0, 0, 1], [0.3, -0.2, 0.9]];
    const landmarks = from.map((p) => ({ from: p as [number, number, number], to: transferSphere(2, 3, MOVED).place(p) }));
    const fit = alignSurfaces({ units: 'cm', upAxis: 'y', positions: new Float64Array(3) }, { units: 'cm', upAxis: 'y', positions: new Float64Array(3) }, landmarks);
    expect(fit.scale).toBeCloseTo(truth.scale, 10);
    fit.rotation.forEach((x, i) => expect(x).toBeCloseTo(truth.rotation[i], 10));
    fit.translation.forEach((x, i) => expect(x).toBeCloseTo(truth.translation[i], 10));
    expect(fit.landmarkError!).toBeLessThan(1e-10);
  });

  it('turns a Y-up file into a Z-up one and converts inches to centimetres before matching boxes', () => {
    const box = (pts: number[][]) => Float64Array.from(pts.flat());
    const fit = alignSurfaces({ units: 'in', upAxis: 'y', positions: box([[0, 0, 0], [1, 2, 1]]) }, { units: 'cm', upAxis: 'z', positions: box([[0, -2.54, 0], [2.54, 0, 5.08]]) });
    expect(fit.scale).toBeCloseTo(2.54, 12);
    // The Y-up model's top (0.5, 2, 0.5) is the Z-up model's top.
    alignPoint(fit, [0.5, 2, 0.5]).forEach((x, i) => expect(x).toBeCloseTo([1.27, -1.27, 5.08][i], 12));
  });

  it('refuses collinear landmarks, and fewer than three, in words', () => {
    const space = { units: 'cm' as const, upAxis: 'y' as const, positions: new Float64Array(3) };
    const line = [0, 1, 2, 3].map((k) => ({ from: [k, 2 * k, 0] as [number, number, number], to: [k, k, k] as [number, number, number] }));
    expect(() => alignSurfaces(space, space, line)).toThrow(/lie on one line .* pick at least three that make a triangle/);
    try {
      alignSurfaces(space, space, line);
    } catch (error) {
      expect((error as GroomError).code).toBe('collinear-landmarks');
    }
    expect(() => alignSurfaces(space, space, line.slice(0, 2))).toThrow(/at least three pairs; 2 were given/);
  });
});

describe('what is not carried, and why', () => {
  const a = transferSphere(RINGS, SEGMENTS);
  const from = side(a, withoutUv(a.identity));

  it('never lands across a thin gap: the sheet facing the other way is passed over', () => {
    const flat = transferSphere(RINGS, SEGMENTS, { scale: 1, sculpt: ([x, y, z]) => [x, y, 0.03 * z] });
    const lifted = transferSphere(RINGS, SEGMENTS, { sculpt: ([x, y, z]) => [x, y, 0.03 * z], translation: [0, 0, 0.04] });
    const spec = parseGroomSpec({ specVersion: 2, units: 'cm', upAxis: 'z', field: { singularities: [{ point: [0, 0, 0.03], index: 1 }, { point: [0, 0, -0.03], index: 1 }] } });
    const landmarks = [[1, 0, 0], [0, 1, 0], [-1, 0, 0], [0, -1, 0.01]].map((p) => ({ from: p as [number, number, number], to: p as [number, number, number] }));
    const to = side(lifted, withoutUv(lifted.identity));
    const { report } = transferSpec(spec, side(flat, withoutUv(flat.identity)), to, { landmarks, method: 'alignment' });
    // The top whorl sits at z = 0.03; on the lifted slab the nearest sheet to it is the bottom one
    // (z = 0.01, facing down) — plain closest point would put it there.
    const out = new Float64Array(SKIN_QUERY_SIZE);
    to.surface.skin.closest(0, 0, 0.03, 1, out);
    expect(out[2]).toBeCloseTo(0.01, 6);
    expect(report.features[0].to![2]).toBeCloseTo(0.07, 6);
    expect(report.features[1].to![2]).toBeCloseTo(0.01, 6);
  });

  it('a feature with no surface facing its way within reach is left out, and the budget shows the remainder', () => {
    const dented = transferSphere(RINGS, SEGMENTS, { sculpt: (p) => (p[2] > 0.6 ? [p[0] * 0.5, p[1] * 0.5, p[2] * 0.5] : p) });
    const to = side(dented, withoutUv(dented.identity));
    const identityFit = [[1, 0, 0], [0, 1, 0], [0, 0, -1], [-1, 0, 0]].map((p) => ({ from: p as [number, number, number], to: p as [number, number, number] }));
    const { spec, report } = transferSpec(SPEC, from, to, { landmarks: identityFit, reach: 0.02, method: 'alignment' });
    const lost = report.features.find((f) => f.path === 'field.singularities[0]')!;
    expect(lost.to).toBeNull();
    expect(report.notCarried).toContainEqual({ path: 'field.singularities[0]', reason: expect.stringMatching(/no part of the new surface lies within/) });
    expect(spec.field.singularities).toHaveLength(2);
    expect(report.budget[0]).toMatchObject({ demanded: 2, placed: 1, remainder: 1 });
    expect(report.field).toMatchObject({ solved: false, code: 'index-budget' });
  });

  it('a parting that would now cross an opening is left out whole, naming the gap', () => {
    const mesh = a.mesh;
    // Remove the faces around the parting's middle point: an opening between its points.
    const centre = at(75, 265);
    const keep: number[] = [];
    for (let f = 0; f < mesh.triangles.length / 3; f++) {
      const c = [0, 1, 2].map((k) => [0, 1, 2].reduce((s, j) => s + mesh.positions[3 * mesh.triangles[3 * f + j] + k], 0) / 3);
      if (Math.hypot(c[0] - centre[0], c[1] - centre[1], c[2] - centre[2]) > 0.25) keep.push(f);
    }
    const holed = { positions: mesh.positions, triangles: Uint32Array.from(keep.flatMap((f) => [0, 1, 2].map((k) => mesh.triangles[3 * f + k]))) };
    const spec = parseGroomSpec({ ...SPEC, field: { ...SPEC.field, partings: [{ points: [at(75, 245), at(75, 285)] }] } });
    const { report } = transferSpec(spec, from, { surface: prepareGroomSurface(holed), identity: identityOfMesh(holed) });
    expect(report.notCarried).toContainEqual({ path: 'field.partings[0]', reason: expect.stringMatching(/opening/) });
  });

  it('a region the new surface lacks is reported; a region map carries it', () => {
    const named = (names: string[]) => withGroups(a.mesh, names, (_x, _y, z) => (z > 0 ? 0 : 1));
    const old = named(['scalp', 'chin']);
    const renamed = named(['crown', 'chin']);
    const spec = parseGroomSpec({ ...SPEC, guides: { regions: ['scalp', 'chin'] } });
    const to = { surface: prepareGroomSurface(renamed), identity: a.identity };
    const plain = transferSpec(spec, { surface: prepareGroomSurface(old), identity: a.identity }, to);
    expect(plain.report.notCarried).toContainEqual({ path: 'guides.regions[0]', reason: expect.stringMatching(/no group "scalp" .* "crown", "chin"/) });
    expect(plain.spec.guides.regions).toEqual(['chin']);
    const mapped = transferSpec(spec, { surface: prepareGroomSurface(old), identity: a.identity }, to, { regionMap: { scalp: 'crown' } });
    expect(mapped.report.notCarried).toEqual([]);
    expect(mapped.spec.guides.regions).toEqual(['crown', 'chin']);
  });

  it('refuses a UV transfer asked for when a surface has no UVs, and reports overlapping UVs', () => {
    const b = transferSphere(RINGS, SEGMENTS, MOVED);
    expect(() => transferSpec(SPEC, from, side(b), { method: 'uv' })).toThrow(/needs UVs on both surfaces; the old surface has none/);
    // Every polygon's UVs folded onto the first quadrant's: the layout overlaps everywhere.
    const folded = { ...b.identity, cornerUv: b.identity.cornerUv!.map((x) => x % 0.25) };
    const { report } = transferSpec(SPEC, side(a), { surface: prepareGroomSurface(b.mesh), identity: folded }, { landmarks: [[1, 0, 0], [0, 1, 0], [0, 0, 1]].map((p) => ({ from: p as [number, number, number], to: b.place(p) })) });
    expect(report.to.uvOverlaps).toBeGreaterThan(0);
    expect(report.method).toBe('alignment');
    expect(() => transferSpec(SPEC, side(a), { surface: prepareGroomSurface(b.mesh), identity: folded }, { method: 'uv' })).toThrow(/UVs that do not overlap/);
  });
});

describe('surface positions in the spec (version 2, extended)', () => {
  const position = { polygon: 12, corners: [0, 2, 3], barycentric: [0.2, 0.3, 0.5], uv: [0.25, 0.5] };

  it('keeps old specs valid and round-trips the positions a transfer writes', () => {
    expect(SPEC.field.singularities[0].surface).toBeUndefined();
    const spec = parseGroomSpec({ ...SPEC, field: { ...SPEC.field, singularities: [{ point: [1, 0, 0], index: 2, surface: position }] } });
    expect(spec.field.singularities[0].surface).toEqual(position);
    expect(parseGroomSpec(JSON.parse(specToJson(spec)))).toEqual(spec);
  });

  it('refuses weights that do not sum to one and a curve with a position too few, naming the path', () => {
    const bad = validateGroomSpec({ ...SPEC, field: { ...SPEC.field, singularities: [{ point: [1, 0, 0], index: 2, surface: { ...position, barycentric: [0.5, 0.5, 0.5] } }] } });
    expect(bad.problems).toEqual([{ path: 'field.singularities[0].surface.barycentric', message: 'the barycentric weights must sum to 1' }]);
    const short = validateGroomSpec({ ...SPEC, field: { ...SPEC.field, partings: [{ points: [[1, 0, 0], [0, 1, 0]], surface: [position] }] } });
    expect(short.problems).toEqual([{ path: 'field.partings[0].surface', message: 'must give one surface position per point (2), not 1' }]);
  });
});
