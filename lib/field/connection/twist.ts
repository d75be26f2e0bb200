/**
 * Where a singularity's twist is fixed: one face of its vertex's ring and the angle the twist is
 * measured from there. Without a direction it is the vertex's first face, measured from the
 * direction out of the vertex to that face's centroid (what every twist was before). With a
 * direction (`PointSingularity.twistDirection`) the face and the angle follow that direction alone
 * — not the mesh's face numbering — so the mirror image of a twisted singularity, given the mirror
 * image of the direction, fixes the mirror image of the face at the mirrored angle.
 */
import { FieldError } from '../mesh/errors';
import { faceOfHalfedge, nextAroundVertex, prevHalfedge, type Topology } from '../mesh/topology';
import { TWO_PI, angleInFace, type FaceFrames } from '../mesh/transport';

/** Within (−π, π]. */
function wrapped(angle: number): number {
  const a = angle - TWO_PI * Math.floor((angle + Math.PI) / TWO_PI);
  return a === -Math.PI ? Math.PI : a;
}

/** The halfedges leaving vertex v, in ring order (an open fan stops at the boundary). */
function outgoing(topology: Topology, v: number): number[] {
  const first = topology.vertexHalfedge[v];
  const ring: number[] = [];
  for (let h = first; h !== -1; ) {
    ring.push(h);
    h = nextAroundVertex(topology, h);
    if (h === first) break;
  }
  return ring;
}

/** Margins (radians) this close are one: the direction lies along the edge between the two faces. */
const TIE = 1e-9;

/** A direction this close to the surface's normal at the vertex (sine of the angle off it) says nothing about a way along the surface. */
const LEAST_TANGENT_SHARE = 0.01;

/**
 * The face a twist is fixed in and the angle (in that face's frame) it is measured from.
 *
 * Guarantees: the face is one of vertex v's ring. Without `direction`: v's first face and the
 * angle of the direction from v to its centroid, as before. With `direction`: the ring face whose
 * corner at v holds the direction laid into the face's plane with the widest margin (where the
 * direction lies along an edge between two faces, the one of wider corner at v), and the angle of that
 * laid-in direction — both functions of the geometry and the direction only, so mirroring the
 * surface and the direction mirrors the face and reverses the angle's sense. A direction along the
 * surface's normal at v, or not finite, is a FieldError `bad-twist-direction`.
 */
export function twistReference(
  frames: FaceFrames,
  topology: Topology,
  positions: Float64Array,
  v: number,
  direction: readonly [number, number, number] | undefined,
  what: string,
): { face: number; angle: number } {
  const tri = topology.triangles;
  if (direction === undefined) {
    const f = faceOfHalfedge(topology.vertexHalfedge[v]);
    let cx = 0, cy = 0, cz = 0;
    for (let k = 0; k < 3; k++) {
      const w = 3 * tri[3 * f + k];
      cx += positions[w] / 3; cy += positions[w + 1] / 3; cz += positions[w + 2] / 3;
    }
    const o = 3 * v;
    return { face: f, angle: angleInFace(frames, f, cx - positions[o], cy - positions[o + 1], cz - positions[o + 2]) };
  }
  const [dx, dy, dz] = direction;
  const length = Math.sqrt(dx * dx + dy * dy + dz * dz);
  if (!Number.isFinite(length) || length === 0) throw new FieldError('bad-twist-direction', `${what} has a twist direction that is zero or not finite.`);
  const ring = outgoing(topology, v);
  const n = frames.normal;
  let nx = 0, ny = 0, nz = 0;
  for (const h of ring) {
    const f = faceOfHalfedge(h);
    nx += n[3 * f]; ny += n[3 * f + 1]; nz += n[3 * f + 2];
  }
  const nl = Math.sqrt(nx * nx + ny * ny + nz * nz) || 1;
  const along = (dx * nx + dy * ny + dz * nz) / (nl * length);
  if (Math.sqrt(Math.max(0, 1 - along * along)) < LEAST_TANGENT_SHARE) {
    throw new FieldError('bad-twist-direction', `${what} has a twist direction along the surface's normal at vertex ${v}; give a direction along the surface there.`);
  }
  let best = { face: -1, angle: 0, margin: -Infinity, corner: 0 };
  for (const h of ring) {
    const f = faceOfHalfedge(h);
    const angle = angleInFace(frames, f, dx, dy, dz);
    // The corner at v runs counterclockwise from the edge to the next vertex to the edge to the previous one.
    const corner = wrapped(frames.halfedgeAngle[prevHalfedge(h)] + Math.PI - frames.halfedgeAngle[h]);
    const from = wrapped(angle - frames.halfedgeAngle[h]);
    const margin = Math.min(from, corner - from);
    // A direction along an edge is in both faces beside it at once; the wider corner takes it, so
    // the choice is one of shapes, which a mirror keeps, and not of the ring's order, which it reverses.
    const tied = Math.abs(margin - best.margin) <= TIE * Math.max(1, Math.abs(margin));
    if (tied ? corner > best.corner : margin > best.margin) best = { face: f, angle, margin, corner };
  }
  return { face: best.face, angle: best.angle };
}
