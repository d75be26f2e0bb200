/**
 * Dense kernels of the supernodal Cholesky (row-major blocks on Float64Array).
 *
 * The one kernel that matters is C −= A Bᵀ with A and B stored by rows: every entry is
 * a dot product of two contiguous rows. Computing a 3×4 tile of C at once reuses each
 * loaded value three or four times, and its 12 accumulators, 3 row values and 1 column
 * value fit the 16 floating-point registers of x86-64. Measured under Node 20 this runs
 * about 2.5× faster than one dot product at a time, and 10–20% faster than 4×2 or 4×4
 * tiles (fewer loads, each of them bounds-checked, per multiply-add; no spills).
 */

/**
 * C[i][j] −= Σ_q A[i][q] · B[j][q] for 0 ≤ i < rows, 0 ≤ j < cols, 0 ≤ q < len, where
 * X[i][q] means X[xAt + i·ldx + q]; with `assign`, C[i][j] = −Σ instead, whatever C held
 * (which spares clearing it first). A, B and C may share one array; C must not overlap
 * the parts of A and B that are read.
 */
export function subtractProductNT(
  C: Float64Array,
  cAt: number,
  ldc: number,
  rows: number,
  cols: number,
  A: Float64Array,
  aAt: number,
  lda: number,
  B: Float64Array,
  bAt: number,
  ldb: number,
  len: number,
  assign = false,
): void {
  if (len === 0) {
    if (assign) for (let i = 0; i < rows; i++) C.fill(0, cAt + i * ldc, cAt + i * ldc + cols);
    return;
  }
  const fullCols = cols - (cols % 4);
  let i = 0;
  for (; i + 2 < rows; i += 3) {
    const a0 = aAt + i * lda;
    const a1 = a0 + lda;
    const a2 = a1 + lda;
    const c0 = cAt + i * ldc;
    const c1 = c0 + ldc;
    const c2 = c1 + ldc;
    for (let j = 0; j < fullCols; j += 4) {
      const b0 = bAt + j * ldb;
      const b1 = b0 + ldb;
      const b2 = b1 + ldb;
      const b3 = b2 + ldb;
      let s00 = 0;
      let s01 = 0;
      let s02 = 0;
      let s03 = 0;
      let s10 = 0;
      let s11 = 0;
      let s12 = 0;
      let s13 = 0;
      let s20 = 0;
      let s21 = 0;
      let s22 = 0;
      let s23 = 0;
      for (let q = 0; q < len; q++) {
        const x0 = A[a0 + q];
        const x1 = A[a1 + q];
        const x2 = A[a2 + q];
        let y = B[b0 + q];
        s00 += x0 * y;
        s10 += x1 * y;
        s20 += x2 * y;
        y = B[b1 + q];
        s01 += x0 * y;
        s11 += x1 * y;
        s21 += x2 * y;
        y = B[b2 + q];
        s02 += x0 * y;
        s12 += x1 * y;
        s22 += x2 * y;
        y = B[b3 + q];
        s03 += x0 * y;
        s13 += x1 * y;
        s23 += x2 * y;
      }
      if (assign) {
        C[c0 + j] = -s00;
        C[c0 + j + 1] = -s01;
        C[c0 + j + 2] = -s02;
        C[c0 + j + 3] = -s03;
        C[c1 + j] = -s10;
        C[c1 + j + 1] = -s11;
        C[c1 + j + 2] = -s12;
        C[c1 + j + 3] = -s13;
        C[c2 + j] = -s20;
        C[c2 + j + 1] = -s21;
        C[c2 + j + 2] = -s22;
        C[c2 + j + 3] = -s23;
      } else {
        C[c0 + j] -= s00;
        C[c0 + j + 1] -= s01;
        C[c0 + j + 2] -= s02;
        C[c0 + j + 3] -= s03;
        C[c1 + j] -= s10;
        C[c1 + j + 1] -= s11;
        C[c1 + j + 2] -= s12;
        C[c1 + j + 3] -= s13;
        C[c2 + j] -= s20;
        C[c2 + j + 1] -= s21;
        C[c2 + j + 2] -= s22;
        C[c2 + j + 3] -= s23;
      }
    }
    for (let j = fullCols; j < cols; j++) {
      const b0 = bAt + j * ldb;
      let s0 = 0;
      let s1 = 0;
      let s2 = 0;
      for (let q = 0; q < len; q++) {
        const y = B[b0 + q];
        s0 += A[a0 + q] * y;
        s1 += A[a1 + q] * y;
        s2 += A[a2 + q] * y;
      }
      if (assign) {
        C[c0 + j] = -s0;
        C[c1 + j] = -s1;
        C[c2 + j] = -s2;
      } else {
        C[c0 + j] -= s0;
        C[c1 + j] -= s1;
        C[c2 + j] -= s2;
      }
    }
  }
  for (; i < rows; i++) {
    const a0 = aAt + i * lda;
    const c0 = cAt + i * ldc;
    let j = 0;
    for (; j < fullCols; j += 4) {
      const b0 = bAt + j * ldb;
      const b1 = b0 + ldb;
      const b2 = b1 + ldb;
      const b3 = b2 + ldb;
      let s0 = 0;
      let s1 = 0;
      let s2 = 0;
      let s3 = 0;
      for (let q = 0; q < len; q++) {
        const x = A[a0 + q];
        s0 += x * B[b0 + q];
        s1 += x * B[b1 + q];
        s2 += x * B[b2 + q];
        s3 += x * B[b3 + q];
      }
      if (assign) {
        C[c0 + j] = -s0;
        C[c0 + j + 1] = -s1;
        C[c0 + j + 2] = -s2;
        C[c0 + j + 3] = -s3;
      } else {
        C[c0 + j] -= s0;
        C[c0 + j + 1] -= s1;
        C[c0 + j + 2] -= s2;
        C[c0 + j + 3] -= s3;
      }
    }
    for (; j < cols; j++) {
      const b0 = bAt + j * ldb;
      let s = 0;
      for (let q = 0; q < len; q++) s += A[a0 + q] * B[b0 + q];
      if (assign) C[c0 + j] = -s;
      else C[c0 + j] -= s;
    }
  }
}

/**
 * Lower triangle of C (r×r) = −X Xᵀ, X being r×len by rows, whatever C held. Entries just
 * above the diagonal (within the 3-row stripes' last 4-column tile) may also change;
 * callers keep nothing there.
 */
export function negatedGram(
  C: Float64Array,
  cAt: number,
  ldc: number,
  r: number,
  X: Float64Array,
  xAt: number,
  ldx: number,
  len: number,
): void {
  for (let i = 0; i < r; i += 3) {
    const rows = Math.min(3, r - i);
    // columns up to the stripe's last row, rounded up to whole 4-wide tiles
    const cols = Math.min(r, (((i + rows + 3) >> 2) << 2));
    subtractProductNT(C, cAt + i * ldc, ldc, rows, cols, X, xAt + i * ldx, ldx, X, xAt, ldx, len, true);
  }
}

/** Column-block width of the panel factorization: wide enough that the blocked update
 * dominates, narrow enough that the scalar triangular parts stay a small share. */
const PANEL_BLOCK = 24;
// Multiplying by reciprocals of the block's pivots instead of dividing: a division costs
// as much as a dozen multiply-adds, and narrow supernodes do little else.
const blockInverseDiagonal = new Float64Array(PANEL_BLOCK);

/**
 * Rows iFrom..iTo−1 of a row-major array (row i starting at at + i·ld) are replaced by
 * their solution X of X Tᵀ = rows, T being the w×w lower-triangular block of `T` whose
 * row j starts at tAt + j·ld, with inverseDiagonal[j] = 1 / T[j][j]. Four rows at a time
 * so that each loaded entry of T serves four rows.
 */
function solveRowsAgainstBlock(
  P: Float64Array,
  at: number,
  ld: number,
  T: Float64Array,
  tAt: number,
  w: number,
  iFrom: number,
  iTo: number,
  inverseDiagonal: Float64Array,
): void {
  let i = iFrom;
  for (; i + 3 < iTo; i += 4) {
    const r0 = at + i * ld;
    const r1 = r0 + ld;
    const r2 = r1 + ld;
    const r3 = r2 + ld;
    for (let j = 0; j < w; j++) {
      const rowJ = tAt + j * ld;
      let s0 = P[r0 + j];
      let s1 = P[r1 + j];
      let s2 = P[r2 + j];
      let s3 = P[r3 + j];
      for (let q = 0; q < j; q++) {
        const l = T[rowJ + q];
        s0 -= P[r0 + q] * l;
        s1 -= P[r1 + q] * l;
        s2 -= P[r2 + q] * l;
        s3 -= P[r3 + q] * l;
      }
      const inv = inverseDiagonal[j];
      P[r0 + j] = s0 * inv;
      P[r1 + j] = s1 * inv;
      P[r2 + j] = s2 * inv;
      P[r3 + j] = s3 * inv;
    }
  }
  for (; i < iTo; i++) {
    const r0 = at + i * ld;
    for (let j = 0; j < w; j++) {
      const rowJ = tAt + j * ld;
      let s0 = P[r0 + j];
      for (let q = 0; q < j; q++) s0 -= P[r0 + q] * T[rowJ + q];
      P[r0 + j] = s0 * inverseDiagonal[j];
    }
  }
}

/**
 * Factors a supernode's panel in place: the k×k block D (from index 0, leading
 * dimension k) becomes lower-triangular L₁₁ with D = L₁₁L₁₁ᵀ, and the r×k block
 * B (row i at bAt + i·k) becomes L₂₁ = B L₁₁⁻ᵀ. Entries of D above the diagonal are left
 * undefined. Left-looking by column blocks: each block is first brought up to date with
 * all earlier columns in the fast tiled kernel, leaving only narrow triangular work to
 * scalar loops.
 *
 * Pivot j (before its square root) must exceed pivotFloor[floorAt + j] and be finite; on
 * the first that is not, the factorization stops, stores the pivot in failedPivot[0] and
 * returns j. Returns −1 on success.
 */
export function factorPanel(
  D: Float64Array,
  B: Float64Array,
  bAt: number,
  k: number,
  r: number,
  pivotFloor: Float64Array,
  floorAt: number,
  failedPivot: Float64Array,
): number {
  const inverseDiagonal = blockInverseDiagonal;
  for (let j0 = 0; j0 < k; j0 += PANEL_BLOCK) {
    const w = Math.min(PANEL_BLOCK, k - j0);
    const blockAt = j0 * k;
    // bring columns j0..j0+w up to date with all earlier columns, for every row below
    subtractProductNT(D, blockAt + j0, k, k - j0, w, D, blockAt, k, D, blockAt, k, j0);
    if (r > 0) subtractProductNT(B, bAt + j0, k, r, w, B, bAt, k, D, blockAt, k, j0);
    // unblocked Cholesky of the w×w diagonal block
    for (let i = 0; i < w; i++) {
      const rowI = blockAt + i * k + j0;
      for (let j = 0; j < i; j++) {
        const rowJ = blockAt + j * k + j0;
        let sum = D[rowI + j];
        for (let q = 0; q < j; q++) sum -= D[rowI + q] * D[rowJ + q];
        D[rowI + j] = sum * inverseDiagonal[j];
      }
      let d = D[rowI + i];
      for (let q = 0; q < i; q++) d -= D[rowI + q] * D[rowI + q];
      if (!(d > pivotFloor[floorAt + j0 + i]) || d === Infinity) {
        failedPivot[0] = d;
        return j0 + i;
      }
      const root = Math.sqrt(d);
      D[rowI + i] = root;
      inverseDiagonal[i] = 1 / root;
    }
    solveRowsAgainstBlock(D, j0, k, D, blockAt + j0, w, j0 + w, k, inverseDiagonal);
    if (r > 0) solveRowsAgainstBlock(B, bAt + j0, k, D, blockAt + j0, w, 0, r, inverseDiagonal);
  }
  return -1;
}
