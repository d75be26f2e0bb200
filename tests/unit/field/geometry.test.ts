import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import {
  angleDefects,
  boundingBox,
  componentFacts,
  cornerAngles,
  eulerCharacteristic,
  faceAreas,
  faceNormals,
  genus,
  surfaceArea,
  vertexNormals,
} from '@/lib/field/mesh/geometry';
import type { TriangleMesh } from '@/lib/field/mesh/mesh';
import { disc, genusTwoSurface, gridPlane, icosphere, torus, uvSphere } from '@/tests/fixtures/shapes';
import { buildTopology } from '@/lib/field/mesh/topology';
import { concatenate, stanfordBunny } from './surfaces';

const TWO_PI = 2 * Math.PI;

function sum(values: Float64Array): number {
  return values.reduce((s, x) => s + x, 0);
}

describe('discrete Gauss–Bonnet: Σ angle defects = 2πχ', () => {
  // Source: the discrete Gauss–Bonnet theorem for triangle meshes, Meyer, Desbrun, Schröder, Barr,
  // "Discrete Differential-Geometry Operators for Triangulated 2-Manifolds" (2003), section 5:
  // Σ_v (2π − Σ θ) = 2πχ on a closed mesh; with boundary, interior vertices contribute
  // 2π − Σ θ and boundary vertices π − Σ θ (their geodesic curvature), and the sum is still 2πχ.
  const cases: [string, TriangleMesh, number][] = [
    // The `bunny` npm package's Stanford bunny turns out to be closed: one component, no
    // boundary loops, χ = 2 (checked below), so the closed form applies.
    ['the Stanford bunny (bunny package)', stanfordBunny(), 2],
    ['an icosphere', icosphere(3), 2],
    ['a latitude–longitude sphere', uvSphere(12, 24), 2],
    ['a torus', torus(2, 0.7, 40, 16), 0],
    ['a genus-2 surface', genusTwoSurface(), -2],
    ['a disc', disc(6, 24), 1],
    ['a grid plane', gridPlane(7, 5, 3, 2), 1],
  ];
  for (const [name, mesh, chi] of cases) {
    it(`holds on ${name} (χ = ${chi}) to 1e-9`, () => {
      const topology = buildTopology(mesh);
      expect(eulerCharacteristic(topology)).toBe(chi);
      expect(sum(angleDefects(mesh, topology))).toBeCloseTo(TWO_PI * chi, 9);
    });
  }

  it('finds the bunny closed: one component, no boundary, genus 0', () => {
    const facts = componentFacts(buildTopology(stanfordBunny()));
    expect(facts).toEqual([{ faceCount: 3674, vertexCount: 1839, edgeCount: 5511, boundaryLoopCount: 0, eulerCharacteristic: 2, genus: 0 }]);
  });

  it('gives a disc boundary total geodesic curvature 2π and a flat interior', () => {
    // Source: Gauss–Bonnet for a flat disc (∫K = 0, so ∮κ_g = 2π), e.g. do Carmo,
    // "Differential Geometry of Curves and Surfaces", §4-5.
    const mesh = disc(4, 16);
    const topology = buildTopology(mesh);
    const defects = angleDefects(mesh, topology);
    let boundary = 0;
    for (let v = 0; v < topology.vertexCount; v++) {
      if (topology.isBoundaryVertex[v]) boundary += defects[v];
      else expect(Math.abs(defects[v])).toBeLessThan(1e-12);
    }
    expect(boundary).toBeCloseTo(TWO_PI, 12);
  });

  it('holds on random perturbations of a torus', () => {
    // Gauss–Bonnet is topological: moving vertices must not change the sum (same source as above).
    fc.assert(
      fc.property(fc.array(fc.double({ min: -0.05, max: 0.05, noNaN: true }), { minLength: 3 * 12 * 8, maxLength: 3 * 12 * 8 }), (noise) => {
        const base = torus(1, 0.4, 12, 8);
        const positions = base.positions.map((x, i) => x + noise[i]);
        const mesh = { ...base, positions };
        expect(sum(angleDefects(mesh, buildTopology(mesh)))).toBeCloseTo(0, 9);
      }),
      { numRuns: 50 },
    );
  });
});

describe('cornerAngles', () => {
  it('gives the angles of a right triangle, per halfedge', () => {
    const mesh = { positions: Float64Array.of(0, 0, 0, 1, 0, 0, 0, 1, 0), triangles: Uint32Array.of(0, 1, 2) };
    const angles = cornerAngles(mesh);
    expect(angles[0]).toBeCloseTo(Math.PI / 2, 15);
    expect(angles[1]).toBeCloseTo(Math.PI / 4, 15);
    expect(angles[2]).toBeCloseTo(Math.PI / 4, 15);
  });

  it('sums to π in every triangle and stays accurate for very flat ones', () => {
    // Source: the angle sum of a Euclidean triangle is π (Euclid, Elements I.32).
    fc.assert(
      fc.property(fc.array(fc.double({ min: -10, max: 10, noNaN: true }), { minLength: 9, maxLength: 9 }), (p) => {
        const mesh = { positions: Float64Array.from(p), triangles: Uint32Array.of(0, 1, 2) };
        fc.pre(faceAreas(mesh)[0] > 1e-9);
        expect(sum(cornerAngles(mesh))).toBeCloseTo(Math.PI, 12);
      }),
    );
    // A sliver whose small angle is 1e-12: acos would return 0 or ~1e-8 here.
    const sliver = { positions: Float64Array.of(0, 0, 0, 1, 0, 0, 0.5, 0.5e-12, 0), triangles: Uint32Array.of(0, 1, 2) };
    expect(cornerAngles(sliver)[0] / 1e-12).toBeCloseTo(1, 9);
  });
});

describe('areas and normals', () => {
  it('measures a grid plane and a disc exactly', () => {
    // Source: the area of a rectangle, and of a regular n-gon of circumradius r, (n/2)·r²·sin(2π/n).
    expect(surfaceArea(gridPlane(7, 5, 3, 2))).toBeCloseTo(6, 13);
    // A regular 16-gon of circumradius 1 has area (16/2)·sin(2π/16).
    expect(surfaceArea(disc(4, 16))).toBeCloseTo(8 * Math.sin(TWO_PI / 16), 13);
  });

  it('approaches the sphere area 4πr² and the torus area 4π²Rr under refinement', () => {
    // Source: the area of a sphere (Archimedes) and of a torus of revolution (Pappus's centroid theorem).
    const errors = [1, 2, 3, 4].map((level) => Math.abs(surfaceArea(icosphere(level, 2)) - 16 * Math.PI));
    for (let i = 1; i < errors.length; i++) expect(errors[i]).toBeLessThan(errors[i - 1] / 3);
    expect(surfaceArea(torus(2, 0.5, 200, 100)) / (4 * Math.PI * Math.PI * 2 * 0.5)).toBeCloseTo(1, 3);
  });

  it('points face normals out of closed shapes and makes them unit length', () => {
    for (const mesh of [icosphere(2), uvSphere(8, 12), torus(2, 0.5, 24, 12)]) {
      const normals = faceNormals(mesh);
      const p = mesh.positions;
      const t = mesh.triangles;
      for (let f = 0; f < t.length / 3; f++) {
        const n = normals.subarray(3 * f, 3 * f + 3);
        expect(Math.hypot(n[0], n[1], n[2])).toBeCloseTo(1, 14);
        // The outward direction: from the sphere's centre, or from the torus's tube centre.
        const c = [0, 1, 2].map((k) => (p[3 * t[3 * f] + k] + p[3 * t[3 * f + 1] + k] + p[3 * t[3 * f + 2] + k]) / 3);
        const ring = Math.hypot(c[0], c[1]);
        const out = mesh.triangles.length === 2 * 24 * 12 * 3 ? [c[0] - (2 * c[0]) / ring, c[1] - (2 * c[1]) / ring, c[2]] : c;
        expect(n[0] * out[0] + n[1] * out[1] + n[2] * out[2]).toBeGreaterThan(0);
      }
    }
  });

  it('gives zero normal and zero area to a degenerate face', () => {
    const mesh = { positions: Float64Array.of(0, 0, 0, 1, 1, 1, 2, 2, 2), triangles: Uint32Array.of(0, 1, 2) };
    expect(Array.from(faceNormals(mesh))).toEqual([0, 0, 0]);
    expect(faceAreas(mesh)[0]).toBe(0);
  });

  it('makes vertex normals of a sphere radial', () => {
    const mesh = icosphere(3, 3);
    const normals = vertexNormals(mesh);
    for (let v = 0; v < mesh.positions.length / 3; v++) {
      const dot = [0, 1, 2].reduce((s, k) => s + (normals[3 * v + k] * mesh.positions[3 * v + k]) / 3, 0);
      expect(dot).toBeGreaterThan(0.999);
    }
  });

  it('weights vertex normals by angle, so splitting a face does not change them', () => {
    // Source: Thürmer and Wüthrich, "Computing Vertex Normals from Polygonal Facets" (1998):
    // angle weighting is independent of how the faces around a vertex are triangulated.
    const corner = Float64Array.of(0, 0, 0, 1, 0, 0, 0, 1, 0, 0, 0, 1);
    const coarse = { positions: corner, triangles: Uint32Array.of(0, 2, 1, 0, 1, 3, 0, 3, 2) };
    const split = {
      positions: Float64Array.of(...corner, 0.5, 0.5, 0),
      triangles: Uint32Array.of(0, 2, 4, 0, 4, 1, 0, 1, 3, 0, 3, 2),
    };
    const a = vertexNormals(coarse).subarray(0, 3);
    const b = vertexNormals(split).subarray(0, 3);
    for (let k = 0; k < 3; k++) expect(b[k]).toBeCloseTo(a[k], 14);
    expect(a[0]).toBeCloseTo(-1 / Math.sqrt(3), 14);
  });

  it('boxes only used, finite vertices', () => {
    const mesh = { positions: Float64Array.of(0, 0, 0, 1, 2, 3, 0, 1, 0, 99, 99, 99), triangles: Uint32Array.of(0, 1, 2) };
    expect(boundingBox(mesh)).toEqual({ min: [0, 0, 0], max: [1, 2, 3] });
    expect(boundingBox({ positions: new Float64Array(0), triangles: new Uint32Array(0) })).toBeNull();
  });
});

describe('Euler characteristic and genus', () => {
  // Source: χ = V − E + F and, for a connected orientable surface with b boundary loops,
  // χ = 2 − 2g − b (classification of surfaces; e.g. Massey, "A Basic Course in Algebraic Topology", ch. 1).
  it('gives each test surface its genus and boundary', () => {
    const expectations: [TriangleMesh, number, number][] = [
      [icosphere(2), 0, 0],
      [torus(2, 0.5, 20, 10), 1, 0],
      [genusTwoSurface({ resolution: 2, smoothingSteps: 0 }), 2, 0],
      [disc(3, 12), 0, 1],
      [gridPlane(4, 4), 0, 1],
    ];
    for (const [mesh, g, b] of expectations) {
      const topology = buildTopology(mesh);
      expect(genus(topology)).toBe(g);
      expect(topology.boundaryLoops.length).toBe(b);
    }
  });

  it('reports each component separately and ignores isolated vertices', () => {
    const both = concatenate(icosphere(1), torus(2, 0.5, 12, 6), disc(2, 8));
    const withIsolated = { ...both, positions: Float64Array.of(...both.positions, 7, 7, 7) };
    const topology = buildTopology(withIsolated);
    expect(eulerCharacteristic(topology)).toBe(2 + 0 + 1);
    expect(componentFacts(topology).map((c) => [c.eulerCharacteristic, c.genus, c.boundaryLoopCount])).toEqual([
      [2, 0, 0],
      [0, 1, 0],
      [1, 0, 1],
    ]);
    expect(genus(topology)).toBe(1);
    expect(sum(angleDefects(withIsolated, topology))).toBeCloseTo(TWO_PI * 3, 9);
  });
});
