/**
 * The second half of the engine's proof: across every edge the field crosses, the turn of the
 * built field, measured from positions and face vectors alone, is the connection's angle there
 * and smaller than π/n; beside every curve the field is perpendicular to it and turns round each
 * curve vertex as the curve demands. Vertex indices alone cannot see a seam — a line of edges
 * across which the field jumps by a fixed angle leaves every vertex on it with +δ on one side and
 * −δ on the other — so the edges are checked too.
 */
import type { ConnectionResult, FieldSurface } from './connection';
import { fieldAngleToEdge } from './indices';
import { faceNormals } from './mesh/geometry';
import { nextHalfedge } from './mesh/topology';
import { wrapAngleForOrder } from './mesh/transport';

/** What the edge proof checked, for the studio and the command line to show. */
export interface EdgeProof {
  /** Interior edges off every curve: the field's turn across each equals the connection's angle. */
  readonly checkedEdges: number;
  /** Largest |turn| across those edges (radians); below π/n by the proof. */
  readonly largestTurn: number;
  /** Faces beside curves whose direction was checked to be across the curve. */
  readonly checkedCurveSides: number;
  /** Turns round curve vertices (one per side per vertex, and round each open end). */
  readonly checkedCurveTurns: number;
}

/** One thing the proof found wrong, in words, with the vertex nearest to it. */
export interface ProofViolation {
  readonly kind: 'seam' | 'too-fast' | 'curve-side' | 'curve-turn';
  readonly vertex: number;
  /** For seams and too fast turns: the angle by which it is off (radians). */
  readonly angle: number;
}

const TOLERANCE = 1e-6;

/**
 * Checks the built field edge by edge. The turn across an edge is measured as the change of the
 * field's angle to the shared edge from one face to the other: unfolding the two faces into a
 * plane keeps that angle, so this is the turn relative to Levi-Civita transport, read from
 * positions and face vectors only (not the solver's frames or rotations).
 *
 * Guarantees: returns no violation exactly when every uncut interior edge turns the field by the
 * connection's angle (modulo 2π/n) with |angle| < π/n, every face beside a curve points across it
 * (away for a parting, towards for a crest), and every turn round a curve vertex is within π/n of
 * what the curve demands (none between side faces, half a circle round an open end).
 */
export function proveEdges(
  surface: Pick<FieldSurface, 'mesh' | 'topology'>,
  connection: ConnectionResult,
  faceDirection: Float64Array,
  /** `faceNormals(surface.mesh)` when the caller has them (the index measurement needs the same). */
  normals: Float64Array = faceNormals(surface.mesh),
): { proof: EdgeProof; violations: ProofViolation[] } {
  const { mesh, topology } = surface;
  const { order, angles, cutEdge } = connection;
  const p = mesh.positions;
  const tri = topology.triangles;
  const limit = Math.PI / order;
  /** The field's angle in face f to the edge running from vertex a to vertex b. */
  const angleToEdge = (f: number, a: number, b: number) => fieldAngleToEdge(p, normals, faceDirection, f, a, b);
  // The measured turn crossing each uncut interior edge from its canonical halfedge's face to the
  // twin's face (NaN elsewhere), once: the curve turns below sum them again.
  const turn = new Float64Array(topology.edgeCount).fill(NaN);
  for (let e = 0; e < topology.edgeCount; e++) {
    const h = topology.edgeHalfedge[e];
    if (topology.twin[h] === -1 || cutEdge[e]) continue;
    const a = tri[h], b = tri[nextHalfedge(h)];
    turn[e] = wrapAngleForOrder(angleToEdge((topology.twin[h] / 3) | 0, a, b) - angleToEdge((h / 3) | 0, a, b), order);
  }

  const violations: ProofViolation[] = [];
  let checkedEdges = 0;
  let largestTurn = 0;
  for (let e = 0; e < topology.edgeCount; e++) {
    if (Number.isNaN(turn[e])) continue;
    checkedEdges++;
    largestTurn = Math.max(largestTurn, Math.abs(turn[e]));
    const vertex = tri[topology.edgeHalfedge[e]];
    if (Math.abs(angles[e]) >= limit - TOLERANCE) violations.push({ kind: 'too-fast', vertex, angle: angles[e] });
    else if (Math.abs(wrapAngleForOrder(turn[e] - angles[e], order)) > TOLERANCE) violations.push({ kind: 'seam', vertex, angle: wrapAngleForOrder(turn[e] - angles[e], order) });
  }

  for (const side of connection.curveSides) {
    const h = side.halfedge;
    const across = angleToEdge(side.face, tri[h], tri[nextHalfedge(h)]);
    if (Math.abs(wrapAngleForOrder(across - side.sense * (Math.PI / 2), order)) > TOLERANCE) violations.push({ kind: 'curve-side', vertex: tri[h], angle: across });
  }
  for (const link of connection.curveLinks) {
    let turning = 0;
    for (let i = 0; i < link.chain.edges.length; i++) turning += link.chain.signs[i] * turn[link.chain.edges[i]];
    if (Math.abs(turning - link.preferred) > limit + TOLERANCE) violations.push({ kind: 'curve-turn', vertex: link.vertex, angle: turning - link.preferred });
  }
  return {
    proof: { checkedEdges, largestTurn, checkedCurveSides: connection.curveSides.length, checkedCurveTurns: connection.curveLinks.length },
    violations,
  };
}
