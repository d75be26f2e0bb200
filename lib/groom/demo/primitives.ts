// The primitive surfaces the demo characters are sculpted from (and that tests and benchmarks reuse
// through tests/fixtures/shapes.ts). Every face is counter-clockwise seen from outside, every surface
// is manifold, and none has a degenerate face.
import type { TriangleMesh } from '../../field';

function mesh(positions: number[] | Float64Array, triangles: number[] | Uint32Array): TriangleMesh {
  return { positions: Float64Array.from(positions), triangles: Uint32Array.from(triangles) };
}

/** Flips faces of a surface around the origin (star-shaped) so their normals point away from it. */
function orientOutward(positions: number[], triangles: number[]): void {
  for (let f = 0; f < triangles.length / 3; f++) {
    const [a, b, c] = triangles.slice(3 * f, 3 * f + 3).map((v) => 3 * v);
    const u = [0, 1, 2].map((k) => positions[b + k] - positions[a + k]);
    const w = [0, 1, 2].map((k) => positions[c + k] - positions[a + k]);
    const n = [u[1] * w[2] - u[2] * w[1], u[2] * w[0] - u[0] * w[2], u[0] * w[1] - u[1] * w[0]];
    if (n[0] * positions[a] + n[1] * positions[a + 1] + n[2] * positions[a + 2] < 0) {
      [triangles[3 * f + 1], triangles[3 * f + 2]] = [triangles[3 * f + 2], triangles[3 * f + 1]];
    }
  }
}

/**
 * A sphere made by splitting each face of an icosahedron into four, `level` times, with the new
 * vertices pushed out onto the sphere. Nearly uniform triangles, no poles.
 *
 * Guarantees: 10·4^level + 2 vertices, 20·4^level faces, χ = 2; every vertex at distance `radius`
 * from the origin (up to rounding).
 */
export function icosphere(level: number, radius = 1): TriangleMesh {
  const phi = (1 + Math.sqrt(5)) / 2;
  const positions: number[] = [];
  for (const [a, b] of [[-1, phi], [1, phi], [-1, -phi], [1, -phi]]) positions.push(a, b, 0);
  for (const [a, b] of [[-1, phi], [1, phi], [-1, -phi], [1, -phi]]) positions.push(0, a, b);
  for (const [a, b] of [[phi, -1], [phi, 1], [-phi, -1], [-phi, 1]]) positions.push(a, 0, b);
  // The twenty faces of the icosahedron on these twelve vertices; orientation is fixed below.
  let triangles = [
    0, 11, 5, 0, 5, 1, 0, 1, 7, 0, 7, 10, 0, 10, 11, 1, 5, 9, 5, 11, 4, 11, 10, 2, 10, 7, 6, 7, 1, 8,
    3, 9, 4, 3, 4, 2, 3, 2, 6, 3, 6, 8, 3, 8, 9, 4, 9, 5, 2, 4, 11, 6, 2, 10, 8, 6, 7, 9, 8, 1,
  ];
  const project = (v: number) => {
    const l = Math.hypot(positions[3 * v], positions[3 * v + 1], positions[3 * v + 2]);
    for (let k = 0; k < 3; k++) positions[3 * v + k] *= radius / l;
  };
  for (let v = 0; v < 12; v++) project(v);
  orientOutward(positions, triangles);

  for (let step = 0; step < level; step++) {
    const midpoints = new Map<number, number>();
    const nV = positions.length / 3;
    const midpoint = (a: number, b: number): number => {
      const key = Math.min(a, b) * nV + Math.max(a, b);
      let m = midpoints.get(key);
      if (m === undefined) {
        m = positions.length / 3;
        for (let k = 0; k < 3; k++) positions.push((positions[3 * a + k] + positions[3 * b + k]) / 2);
        project(m);
        midpoints.set(key, m);
      }
      return m;
    };
    const next: number[] = [];
    for (let f = 0; f < triangles.length / 3; f++) {
      const [a, b, c] = triangles.slice(3 * f, 3 * f + 3);
      const ab = midpoint(a, b);
      const bc = midpoint(b, c);
      const ca = midpoint(c, a);
      next.push(a, ab, ca, b, bc, ab, c, ca, bc, ab, bc, ca);
    }
    triangles = next;
  }
  return mesh(positions, triangles);
}

/**
 * A latitude–longitude sphere around the z axis: a vertex at each pole and `rings − 1` circles of
 * latitude of `segments` vertices each, at polar angles π·i/rings.
 *
 * Guarantees: 2 + (rings − 1)·segments vertices, 2·(rings − 1)·segments faces, χ = 2; each circle
 * of latitude is a closed loop of mesh edges (see `latitudeRingVertices`). Needs rings ≥ 2 and
 * segments ≥ 3.
 */
export function uvSphere(rings: number, segments: number, radius = 1): TriangleMesh {
  const positions: number[] = [0, 0, radius];
  for (let i = 1; i < rings; i++) {
    const theta = (Math.PI * i) / rings;
    for (let j = 0; j < segments; j++) {
      const phi = (2 * Math.PI * j) / segments;
      positions.push(radius * Math.sin(theta) * Math.cos(phi), radius * Math.sin(theta) * Math.sin(phi), radius * Math.cos(theta));
    }
  }
  const south = positions.length / 3;
  positions.push(0, 0, -radius);
  const ring = (i: number, j: number) => 1 + (i - 1) * segments + (j % segments);
  const triangles: number[] = [];
  for (let j = 0; j < segments; j++) {
    triangles.push(0, ring(1, j), ring(1, j + 1));
    for (let i = 1; i + 1 < rings; i++) {
      const a = ring(i, j), b = ring(i, j + 1), c = ring(i + 1, j), d = ring(i + 1, j + 1);
      triangles.push(a, c, d, a, d, b);
    }
    triangles.push(ring(rings - 1, j), south, ring(rings - 1, j + 1));
  }
  return mesh(positions, triangles);
}

/**
 * A torus around the z axis: tube centre at distance `R` from the axis, tube radius `r`, `nu`
 * vertices around the axis and `nv` around the tube.
 *
 * Guarantees: nu·nv vertices, 2·nu·nv faces, χ = 0, genus 1 (needs nu, nv ≥ 3 and R > r > 0).
 */
export function torus(R: number, r: number, nu: number, nv: number): TriangleMesh {
  const positions: number[] = [];
  for (let i = 0; i < nu; i++) {
    const u = (2 * Math.PI * i) / nu;
    for (let j = 0; j < nv; j++) {
      const v = (2 * Math.PI * j) / nv;
      positions.push((R + r * Math.cos(v)) * Math.cos(u), (R + r * Math.cos(v)) * Math.sin(u), r * Math.sin(v));
    }
  }
  const at = (i: number, j: number) => (i % nu) * nv + (j % nv);
  const triangles: number[] = [];
  // (∂/∂u) × (∂/∂v) points out of the tube, so (u, v) order is counter-clockwise from outside.
  for (let i = 0; i < nu; i++) {
    for (let j = 0; j < nv; j++) triangles.push(at(i, j), at(i + 1, j), at(i + 1, j + 1), at(i, j), at(i + 1, j + 1), at(i, j + 1));
  }
  return mesh(positions, triangles);
}
