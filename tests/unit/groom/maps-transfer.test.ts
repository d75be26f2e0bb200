// Painted maps carried with a groom onto another surface (lib/groom/README.md, "Painted maps").
import { describe, expect, it } from 'vitest';
import { parseGroomSpec, prepareGroomSurface, transferReportText, transferSpec, withoutUv, type SurfaceIdentity } from '@/lib/groom';
import type { TriangleMesh } from '@/lib/field';
import { decodeMap, decodeMask, encodeMap, encodeMask } from '@/lib/groom/place/maps';
import { carryMaps } from '@/lib/groom/transfer/maps';
import { identityOfMesh } from '@/lib/groom/transfer/identity';
import { gridPlane } from '@/tests/fixtures/shapes';
import { transferSphere, type TransferSphere } from '@/tests/fixtures/transfer-sphere';

const RINGS = 16, SEGMENTS = 24;

function side(sphere: TransferSphere, identity: SurfaceIdentity = sphere.identity) {
  return { surface: prepareGroomSurface(sphere.mesh), identity };
}

/** A length map of 1 + z on the unit sphere (0 to 2) and a width map of 0.5 + x², painted on `sphere`. */
function paintedSpec(sphere: TransferSphere) {
  const p = sphere.mesh.positions, nV = p.length / 3;
  const length = Float64Array.from({ length: nV }, (_x, v) => 1 + p[3 * v + 2]);
  const width = Float64Array.from({ length: nV }, (_x, v) => 0.5 + p[3 * v] ** 2);
  return parseGroomSpec({ specVersion: 3, units: 'cm', upAxis: 'z', field: {}, maps: [encodeMap('length', length, sphere.mesh), encodeMap('width', width, sphere.mesh, 8)] });
}

describe('painted maps travel with the groom', () => {
  const a = transferSphere(RINGS, SEGMENTS);
  const spec = paintedSpec(a);

  it('by polygon on a sculpt pass: every map unchanged, code for code', () => {
    const sculpted = transferSphere(RINGS, SEGMENTS, { sculpt: ([x, y, z]) => [1.2 * x, y, 0.8 * z + 0.1 * x * x] });
    const { spec: carried, report } = transferSpec(spec, side(a), side(sculpted));
    expect(report.method).toBe('topology');
    expect(report.maps).toEqual([
      { path: 'maps[0]', attribute: 'length', how: 'polygon' },
      { path: 'maps[1]', attribute: 'width', how: 'polygon' },
    ]);
    carried.maps!.forEach((map, i) => {
      expect(map.data).toBe(spec.maps![i].data);
      expect(decodeMap(map, sculpted.mesh)).toEqual(decodeMap(spec.maps![i], a.mesh));
    });
    expect(transferReportText(report)).toMatch(/maps\s+2 carried\n\s+maps\[0\]\s+length\s+by polygon, unchanged/);
  });

  it('onto the same shape numbered otherwise (carried by UV): each point of the sphere keeps its value, within a code step', () => {
    const shifted = transferSphere(RINGS, SEGMENTS, { shift: 5 });
    const { spec: carried, report } = transferSpec(spec, side(a), side(shifted));
    expect(report.method).toBe('uv');
    // The features went by UV, so the maps do too (lib/groom/README.md, "Painted maps", Travel).
    expect(report.maps![0]).toEqual({ path: 'maps[0]', attribute: 'length', how: 'uv', unlocated: 0 });
    const before = decodeMap(spec.maps![0], a.mesh), after = decodeMap(carried.maps![0], shifted.mesh);
    const key = (p: Float64Array, v: number) => [0, 1, 2].map((k) => p[3 * v + k].toFixed(9)).join(' ');
    const valueAt = new Map<string, number>();
    for (let v = 0; v < before.length; v++) valueAt.set(key(a.mesh.positions, v), before[v]);
    for (let v = 0; v < after.length; v++) expect(Math.abs(after[v] - valueAt.get(key(shifted.mesh.positions, v))!)).toBeLessThanOrEqual(2 / 65535);
  });

  it('by UV onto a character bent out of shape: each vertex reads the value painted at its UV, where the alignment would read another place', () => {
    // Other triangles (the other diagonal, other numbers) and the sphere bent: x pushed by 0.8 z².
    // No similarity lays it onto the old sphere, but each vertex keeps its UV (transfer-sphere.ts).
    const bend = ([x, y, z]: [number, number, number]): [number, number, number] => [x + 0.8 * z * z, y, z];
    const bent = transferSphere(RINGS, SEGMENTS, { split: 'bc', asTriangles: true, shift: 7, sculpt: bend });
    const unbent = transferSphere(RINGS, SEGMENTS, { split: 'bc', asTriangles: true, shift: 7 });
    const p = a.mesh.positions, nV = p.length / 3;
    const painted = Float64Array.from({ length: nV }, (_x, v) => 1.6 + p[3 * v + 2] + 0.5 * p[3 * v]);
    const cap = Float64Array.from({ length: nV }, (_x, v) => Math.max(0, Math.min(1, 2 * p[3 * v + 2])));
    const input = parseGroomSpec({ specVersion: 3, units: 'cm', upAxis: 'z', field: {}, maps: [encodeMap('length', painted, a.mesh)], masks: [encodeMask('cap', cap, a.mesh)] });
    const { spec: carried, report } = transferSpec(input, side(a), side(bent));
    expect(report.method).toBe('uv');
    expect(report.maps).toEqual([{ path: 'maps[0]', attribute: 'length', how: 'uv', unlocated: 0 }]);
    expect(report.masks).toEqual([{ path: 'masks[0]', name: 'cap', how: 'uv', unlocated: 0 }]);
    expect(transferReportText(report)).toMatch(/maps\[0\]\s+length\s+by UV\n/);
    // The expected value at each new vertex: the painted function at its point of the unit sphere (the same vertex unbent).
    const q = unbent.mesh.positions;
    const expected = (v: number) => 1.6 + q[3 * v + 2] + 0.5 * q[3 * v];
    const length = decodeMap(carried.maps![0], bent.mesh), mask = decodeMask(carried.masks![0], bent.mesh);
    // Same grid vertex, same UV: twice quantised at 16 bits (each map about 3 wide).
    for (let v = 0; v < length.length; v++) expect(Math.abs(length[v] - expected(v))).toBeLessThanOrEqual(2 * 3.2 / 65535);
    for (let v = 0; v < mask.length; v++) expect(Math.abs(mask[v] - Math.max(0, Math.min(1, 2 * q[3 * v + 2])))).toBeLessThanOrEqual(2 / 255);
    // What the alignment would read instead: the bent vertices lie where other values were painted.
    const aligned = transferSpec(input, side(a), side(bent), { method: 'alignment' });
    expect(aligned.report.maps![0].how).toBe('closest point');
    const off = decodeMap(aligned.spec.maps![0], bent.mesh);
    expect(Math.max(...Array.from(off, (x, v) => Math.abs(x - expected(v))))).toBeGreaterThan(0.1);
  });

  it('by the nearest point after the alignment on other triangles: values where they were, within the quantisation', () => {
    const c = transferSphere(RINGS, SEGMENTS, { split: 'bc', asTriangles: true, shift: 7, scale: 2.54, translation: [3, -1, 2] });
    const { spec: carried, report } = transferSpec(spec, side(a, withoutUv(a.identity)), side(c, withoutUv(c.identity)));
    expect(report.method).toBe('alignment');
    expect(report.maps!.map((m) => m.how)).toEqual(['closest point', 'closest point']);
    expect(report.maps![0].farthest!).toBeLessThan(1e-6);
    const length = decodeMap(carried.maps![0], c.mesh), width = decodeMap(carried.maps![1], c.mesh);
    const p = c.mesh.positions;
    for (let v = 0; v < length.length; v++) {
      // Back onto the unit sphere: c's points are 2.54 × the unit sphere's + (3, −1, 2).
      const x = (p[3 * v] - 3) / 2.54, z = (p[3 * v + 2] - 2) / 2.54;
      // Twice quantised (old codes, new codes): within a code step of each.
      expect(Math.abs(length[v] - (1 + z))).toBeLessThanOrEqual(2 / 65535 + 1e-6);
      expect(Math.abs(width[v] - (0.5 + x * x))).toBeLessThanOrEqual(1 / 255 + 1e-6);
    }
  });

  it('carries a painted mask as a map: by polygon code for code, by the nearest point within a code step, the set still naming it', () => {
    const p = a.mesh.positions, nV = p.length / 3;
    const cap = Float64Array.from({ length: nV }, (_x, v) => Math.max(0, Math.min(1, 2 * p[3 * v + 2])));
    const masked = parseGroomSpec({ specVersion: 3, units: 'cm', upAxis: 'z', field: {}, masks: [encodeMask('cap', cap, a.mesh)], guideSets: [{ name: 'crown', region: { mask: 'cap' } }] });
    const sculpted = transferSphere(RINGS, SEGMENTS, { sculpt: ([x, y, z]) => [1.1 * x, y, 0.9 * z] });
    const byPolygon = transferSpec(masked, side(a), side(sculpted));
    expect(byPolygon.report.masks).toEqual([{ path: 'masks[0]', name: 'cap', how: 'polygon' }]);
    expect(byPolygon.spec.masks![0].data).toBe(masked.masks![0].data);
    expect(byPolygon.spec.guideSets![0].region).toEqual({ mask: 'cap' });
    const c = transferSphere(RINGS, SEGMENTS, { split: 'bc', asTriangles: true, shift: 7, scale: 2, translation: [1, 0, 0] });
    const moved = transferSpec(masked, side(a, withoutUv(a.identity)), side(c, withoutUv(c.identity)));
    expect(moved.report.masks![0].how).toBe('closest point');
    const after = decodeMask(moved.spec.masks![0], c.mesh);
    // The unit sphere's cap, 2 × larger and moved by (1, 0, 0): twice quantised at 8 bits, and read across faces where the clamp bends it (a face is about 0.2 across).
    for (let v = 0; v < after.length; v++) expect(Math.abs(after[v] - Math.max(0, Math.min(1, c.mesh.positions[3 * v + 2])))).toBeLessThanOrEqual(2 / 255 + 0.05);
  });

  it('refuses a map that was not painted on the old surface', () => {
    const other = transferSphere(8, 12);
    const foreign = paintedSpec(other);
    expect(() => transferSpec(foreign, side(a), side(a))).toThrow(/maps\[0\]: the length map was painted on a surface of \d+ vertices/);
  });

  it('keeps to its own side of a thin gap: a sheet under another reads its own values, not those of the nearer sheet', () => {
    // Two sheets facing apart (+z on top, −z below), like an ear's two sides; on the new surface
    // the lower sheet lies nearer the upper sheet of the old one than the old lower sheet.
    const sandwich = (cells: number, gap: number): TriangleMesh => {
      const top = gridPlane(cells, cells), bottom = gridPlane(cells, cells);
      const nV = top.positions.length / 3;
      const positions = new Float64Array(6 * nV);
      positions.set(top.positions);
      positions.set(bottom.positions.map((x, i) => (i % 3 === 2 ? -gap : x)), 3 * nV);
      const flipped = Uint32Array.from(bottom.triangles, (_x, i) => bottom.triangles[i - (i % 3) + [0, 2, 1][i % 3]] + nV);
      const triangles = new Uint32Array(2 * top.triangles.length);
      triangles.set(top.triangles);
      triangles.set(flipped, top.triangles.length);
      return { positions, triangles };
    };
    const old = sandwich(10, 0.01), fresh = sandwich(12, 0.004);
    const values = Float64Array.from({ length: old.positions.length / 3 }, (_x, v) => (old.positions[3 * v + 2] < 0 ? 3 : 1));
    const spec = parseGroomSpec({ specVersion: 3, units: 'cm', field: {}, maps: [encodeMap('length', values, old)] });
    const identity = { scale: 1, rotation: [1, 0, 0, 0, 1, 0, 0, 0, 1], translation: [0, 0, 0] as [number, number, number], kind: 'landmarks' as const };
    const { maps, report } = carryMaps(spec, { surface: prepareGroomSurface(old), identity: identityOfMesh(old) }, { surface: prepareGroomSurface(fresh), identity: identityOfMesh(fresh) }, false, identity, 0.05);
    expect(report[0]).toMatchObject({ how: 'closest point', unchecked: 0 });
    const carried = decodeMap(maps[0], fresh);
    for (let v = 0; v < carried.length; v++) expect(carried[v]).toBeCloseTo(fresh.positions[3 * v + 2] < 0 ? 3 : 1, 9);
  });
});
