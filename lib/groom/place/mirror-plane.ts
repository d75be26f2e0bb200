import { SKIN_QUERY_SIZE } from './skin';
import { mirrorPoint, planeDistance, type MirrorPlane } from '../spec/symmetry';
import type { GroomSurface } from './surface';

/** What `detectMirrorPlane` found. */
export interface DetectedMirror {
  readonly plane: MirrorPlane;
  /** The largest distance from a mirrored vertex to the surface, over the bounding-box diagonal. */
  readonly mismatch: number;
  /** mismatch ≤ SYMMETRIC_MISMATCH. */
  readonly symmetric: boolean;
}

/**
 * Past this mismatch (1 % of the bounding-box diagonal, our choice: about a millimetre on a 10 cm
 * head, below what a groomer sees) a surface is called not symmetric. The plane is still returned.
 */
export const SYMMETRIC_MISMATCH = 0.01;

/** Refinement rounds after the best candidate (each one closest-point pass). */
const REFINE_ROUNDS = 8;

/**
 * How far the surface is from its own mirror image: the largest distance from a mirrored vertex
 * to the surface, over the bounding-box diagonal (a mirrored vertex farther than a diagonal off
 * counts as 1).
 */
export function mirrorMismatch(surface: GroomSurface, plane: MirrorPlane): number {
  const p = surface.mesh.positions;
  const out = new Float64Array(SKIN_QUERY_SIZE);
  const limit = surface.diagonal;
  let worst = 0;
  for (let v = 0; v < p.length / 3; v++) {
    if (surface.field.topology.vertexHalfedge[v] === -1) continue;
    const m = mirrorPoint(plane, [p[3 * v], p[3 * v + 1], p[3 * v + 2]]);
    const d = surface.skin.closest(m[0], m[1], m[2], limit, out) ? Math.abs(out[6]) : limit;
    if (d > worst) worst = d;
  }
  return limit > 0 ? worst / limit : 0;
}

/** Area-weighted centroid (of the faces) and second moments (of the faces' centroids). */
function moments(surface: GroomSurface): { centre: number[]; covariance: number[][] } {
  const p = surface.mesh.positions, tri = surface.mesh.triangles, area = surface.faceArea;
  const centre = [0, 0, 0];
  let total = 0;
  const centroid = (f: number, k: number) => (p[3 * tri[3 * f] + k] + p[3 * tri[3 * f + 1] + k] + p[3 * tri[3 * f + 2] + k]) / 3;
  for (let f = 0; f < tri.length / 3; f++) {
    total += area[f];
    for (let k = 0; k < 3; k++) centre[k] += area[f] * centroid(f, k);
  }
  for (let k = 0; k < 3; k++) centre[k] /= total || 1;
  const covariance = [[0, 0, 0], [0, 0, 0], [0, 0, 0]];
  for (let f = 0; f < tri.length / 3; f++) {
    const d = [0, 1, 2].map((k) => centroid(f, k) - centre[k]);
    for (let i = 0; i < 3; i++) for (let j = 0; j < 3; j++) covariance[i][j] += area[f] * d[i] * d[j];
  }
  return { centre, covariance };
}

/** Eigenvectors of a symmetric 3×3 matrix by Jacobi rotations (Golub and Van Loan §8.5). */
function eigenvectors(a: number[][]): number[][] {
  const m = a.map((row) => row.slice());
  const v = [[1, 0, 0], [0, 1, 0], [0, 0, 1]];
  for (let sweep = 0; sweep < 50; sweep++) {
    const off = m[0][1] ** 2 + m[0][2] ** 2 + m[1][2] ** 2;
    if (off < 1e-30 * (m[0][0] ** 2 + m[1][1] ** 2 + m[2][2] ** 2 + 1e-300)) break;
    for (const [p, q] of [[0, 1], [0, 2], [1, 2]]) {
      if (m[p][q] === 0) continue;
      const theta = (m[q][q] - m[p][p]) / (2 * m[p][q]);
      const t = Math.sign(theta || 1) / (Math.abs(theta) + Math.sqrt(theta * theta + 1));
      const c = 1 / Math.sqrt(t * t + 1), s = t * c;
      for (let k = 0; k < 3; k++) {
        const mkp = m[k][p], mkq = m[k][q];
        m[k][p] = c * mkp - s * mkq;
        m[k][q] = s * mkp + c * mkq;
      }
      for (let k = 0; k < 3; k++) {
        const mpk = m[p][k], mqk = m[q][k];
        m[p][k] = c * mpk - s * mqk;
        m[q][k] = s * mpk + c * mqk;
      }
      for (let k = 0; k < 3; k++) {
        const vkp = v[k][p], vkq = v[k][q];
        v[k][p] = c * vkp - s * vkq;
        v[k][q] = s * vkp + c * vkq;
      }
    }
  }
  return [0, 1, 2].map((j) => [v[0][j], v[1][j], v[2][j]]);
}

function planeThrough(normal: readonly number[], point: readonly number[]): MirrorPlane {
  const length = Math.hypot(normal[0], normal[1], normal[2]);
  const n: [number, number, number] = [normal[0] / length, normal[1] / length, normal[2] / length];
  return { normal: n, offset: n[0] * point[0] + n[1] * point[1] + n[2] * point[2] };
}

/**
 * One refinement round: each vertex away from the plane is paired with the surface point nearest
 * its mirror image, and the plane is re-fitted as the one bisecting the pairs (normal the mean of
 * their differences, offset the mean of their midpoints) — a reflection's iterative closest point.
 */
function refine(surface: GroomSurface, plane: MirrorPlane): MirrorPlane {
  const p = surface.mesh.positions;
  const out = new Float64Array(SKIN_QUERY_SIZE);
  const near = 1e-3 * surface.diagonal;
  const sum = [0, 0, 0];
  const pairs: number[] = [];
  for (let v = 0; v < p.length / 3; v++) {
    const x = [p[3 * v], p[3 * v + 1], p[3 * v + 2]];
    const side = planeDistance(plane, x);
    if (Math.abs(side) < near) continue;
    const m = mirrorPoint(plane, x);
    if (!surface.skin.closest(m[0], m[1], m[2], surface.diagonal, out)) continue;
    const s = Math.sign(side);
    for (let k = 0; k < 3; k++) sum[k] += s * (x[k] - out[k]);
    pairs.push(x[0] + out[0], x[1] + out[1], x[2] + out[2]);
  }
  if (pairs.length === 0 || Math.hypot(sum[0], sum[1], sum[2]) === 0) return plane;
  const length = Math.hypot(sum[0], sum[1], sum[2]);
  const n: [number, number, number] = [sum[0] / length, sum[1] / length, sum[2] / length];
  let offset = 0;
  for (let i = 0; i < pairs.length; i += 3) offset += (n[0] * pairs[i] + n[1] * pairs[i + 1] + n[2] * pairs[i + 2]) / 2;
  return { normal: n, offset: offset / (pairs.length / 3) };
}

/**
 * The surface's best mirror plane. Candidates are the planes through the area-weighted centroid
 * across each principal axis of the faces' second moments and across each world axis (a model
 * built symmetric about x = 0 often has equal moments along two axes, where principal axes are
 * not defined); the one of least mismatch is refined by `refine` rounds, each kept only when it
 * lowers the mismatch. The normal is turned to point along +x, +y or +z, whichever it is nearest.
 *
 * Guarantees: `mismatch` is `mirrorMismatch` of the returned plane; on an exactly symmetric surface
 * whose plane is among the candidates it is 0 up to rounding; `symmetric` is mismatch ≤
 * SYMMETRIC_MISMATCH. Cost: one closest-point pass over the vertices per candidate and round.
 */
export function detectMirrorPlane(surface: GroomSurface): DetectedMirror {
  const { centre, covariance } = moments(surface);
  const candidates = [...eigenvectors(covariance), [1, 0, 0], [0, 1, 0], [0, 0, 1]].map((n) => planeThrough(n, centre));
  let best = candidates[0];
  let bestMismatch = Infinity;
  for (const plane of candidates) {
    const mismatch = mirrorMismatch(surface, plane);
    if (mismatch < bestMismatch) [best, bestMismatch] = [plane, mismatch];
  }
  for (let round = 0; round < REFINE_ROUNDS && bestMismatch > 0; round++) {
    const next = refine(surface, best);
    const mismatch = mirrorMismatch(surface, next);
    if (!(mismatch < bestMismatch)) break;
    [best, bestMismatch] = [next, mismatch];
  }
  const n = best.normal;
  const axis = [0, 1, 2].reduce((a, k) => (Math.abs(n[k]) > Math.abs(n[a]) ? k : a), 0);
  if (n[axis] < 0) best = { normal: [-n[0], -n[1], -n[2]], offset: -best.offset };
  return { plane: best, mismatch: bestMismatch, symmetric: bestMismatch <= SYMMETRIC_MISMATCH };
}
