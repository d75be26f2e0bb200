/**
 * The brush's arithmetic: which vertices a dab reaches, how strongly, and what it does to the
 * per-vertex values of a painted map or mask. Plain functions on typed arrays, so the editor
 * (in the browser) and tests run the very same code; the editor decodes a map once per stroke,
 * dabs on the decoded values and encodes them once when the stroke ends (place/maps.ts).
 *
 * Distance is measured along the surface (bounded fast marching, as place/geodesic.ts), not in
 * a straight line: a dab on one sheet of an ear, or on a lip, must not reach the sheet or lip an
 * ear's thickness away, which a ball of the brush's radius would.
 */
import type { TriangleMesh } from '../../field';
import { acrossTriangle, type VertexFaces } from './geodesic';
import { MaxHeap } from './heap';

/** How a dab's strength falls off from its centre to its rim. */
export type BrushFalloff = 'smooth' | 'hard';
/** `paint`: toward `target`; `smooth`: toward the mean of the neighbours; `erase`: back to the unpainted value. */
export type BrushMode = 'paint' | 'smooth' | 'erase';

export interface BrushSettings {
  /** Reach of a dab along the surface, in the surface's units (> 0). */
  readonly radius: number;
  /** 0 … 1: the share of the way to the goal a vertex at the centre goes in one dab. */
  readonly strength: number;
  readonly falloff: BrushFalloff;
  readonly mode: BrushMode;
  /** The value painted toward (mode `paint`). */
  readonly target: number;
}

/** The values a map or mask may hold, and the value that means "not painted" (a map's 1×, a mask's 0). */
export interface PaintRange {
  readonly low: number;
  readonly high: number;
  readonly blank: number;
}

/** A map's factors: 0 … 10 like a pin's, 1 where nothing is painted. */
export const MAP_PAINT_RANGE: PaintRange = { low: 0, high: 10, blank: 1 };
/** A mask's share: 0 (outside) … 1 (inside), 0 where nothing is painted. */
export const MASK_PAINT_RANGE: PaintRange = { low: 0, high: 1, blank: 0 };

/** The vertices a dab reaches and their distance from its centre along the surface. */
export interface DabReach {
  readonly vertices: Int32Array;
  readonly distances: Float64Array;
}

/**
 * A dab's weight at distance `d` from its centre: `smooth` is 1 − 3t² + 2t³ with t = d / radius
 * (the reversed smoothstep: 1 at the centre, 0 at the rim with zero slope at both), `hard` is 1
 * everywhere within the radius. Both are 0 beyond the radius.
 *
 * Guarantees: in [0, 1], non-increasing in `d`, exactly 1 at d = 0 and exactly 0 for d ≥ radius
 * (smooth) or d > radius (hard).
 */
export function falloffWeight(falloff: BrushFalloff, d: number, radius: number): number {
  if (!(d <= radius) || !(radius > 0)) return 0;
  if (falloff === 'hard') return 1;
  const t = d / radius;
  return Math.min(1, Math.max(0, 1 - t * t * (3 - 2 * t)));
}

/**
 * The vertices within `radius` of `point` (on face `face`) along the surface, and their distances:
 * the face's corners start at their straight distance from the point (exact within the flat face),
 * and the front is marched outward across triangles, as `geodesicDistances`, stopping at the radius.
 *
 * Guarantees: every vertex returned has a distance ≤ radius; its distance is at least its straight
 * distance from the point and at most the shortest edge path from a corner of `face`; no vertex of
 * another piece of surface is returned; the cost grows with the vertices reached, not the mesh.
 */
export function dabReach(mesh: TriangleMesh, around: VertexFaces, face: number, point: readonly number[], radius: number): DabReach {
  const p = mesh.positions;
  const tri = mesh.triangles;
  const dist = new Map<number, number>();
  const done = new Set<number>();
  const heap = new MaxHeap(64);
  const straight = (v: number) => Math.hypot(p[3 * v] - point[0], p[3 * v + 1] - point[1], p[3 * v + 2] - point[2]);
  for (let k = 0; k < 3; k++) {
    const v = tri[3 * face + k];
    const d = straight(v);
    if (d < (dist.get(v) ?? Infinity)) {
      dist.set(v, d);
      heap.push(v, -d);
    }
  }
  const edge = (u: number, v: number) => Math.hypot(p[3 * v] - p[3 * u], p[3 * v + 1] - p[3 * u + 1], p[3 * v + 2] - p[3 * u + 2]);
  const vertices: number[] = [];
  const distances: number[] = [];
  while (heap.size > 0) {
    const key = -heap.topKey();
    const v = heap.pop();
    if (done.has(v) || key > dist.get(v)!) continue;
    if (key > radius) break;
    done.add(v);
    vertices.push(v);
    distances.push(key);
    for (let i = around.start[v]; i < around.start[v + 1]; i++) {
      const f = around.faces[i];
      for (let k = 0; k < 3; k++) {
        const c = tri[3 * f + k];
        if (done.has(c)) continue;
        let d = key + edge(v, c);
        const other = tri[3 * f] + tri[3 * f + 1] + tri[3 * f + 2] - v - c;
        if (done.has(other)) d = Math.min(d, acrossTriangle(p, v, other, c, key, dist.get(other)!));
        // A front unfolded across triangles can never beat the straight line from the dab's centre.
        d = Math.max(d, straight(c));
        if (d < (dist.get(c) ?? Infinity)) {
          dist.set(c, d);
          heap.push(c, -d);
        }
      }
    }
  }
  return { vertices: Int32Array.from(vertices), distances: Float64Array.from(distances) };
}

/**
 * One dab on `values` (one per vertex, changed in place) at the vertices of `reach`. Each vertex
 * goes the share a = strength · falloff(distance) of the way to its goal — `target` (paint), the
 * unpainted `range.blank` (erase), or the mean of its one-ring neighbours as they were before the
 * dab (smooth) — as value + a · (goal − value), clamped into the range; a = 1 puts the goal itself.
 *
 * Guarantees: every value stays within [range.low, range.high] (when it was before); vertices not in
 * `reach`, and vertices at or beyond the radius with the smooth falloff, are not changed; erase at
 * strength 1 with the hard falloff leaves exactly `range.blank` at every vertex reached; smoothing
 * leaves a constant map exactly constant (the mean is taken as the value plus the mean of the
 * differences, which are all exactly 0 there — a mean of equal values is that value). Returns how
 * many values changed.
 */
export function applyDab(values: Float64Array, reach: DabReach, brush: BrushSettings, range: PaintRange, mesh: TriangleMesh, around: VertexFaces): number {
  const strength = Math.min(1, Math.max(0, brush.strength));
  const goals = brush.mode === 'smooth' ? neighbourMeans(values, reach, mesh, around) : null;
  const goalOf = brush.mode === 'erase' ? range.blank : Math.min(range.high, Math.max(range.low, brush.target));
  let changed = 0;
  for (let i = 0; i < reach.vertices.length; i++) {
    const a = strength * falloffWeight(brush.falloff, reach.distances[i], brush.radius);
    if (a <= 0) continue;
    const v = reach.vertices[i];
    const goal = goals ? goals[i] : goalOf;
    // value + a · (goal − value): a goal equal to the value leaves it exactly as it was.
    const next = a >= 1 ? goal : Math.min(range.high, Math.max(range.low, values[v] + a * (goal - values[v])));
    if (next !== values[v]) {
      values[v] = next;
      changed++;
    }
  }
  return changed;
}

/** The mean of each reached vertex's neighbours (over the faces around it), as value + mean difference, from the values before the dab. */
function neighbourMeans(values: Float64Array, reach: DabReach, mesh: TriangleMesh, around: VertexFaces): Float64Array {
  const tri = mesh.triangles;
  const out = new Float64Array(reach.vertices.length);
  for (let i = 0; i < reach.vertices.length; i++) {
    const v = reach.vertices[i];
    let sum = 0, count = 0;
    for (let j = around.start[v]; j < around.start[v + 1]; j++) {
      const f = around.faces[j];
      for (let k = 0; k < 3; k++) {
        const u = tri[3 * f + k];
        if (u === v) continue;
        // Each neighbour is met on the two faces it shares with v (one on a border): weighed alike.
        sum += values[u] - values[v];
        count++;
      }
    }
    out[i] = count > 0 ? values[v] + sum / count : values[v];
  }
  return out;
}

/**
 * The faces inside a painted mask: a face belongs when the mean of its three corners' values is at
 * least ½ (1 per face inside, 0 outside).
 *
 * Guarantees: a mask of all 0 gives no face, one of all 1 every face; only the corners' values count.
 */
export function facesOfMask(mesh: TriangleMesh, values: Float64Array): Uint8Array {
  const tri = mesh.triangles;
  const out = new Uint8Array(tri.length / 3);
  for (let f = 0; f < out.length; f++) out[f] = values[tri[3 * f]] + values[tri[3 * f + 1]] + values[tri[3 * f + 2]] >= 1.5 ? 1 : 0;
  return out;
}
