/**
 * Tufts: guides gathered onto the curves of tuft centres. A tuft centre is a root like any other
 * (sampled by the same blue-noise sampler at the tufts' own density), its centre curve is grown
 * like a guide, and each guide belongs to the centre nearest its root. Drawing a guide onto its
 * centre curve is a per-point blend, so the root never moves and a full draw at the tip puts the
 * tip on the centre curve.
 */

/** How strongly a guide is drawn onto its centre curve: share at the root, at the tip, and the curve's rise between. */
export interface Gather {
  readonly root: number;
  readonly tip: number;
  readonly rise: number;
}

/** True when the gather draws no point at all (so a guide is left bit for bit as it was). */
export function gathersNothing(gather: Gather): boolean {
  return gather.root === 0 && gather.tip === 0;
}

/**
 * Draws guide `g` (n points from index g·n of `points`) onto curve `c` of `curves` (n points each):
 * point i moves the share root + (tip − root)·(i/(n−1))^rise of the way to the curve's point i.
 *
 * With `onlyFull`, only the points of share 1 are set (again) onto the curve.
 *
 * Guarantees: point 0 (the root) is never moved; with a share of 1 a point is set to the curve's
 * point exactly; with a share of 0 it is not touched.
 */
export function gatherOnto(points: Float64Array, g: number, curves: Float64Array, c: number, n: number, gather: Gather, onlyFull = false): void {
  for (let i = 1; i < n; i++) {
    const share = gather.root + (gather.tip - gather.root) * (i / (n - 1)) ** gather.rise;
    if (share === 0 || (onlyFull && share !== 1)) continue;
    const q = 3 * (g * n + i), r = 3 * (c * n + i);
    for (let k = 0; k < 3; k++) points[q + k] = share === 1 ? curves[r + k] : points[q + k] + share * (curves[r + k] - points[q + k]);
  }
}

/**
 * For each point (3 numbers each in `at`, with a unit normal in `atNormal`), the nearest centre in
 * a straight line among those whose normal is within 90° of the point's (so a guide on one side of
 * a thin part — an ear — never joins a tuft on the other side); the nearest of all when none
 * faces its way. `spacing` sizes the search grid (about the centres' mean spacing).
 *
 * Guarantees: a centre index for every point (−1 only when there are no centres); ties go to the
 * lower centre, so the answer does not depend on the grid.
 */
export function nearestCentres(at: Float64Array, atNormal: Float64Array, centres: Float64Array, centreNormal: Float64Array, spacing: number): Int32Array {
  const count = at.length / 3, nc = centres.length / 3;
  const out = new Int32Array(count).fill(-1);
  if (nc === 0) return out;
  let minX = Infinity, minY = Infinity, minZ = Infinity, maxX = -Infinity, maxY = -Infinity, maxZ = -Infinity;
  for (let c = 0; c < nc; c++) {
    minX = Math.min(minX, centres[3 * c]); minY = Math.min(minY, centres[3 * c + 1]); minZ = Math.min(minZ, centres[3 * c + 2]);
    maxX = Math.max(maxX, centres[3 * c]); maxY = Math.max(maxY, centres[3 * c + 1]); maxZ = Math.max(maxZ, centres[3 * c + 2]);
  }
  const cell = spacing > 0 ? spacing : 1;
  const nx = Math.floor((maxX - minX) / cell) + 1, ny = Math.floor((maxY - minY) / cell) + 1, nz = Math.floor((maxZ - minZ) / cell) + 1;
  const key = (i: number, j: number, k: number) => (k * ny + j) * nx + i;
  const cellOf = (x: number, lo: number, size: number) => Math.max(0, Math.min(size - 1, Math.floor((x - lo) / cell)));
  // Centres bucketed by grid cell.
  const cells = new Map<number, number[]>();
  for (let c = 0; c < nc; c++) {
    const m = key(cellOf(centres[3 * c], minX, nx), cellOf(centres[3 * c + 1], minY, ny), cellOf(centres[3 * c + 2], minZ, nz));
    const list = cells.get(m);
    if (list) list.push(c); else cells.set(m, [c]);
  }
  const widest = Math.max(nx, ny, nz);
  for (let p = 0; p < count; p++) {
    const x = at[3 * p], y = at[3 * p + 1], z = at[3 * p + 2];
    const ci = cellOf(x, minX, nx), cj = cellOf(y, minY, ny), ck = cellOf(z, minZ, nz);
    let best = -1, bestD = Infinity, anyBest = -1, anyD = Infinity;
    for (let r = 0; r <= widest; r++) {
      // Every centre in ring r + 1 or beyond is at least r cells away from the point's cell.
      if (best >= 0 && r > 1 && bestD <= ((r - 1) * cell) ** 2) break;
      for (let k = ck - r; k <= ck + r; k++) {
        if (k < 0 || k >= nz) continue;
        for (let j = cj - r; j <= cj + r; j++) {
          if (j < 0 || j >= ny) continue;
          for (let i = ci - r; i <= ci + r; i++) {
            if (i < 0 || i >= nx) continue;
            if (Math.max(Math.abs(i - ci), Math.abs(j - cj), Math.abs(k - ck)) !== r) continue;
            const list = cells.get(key(i, j, k));
            if (!list) continue;
            for (const c of list) {
              const d = (centres[3 * c] - x) ** 2 + (centres[3 * c + 1] - y) ** 2 + (centres[3 * c + 2] - z) ** 2;
              if (d < anyD || (d === anyD && c < anyBest)) { anyD = d; anyBest = c; }
              const facing = centreNormal[3 * c] * atNormal[3 * p] + centreNormal[3 * c + 1] * atNormal[3 * p + 1] + centreNormal[3 * c + 2] * atNormal[3 * p + 2];
              if (facing > 0 && (d < bestD || (d === bestD && c < best))) { bestD = d; best = c; }
            }
          }
        }
      }
    }
    out[p] = best >= 0 ? best : anyBest;
  }
  return out;
}
