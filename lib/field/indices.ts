/**
 * The engine's proof: the index of the built field at every vertex, measured from positions and
 * face directions alone, to be compared with what was asked rather than trusted from the solver.
 */
import type { ConnectionResult, FieldSurface } from './connection';
import { faceNormals } from './mesh/geometry';
import { nextAroundVertex, nextHalfedge } from './mesh/topology';
import { TWO_PI, wrapAngleForOrder } from './mesh/transport';

/**
 * The field's angle in face `f` from the edge running from vertex `a` to vertex `b` (a side of f),
 * counter-clockwise about the face normal: the same in both faces of an edge when the field is
 * carried across it without turning, since unfolding the two faces keeps the angle to their edge.
 */
export function fieldAngleToEdge(positions: Float64Array, normals: Float64Array, faceDirection: Float64Array, f: number, a: number, b: number): number {
  const p = positions;
  const ex = p[3 * b] - p[3 * a], ey = p[3 * b + 1] - p[3 * a + 1], ez = p[3 * b + 2] - p[3 * a + 2];
  const dx = faceDirection[3 * f], dy = faceDirection[3 * f + 1], dz = faceDirection[3 * f + 2];
  const cx = ey * dz - ez * dy, cy = ez * dx - ex * dz, cz = ex * dy - ey * dx;
  return Math.atan2(cx * normals[3 * f] + cy * normals[3 * f + 1] + cz * normals[3 * f + 2], ex * dx + ey * dy + ez * dz);
}

/**
 * Measures the index of a face field at every vertex from the field alone: around the vertex, the
 * field's angle to each outgoing edge, the change from face to face after unfolding across the
 * shared edge (wrapped to the field's symmetry), summed with the angle defect, over 2π.
 *
 * This reads only positions and the face vectors — not the solver's angles or frames — so it
 * checks the solve independently. Guarantees: the result at a measured vertex is a multiple of
 * 1/order up to rounding; `measured` is 1 at interior vertices, and at boundary vertices when
 * `boundaryDefect` is given (a held boundary), 0 elsewhere (those values are 0, never NaN).
 */
export function measureIndices(
  surface: Pick<FieldSurface, 'mesh' | 'topology' | 'cornerAngles' | 'angleDefects'>,
  faceDirection: Float64Array,
  order: number,
  boundaryDefect?: Float64Array,
  /** `faceNormals(surface.mesh)` when the caller has them (the edge proof needs the same). */
  normals: Float64Array = faceNormals(surface.mesh),
): { index: Float64Array; measured: Uint8Array } {
  const { mesh, topology, cornerAngles } = surface;
  const p = mesh.positions;
  const tri = topology.triangles;
  const index = new Float64Array(topology.vertexCount);
  const measured = new Uint8Array(topology.vertexCount);
  // Angle of the field in the face of outgoing halfedge h, measured from h's edge.
  const angleToEdge = (h: number): number => fieldAngleToEdge(p, normals, faceDirection, (h / 3) | 0, tri[h], tri[nextHalfedge(h)]);
  for (let v = 0; v < topology.vertexCount; v++) {
    const start = topology.vertexHalfedge[v];
    if (start === -1) continue;
    const onBoundary = topology.isBoundaryVertex[v] === 1;
    if (onBoundary && !boundaryDefect) continue;
    let turning = 0;
    let h = start;
    let phi = angleToEdge(h);
    for (;;) {
      const next = nextAroundVertex(topology, h);
      if (next === -1) break;
      const nextPhi = angleToEdge(next);
      turning += wrapAngleForOrder(nextPhi - phi + cornerAngles[h], order);
      h = next;
      phi = nextPhi;
      if (h === start) break;
    }
    const defect = onBoundary ? boundaryDefect![v] : surface.angleDefects[v];
    index[v] = (turning + defect) / TWO_PI;
    measured[v] = 1;
  }
  return { index, measured };
}

/** One vertex where the measured index differs from the one asked for. */
export interface IndexMismatch {
  readonly vertex: number;
  readonly requested: number;
  readonly measured: number;
}

/**
 * Compares measured indices with the requested ones at every vertex where the index is defined
 * and was prescribed (zero where nothing was placed). An empty list is the guarantee that the
 * field has its singularities exactly where they were placed and nowhere else.
 */
export function compareIndices(connection: ConnectionResult, measured: { index: Float64Array; measured: Uint8Array }, tolerance = 1e-6): IndexMismatch[] {
  const mismatches: IndexMismatch[] = [];
  for (let v = 0; v < measured.index.length; v++) {
    if (!connection.constrainedVertex[v] || !measured.measured[v]) continue;
    if (Math.abs(measured.index[v] - connection.requestedIndex[v]) > tolerance) {
      mismatches.push({ vertex: v, requested: connection.requestedIndex[v], measured: measured.index[v] });
    }
  }
  return mismatches;
}
