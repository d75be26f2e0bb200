import { describe, expect, it } from 'vitest';
import { prepareHarmonic } from '@/lib/field/harmonic';
import { FieldError } from '@/lib/field/mesh/errors';
import { disc, gridPlane, icosphere } from '@/tests/fixtures/shapes';
import { buildTopology } from '@/lib/field/mesh/topology';

describe('harmonic interpolation of pinned values', () => {
  it('reproduces a linear function on a flat mesh from its boundary values', () => {
    // Source: the cotangent Laplacian has linear precision on planar meshes — it annihilates
    // linear functions at interior vertices (Pinkall & Polthier, "Computing Discrete Minimal
    // Surfaces and Their Conjugates", Experimental Mathematics 2(1), 1993; Wardetzky, Mathur,
    // Kälberer, Grinspun, "Discrete Laplace operators: No free lunch", SGP 2007, property LP).
    const mesh = disc(8, 30, 2);
    const topology = buildTopology(mesh);
    const linear = (v: number) => 3 + 0.5 * mesh.positions[3 * v] - 1.25 * mesh.positions[3 * v + 1];
    const pins = [];
    for (let v = 0; v < topology.vertexCount; v++) if (topology.isBoundaryVertex[v]) pins.push({ vertex: v, value: linear(v) });
    const values = prepareHarmonic(mesh).interpolate(pins);
    for (let v = 0; v < topology.vertexCount; v++) expect(values[v]).toBeCloseTo(linear(v), 5);
  });

  it('keeps pinned values exactly and stays between the smallest and largest pin', () => {
    const mesh = icosphere(3);
    const values = prepareHarmonic(mesh).interpolate([
      { vertex: 0, value: 2 },
      { vertex: 300, value: 5 },
      { vertex: 600, value: 3 },
    ]);
    expect(values[0]).toBe(2);
    expect(values[300]).toBe(5);
    expect(values[600]).toBe(3);
    // Maximum principle for harmonic functions (e.g. Evans, "Partial Differential Equations",
    // §2.2.3); the icosphere's triangles are acute, so the discrete operator keeps it.
    for (const x of values) {
      expect(x).toBeGreaterThanOrEqual(2 - 1e-6);
      expect(x).toBeLessThanOrEqual(5 + 1e-6);
    }
  });

  it('gives a constant from a single pin, and reuses its factorization for new pins', () => {
    const interpolator = prepareHarmonic(gridPlane(10, 10));
    for (const x of interpolator.interpolate([{ vertex: 7, value: 1.5 }])) expect(x).toBeCloseTo(1.5, 6);
    for (const x of interpolator.interpolate([{ vertex: 50, value: -4 }])) expect(x).toBeCloseTo(-4, 6);
  });

  it('refuses bad pins with a clear reason', () => {
    const interpolator = prepareHarmonic(gridPlane(4, 4));
    expect(() => interpolator.interpolate([{ vertex: 99, value: 1 }])).toThrow(FieldError);
    expect(() => interpolator.interpolate([{ vertex: 1, value: Number.NaN }])).toThrow(/finite/);
    expect(() => interpolator.interpolate([{ vertex: 1, value: 1 }, { vertex: 1, value: 2 }])).toThrow(/vertex 1/);
  });
});
