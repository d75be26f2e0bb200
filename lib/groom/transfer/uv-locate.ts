import type { SurfaceIdentity } from './identity';

/**
 * Point location in UV space: which triangle of the surface holds a (u, v), on a uniform grid
 * over the triangles' UV bounding boxes (about one triangle per cell), so a look-up tests only
 * the few triangles of one cell.
 */
export interface UvLocator {
  /**
   * The triangle whose UV triangle holds (u, v), with barycentric weights over its corners; when
   * none holds it exactly, the nearest within `slack` (UV units) with its weights clamped onto it.
   * Null when no triangle is that near.
   */
  locate(u: number, v: number, slack?: number): { face: number; weights: [number, number, number] } | null;
  /** Triangles whose UV centroid lies inside another triangle's UV triangle: overlapping UVs (0 for a clean layout). */
  readonly overlappingFaces: number;
  /** Triangles whose UV triangle has no area (all three corners on a line or a point). */
  readonly flatFaces: number;
}

/** Inside test tolerance in barycentric weight, so points on shared UV edges are found. */
const EDGE_SLACK = 1e-9;

/**
 * Builds the UV index of a surface with UVs.
 *
 * Guarantees: `locate` finds a triangle whose UV triangle contains the point whenever one exists
 * (several overlapping: the lowest-numbered); the overlap count tests each triangle's UV centroid
 * against every other triangle sharing its cell, so two islands laid over each other are counted.
 */
export function buildUvLocator(identity: SurfaceIdentity, faceCount: number): UvLocator {
  const uv = identity.cornerUv;
  if (!uv) throw new Error('buildUvLocator needs a surface with UVs');
  const corner = new Float64Array(6 * faceCount);
  let lo0 = Infinity, lo1 = Infinity, hi0 = -Infinity, hi1 = -Infinity;
  for (let f = 0; f < faceCount; f++) {
    const start = identity.polygonStart[identity.polygonOfFace[f]];
    for (let k = 0; k < 3; k++) {
      const c = start + identity.faceCorner[3 * f + k];
      corner[6 * f + 2 * k] = uv[2 * c];
      corner[6 * f + 2 * k + 1] = uv[2 * c + 1];
      lo0 = Math.min(lo0, uv[2 * c]); hi0 = Math.max(hi0, uv[2 * c]);
      lo1 = Math.min(lo1, uv[2 * c + 1]); hi1 = Math.max(hi1, uv[2 * c + 1]);
    }
  }
  const width = Math.max(hi0 - lo0, 1e-12), height = Math.max(hi1 - lo1, 1e-12);
  const side = Math.max(1, Math.min(2048, Math.ceil(Math.sqrt(faceCount))));
  const cellOf = (x: number, lo: number, size: number) => Math.min(side - 1, Math.max(0, Math.floor(((x - lo) / size) * side)));
  const ranges = new Int32Array(4 * faceCount);
  const count = new Int32Array(side * side + 1);
  for (let f = 0; f < faceCount; f++) {
    const us = [corner[6 * f], corner[6 * f + 2], corner[6 * f + 4]], vs = [corner[6 * f + 1], corner[6 * f + 3], corner[6 * f + 5]];
    const r = [cellOf(Math.min(...us), lo0, width), cellOf(Math.max(...us), lo0, width), cellOf(Math.min(...vs), lo1, height), cellOf(Math.max(...vs), lo1, height)];
    ranges.set(r, 4 * f);
    for (let i = r[0]; i <= r[1]; i++) for (let j = r[2]; j <= r[3]; j++) count[i + side * j + 1]++;
  }
  for (let c = 0; c < side * side; c++) count[c + 1] += count[c];
  const members = new Int32Array(count[side * side]);
  const fill = count.slice(0, side * side);
  for (let f = 0; f < faceCount; f++) {
    const r = ranges.subarray(4 * f, 4 * f + 4);
    for (let i = r[0]; i <= r[1]; i++) for (let j = r[2]; j <= r[3]; j++) members[fill[i + side * j]++] = f;
  }

  const weights = new Float64Array(3);
  /** Barycentric weights of (u, v) in face f's UV triangle; false for a flat UV triangle. */
  const weigh = (f: number, u: number, v: number): boolean => {
    const ax = corner[6 * f], ay = corner[6 * f + 1];
    const bx = corner[6 * f + 2] - ax, by = corner[6 * f + 3] - ay;
    const cx = corner[6 * f + 4] - ax, cy = corner[6 * f + 5] - ay;
    const det = bx * cy - by * cx;
    if (Math.abs(det) < 1e-300) return false;
    const px = u - ax, py = v - ay;
    weights[1] = (px * cy - py * cx) / det;
    weights[2] = (bx * py - by * px) / det;
    weights[0] = 1 - weights[1] - weights[2];
    return true;
  };
  const isFlat = (f: number) => !weigh(f, corner[6 * f], corner[6 * f + 1]);

  let flatFaces = 0;
  for (let f = 0; f < faceCount; f++) if (isFlat(f)) flatFaces++;
  let overlappingFaces = 0;
  for (let f = 0; f < faceCount; f++) {
    const u = (corner[6 * f] + corner[6 * f + 2] + corner[6 * f + 4]) / 3, v = (corner[6 * f + 1] + corner[6 * f + 3] + corner[6 * f + 5]) / 3;
    const c = cellOf(u, lo0, width) + side * cellOf(v, lo1, height);
    for (let m = count[c]; m < count[c + 1]; m++) {
      const g = members[m];
      if (g !== f && weigh(g, u, v) && Math.min(weights[0], weights[1], weights[2]) > 1e-6) {
        overlappingFaces++;
        break;
      }
    }
  }

  return {
    overlappingFaces,
    flatFaces,
    locate(u, v, slack = 0) {
      const ci = Math.floor(((u - lo0) / width) * side), cj = Math.floor(((v - lo1) / height) * side);
      const reach = slack > 0 ? Math.ceil((slack / Math.min(width, height)) * side) : 0;
      let best = -1, bestOutside = Infinity;
      const bestWeights: [number, number, number] = [0, 0, 0];
      for (let i = Math.max(0, ci - reach); i <= Math.min(side - 1, ci + reach); i++) {
        for (let j = Math.max(0, cj - reach); j <= Math.min(side - 1, cj + reach); j++) {
          const c = i + side * j;
          for (let m = count[c]; m < count[c + 1]; m++) {
            const f = members[m];
            if (!weigh(f, u, v)) continue;
            const outside = -Math.min(weights[0], weights[1], weights[2]);
            if (outside < bestOutside - EDGE_SLACK || (Math.abs(outside - bestOutside) <= EDGE_SLACK && f < best)) {
              best = f;
              bestOutside = outside;
              bestWeights[0] = weights[0]; bestWeights[1] = weights[1]; bestWeights[2] = weights[2];
            }
          }
        }
      }
      if (best < 0) return null;
      if (bestOutside > EDGE_SLACK) {
        // Outside every triangle: accept the nearest only within the slack, measured in UV units
        // through the weight it misses by times the triangle's UV size.
        const f = best;
        const size = Math.max(Math.hypot(corner[6 * f + 2] - corner[6 * f], corner[6 * f + 3] - corner[6 * f + 1]), Math.hypot(corner[6 * f + 4] - corner[6 * f], corner[6 * f + 5] - corner[6 * f + 1]));
        if (bestOutside * size > slack) return null;
        for (let k = 0; k < 3; k++) bestWeights[k] = Math.max(0, bestWeights[k]);
        const sum = bestWeights[0] + bestWeights[1] + bestWeights[2];
        for (let k = 0; k < 3; k++) bestWeights[k] /= sum;
      }
      return { face: best, weights: bestWeights };
    },
  };
}
