// The brush's arithmetic (lib/groom/place/paint.ts) and painted masks as a guide set's region
// (lib/groom/README.md, "The brush and painted masks").
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import type { TriangleMesh } from '@/lib/field';
import { vertexFaces } from '@/lib/groom/place/geodesic';
import { decodeMask, encodeMask } from '@/lib/groom/place/maps';
import { applyDab, dabReach, facesOfMask, falloffWeight, MAP_PAINT_RANGE, MASK_PAINT_RANGE, type BrushSettings } from '@/lib/groom/place/paint';
import { setRegionMask } from '@/lib/groom/place/set-region';
import { prepareGroomSurface } from '@/lib/groom/place/surface';
import { parseGroomSpec, type GroomSpecInput } from '@/lib/groom/spec/spec';
import { gridPlane, icosphere } from '@/tests/fixtures/shapes';
import { groomOn } from './support';

const SEED = 1612;
const brush = (more: Partial<BrushSettings> = {}): BrushSettings => ({ radius: 0.2, strength: 1, falloff: 'smooth', mode: 'paint', target: 3, ...more });

/** A flat 1 × 1 grid of 40 × 40 squares (edge 0.025), centred on the origin in z = 0. */
const grid = gridPlane(40, 40);
const gridAround = vertexFaces(grid);
/** The face whose centre is nearest a point. */
function faceAt(mesh: TriangleMesh, x: number, y: number, z = 0): number {
  const tri = mesh.triangles, p = mesh.positions;
  let best = 0, bestD = Infinity;
  for (let f = 0; f < tri.length / 3; f++) {
    const cx = (p[3 * tri[3 * f]] + p[3 * tri[3 * f + 1]] + p[3 * tri[3 * f + 2]]) / 3;
    const cy = (p[3 * tri[3 * f] + 1] + p[3 * tri[3 * f + 1] + 1] + p[3 * tri[3 * f + 2] + 1]) / 3;
    const cz = (p[3 * tri[3 * f] + 2] + p[3 * tri[3 * f + 1] + 2] + p[3 * tri[3 * f + 2] + 2]) / 3;
    const d = Math.hypot(cx - x, cy - y, cz - z);
    if (d < bestD) (best = f), (bestD = d);
  }
  return best;
}

describe('a dab’s falloff', () => {
  it('smooth follows 1 − 3t² + 2t³ (the reversed smoothstep, the cubic Hermite step; from common practice), hard is 1 inside and 0 outside', () => {
    for (const t of [0, 0.1, 0.25, 0.5, 0.75, 0.9, 1]) {
      expect(falloffWeight('smooth', 2 * t, 2)).toBeCloseTo(1 - 3 * t * t + 2 * t * t * t, 14);
    }
    expect(falloffWeight('smooth', 0, 2)).toBe(1);
    expect(falloffWeight('smooth', 1, 2)).toBe(0.5);
    expect(falloffWeight('smooth', 2, 2)).toBe(0);
    expect(falloffWeight('hard', 1.999, 2)).toBe(1);
    expect(falloffWeight('hard', 2, 2)).toBe(1);
    expect(falloffWeight('hard', 2.001, 2)).toBe(0);
    expect(falloffWeight('smooth', 3, 2)).toBe(0);
  });

  it('painted from 0 toward 1 at full strength, a dab on a flat grid leaves each vertex at the falloff of its straight distance (distance along a plane is the straight one)', () => {
    const values = new Float64Array(grid.positions.length / 3);
    const centre = [0.013, -0.021, 0];
    const reach = dabReach(grid, gridAround, faceAt(grid, centre[0], centre[1]), centre, 0.2);
    applyDab(values, reach, brush({ target: 1 }), { low: 0, high: 1, blank: 0 }, grid, gridAround);
    const p = grid.positions;
    let inside = 0;
    for (let v = 0; v < values.length; v++) {
      const d = Math.hypot(p[3 * v] - centre[0], p[3 * v + 1] - centre[1]);
      if (d > 0.2) expect(values[v]).toBe(0);
      else {
        inside++;
        // Fast marching on right triangles is within a few per cent of a mean edge of the straight distance.
        expect(Math.abs(values[v] - falloffWeight('smooth', d, 0.2))).toBeLessThan(0.02);
      }
    }
    expect(inside).toBeGreaterThan(150);
  });
});

describe('where a dab reaches', () => {
  it('never beyond the radius, at least as far as the straight line, and every vertex well within the radius on a plane', () => {
    const reach = dabReach(grid, gridAround, faceAt(grid, 0.1, 0.1), [0.1, 0.1, 0], 0.15);
    const p = grid.positions;
    const reached = new Set(reach.vertices);
    reach.vertices.forEach((v, i) => {
      const straight = Math.hypot(p[3 * v] - 0.1, p[3 * v + 1] - 0.1);
      expect(reach.distances[i]).toBeLessThanOrEqual(0.15);
      expect(reach.distances[i]).toBeGreaterThanOrEqual(straight - 1e-12);
    });
    for (let v = 0; v < p.length / 3; v++) if (Math.hypot(p[3 * v] - 0.1, p[3 * v + 1] - 0.1) < 0.14) expect(reached.has(v)).toBe(true);
  });

  it('along the surface: a dab on one sheet of a hairpin fold (an ear’s two sides 0.1 apart) does not reach the other sheet', () => {
    // A 3 × 0.3 strip folded back over itself round a half circle of radius 0.05.
    const strip = gridPlane(120, 6, 3, 0.3);
    const p = Float64Array.from(strip.positions);
    const bendAt = 1.4, r = 0.05, bend = Math.PI * r;
    for (let v = 0; v < p.length / 3; v++) {
      const s = p[3 * v] + 1.5;
      if (s <= bendAt) (p[3 * v] = s), (p[3 * v + 2] = 0);
      else if (s <= bendAt + bend) {
        const a = (s - bendAt) / r;
        (p[3 * v] = bendAt + r * Math.sin(a)), (p[3 * v + 2] = r - r * Math.cos(a));
      } else (p[3 * v] = bendAt - (s - bendAt - bend)), (p[3 * v + 2] = 2 * r);
    }
    const folded: TriangleMesh = { positions: p, triangles: strip.triangles };
    const around = vertexFaces(folded);
    const centre = [0.8, 0, 0];
    const reach = dabReach(folded, around, faceAt(folded, 0.8, 0), centre, 0.3);
    expect(reach.vertices.length).toBeGreaterThan(50);
    for (const v of reach.vertices) expect(p[3 * v + 2]).toBeLessThan(1e-9);
  });
});

describe('a dab on the values', () => {
  const values = fc.array(fc.double({ min: 0, max: 10, noNaN: true }), { minLength: grid.positions.length / 3, maxLength: grid.positions.length / 3 });
  const settings = fc.record({
    radius: fc.double({ min: 0.01, max: 0.6, noNaN: true }),
    strength: fc.double({ min: 0, max: 1, noNaN: true }),
    falloff: fc.constantFrom('smooth' as const, 'hard' as const),
    mode: fc.constantFrom('paint' as const, 'smooth' as const, 'erase' as const),
    target: fc.double({ min: -5, max: 15, noNaN: true }),
  });
  const centre = fc.tuple(fc.double({ min: -0.49, max: 0.49, noNaN: true }), fc.double({ min: -0.49, max: 0.49, noNaN: true }));

  it('keeps every value within the map’s range and changes no vertex outside the reach (property)', () => {
    fc.assert(
      fc.property(values, settings, centre, (start, b, [x, y]) => {
        const v = Float64Array.from(start);
        const reach = dabReach(grid, gridAround, faceAt(grid, x, y), [x, y, 0], b.radius);
        applyDab(v, reach, b, MAP_PAINT_RANGE, grid, gridAround);
        const reached = new Set(reach.vertices);
        for (let i = 0; i < v.length; i++) {
          expect(v[i]).toBeGreaterThanOrEqual(0);
          expect(v[i]).toBeLessThanOrEqual(10);
          if (!reached.has(i)) expect(v[i]).toBe(start[i]);
        }
      }),
      { seed: SEED, numRuns: 40 },
    );
  });

  it('erase at full strength with the hard edge gives back exactly the unpainted value: 1× for a map, 0 for a mask', () => {
    fc.assert(
      fc.property(values, centre, ([...start], [x, y]) => {
        const v = Float64Array.from(start);
        const reach = dabReach(grid, gridAround, faceAt(grid, x, y), [x, y, 0], 0.3);
        applyDab(v, reach, brush({ mode: 'erase', falloff: 'hard', radius: 0.3 }), MAP_PAINT_RANGE, grid, gridAround);
        for (const i of reach.vertices) expect(v[i]).toBe(1);
        const mask = Float64Array.from(start, (s) => s / 10);
        applyDab(mask, reach, brush({ mode: 'erase', falloff: 'hard', radius: 0.3 }), MASK_PAINT_RANGE, grid, gridAround);
        for (const i of reach.vertices) expect(mask[i]).toBe(0);
      }),
      { seed: SEED, numRuns: 20 },
    );
  });

  it('smoothing keeps a constant map exactly constant (a mean of equal values is that value), for any constant and any brush', () => {
    fc.assert(
      fc.property(fc.double({ min: 0, max: 10, noNaN: true }), settings, centre, (c, b, [x, y]) => {
        const v = new Float64Array(grid.positions.length / 3).fill(c);
        const reach = dabReach(grid, gridAround, faceAt(grid, x, y), [x, y, 0], b.radius);
        expect(applyDab(v, reach, { ...b, mode: 'smooth' }, MAP_PAINT_RANGE, grid, gridAround)).toBe(0);
        expect(v.every((x) => x === c)).toBe(true);
      }),
      { seed: SEED, numRuns: 40 },
    );
  });

  it('smoothing brings a spike down toward its neighbours and lifts them, never past the spike', () => {
    const v = new Float64Array(grid.positions.length / 3).fill(1);
    const spike = 20 * 41 + 20; // the grid's centre vertex (0, 0)
    v[spike] = 5;
    const reach = dabReach(grid, gridAround, faceAt(grid, 0, 0), [0, 0, 0], 0.1);
    applyDab(v, reach, brush({ mode: 'smooth', radius: 0.1, strength: 0.5 }), MAP_PAINT_RANGE, grid, gridAround);
    // Half the way from 5 to its neighbours' mean of 1.
    expect(v[spike]).toBe(3);
    expect(v[spike + 1]).toBeGreaterThan(1);
  });

  it('paints exactly the target at full strength with the hard edge, clamped into the range', () => {
    const v = new Float64Array(grid.positions.length / 3).fill(1);
    const reach = dabReach(grid, gridAround, faceAt(grid, 0, 0), [0, 0, 0], 0.1);
    applyDab(v, reach, brush({ falloff: 'hard', target: 2.5 }), MAP_PAINT_RANGE, grid, gridAround);
    for (const i of reach.vertices) expect(v[i]).toBe(2.5);
    applyDab(v, reach, brush({ falloff: 'hard', target: 14 }), MAP_PAINT_RANGE, grid, gridAround);
    for (const i of reach.vertices) expect(v[i]).toBe(10);
  });
});

describe('a painted mask as a guide set’s region', () => {
  const sphere = icosphere(3, 1);
  const nV = sphere.positions.length / 3;
  const north = Float64Array.from({ length: nV }, (_x, v) => (sphere.positions[3 * v + 1] > 0.2 ? 1 : 0));
  const field = { singularities: [{ point: [0, 1, 0] as [number, number, number], index: 1 }, { point: [0, -1, 0] as [number, number, number], index: 1 }] };
  const specWith = (mask: Float64Array, name = 'cap'): GroomSpecInput => ({
    specVersion: 3,
    units: 'cm',
    field,
    masks: [encodeMask(name, mask, sphere)],
    guideSets: [{ name: 'crown', region: { mask: 'cap' }, guides: { density: 60, length: 0.3 } }],
  });

  it('holds the faces whose corners’ mean share is at least ½, and no other', () => {
    const faces = facesOfMask(sphere, Float64Array.from({ length: nV }, (_x, v) => (v % 2 === 0 ? 1 : 0)));
    const tri = sphere.triangles;
    for (let f = 0; f < faces.length; f++) {
      const ones = [0, 1, 2].filter((k) => tri[3 * f + k] % 2 === 0).length;
      expect(faces[f]).toBe(ones >= 2 ? 1 : 0);
    }
    const spec = parseGroomSpec(specWith(north));
    const surface = prepareGroomSurface(sphere);
    const region = setRegionMask(surface, spec, spec.guideSets![0].region, 'guideSets[0].region');
    expect(region).toEqual(facesOfMask(sphere, decodeMask(spec.masks![0], sphere)));
  });

  it('grows the set’s guides only on the masked faces', () => {
    const { guides, surface } = groomOn(sphere, specWith(north));
    expect(guides.count).toBeGreaterThan(10);
    const tri = surface.mesh.triangles;
    for (let g = 0; g < guides.count; g++) {
      const f = guides.rootFace[g];
      expect([0, 1, 2].reduce((s, k) => s + north[tri[3 * f + k]], 0)).toBeGreaterThanOrEqual(1.5);
    }
  });

  it('refuses in words a mask that covers no face, and a region naming a mask the spec lacks', () => {
    expect(() => groomOn(sphere, specWith(new Float64Array(nV)))).toThrow(/guideSets\[0\]\.region\.mask: the mask "cap" covers no face .*Paint the mask/);
    expect(() => parseGroomSpec(specWith(north, 'brow'))).toThrow(/guideSets\[0\]\.region\.mask: there is no mask named "cap"; the spec's masks are "brow"/);
    expect(() => parseGroomSpec({ ...specWith(north), guideSets: [{ name: 'a', region: { mask: 'cap', groups: ['x'] } }] })).toThrow(/either "mask" or/);
  });
});
