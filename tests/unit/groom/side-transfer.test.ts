// A guide set grown on the side of a parting, carried onto another surface (lib/groom/README.md,
// "Guide sets", Transfer): its `from` place travels like every other place (by polygon, UV or
// alignment), the report lists it, and the side it names on the new surface is the side it named.
import { describe, expect, it } from 'vitest';
import { parseGroomSpec, prepareGroomSurface, transferReportText, transferSpec, withoutUv, type GroomSpec } from '@/lib/groom';
import { setRegionMask } from '@/lib/groom/place/set-region';
import { anchorFeatures, placeFeatures, withSurfacePositions } from '@/lib/groom/transfer/features';
import { transferSphere, type TransferSphere } from '@/tests/fixtures/transfer-sphere';

type Vec3 = [number, number, number];
const RINGS = 16, SEGMENTS = 24;
// The equator of transferSphere (ring 8 of 16), every other vertex: a closed parting that cuts the sphere in two.
const equator = Array.from({ length: 12 }, (_x, k): Vec3 => [Math.cos((k * Math.PI) / 6), Math.sin((k * Math.PI) / 6), 0]);
const a = transferSphere(RINGS, SEGMENTS);
const side = (sphere: TransferSphere, uv = true) => ({ surface: prepareGroomSurface(sphere.mesh), identity: uv ? sphere.identity : withoutUv(sphere.identity) });

function capSpec(from: Record<string, unknown>): GroomSpec {
  return parseGroomSpec({
    specVersion: 3,
    units: 'cm',
    upAxis: 'z',
    field: { singularities: [{ point: [0, 0, 1], index: 1 }, { point: [0, 0, -1], index: 1 }], partings: [{ points: equator, closed: true }] },
    guideSets: [
      { name: 'crown', region: { partings: [0], from }, guides: { density: 20 } },
      { name: 'everywhere', guides: { density: 5 } },
    ],
  });
}

/** The z of each face's centroid on the unit sphere the file was made from (`unit`: the same sphere, neither moved nor bent). */
function centroidHeights(unit: TransferSphere): number[] {
  const p = unit.mesh.positions, t = unit.mesh.triangles;
  return Array.from({ length: t.length / 3 }, (_x, f) => (p[3 * t[3 * f] + 2] + p[3 * t[3 * f + 1] + 2] + p[3 * t[3 * f + 2] + 2]) / 3);
}

function sideOf(spec: GroomSpec, sphere: TransferSphere): Uint8Array {
  return setRegionMask(prepareGroomSurface(sphere.mesh), spec, spec.guideSets![0].region, 'guideSets[0].region');
}

describe('the side of a parting carried onto another surface', () => {
  const spec = capSpec({ point: [0.3, 0.1, 0.9] });

  it('by polygon on a sculpt pass: the `from` place lands in the same polygon, and the side holds the same faces', () => {
    const sculpted = transferSphere(RINGS, SEGMENTS, { sculpt: ([x, y, z]) => [1.2 * x, y, 0.8 * z + 0.1 * x * x] });
    const { spec: carried, report } = transferSpec(spec, side(a), side(sculpted));
    expect(report.method).toBe('topology');
    const feature = report.features.find((f) => f.path === 'guideSets[0].region.from')!;
    expect(feature).toMatchObject({ kind: 'parting side' });
    expect(feature.to).not.toBeNull();
    expect(report.notCarried).toEqual([]);
    const region = carried.guideSets![0].region;
    expect(region.partings).toEqual([0]);
    expect(region.from!.surface!.polygon).toBe(withSurfacePositions(spec, side(a).surface, a.identity).guideSets![0].region.from!.surface!.polygon);
    expect(Array.from(sideOf(carried, sculpted))).toEqual(Array.from(sideOf(spec, a)));
    expect(transferReportText(report)).toMatch(/guideSets\[0\]\.region\.from\s+parting side\s+→/);
  });

  it('by UV onto other triangles, and by alignment onto a moved copy: the side is still the northern cap', () => {
    const other = { split: 'bc' as const, asTriangles: true, shift: 5 };
    const byUv = transferSphere(RINGS, SEGMENTS, { ...other, sculpt: ([x, y, z]) => [x + 0.3 * z * z, y, z] });
    const moved = transferSphere(RINGS, SEGMENTS, { ...other, scale: 2, translation: [1, -2, 0.5] });
    const heights = centroidHeights(transferSphere(RINGS, SEGMENTS, other));
    for (const [to, uv, method] of [[byUv, true, 'uv'], [moved, false, 'alignment']] as const) {
      const { spec: carried, report } = transferSpec(spec, side(a, uv), side(to, uv));
      expect(report.method).toBe(method);
      expect(report.notCarried).toEqual([]);
      const faces = sideOf(carried, to);
      // The parting follows the equator's edges, so the side is exactly the faces north of it.
      heights.forEach((z, f) => expect(faces[f]).toBe(z > 0 ? 1 : 0));
    }
  });

  it('keeps a `from` vertex a vertex on the same polygons', () => {
    const byVertex = capSpec({ vertex: 0 });
    const sculpted = transferSphere(RINGS, SEGMENTS, { sculpt: ([x, y, z]) => [x, 1.1 * y, z] });
    const { spec: carried } = transferSpec(byVertex, side(a), side(sculpted));
    expect(carried.guideSets![0].region.from).toMatchObject({ vertex: 0 });
  });

  it('grows on the whole surface, and says so, when its place or every parting of it is left behind; later partings renumbered', () => {
    // Placed by hand (placeFeatures is what transferSpec writes the carried spec with).
    const twoPartings = parseGroomSpec({
      ...capSpec({ point: [0.3, 0.1, 0.9] }),
      field: { ...spec.field, partings: [{ points: [[0, -1, 0], [0, 0, -1]], closed: false }, ...spec.field.partings] },
      guideSets: [{ name: 'crown', region: { partings: [1], from: { point: [0.3, 0.1, 0.9] } } }],
    });
    const features = anchorFeatures(twoPartings, side(a).surface, a.identity);
    const landed = features.map((f) => ({ point: f.point, position: f.position }));
    const withoutFirst = placeFeatures(twoPartings, features, landed, new Set(['field.partings[0]']));
    expect(withoutFirst.spec.guideSets![0].region).toMatchObject({ partings: [0] });
    expect(withoutFirst.droppedSides).toEqual([]);
    const fromLost = placeFeatures(twoPartings, features, features.map((f, i) => (f.kind === 'parting side' ? null : landed[i])), new Set());
    expect(fromLost.spec.guideSets![0].region).toEqual({ groups: [] });
    expect(fromLost.droppedSides).toEqual([{ path: 'guideSets[0].region', reason: 'its place on the side (region.from) could not be carried, so the set grows on the whole surface' }]);
    const partingLost = placeFeatures(twoPartings, features, landed, new Set(['field.partings[1]']));
    expect(partingLost.droppedSides[0].reason).toBe('its parting was left out, so the set grows on the whole surface');
    expect(() => parseGroomSpec(partingLost.spec)).not.toThrow();
  });
});
