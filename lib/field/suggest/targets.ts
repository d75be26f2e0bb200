/**
 * What a suggested layout may be pulled toward, as complex face values q_f (the n-th power of a
 * direction in the face frame, with a magnitude saying how much it counts there): a held boundary,
 * a world direction such as "down", or the directions of least bending.
 */
import { FieldError } from '../mesh/errors';
import type { TriangleMesh, Vec3 } from '../mesh/mesh';
import { nextHalfedge, prevHalfedge, type Topology } from '../mesh/topology';
import { angleInFace, type FaceFrames } from '../mesh/transport';

/**
 * The direction each face touching a held boundary must take: along the boundary (surface on the
 * left) for `tangent`, a quarter turn into the surface for `normal`. A face with two boundary
 * sides (a corner vertex c with a single face) follows the side that enters c: the connection's
 * held rings carry c's turning to the next vertex along the loop (connection/ring-solver.ts), and
 * with this choice the field's measured turning round that vertex and round the vertex before c
 * (whose first face this is) comes to whole symmetry steps (the chord across the corner does not:
 * on a square held tangent it gave wrong sums). Returns the angle per held face.
 */
export function heldBoundaryAngles(topology: Topology, frames: FaceFrames, mode: 'tangent' | 'normal'): Map<number, number> {
  const quarter = mode === 'normal' ? Math.PI / 2 : 0;
  const tri = topology.triangles;
  const held = new Map<number, number>();
  for (let f = 0; f < topology.faceCount; f++) {
    const open: number[] = [];
    for (let k = 0; k < 3; k++) if (topology.twin[3 * f + k] === -1) open.push(3 * f + k);
    if (open.length === 0) continue;
    let side = open[0];
    if (open.length === 2 && tri[nextHalfedge(open[1])] === tri[open[0]]) side = open[1];
    held.set(f, frames.halfedgeAngle[side] + quarter);
  }
  return held;
}

/**
 * q_f = |d_f| e^{i n θ_f}, with d_f the projection of `direction` onto face f and θ_f its angle:
 * a face the direction lies across pulls fully, a face it stands straight out of not at all.
 * Throws FieldError `bad-direction` for a zero or non-finite direction.
 */
export function directionTarget(topology: Topology, frames: FaceFrames, direction: Vec3 | readonly number[], order: number): Float64Array {
  const [x, y, z] = direction;
  const length = Math.hypot(x, y, z);
  if (!Number.isFinite(length) || length === 0) throw new FieldError('bad-direction', 'The direction to align the suggestion to must be a non-zero vector of finite numbers.');
  const q = new Float64Array(2 * topology.faceCount);
  const N = frames.normal;
  for (let f = 0; f < topology.faceCount; f++) {
    const along = (x * N[3 * f] + y * N[3 * f + 1] + z * N[3 * f + 2]) / length;
    const inPlane = Math.sqrt(Math.max(0, 1 - along * along));
    const theta = angleInFace(frames, f, x, y, z);
    q[2 * f] = inPlane * Math.cos(order * theta);
    q[2 * f + 1] = inPlane * Math.sin(order * theta);
  }
  return q;
}

/**
 * The directions of least bending, from the edge-based curvature tensor Σ_e β_e |e| ê êᵀ
 * (Cohen-Steiner and Morvan, "Restricted Delaunay triangulations and normal cycle", SoCG 2003),
 * summed per face over its three sides with β_e the signed dihedral angle (positive where convex).
 * Its major axis runs along the creases — along a limb, along a rounded edge — which is the
 * principal direction of least curvature; for a cross field the other principal direction is the
 * same cross. Divided by the face's area it is a curvature. As a line field this is e^{2ia} per side; an n-direction field with even n takes
 * its (n/2)-th power, magnitude kept (it says how anisotropic the bending is there), normalised
 * so the area-weighted mean of |q|² is 1.
 *
 * Throws FieldError `curvature-needs-even-order` for odd n: principal directions are lines with no
 * sign, which a field of odd order cannot follow.
 */
export function curvatureTarget(mesh: TriangleMesh, topology: Topology, frames: FaceFrames, areas: Float64Array, order: number): Float64Array {
  if (order % 2 !== 0) {
    throw new FieldError('curvature-needs-even-order', `Principal curvature directions are lines without a sign; a field of order ${order} cannot follow them. Use an even order (2 for lines, 4 for crosses).`);
  }
  const p = mesh.positions;
  const tri = topology.triangles;
  const N = frames.normal;
  const line = new Float64Array(2 * topology.faceCount);
  for (let h = 0; h < tri.length; h++) {
    const t = topology.twin[h];
    if (t === -1) continue;
    const f = (h / 3) | 0, g = (t / 3) | 0;
    const a = 3 * tri[h], b = 3 * tri[nextHalfedge(h)];
    const length = Math.hypot(p[b] - p[a], p[b + 1] - p[a + 1], p[b + 2] - p[a + 2]);
    const cx = N[3 * f + 1] * N[3 * g + 2] - N[3 * f + 2] * N[3 * g + 1];
    const cy = N[3 * f + 2] * N[3 * g] - N[3 * f] * N[3 * g + 2];
    const cz = N[3 * f] * N[3 * g + 1] - N[3 * f + 1] * N[3 * g];
    const unsigned = Math.atan2(Math.hypot(cx, cy, cz), N[3 * f] * N[3 * g] + N[3 * f + 1] * N[3 * g + 1] + N[3 * f + 2] * N[3 * g + 2]);
    // Convex where the far corner of the neighbour lies below this face's plane.
    const o = 3 * tri[prevHalfedge(t)];
    const below = (p[o] - p[a]) * N[3 * f] + (p[o + 1] - p[a + 1]) * N[3 * f + 1] + (p[o + 2] - p[a + 2]) * N[3 * f + 2] < 0;
    // Half of the edge's share to each of its two faces; this halfedge is face f's side.
    const amount = 0.5 * (below ? unsigned : -unsigned) * length;
    const angle = 2 * frames.halfedgeAngle[h];
    line[2 * f] += amount * Math.cos(angle);
    line[2 * f + 1] += amount * Math.sin(angle);
  }
  const q = new Float64Array(2 * topology.faceCount);
  const power = order / 2;
  let weighted = 0, area = 0;
  for (let f = 0; f < topology.faceCount; f++) {
    // Per unit area, as the tensor is a density: a curvature, whatever the face's size.
    const r = Math.hypot(line[2 * f], line[2 * f + 1]) / Math.max(areas[f], 1e-300);
    if (r === 0) continue;
    const phase = power * Math.atan2(line[2 * f + 1], line[2 * f]);
    q[2 * f] = r * Math.cos(phase);
    q[2 * f + 1] = r * Math.sin(phase);
    weighted += areas[f] * r * r;
    area += areas[f];
  }
  const scale = weighted > 0 ? Math.sqrt(area / weighted) : 0;
  for (let i = 0; i < q.length; i++) q[i] *= scale;
  return q;
}
