/**
 * The factor as callers hold it: L in supernodal blocks and the forward and backward solves
 * that reuse it for any number of right-hand sides.
 */
import type { CholeskySymbolic } from './symbolic';

export interface CholeskyFactor {
  readonly n: number;
  /** Entries of L (diagonal included), as implied by the pattern of A and the ordering. */
  readonly nonZerosInFactor: number;
  /**
   * x = A⁻¹ b. Does not modify b. Reuses internal work buffers; safe to call many times.
   * Writes into and returns `out` when given (it may be b itself). Throws RangeError
   * when b or out does not have length n.
   */
  solve(b: Float64Array, out?: Float64Array): Float64Array;
}

export class SupernodalFactor implements CholeskyFactor {
  readonly n: number;
  readonly nonZerosInFactor: number;
  private readonly work: Float64Array;
  constructor(
    private readonly symbolic: CholeskySymbolic,
    private readonly values: Float64Array,
  ) {
    this.n = symbolic.n;
    this.nonZerosInFactor = symbolic.nonZerosInFactor;
    this.work = new Float64Array(symbolic.n);
  }

  solve(b: Float64Array, out?: Float64Array): Float64Array {
    const n = this.n;
    if (b.length !== n) throw new RangeError(`solve: b has length ${b.length}, expected ${n}`);
    const x = out ?? new Float64Array(n);
    if (x.length !== n) throw new RangeError(`solve: out has length ${x.length}, expected ${n}`);
    const { perm, supernodeCount, layout } = this.symbolic;
    const { firstCol, rowPtr, rows, valuePtr } = layout;
    const L = this.values;
    const y = this.work;
    for (let k = 0; k < n; k++) y[k] = b[perm[k]];
    // L y = Pb, supernode by supernode
    for (let s = 0; s < supernodeCount; s++) {
      const f = firstCol[s];
      const k = firstCol[s + 1] - f;
      const m = rowPtr[s + 1] - rowPtr[s];
      let t = valuePtr[s];
      if (k === 1) {
        // a third of all supernodes on large meshes: skip the block machinery
        const yf = (y[f] /= L[t]);
        const rp = rowPtr[s];
        for (let i = 1; i < m; i++) y[rows[rp + i]] -= L[t + i] * yf;
        continue;
      }
      for (let i = 0; i < k; i++) {
        let sum = y[f + i];
        for (let q = 0; q < i; q++) sum -= L[t + q] * y[f + q];
        y[f + i] = sum / L[t + i];
        t += i + 1;
      }
      const rp = rowPtr[s];
      let i = k;
      // four rows of L₂₁ at a time share each load of y
      for (; i + 3 < m; i += 4, t += 4 * k) {
        const t1 = t + k;
        const t2 = t1 + k;
        const t3 = t2 + k;
        let s0 = 0;
        let s1 = 0;
        let s2 = 0;
        let s3 = 0;
        for (let q = 0; q < k; q++) {
          const yq = y[f + q];
          s0 += L[t + q] * yq;
          s1 += L[t1 + q] * yq;
          s2 += L[t2 + q] * yq;
          s3 += L[t3 + q] * yq;
        }
        y[rows[rp + i]] -= s0;
        y[rows[rp + i + 1]] -= s1;
        y[rows[rp + i + 2]] -= s2;
        y[rows[rp + i + 3]] -= s3;
      }
      for (; i < m; i++, t += k) {
        let sum = 0;
        for (let q = 0; q < k; q++) sum += L[t + q] * y[f + q];
        y[rows[rp + i]] -= sum;
      }
    }
    // Lᵀ z = y, in reverse
    for (let s = supernodeCount - 1; s >= 0; s--) {
      const f = firstCol[s];
      const k = firstCol[s + 1] - f;
      const m = rowPtr[s + 1] - rowPtr[s];
      const rp = rowPtr[s];
      if (k === 1) {
        const t = valuePtr[s];
        let sum = y[f];
        for (let i = 1; i < m; i++) sum -= L[t + i] * y[rows[rp + i]];
        y[f] = sum / L[t];
        continue;
      }
      let t = valuePtr[s] + ((k * (k + 1)) >> 1);
      let i = k;
      for (; i + 3 < m; i += 4, t += 4 * k) {
        const t1 = t + k;
        const t2 = t1 + k;
        const t3 = t2 + k;
        const y0 = y[rows[rp + i]];
        const y1 = y[rows[rp + i + 1]];
        const y2 = y[rows[rp + i + 2]];
        const y3 = y[rows[rp + i + 3]];
        for (let q = 0; q < k; q++) y[f + q] -= L[t + q] * y0 + L[t1 + q] * y1 + L[t2 + q] * y2 + L[t3 + q] * y3;
      }
      for (; i < m; i++, t += k) {
        const yi = y[rows[rp + i]];
        for (let q = 0; q < k; q++) y[f + q] -= L[t + q] * yi;
      }
      t = valuePtr[s] + ((k * (k - 1)) >> 1); // row k−1 of the packed diagonal block
      for (let i = k - 1; i >= 0; i--) {
        const zi = (y[f + i] /= L[t + i]);
        for (let q = 0; q < i; q++) y[f + q] -= L[t + q] * zi;
        t -= i;
      }
    }
    for (let k = 0; k < n; k++) x[perm[k]] = y[k];
    return x;
  }
}
