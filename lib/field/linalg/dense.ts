/**
 * LU factorization with partial pivoting of a small dense square matrix (row-major), for the
 * Schur complements of the few extra constraint rows.
 */
export interface DenseLU {
  readonly size: number;
  /** Solves A x = b. Does not modify b. */
  solve(b: Float64Array): Float64Array;
}

/**
 * Factors `a` (row-major n×n; the array is copied). Returns null when a pivot falls below
 * `relativeTolerance` × the largest entry, which signals dependent rows.
 */
export function factorDenseLU(a: Float64Array, n: number, relativeTolerance = 1e-11): DenseLU | null {
  const m = a.slice();
  const pivot = new Int32Array(n);
  let scale = 0;
  for (let i = 0; i < n * n; i++) scale = Math.max(scale, Math.abs(m[i]));
  const tiny = relativeTolerance * (scale || 1);
  for (let k = 0; k < n; k++) {
    let best = k;
    let bestValue = Math.abs(m[k * n + k]);
    for (let i = k + 1; i < n; i++) {
      const v = Math.abs(m[i * n + k]);
      if (v > bestValue) {
        best = i;
        bestValue = v;
      }
    }
    if (!(bestValue > tiny)) return null;
    pivot[k] = best;
    if (best !== k) {
      for (let j = 0; j < n; j++) {
        const t = m[k * n + j];
        m[k * n + j] = m[best * n + j];
        m[best * n + j] = t;
      }
    }
    const d = m[k * n + k];
    for (let i = k + 1; i < n; i++) {
      const l = (m[i * n + k] /= d);
      if (l === 0) continue;
      for (let j = k + 1; j < n; j++) m[i * n + j] -= l * m[k * n + j];
    }
  }
  return {
    size: n,
    solve(b: Float64Array): Float64Array {
      const x = b.slice();
      for (let k = 0; k < n; k++) {
        const p = pivot[k];
        if (p !== k) {
          const t = x[k];
          x[k] = x[p];
          x[p] = t;
        }
      }
      for (let i = 0; i < n; i++) {
        let s = x[i];
        for (let j = 0; j < i; j++) s -= m[i * n + j] * x[j];
        x[i] = s;
      }
      for (let i = n - 1; i >= 0; i--) {
        let s = x[i];
        for (let j = i + 1; j < n; j++) s -= m[i * n + j] * x[j];
        x[i] = s / m[i * n + i];
      }
      return x;
    },
  };
}
