/**
 * The face-based connection Laplacian of an n-direction field: the quadratic energy whose smallest
 * eigenvector is the smoothest field with free singularities (Knöppel, Crane, Pinkall, Schröder,
 * "Globally Optimal Direction Fields", ACM TOG 32(4), 2013), written as a real symmetric matrix so
 * the engine's sparse Cholesky factors it.
 */
import { symmetricFromTriplets, type SymmetricSparse } from '../linalg/sparse';
import type { TriangleMesh } from '../mesh/mesh';
import { nextHalfedge, prevHalfedge, type Topology } from '../mesh/topology';
import type { FaceFrames } from '../mesh/transport';

/**
 * The energy E(u) = Σ over interior edges w_e |u_j − e^{i n ρ_e} u_i|² on complex face values u_f
 * (the n-th power of the direction in the face frame of mesh/transport.ts), and the lumped mass.
 *
 * Real layout: face f's value is x_f + i y_f at rows 2f and 2f + 1, so a complex entry a + ib is
 * the block [[a, −b], [b, a]] and the Hermitian matrix becomes real symmetric of size 2F.
 */
export interface ConnectionLaplacian {
  /** The stiffness matrix (lower triangle), 2F × 2F, positive semi-definite. */
  readonly stiffness: SymmetricSparse;
  /** Diagonal of the mass matrix, 2F entries: the face's area, twice. */
  readonly mass: Float64Array;
  /** Weight w_e per edge (0 on boundary edges). */
  readonly edgeWeight: Float64Array;
}

/**
 * Edge weight w_e = |e| / |e*|: the two-point flux of a piecewise-constant field across the edge
 * (finite volumes on the dual mesh), so that E approximates the Dirichlet energy ∫|∇u|². The dual
 * edge e* joins the circumcentres of the two faces, |e*| = |e| (cot α + cot β) / 2 with α, β the
 * angles opposite e: it is perpendicular to e, which makes the flux consistent (exact for a
 * linear field where the mesh is Delaunay; Eymard, Gallouët, Herbin, "Finite Volume Methods",
 * Handbook of Numerical Analysis VII, 2000, admissible meshes). Barycentres instead would be
 * inconsistent on skewed triangles: on a disc held tangent the field then spirals. Where the mesh
 * is not Delaunay (cot α + cot β ≤ 0), |e*| is held at a tenth of the barycentres' distance, which
 * keeps every weight positive and finite (the matrix semi-definite) at the cost of consistency on
 * those few edges; a value common in practice, not from a source.
 */
export function edgeWeights(mesh: TriangleMesh, topology: Topology, cornerAngles: Float64Array): Float64Array {
  const p = mesh.positions;
  const tri = topology.triangles;
  const centre = new Float64Array(3 * topology.faceCount);
  for (let f = 0; f < topology.faceCount; f++) {
    for (let k = 0; k < 3; k++) {
      const v = 3 * tri[3 * f + k];
      centre[3 * f] += p[v] / 3; centre[3 * f + 1] += p[v + 1] / 3; centre[3 * f + 2] += p[v + 2] / 3;
    }
  }
  const weight = new Float64Array(topology.edgeCount);
  for (let e = 0; e < topology.edgeCount; e++) {
    const h = topology.edgeHalfedge[e];
    const t = topology.twin[h];
    if (t === -1) continue;
    const a = 3 * tri[h], b = 3 * tri[nextHalfedge(h)];
    const length = Math.hypot(p[b] - p[a], p[b + 1] - p[a + 1], p[b + 2] - p[a + 2]);
    const i = 3 * ((h / 3) | 0), j = 3 * ((t / 3) | 0);
    const between = Math.hypot(centre[j] - centre[i], centre[j + 1] - centre[i + 1], centre[j + 2] - centre[i + 2]);
    // The corner opposite halfedge h is at prev(h) of the same face.
    const cotSum = cot(cornerAngles[prevHalfedge(h)]) + cot(cornerAngles[prevHalfedge(t)]);
    const dual = Math.max((length * cotSum) / 2, 0.1 * between, 1e-12 * length);
    weight[e] = length / dual;
  }
  return weight;
}

function cot(angle: number): number {
  return Math.cos(angle) / Math.max(Math.sin(angle), 1e-12);
}

/**
 * Assembles the connection Laplacian of an order-n field over the given faces.
 *
 * `unknownOf[f]` is the complex unknown number of face f, or −1 when the face is held (its value
 * known); edges between two held faces are left out. Guarantees: the matrix is symmetric positive
 * semi-definite with nullity at most 2 per component of free faces (a parallel field, which only a
 * flat or holonomy-free component has), and exactly E(u) = uᵀ S u over the free faces.
 */
export function assembleLaplacian(
  topology: Topology,
  frames: FaceFrames,
  weight: Float64Array,
  areas: Float64Array,
  order: number,
  unknownOf: Int32Array,
  unknownCount: number,
): ConnectionLaplacian {
  const capacity = 4 * unknownCount + 8 * topology.edgeCount;
  const ti = new Int32Array(capacity), tj = new Int32Array(capacity), tv = new Float64Array(capacity);
  let count = 0;
  const add = (i: number, j: number, v: number) => {
    ti[count] = i;
    tj[count] = j;
    tv[count++] = v;
  };
  const mass = new Float64Array(2 * unknownCount);
  for (let f = 0; f < topology.faceCount; f++) {
    const k = unknownOf[f];
    if (k < 0) continue;
    mass[2 * k] = mass[2 * k + 1] = areas[f];
    // Every unknown gets a diagonal entry, so the pattern is whole even on a face with no neighbour.
    add(2 * k, 2 * k, 0);
    add(2 * k + 1, 2 * k + 1, 0);
  }
  for (let e = 0; e < topology.edgeCount; e++) {
    const w = weight[e];
    if (w === 0) continue;
    const h = topology.edgeHalfedge[e];
    const i = unknownOf[(h / 3) | 0], j = unknownOf[(topology.twin[h] / 3) | 0];
    if (i >= 0) { add(2 * i, 2 * i, w); add(2 * i + 1, 2 * i + 1, w); }
    if (j >= 0) { add(2 * j, 2 * j, w); add(2 * j + 1, 2 * j + 1, w); }
    if (i < 0 || j < 0) continue;
    // H_ji = −w e^{i n ρ}: the block [[−w cos, w sin], [−w sin, −w cos]] at rows of j, columns of i.
    const c = w * Math.cos(order * frames.edgeRotation[e]), s = w * Math.sin(order * frames.edgeRotation[e]);
    add(2 * j, 2 * i, -c);
    add(2 * j, 2 * i + 1, s);
    add(2 * j + 1, 2 * i, -s);
    add(2 * j + 1, 2 * i + 1, -c);
  }
  const stiffness = symmetricFromTriplets(2 * unknownCount, ti.subarray(0, count), tj.subarray(0, count), tv.subarray(0, count));
  return { stiffness, mass, edgeWeight: weight };
}

/**
 * The right-hand side a held face contributes to its free neighbours: minimising E with u_j fixed
 * gives H_ii u_i = −H_ij u_j = w e^{−i n ρ} u_j for each held neighbour j (and the mirror for the
 * other crossing direction). Adds into `rhs` (2 per unknown).
 */
export function addHeldCoupling(
  topology: Topology,
  frames: FaceFrames,
  weight: Float64Array,
  order: number,
  unknownOf: Int32Array,
  held: Float64Array,
  rhs: Float64Array,
): void {
  for (let e = 0; e < topology.edgeCount; e++) {
    const w = weight[e];
    if (w === 0) continue;
    const h = topology.edgeHalfedge[e];
    const fi = (h / 3) | 0, fj = (topology.twin[h] / 3) | 0;
    const i = unknownOf[fi], j = unknownOf[fj];
    if ((i >= 0) === (j >= 0)) continue;
    const c = Math.cos(order * frames.edgeRotation[e]), s = Math.sin(order * frames.edgeRotation[e]);
    if (i >= 0) {
      // u_j seen from face i: e^{−i n ρ} u_j
      const x = held[2 * fj], y = held[2 * fj + 1];
      rhs[2 * i] += w * (c * x + s * y);
      rhs[2 * i + 1] += w * (c * y - s * x);
    } else {
      const x = held[2 * fi], y = held[2 * fi + 1];
      rhs[2 * j] += w * (c * x - s * y);
      rhs[2 * j + 1] += w * (s * x + c * y);
    }
  }
}
