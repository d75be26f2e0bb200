import { describe, expect, it } from 'vitest';
import { gridPlane, icosphere } from '@/tests/fixtures/shapes';
import { decodeMap, encodeMap, surfaceSignature } from '@/lib/groom/place/maps';
import { MAP_ATTRIBUTES, PIN_ATTRIBUTES, parseGroomSpec, specToJson, parseGroomSpecJson, type GroomSpecInput } from '@/lib/groom/spec/spec';
import { GroomError } from '@/lib/groom/errors';
import { groomOn } from './support';

const PLANE = { specVersion: 3 as const, units: 'cm' as const, upAxis: 'z' as const, field: { referenceDirection: [1, 0.3, 0] as [number, number, number] } };

/** A 2 cm square, its right half (x ≥ 0) painted at `right`×, its left half at 1×. */
function halfPainted(right: number) {
  const mesh = gridPlane(40, 40, 2, 2);
  const values = Float64Array.from({ length: mesh.positions.length / 3 }, (_x, v) => (mesh.positions[3 * v] >= 0 ? right : 1));
  return { mesh, values };
}

describe('painted maps in the spec', () => {
  it('round-trips through the spec JSON, each value within half a quantisation step, the ends exact', () => {
    const mesh = icosphere(2, 1);
    const values = Array.from({ length: mesh.positions.length / 3 }, (_x, v) => 0.5 + 1.5 * Math.abs(mesh.positions[3 * v + 1]));
    for (const bits of [8, 16] as const) {
      const map = encodeMap('length', values, mesh, bits);
      const spec = parseGroomSpecJson(specToJson(parseGroomSpec({ ...PLANE, maps: [map] })));
      const back = decodeMap(spec.maps![0], mesh);
      const step = (map.high - map.low) / (2 ** bits - 1);
      let worst = 0;
      values.forEach((x, v) => (worst = Math.max(worst, Math.abs(back[v] - x))));
      expect(worst).toBeLessThanOrEqual(step / 2 + 1e-12);
      expect(Math.min(...back)).toBe(Math.min(...values));
      expect(Math.max(...back)).toBe(Math.max(...values));
    }
  });

  it('can paint every attribute a pin can set', () => {
    for (const attribute of PIN_ATTRIBUTES) expect(MAP_ATTRIBUTES).toContain(attribute);
  });

  it('leaves a spec without maps as it was (no maps field written)', () => {
    const spec = parseGroomSpec(PLANE);
    expect('maps' in spec).toBe(false);
    expect(specToJson(spec)).not.toContain('"maps"');
  });

  it('refuses in words a map whose data does not fit its vertex count, and two maps of one attribute', () => {
    const mesh = icosphere(1, 1);
    const map = encodeMap('width', new Float64Array(mesh.positions.length / 3).fill(2), mesh, 8);
    expect(() => parseGroomSpec({ ...PLANE, maps: [{ ...map, vertices: map.vertices + 5 }] })).toThrow(/maps\[0\]\.data: holds \d+ base64 characters; 47 vertices at 8 bits need 64/);
    expect(() => parseGroomSpec({ ...PLANE, maps: [map, map] })).toThrow(/maps\[1\]\.attribute: a map of "width" is already given/);
  });

  it('refuses a map made for another surface, naming both surfaces', () => {
    const painted = icosphere(2, 1), other = icosphere(3, 1);
    const map = encodeMap('length', new Float64Array(painted.positions.length / 3).fill(2), painted);
    const spec = parseGroomSpec({ ...PLANE, maps: [map] });
    let error: unknown;
    try {
      decodeMap(spec.maps![0], other, 'maps[0]');
    } catch (e) {
      error = e;
    }
    expect(error).toBeInstanceOf(GroomError);
    expect((error as GroomError).code).toBe('map-surface-mismatch');
    expect((error as GroomError).message).toMatch(/maps\[0\]: the length map was painted on a surface of 162 vertices and 320 triangles .*this surface has 642 vertices and 1280 triangles/);
    // Same counts, other triangles (two faces' corners turned): still refused, by the signature.
    const turned = { ...painted, triangles: Uint32Array.from(painted.triangles) };
    [turned.triangles[0], turned.triangles[1], turned.triangles[2]] = [turned.triangles[1], turned.triangles[2], turned.triangles[0]];
    expect(surfaceSignature(turned).signature).not.toBe(map.signature);
    expect(() => decodeMap(spec.maps![0], turned)).toThrow(GroomError);
    // A sculpt pass (same triangles, moved vertices) keeps the map.
    const moved = { ...painted, positions: painted.positions.map((x) => 1.3 * x) };
    expect(decodeMap(spec.maps![0], moved)[0]).toBe(2);
  });
});

describe('growing with painted maps', () => {
  it('grows exactly the guides of no map from a map of all ones', () => {
    const { mesh } = halfPainted(1);
    const base: GroomSpecInput = { ...PLANE, guides: { density: 150, length: 0.2, jitter: 0.3 } };
    const ones = new Float64Array(mesh.positions.length / 3).fill(1);
    const maps = MAP_ATTRIBUTES.map((a) => encodeMap(a, ones, mesh, 8));
    const shaped: GroomSpecInput = { ...base, guides: { ...base.guides, tufts: { density: 20 }, waver: { amplitude: 0.02 } } };
    const plain = groomOn(mesh, shaped).guides;
    const mapped = groomOn(mesh, { ...shaped, maps }).guides;
    expect(mapped.count).toBe(plain.count);
    expect(Buffer.from(mapped.points.buffer).equals(Buffer.from(plain.points.buffer))).toBe(true);
    expect(mapped.guideRootWidth).toEqual(plain.guideRootWidth);
  });

  it('scales length and width per guide by the map at its root (barycentric), and a length map leaves the roots alone', () => {
    const { mesh, values } = halfPainted(2);
    const base: GroomSpecInput = { ...PLANE, guides: { density: 100, length: 0.2, jitter: 0, droop: 0, lift: 0 } };
    const plain = groomOn(mesh, base).guides;
    const mapped = groomOn(mesh, { ...base, maps: [encodeMap('length', values, mesh), encodeMap('width', values, mesh)] }).guides;
    // Only a density map changes the roots: ids, faces and weights stay.
    expect(mapped.guideId).toEqual(plain.guideId);
    expect(mapped.rootFace).toEqual(plain.rootFace);
    expect(mapped.rootBarycentric).toEqual(plain.rootBarycentric);
    let exact = 0;
    for (let g = 0; g < plain.count; g++) {
      const f = plain.rootFace[g];
      const factor = [0, 1, 2].reduce((s, k) => s + plain.rootBarycentric[3 * g + k] * values[mesh.triangles[3 * f + k]], 0);
      expect(mapped.guideRootWidth[g]).toBeCloseTo(plain.guideRootWidth[g] * factor, 12);
      // Lift, droop and jitter 0 on a flat sheet: the polyline is the combed length (to the clearance kept above the skin) unless the sheet's edge bends it.
      if (Math.abs(mapped.length[g] / (0.2 * factor) - 1) < 1e-3) exact++;
    }
    expect(exact).toBeGreaterThan(0.9 * plain.count);
  });

  it('drives the waver and the gather: a map of zeros grows the guides of no waver and of no tufts, bit for bit', () => {
    const { mesh } = halfPainted(1);
    const base: GroomSpecInput = { ...PLANE, guides: { density: 100, length: 0.2 } };
    const zeros = new Float64Array(mesh.positions.length / 3);
    const bytes = (input: GroomSpecInput) => Buffer.from(groomOn(mesh, input).guides.points.buffer);
    const plain = bytes(base);
    const wavered: GroomSpecInput = { ...base, guides: { ...base.guides, waver: { amplitude: 0.05 } } };
    const tufted: GroomSpecInput = { ...base, guides: { ...base.guides, tufts: { density: 20, gather: { root: 0.2, tip: 1 } } } };
    expect(bytes(wavered).equals(plain)).toBe(false);
    expect(bytes(tufted).equals(plain)).toBe(false);
    expect(bytes({ ...wavered, maps: [encodeMap('waver', zeros, mesh, 8)] }).equals(plain)).toBe(true);
    expect(bytes({ ...tufted, maps: [encodeMap('gather', zeros, mesh, 8)] }).equals(plain)).toBe(true);
  });

  it('multiplies a map with the pins of its attribute', () => {
    const { mesh, values } = halfPainted(1.5);
    const base: GroomSpecInput = { ...PLANE, guides: { count: 200, width: 0.01 }, pins: [{ attribute: 'width', vertex: 0, value: 2 }] };
    const pinned = groomOn(mesh, base).guides;
    const both = groomOn(mesh, { ...base, maps: [encodeMap('width', values, mesh)] }).guides;
    for (let g = 0; g < both.count; g++) {
      const f = both.rootFace[g];
      const map = [0, 1, 2].reduce((s, k) => s + both.rootBarycentric[3 * g + k] * values[mesh.triangles[3 * f + k]], 0);
      // One pin makes its value the factor everywhere (README, "Pin blending"): 0.01 × 2 × the map.
      expect(pinned.guideRootWidth[g]).toBeCloseTo(0.02, 12);
      expect(both.guideRootWidth[g]).toBeCloseTo(0.02 * map, 12);
    }
  });

  it('spreads guides by the painted density: half the square at 1×, half at 3×', () => {
    // Statistical tolerance (our choice, stated): the count in a region within 3 standard
    // deviations of a Poisson count of the expected mean, 3·√N. A Poisson-disk set's counts vary
    // less than a Poisson process's (its points repel), so the bound is conservative; it still
    // fails for a sampler that ignores the map (spread by area alone, the 1× half would hold twice its share: about 30 σ off at these counts).
    const { mesh, values } = halfPainted(3);
    const { guides } = groomOn(mesh, { ...PLANE, guides: { density: 600, length: 0.05 }, maps: [encodeMap('density', values, mesh, 8)] });
    // Faces wholly in x ≤ −0.05 are at 1×, in x ≥ 0 at 3×; the strip between is blended (mean 2×).
    const weighted = 0.95 * 2 * 1 + 0.05 * 2 * 2 + 1 * 2 * 3;
    let left = 0, right = 0;
    for (let g = 0; g < guides.count; g++) {
      const f = guides.rootFace[g];
      const xs = [0, 1, 2].map((k) => mesh.positions[3 * mesh.triangles[3 * f + k]]);
      if (Math.max(...xs) <= -0.05 + 1e-9) left++;
      else if (Math.min(...xs) >= -1e-9) right++;
    }
    const expectLeft = (guides.count * (0.95 * 2 * 1)) / weighted, expectRight = (guides.count * (1 * 2 * 3)) / weighted;
    expect(guides.count).toBe(Math.round(600 * weighted));
    expect(Math.abs(left - expectLeft)).toBeLessThanOrEqual(3 * Math.sqrt(expectLeft));
    expect(Math.abs(right - expectRight)).toBeLessThanOrEqual(3 * Math.sqrt(expectRight));
    // Per area: the 3× half holds three times the guides per cm² of the 1× half, within the same tolerance.
    const ratio = right / 1 / (left / 0.95);
    expect(Math.abs(ratio - 3)).toBeLessThan(3 * (3 * Math.sqrt(1 / expectLeft + 1 / expectRight)));
  });
});
