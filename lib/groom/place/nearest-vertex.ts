/**
 * Nearest-vertex look-up on a uniform grid, for snapping points of a spec to surface vertices.
 */
export interface NearestVertex {
  /** The vertex closest to (x, y, z) (lowest number on a tie), and its distance. */
  find(x: number, y: number, z: number): { vertex: number; distance: number };
}

const MAX_CELLS = 1 << 24;

/**
 * Buckets the vertices into cubes of about two vertices each.
 *
 * Guarantees: `find` returns exactly the vertex a brute-force scan would (ties to the lower
 * number), for query points inside or outside the surface's bounding box.
 */
export function buildNearestVertex(positions: Float64Array): NearestVertex {
  const n = positions.length / 3;
  const lo = [Infinity, Infinity, Infinity];
  const hi = [-Infinity, -Infinity, -Infinity];
  for (let v = 0; v < n; v++) {
    for (let k = 0; k < 3; k++) {
      lo[k] = Math.min(lo[k], positions[3 * v + k]);
      hi[k] = Math.max(hi[k], positions[3 * v + k]);
    }
  }
  const diagonal = Math.hypot(hi[0] - lo[0], hi[1] - lo[1], hi[2] - lo[2]) || 1;
  const extent = [0, 1, 2].map((k) => Math.max(hi[k] - lo[k], diagonal * 1e-3));
  let cell = Math.cbrt((extent[0] * extent[1] * extent[2]) / Math.max(1, 2 * n));
  let dims = extent.map((e) => Math.max(1, Math.ceil(e / cell)));
  while (dims[0] * dims[1] * dims[2] > MAX_CELLS) {
    cell *= 1.5;
    dims = extent.map((e) => Math.max(1, Math.ceil(e / cell)));
  }
  const [nx, ny, nz] = dims;
  const cellIndex = (c: number, k: number) => Math.min(dims[k] - 1, Math.max(0, Math.floor((c - lo[k]) / cell)));
  const start = new Int32Array(nx * ny * nz + 1);
  const cellOf = new Int32Array(n);
  for (let v = 0; v < n; v++) {
    const c = cellIndex(positions[3 * v], 0) + nx * (cellIndex(positions[3 * v + 1], 1) + ny * cellIndex(positions[3 * v + 2], 2));
    cellOf[v] = c;
    start[c + 1]++;
  }
  for (let c = 0; c < nx * ny * nz; c++) start[c + 1] += start[c];
  const members = new Int32Array(n);
  const fill = start.slice(0, nx * ny * nz);
  for (let v = 0; v < n; v++) members[fill[cellOf[v]]++] = v;

  return {
    find(x, y, z) {
      const q = [x, y, z];
      const home = [0, 1, 2].map((k) => cellIndex(q[k], k));
      // How far the query is outside the grid: no vertex is nearer than that.
      let outside = 0;
      for (let k = 0; k < 3; k++) outside += Math.max(0, lo[k] - q[k], q[k] - (lo[k] + dims[k] * cell)) ** 2;
      outside = Math.sqrt(outside);
      let best = -1;
      let bestSq = Infinity;
      const maxRing = Math.max(nx, ny, nz);
      for (let r = 0; r <= maxRing; r++) {
        for (let i = home[0] - r; i <= home[0] + r; i++) {
          if (i < 0 || i >= nx) continue;
          for (let j = home[1] - r; j <= home[1] + r; j++) {
            if (j < 0 || j >= ny) continue;
            for (let k = home[2] - r; k <= home[2] + r; k++) {
              if (k < 0 || k >= nz) continue;
              if (Math.max(Math.abs(i - home[0]), Math.abs(j - home[1]), Math.abs(k - home[2])) !== r) continue;
              const c = i + nx * (j + ny * k);
              for (let m = start[c]; m < start[c + 1]; m++) {
                const v = members[m];
                const dSq = (positions[3 * v] - x) ** 2 + (positions[3 * v + 1] - y) ** 2 + (positions[3 * v + 2] - z) ** 2;
                if (dSq < bestSq || (dSq === bestSq && v < best)) {
                  bestSq = dSq;
                  best = v;
                }
              }
            }
          }
        }
        // Cells beyond ring r are at least r whole cells away from the query's (clamped) cell, and
        // every cell is at least `outside` away.
        if (best >= 0 && Math.sqrt(bestSq) <= Math.max(outside, r * cell)) break;
      }
      return { vertex: best, distance: Math.sqrt(bestSq) };
    },
  };
}
