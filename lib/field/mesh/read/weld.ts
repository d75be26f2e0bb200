/**
 * Exporters split a vertex wherever its UV or normal changes; welding joins the copies again so
 * that the surface is one connected sheet, without merging vertices the modeller meant apart.
 */

/** Default weld distance as a fraction of the bounding-box diagonal of the file's vertices. */
export const DEFAULT_WELD_FRACTION = 1e-6;

export interface WeldResult {
  /** File vertex → welded vertex. */
  readonly map: Uint32Array;
  /** Positions of the welded vertices: each is the position of its first file vertex. */
  readonly positions: Float64Array;
}

/**
 * The default weld distance: `DEFAULT_WELD_FRACTION` × the diagonal of the bounding box of the
 * finite vertices. Small enough to keep any vertices a modeller meant apart (a millionth of the
 * model's size), large enough to merge the copies that exporters write when they split a vertex
 * by UV or normal, which agree to far better than that, even in 32-bit floats. Returns 0 when
 * the diagonal is zero or not finite, which welds only exactly equal positions.
 */
export function defaultWeldTolerance(positions: Float64Array): number {
  const lo = [Infinity, Infinity, Infinity];
  const hi = [-Infinity, -Infinity, -Infinity];
  for (let v = 0; v < positions.length / 3; v++) {
    const x = positions[3 * v];
    const y = positions[3 * v + 1];
    const z = positions[3 * v + 2];
    if (!Number.isFinite(x) || !Number.isFinite(y) || !Number.isFinite(z)) continue;
    lo[0] = Math.min(lo[0], x);
    lo[1] = Math.min(lo[1], y);
    lo[2] = Math.min(lo[2], z);
    hi[0] = Math.max(hi[0], x);
    hi[1] = Math.max(hi[1], y);
    hi[2] = Math.max(hi[2], z);
  }
  const diagonal = Math.hypot(hi[0] - lo[0], hi[1] - lo[1], hi[2] - lo[2]);
  const tolerance = DEFAULT_WELD_FRACTION * diagonal;
  return Number.isFinite(tolerance) ? tolerance : 0;
}

/**
 * Merges vertices that lie within `tolerance` (Euclidean distance, inclusive) of an earlier kept
 * vertex, found through a spatial hash with cells of the tolerance's size, so the work is linear
 * in the vertex count for any sensible mesh.
 *
 * Guarantees: deterministic; file vertices are visited in order and each joins the
 * lowest-numbered kept vertex within the tolerance, else becomes a new kept vertex, so welded
 * vertices are numbered in order of first appearance and every file vertex lies within
 * `tolerance` of its welded vertex (merging is not chained further). With tolerance 0 (or a
 * tolerance that is not a positive finite number) only exactly equal positions merge. Vertices
 * with a non-finite coordinate never merge.
 */
export function weldVertices(positions: Float64Array, tolerance: number): WeldResult {
  const n = (positions.length / 3) | 0;
  const map = new Uint32Array(n);
  const kept = new Float64Array(3 * n);
  let keptCount = 0;
  const exact = !(tolerance > 0 && Number.isFinite(tolerance));
  // Cells twice the tolerance wide: a point within the tolerance of p lies in p's cell or in the
  // neighbour on p's nearer side along each axis, so 8 cells are searched instead of 27.
  const cell = exact ? 1 : 2 * tolerance;
  const squaredTolerance = exact ? 0 : tolerance * tolerance;

  let size = 16;
  while (size < 2 * n) size *= 2;
  const mask = size - 1;
  const head = new Int32Array(size).fill(-1);
  const chain = new Int32Array(Math.max(1, n));
  const bits = new Float64Array(3);
  const words = new Uint32Array(bits.buffer);
  const exactHash = (): number => {
    let h = 0x811c9dc5;
    for (let i = 0; i < 6; i++) h = Math.imul(h ^ words[i], 0x01000193);
    return (h ^ (h >>> 15)) & mask;
  };
  const cellHash = (ix: number, iy: number, iz: number): number =>
    (Math.imul(ix | 0, 0x8da6b343) ^ Math.imul(iy | 0, 0xd8163841) ^ Math.imul(iz | 0, 0xcb1ab31f)) & mask;

  for (let v = 0; v < n; v++) {
    const x = positions[3 * v];
    const y = positions[3 * v + 1];
    const z = positions[3 * v + 2];
    const finite = Number.isFinite(x) && Number.isFinite(y) && Number.isFinite(z);
    let found = -1;
    let home = -1;
    if (finite && exact) {
      // Adding 0 turns −0 into +0, which compares equal and must hash the same.
      bits[0] = x + 0;
      bits[1] = y + 0;
      bits[2] = z + 0;
      home = exactHash();
      for (let k = head[home]; k !== -1; k = chain[k]) {
        if (kept[3 * k] === x && kept[3 * k + 1] === y && kept[3 * k + 2] === z && (found === -1 || k < found)) found = k;
      }
    } else if (finite) {
      const fx = x / cell;
      const fy = y / cell;
      const fz = z / cell;
      const ix = Math.floor(fx);
      const iy = Math.floor(fy);
      const iz = Math.floor(fz);
      home = cellHash(ix, iy, iz);
      const sx = fx - ix < 0.5 ? -1 : 1;
      const sy = fy - iy < 0.5 ? -1 : 1;
      const sz = fz - iz < 0.5 ? -1 : 1;
      for (let c = 0; c < 8; c++) {
        const bucket = cellHash(ix + (c & 1 ? sx : 0), iy + (c & 2 ? sy : 0), iz + (c & 4 ? sz : 0));
        for (let k = head[bucket]; k !== -1; k = chain[k]) {
          if (found !== -1 && k > found) continue;
          const ex = kept[3 * k] - x;
          const ey = kept[3 * k + 1] - y;
          const ez = kept[3 * k + 2] - z;
          if (ex * ex + ey * ey + ez * ez <= squaredTolerance) found = k;
        }
      }
    }
    if (found === -1) {
      found = keptCount++;
      kept[3 * found] = x;
      kept[3 * found + 1] = y;
      kept[3 * found + 2] = z;
      if (home !== -1) {
        chain[found] = head[home];
        head[home] = found;
      }
    }
    map[v] = found;
  }
  return { map, positions: kept.slice(0, 3 * keptCount) };
}
