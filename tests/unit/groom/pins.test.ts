import { describe, expect, it } from 'vitest';
import { prepareHarmonic, type TriangleMesh } from '@/lib/field';
import { gridPlane, icosphere } from '@/tests/fixtures/shapes';
import { prepareGroomSurface } from '@/lib/groom/place/surface';
import { blendValues } from '@/lib/groom/place/pins';
import { geodesicDistances, vertexFaces } from '@/lib/groom/place/geodesic';

type Pins = { vertex: number; value: number }[];

function blend(mesh: TriangleMesh, pins: Pins): Float64Array {
  return blendValues(prepareGroomSurface(mesh), vertexFaces(mesh), pins);
}

/** The 10 × 10 grid with x sheared by `shear` · y: corners down to a few degrees, up to about 170°. */
function shearedGrid(shear: number): TriangleMesh {
  const mesh = gridPlane(10, 10);
  for (let v = 0; v < mesh.positions.length / 3; v++) mesh.positions[3 * v] += shear * mesh.positions[3 * v + 1];
  return mesh;
}

/** A strip of long, flat triangles: every other row of the grid shifted half a cell and squashed to 1/8 height. */
function obtuseStrip(): TriangleMesh {
  const mesh = gridPlane(12, 12, 1, 1 / 8);
  for (let j = 0; j <= 12; j++) if (j % 2 === 1) for (let i = 0; i <= 12; i++) mesh.positions[3 * (j * 13 + i)] += 0.5 / 12;
  return mesh;
}

function range(values: Float64Array): [number, number] {
  let lo = Infinity, hi = -Infinity;
  for (const x of values) { lo = Math.min(lo, x); hi = Math.max(hi, x); }
  return [lo, hi];
}

describe('pin blending', () => {
  // The maximum principle of Shepard's inverse-distance weighting (Shepard 1968): the value is a
  // convex combination of the pins' values, so it lies in their range on any triangles. The
  // harmonic blend it replaces obeys a discrete maximum principle only on meshes without obtuse
  // angles (the cotangent weights turn negative), which is why each case first shows it overshoot.
  const cases: [string, TriangleMesh, Pins][] = [
    ['a sheared grid', shearedGrid(2.5), [{ vertex: 11, value: 1 }, { vertex: 12, value: 2 }]],
    ['a strip of obtuse triangles', obtuseStrip(), [{ vertex: 13 * 5 + 3, value: 1 }, { vertex: 13 * 6 + 4, value: 2 }, { vertex: 13 * 9 + 9, value: 1.5 }]],
  ];
  for (const [name, mesh, pins] of cases) {
    it(`stays within the pins' range on ${name}`, () => {
      const [hlo, hhi] = range(prepareHarmonic(mesh).interpolate(pins));
      expect(hlo < 1 - 1e-3 || hhi > 2 + 1e-3).toBe(true);
      const values = blend(mesh, pins);
      const [lo, hi] = range(values);
      expect(lo).toBeGreaterThanOrEqual(1);
      expect(hi).toBeLessThanOrEqual(2);
      for (const pin of pins) expect(values[pin.vertex]).toBe(pin.value);
    });
  }

  it("keeps a pin's influence at a fixed distance when the mesh is refined (icosphere level 3 against 5)", () => {
    // Icosphere subdivision keeps every vertex of the coarser level, with the same number and
    // position, so each level-3 vertex is the same point of the sphere at level 5. Pin 2 at
    // vertex 0 and 1 at its antipode (vertex 3); the influence of the first pin is f − 1.
    const pins = [{ vertex: 0, value: 2 }, { vertex: 3, value: 1 }];
    const coarse = icosphere(3, 1), fine = icosphere(5, 1);
    const atCoarse = blend(coarse, pins), atFine = blend(fine, pins);
    const p = coarse.positions;
    let checked = 0;
    for (let v = 0; v < p.length / 3; v++) {
      // The great-circle distance from the first pin (unit sphere): the vertices from a tenth to
      // half of the way to the other pin.
      const distance = Math.acos(Math.min(1, p[3 * v] * p[0] + p[3 * v + 1] * p[1] + p[3 * v + 2] * p[2]));
      if (distance < 0.1 * Math.PI || distance > 0.5 * Math.PI) continue;
      expect(Math.abs(atCoarse[v] - 1 - (atFine[v] - 1)) / (atFine[v] - 1)).toBeLessThan(0.02);
      checked++;
    }
    expect(checked).toBeGreaterThan(200);
    // The harmonic blend of the same point pins flattens toward the mean as the mesh is refined:
    // a quarter of the way to the other pin the first pin's influence moves by more than 2 %.
    const near = Array.from({ length: p.length / 3 }, (_x, v) => v).find((v) => { const c = p[3 * v] * p[0] + p[3 * v + 1] * p[1] + p[3 * v + 2] * p[2]; return c > 0.85 && c < 0.95; })!;
    const harmonicCoarse = prepareHarmonic(coarse).interpolate(pins), harmonicFine = prepareHarmonic(fine).interpolate(pins);
    expect(Math.abs(harmonicCoarse[near] - harmonicFine[near]) / (harmonicFine[near] - 1)).toBeGreaterThan(0.02);
  });

  it('measures distances along the surface: the great circle on a sphere, straight lines on a plane', () => {
    // Worked example: on the unit sphere the geodesic distance is the angle between the points.
    const mesh = icosphere(5, 1);
    const d = geodesicDistances(mesh, vertexFaces(mesh), 0);
    const p = mesh.positions;
    for (let v = 1; v < p.length / 3; v += 37) {
      const exact = Math.acos(Math.max(-1, Math.min(1, p[3 * v] * p[0] + p[3 * v + 1] * p[1] + p[3 * v + 2] * p[2])));
      expect(Math.abs(d[v] - exact) / exact).toBeLessThan(0.01);
    }
    // On a flat grid of right triangles, from a corner: exact straight-line distances (Pythagoras),
    // where an edge path would be up to 8 % long.
    const grid = gridPlane(10, 10);
    const g = geodesicDistances(grid, vertexFaces(grid), 0);
    expect(g[5 * 11 + 10]).toBeCloseTo(Math.hypot(1, 0.5), 2);
  });
});
