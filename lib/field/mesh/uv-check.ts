/**
 * Whether a surface's UVs can place things: a pipeline that binds guides or carries a groom to
 * another mesh by UV needs every point of the skin to have one UV and every UV to name one
 * point, which overlapping UV islands (mirrored halves, stacked shells) break.
 */
import type { TriangleMesh } from './mesh';
import { Examples } from './check-edges';

/** Cells along the longer side of the UV bounding box in the overlap raster. */
export const UV_RASTER_SIZE = 1024;

export interface UvFacts {
  /** True when every corner of the file had a texture coordinate (`mesh.cornerUvs`). */
  readonly present: boolean;
  /**
   * Of the raster cells (see `uvFacts`) the UV triangles cover, the fraction covered by two or
   * more triangles; 0 without UVs.
   */
  readonly overlapFraction: number;
  /** Triangles (mesh faces) that share a raster cell with another triangle, and the first few. */
  readonly overlappingFaces: { readonly count: number; readonly examples: readonly number[] };
  /** Triangles whose three UVs lie on one line or are not finite: they name no area of the map. */
  readonly collapsedFaces: { readonly count: number; readonly examples: readonly number[] };
}

const NO_UVS: UvFacts = { present: false, overlapFraction: 0, overlappingFaces: { count: 0, examples: [] }, collapsedFaces: { count: 0, examples: [] } };

/**
 * Measures a mesh's UVs: present or not, and overlapping or not, by rasterising the UV
 * triangles into a grid of `UV_RASTER_SIZE` square cells along the longer side of their bounding
 * box and counting the cells whose centre lies strictly inside two or more triangles.
 *
 * Guarantees: never throws; time linear in the faces plus the raster's cells; deterministic.
 * Triangles that only share edges or corners never count as overlapping (a centre exactly on a
 * shared edge is inside neither), so a proper UV layout reports 0. Overlaps smaller than about
 * one cell (a 1024th of the map's extent) can be missed; any overlap covering a cell centre is
 * found. Mirrored (clockwise) UV triangles are fine by themselves.
 */
export function uvFacts(mesh: TriangleMesh, size = UV_RASTER_SIZE): UvFacts {
  const uv = mesh.cornerUvs;
  const nF = Math.floor(mesh.triangles.length / 3);
  if (!uv || uv.length < 6 * nF) return NO_UVS;
  let minU = Infinity, minV = Infinity, maxU = -Infinity, maxV = -Infinity;
  for (let i = 0; i < 6 * nF; i += 2) {
    if (!Number.isFinite(uv[i]) || !Number.isFinite(uv[i + 1])) continue;
    minU = Math.min(minU, uv[i]); maxU = Math.max(maxU, uv[i]);
    minV = Math.min(minV, uv[i + 1]); maxV = Math.max(maxV, uv[i + 1]);
  }
  const extent = Math.max(maxU - minU, maxV - minV);
  const collapsed = new Examples();
  const overlapping = new Examples();
  if (!(extent > 0)) {
    for (let f = 0; f < nF; f++) collapsed.add(f);
    return { present: true, overlapFraction: 0, overlappingFaces: { count: 0, examples: [] }, collapsedFaces: { count: collapsed.count, examples: collapsed.items } };
  }
  const cell = extent / size;
  const width = Math.max(1, Math.ceil((maxU - minU) / cell));
  const height = Math.max(1, Math.ceil((maxV - minV) / cell));
  const owner = new Int32Array(width * height).fill(-1);
  const shared = new Uint8Array(width * height);
  const marked = new Uint8Array(nF);
  let covered = 0;
  let overlapped = 0;
  const mark = (f: number) => {
    if (marked[f]) return;
    marked[f] = 1;
    overlapping.add(f);
  };
  for (let f = 0; f < nF; f++) {
    const ax = (uv[6 * f] - minU) / cell, ay = (uv[6 * f + 1] - minV) / cell;
    const bx = (uv[6 * f + 2] - minU) / cell, by = (uv[6 * f + 3] - minV) / cell;
    const cx = (uv[6 * f + 4] - minU) / cell, cy = (uv[6 * f + 5] - minV) / cell;
    const area = (bx - ax) * (cy - ay) - (by - ay) * (cx - ax);
    if (!Number.isFinite(area) || Math.abs(area) <= 1e-12 * size * size) {
      collapsed.add(f);
      continue;
    }
    // Barycentric weights are affine in the cell centre; a small margin keeps centres on a shared
    // edge out of both triangles whatever the rounding.
    const margin = 1e-9;
    const i0 = Math.max(0, Math.floor(Math.min(ax, bx, cx) - 0.5)), i1 = Math.min(width - 1, Math.ceil(Math.max(ax, bx, cx) - 0.5));
    const j0 = Math.max(0, Math.floor(Math.min(ay, by, cy) - 0.5)), j1 = Math.min(height - 1, Math.ceil(Math.max(ay, by, cy) - 0.5));
    for (let j = j0; j <= j1; j++) {
      const y = j + 0.5;
      for (let i = i0; i <= i1; i++) {
        const x = i + 0.5;
        const wa = ((bx - x) * (cy - y) - (by - y) * (cx - x)) / area;
        const wb = ((cx - x) * (ay - y) - (cy - y) * (ax - x)) / area;
        const wc = 1 - wa - wb;
        if (!(wa > margin && wb > margin && wc > margin)) continue;
        const k = j * width + i;
        if (owner[k] === -1) {
          owner[k] = f;
          covered++;
        } else if (owner[k] !== f) {
          if (!shared[k]) {
            shared[k] = 1;
            overlapped++;
            mark(owner[k]);
          }
          mark(f);
        }
      }
    }
  }
  return {
    present: true,
    overlapFraction: covered > 0 ? overlapped / covered : 0,
    overlappingFaces: { count: overlapping.count, examples: overlapping.items },
    collapsedFaces: { count: collapsed.count, examples: collapsed.items },
  };
}
