/*
 * Test surfaces for tests, benchmarks and demo data. Every face is counter-clockwise seen from
 * outside (for the open surfaces: from +z), every surface is manifold, and none has a degenerate
 * face.
 */
import type { TriangleMesh } from './mesh/mesh';

function mesh(positions: number[] | Float64Array, triangles: number[] | Uint32Array): TriangleMesh {
  return { positions: Float64Array.from(positions), triangles: Uint32Array.from(triangles) };
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
 * The vertices of circle of latitude `ring` (1 … rings − 1, counted from the north pole) of
 * `uvSphere(rings, segments, radius)`, in order of increasing longitude, i.e. counter-clockwise
 * seen from +z; consecutive vertices (and the last with the first) are joined by mesh edges.
 *
 * Guarantees: the polar angle is π·ring/rings; for a smooth sphere the cap north of the circle
 * holds total Gaussian curvature 2π(1 − cos polarAngle), which is what a vector carried once
 * around the circle turns by.
 */
export function latitudeRingVertices(rings: number, segments: number, ring: number): { vertices: Uint32Array; polarAngle: number } {
  if (!(ring >= 1 && ring < rings)) throw new RangeError(`Ring ${ring} does not exist; rings are numbered 1 to ${rings - 1}.`);
  const vertices = new Uint32Array(segments);
  for (let j = 0; j < segments; j++) vertices[j] = 1 + (ring - 1) * segments + j;
  return { vertices, polarAngle: (Math.PI * ring) / rings };
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

/**
 * A flat round disc in the plane z = 0 around the origin: a centre vertex and `rings` circles of
 * `segments` vertices each. Faces are counter-clockwise seen from +z.
 *
 * Guarantees: 1 + rings·segments vertices, (2·rings − 1)·segments faces, χ = 1, one boundary loop
 * (the outer circle, of radius `radius`). Needs rings ≥ 1, segments ≥ 3.
 */
export function disc(rings: number, segments: number, radius = 1): TriangleMesh {
  const positions: number[] = [0, 0, 0];
  for (let k = 1; k <= rings; k++) {
    for (let j = 0; j < segments; j++) {
      const phi = (2 * Math.PI * j) / segments;
      positions.push(((radius * k) / rings) * Math.cos(phi), ((radius * k) / rings) * Math.sin(phi), 0);
    }
  }
  const ring = (k: number, j: number) => 1 + (k - 1) * segments + (j % segments);
  const triangles: number[] = [];
  for (let j = 0; j < segments; j++) {
    triangles.push(0, ring(1, j), ring(1, j + 1));
    for (let k = 1; k < rings; k++) {
      const a = ring(k, j), a1 = ring(k, j + 1), b = ring(k + 1, j), b1 = ring(k + 1, j + 1);
      triangles.push(a, b, b1, a, b1, a1);
    }
  }
  return mesh(positions, triangles);
}

/**
 * A rectangle `w` × `h` in the plane z = 0, centred on the origin, split into nx × ny squares of
 * two triangles each. Vertex (i, j) — i along x, j along y — has index j·(nx + 1) + i. Faces are
 * counter-clockwise seen from +z.
 *
 * Guarantees: (nx + 1)(ny + 1) vertices, 2·nx·ny faces, χ = 1, one boundary loop.
 */
export function gridPlane(nx: number, ny: number, w = 1, h = 1): TriangleMesh {
  const positions: number[] = [];
  for (let j = 0; j <= ny; j++) {
    for (let i = 0; i <= nx; i++) positions.push(-w / 2 + (w * i) / nx, -h / 2 + (h * j) / ny, 0);
  }
  const at = (i: number, j: number) => j * (nx + 1) + i;
  const triangles: number[] = [];
  for (let j = 0; j < ny; j++) {
    for (let i = 0; i < nx; i++) triangles.push(at(i, j), at(i + 1, j), at(i + 1, j + 1), at(i, j), at(i + 1, j + 1), at(i, j + 1));
  }
  return mesh(positions, triangles);
}

export interface GenusTwoOptions {
  /** Subdivisions of each unit of the slab along every axis (≥ 1). Default 4. */
  readonly resolution?: number;
  /** Rounds of Taubin smoothing, which rounds the edges without shrinking the shape. Default 8. */
  readonly smoothingSteps?: number;
}

/**
 * A closed surface of genus 2: the boundary of a 5 × 3 × 1 slab (centred on the origin) with two
 * square 1 × 1 holes through it, built from cubes of side 1/resolution so it is manifold by
 * construction (no two cubes of the solid meet only along an edge or at a corner), then smoothed.
 *
 * Guarantees: closed, manifold, consistently oriented with normals pointing out of the slab,
 * one component, χ = −2; smoothing moves vertices only, so the connectivity is that of the
 * unsmoothed cube faces (each square split into two triangles).
 */
export function genusTwoSurface(options: GenusTwoOptions = {}): TriangleMesh {
  const n = Math.max(1, Math.round(options.resolution ?? 4));
  const steps = options.smoothingSteps ?? 8;
  const size = [5 * n, 3 * n, n];
  const inHole = (i: number, j: number) => j >= n && j < 2 * n && ((i >= n && i < 2 * n) || (i >= 3 * n && i < 4 * n));
  const solid = (c: number[]) => c.every((x, k) => x >= 0 && x < size[k]) && !inHole(c[0], c[1]);

  const vertexOf = new Map<number, number>();
  const positions: number[] = [];
  const vertex = (p: number[]): number => {
    const key = (p[0] * (size[1] + 1) + p[1]) * (size[2] + 1) + p[2];
    let v = vertexOf.get(key);
    if (v === undefined) {
      v = positions.length / 3;
      vertexOf.set(key, v);
      positions.push(p[0] / n - 2.5, p[1] / n - 1.5, p[2] / n - 0.5);
    }
    return v;
  };
  const triangles: number[] = [];
  for (let i = 0; i < size[0]; i++) {
    for (let j = 0; j < size[1]; j++) {
      for (let k = 0; k < size[2]; k++) {
        const cell = [i, j, k];
        if (!solid(cell)) continue;
        for (let d = 0; d < 3; d++) {
          for (const s of [-1, 1]) {
            const neighbour = [...cell];
            neighbour[d] += s;
            if (solid(neighbour)) continue;
            // The square between the cell and its empty neighbour, in axes e1, e2 with e1 × e2 = d,
            // listed counter-clockwise seen from the +d side and reversed for the −d side.
            const e1 = (d + 1) % 3;
            const e2 = (d + 2) % 3;
            const corner = (a: number, b: number) => {
              const p = [...cell];
              if (s > 0) p[d] += 1;
              p[e1] += a;
              p[e2] += b;
              return vertex(p);
            };
            const square = [corner(0, 0), corner(1, 0), corner(1, 1), corner(0, 1)];
            if (s < 0) square.reverse();
            triangles.push(square[0], square[1], square[2], square[0], square[2], square[3]);
          }
        }
      }
    }
  }
  const result = mesh(positions, triangles);
  taubinSmooth(result.positions as Float64Array, result.triangles, steps);
  return result;
}

/**
 * Taubin's λ|μ smoothing with the uniform (umbrella) Laplacian: a shrinking step λ = 0.5 followed
 * by an inflating step μ = −0.53, which together damp sharp features without shrinking the shape.
 */
function taubinSmooth(p: Float64Array, triangles: Uint32Array, steps: number): void {
  const nV = p.length / 3;
  const neighbours: Set<number>[] = Array.from({ length: nV }, () => new Set());
  for (let f = 0; f < triangles.length / 3; f++) {
    for (let k = 0; k < 3; k++) {
      const a = triangles[3 * f + k];
      const b = triangles[3 * f + ((k + 1) % 3)];
      neighbours[a].add(b);
      neighbours[b].add(a);
    }
  }
  const delta = new Float64Array(p.length);
  const relax = (factor: number) => {
    for (let v = 0; v < nV; v++) {
      for (let k = 0; k < 3; k++) {
        let mean = 0;
        for (const w of neighbours[v]) mean += p[3 * w + k];
        delta[3 * v + k] = mean / neighbours[v].size - p[3 * v + k];
      }
    }
    for (let i = 0; i < p.length; i++) p[i] += factor * delta[i];
  };
  for (let step = 0; step < steps; step++) {
    relax(0.5);
    relax(-0.53);
  }
}
