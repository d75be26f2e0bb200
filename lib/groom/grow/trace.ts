import type { DirectionField, FieldSurface } from '../../field';
import { nextAroundVertex, nextHalfedge, prevHalfedge } from '../../field';

/**
 * Streamlines of a face-wise constant direction field over the surface. Inside a face the field
 * is one direction, so a streamline is a straight segment there; it is followed to the exact point
 * where it leaves the face, across the edge into the next face, and so on — no small steps. Where
 * the directions of two neighbouring faces both push against their shared edge (the flow
 * converges on it), the streamline runs along that edge to its end vertex and leaves the vertex
 * through the face whose direction points away from it.
 */

/** Why a streamline ended before its full length. */
export const STOP = { length: 0, boundary: 1, singularity: 2, curve: 3, converged: 4 } as const;
export type StopReason = (typeof STOP)[keyof typeof STOP];

export interface Tracer {
  /**
   * Follows the field from (x, y, z) in `face` and writes the points at arc lengths
   * `targets[0..count)` (increasing, > 0) into `outPosition` (3 each) and their faces into
   * `outFace`, starting at index `at`. Returns how many targets were reached; `end` then holds
   * where and why the streamline ended.
   *
   * Guarantees: every written point lies on the surface, in the written face; the first piece
   * leaves the start point exactly along the field's direction in `face` (for an n-direction
   * field, its first direction); never loops forever.
   */
  trace(face: number, x: number, y: number, z: number, targets: Float64Array, count: number, outPosition: Float64Array, outFace: Uint32Array, at: number): number;
  /** The end of the last streamline: point, unit direction of its last piece, face, arc length, reason. */
  readonly end: { x: number; y: number; z: number; dx: number; dy: number; dz: number; face: number; length: number; reason: StopReason };
}

/** Most edge crossings one streamline may make; far beyond any guide's, it only guards against numerical cycling. */
const MAX_STEPS = 20_000;

/**
 * Prepares tracing on a solved field.
 *
 * `singular` marks vertices where an index was placed, `cutEdge` the edges of partings and
 * crests: a streamline stops on reaching either, and on a free boundary.
 */
export function createTracer(surface: FieldSurface, field: DirectionField, singular: Uint8Array, cutEdge: Uint8Array): Tracer {
  const topology = surface.topology;
  const { triangles: tri, twin, edgeOf } = topology;
  const p = surface.mesh.positions;
  const { frameX, frameY, normal } = surface.frames;
  const order = field.order;
  const nF = topology.faceCount;

  const cutVertex = new Uint8Array(topology.vertexCount);
  for (let h = 0; h < tri.length; h++) {
    if (cutEdge[edgeOf[h]]) {
      cutVertex[tri[h]] = 1;
      cutVertex[tri[nextHalfedge(h)]] = 1;
    }
  }
  const nearSingular = new Uint8Array(nF);
  for (let f = 0; f < nF; f++) for (let k = 0; k < 3; k++) if (singular[tri[3 * f + k]]) nearSingular[f] = 1;

  // Length scale for "zero" tests.
  let scale = 0;
  for (let i = 0; i < p.length; i++) scale = Math.max(scale, Math.abs(p[i]));
  const tiny = 1e-12 * (scale || 1);

  // The direction in face f closest to the reference (rx, ry, rz), into dx, dy, dz.
  let dx = 0, dy = 0, dz = 0;
  const directionIn = (f: number, rx: number, ry: number, rz: number) => {
    if (order === 1) {
      dx = field.faceDirection[3 * f]; dy = field.faceDirection[3 * f + 1]; dz = field.faceDirection[3 * f + 2];
      return;
    }
    const ref = Math.atan2(rx * frameY[3 * f] + ry * frameY[3 * f + 1] + rz * frameY[3 * f + 2], rx * frameX[3 * f] + ry * frameX[3 * f + 1] + rz * frameX[3 * f + 2]);
    const step = (2 * Math.PI) / order;
    const a = field.faceAngle[f] + step * Math.round((ref - field.faceAngle[f]) / step);
    const c = Math.cos(a), s = Math.sin(a);
    dx = c * frameX[3 * f] + s * frameY[3 * f];
    dy = c * frameX[3 * f + 1] + s * frameY[3 * f + 1];
    dz = c * frameX[3 * f + 2] + s * frameY[3 * f + 2];
  };

  // Outward in-plane normal of halfedge h (edge × face normal, not normalised), into mx, my, mz.
  let mx = 0, my = 0, mz = 0;
  const outwardOf = (h: number) => {
    const f = (h / 3) | 0;
    const a = 3 * tri[h], b = 3 * tri[nextHalfedge(h)];
    const ex = p[b] - p[a], ey = p[b + 1] - p[a + 1], ez = p[b + 2] - p[a + 2];
    const nx = normal[3 * f], ny = normal[3 * f + 1], nz = normal[3 * f + 2];
    mx = ey * nz - ez * ny; my = ez * nx - ex * nz; mz = ex * ny - ey * nx;
  };

  const end = { x: 0, y: 0, z: 0, dx: 0, dy: 0, dz: 0, face: 0, length: 0, reason: STOP.length as StopReason };

  // The field's first direction in face f, into dx, dy, dz.
  const firstDirection = (f: number) => {
    if (order === 1) {
      dx = field.faceDirection[3 * f]; dy = field.faceDirection[3 * f + 1]; dz = field.faceDirection[3 * f + 2];
      return;
    }
    const c = Math.cos(field.faceAngle[f]), sn = Math.sin(field.faceAngle[f]);
    dx = c * frameX[3 * f] + sn * frameY[3 * f];
    dy = c * frameX[3 * f + 1] + sn * frameY[3 * f + 1];
    dz = c * frameX[3 * f + 2] + sn * frameY[3 * f + 2];
  };

  return {
    end,
    trace(face, x, y, z, targets, count, outPosition, outFace, at) {
      let f = face;
      let s = 0;
      let reached = 0;
      firstDirection(f);
      let ux = dx, uy = dy, uz = dz;
      let inStartRing = nearSingular[f] === 1;
      let reason: StopReason = STOP.converged;
      // The vertex the current piece starts from, or the halfedge it entered by: neither can be its exit.
      let fromVertex = -1;
      let entered = -1;

      // Emits the targets on the straight piece from the current point along u for `length`; true when all are out.
      const advance = (length: number): boolean => {
        while (reached < count && targets[reached] <= s + length) {
          const t = targets[reached] - s;
          const o = 3 * (at + reached);
          outPosition[o] = x + t * ux; outPosition[o + 1] = y + t * uy; outPosition[o + 2] = z + t * uz;
          outFace[at + reached] = f;
          reached++;
        }
        x += length * ux; y += length * uy; z += length * uz;
        s += length;
        return reached === count;
      };

      // Leaves vertex v through the face around it whose direction points into that face's corner
      // at v, the one best aligned with the way the streamline came. False (with the reason) when none does.
      const leaveVertex = (v: number): boolean => {
        if (singular[v]) { reason = STOP.singularity; return false; }
        if (cutVertex[v]) { reason = STOP.curve; return false; }
        x = p[3 * v]; y = p[3 * v + 1]; z = p[3 * v + 2];
        const start = topology.vertexHalfedge[v];
        let h = start;
        let best = -1, bestScore = -Infinity, bx = 0, by = 0, bz = 0;
        do {
          const g = (h / 3) | 0;
          directionIn(g, ux, uy, uz);
          const nx = normal[3 * g], ny = normal[3 * g + 1], nz = normal[3 * g + 2];
          const w1 = 3 * tri[nextHalfedge(h)], w2 = 3 * tri[prevHalfedge(h)];
          const e1x = p[w1] - x, e1y = p[w1 + 1] - y, e1z = p[w1 + 2] - z;
          const e2x = p[w2] - x, e2y = p[w2 + 1] - y, e2z = p[w2 + 2] - z;
          const side1 = (e1y * dz - e1z * dy) * nx + (e1z * dx - e1x * dz) * ny + (e1x * dy - e1y * dx) * nz;
          const side2 = (dy * e2z - dz * e2y) * nx + (dz * e2x - dx * e2z) * ny + (dx * e2y - dy * e2x) * nz;
          const score = dx * ux + dy * uy + dz * uz;
          if (side1 > 0 && side2 > 0 && score > bestScore) {
            best = g; bestScore = score; bx = dx; by = dy; bz = dz;
          }
          h = nextAroundVertex(topology, h);
        } while (h !== -1 && h !== start);
        if (best === -1) { reason = STOP.converged; return false; }
        f = best; ux = bx; uy = by; uz = bz;
        fromVertex = v;
        entered = -1;
        inStartRing = inStartRing && nearSingular[f] === 1;
        return true;
      };

      for (let step = 0; step < MAX_STEPS; step++) {
        // Where the straight piece along u leaves face f.
        let exitH = -1, exitT = Infinity;
        for (let k = 0; k < 3; k++) {
          const h = 3 * f + k;
          if (h === entered || tri[h] === fromVertex || tri[nextHalfedge(h)] === fromVertex) continue;
          outwardOf(h);
          const speed = ux * mx + uy * my + uz * mz;
          if (speed <= tiny * Math.sqrt(mx * mx + my * my + mz * mz)) continue;
          const a = 3 * tri[h];
          const t = Math.max(0, ((p[a] - x) * mx + (p[a + 1] - y) * my + (p[a + 2] - z) * mz) / speed);
          if (t < exitT) { exitT = t; exitH = h; }
        }
        if (exitH === -1) { reason = STOP.converged; break; }
        if (advance(exitT)) { reason = STOP.length; break; }

        const a = 3 * tri[exitH], b = 3 * tri[nextHalfedge(exitH)];
        const ex = p[b] - p[a], ey = p[b + 1] - p[a + 1], ez = p[b + 2] - p[a + 2];
        const edgeSq = ex * ex + ey * ey + ez * ez;
        const lambda = ((x - p[a]) * ex + (y - p[a + 1]) * ey + (z - p[a + 2]) * ez) / edgeSq;
        // Exactly at a corner: continue from the vertex.
        if (lambda <= 1e-9 || lambda >= 1 - 1e-9) {
          if (!leaveVertex(tri[lambda <= 1e-9 ? exitH : nextHalfedge(exitH)])) break;
          continue;
        }
        const t = twin[exitH];
        if (t === -1) { reason = STOP.boundary; break; }
        if (cutEdge[edgeOf[exitH]]) { reason = STOP.curve; break; }
        const g = (t / 3) | 0;
        if (nearSingular[g] && !inStartRing) { reason = STOP.singularity; break; }
        inStartRing = inStartRing && nearSingular[g] === 1;
        directionIn(g, ux, uy, uz);
        outwardOf(t);
        if (dx * mx + dy * my + dz * mz < 0) {
          f = g; ux = dx; uy = dy; uz = dz;
          fromVertex = -1;
          entered = t;
          continue;
        }
        // Both faces push against the edge: run along it, the way their directions lean.
        const length = Math.sqrt(edgeSq);
        const lean = ((ux + dx) * ex + (uy + dy) * ey + (uz + dz) * ez) / length;
        if (Math.abs(lean) < 0.02) { reason = STOP.converged; break; }
        const towardB = lean > 0;
        ux = (towardB ? ex : -ex) / length; uy = (towardB ? ey : -ey) / length; uz = (towardB ? ez : -ez) / length;
        if (advance((towardB ? 1 - lambda : lambda) * length)) { reason = STOP.length; break; }
        if (!leaveVertex(tri[towardB ? nextHalfedge(exitH) : exitH])) break;
      }
      end.x = x; end.y = y; end.z = z;
      end.dx = ux; end.dy = uy; end.dz = uz;
      end.face = f; end.length = s; end.reason = reason;
      return reached;
    },
  };
}
