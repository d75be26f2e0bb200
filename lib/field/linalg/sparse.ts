/**
 * Symmetric sparse matrices in compressed sparse column form, holding only the lower
 * triangle (diagonal included). Storing one triangle halves memory and is exactly what
 * the Cholesky analysis walks, so the field engine's Laplacians never exist in full.
 */

/**
 * The lower triangle (row ≥ column, diagonal included) of a symmetric n×n matrix, by
 * columns: the entries of column j are `rowIdx[colPtr[j] .. colPtr[j+1])` with values
 * `values[...]` at the same positions, rows strictly increasing within a column.
 */
export interface SymmetricSparse {
  n: number;
  colPtr: Int32Array;
  rowIdx: Int32Array;
  values: Float64Array;
}

/**
 * Builds a symmetric matrix from (row, column, value) triplets.
 *
 * Guarantees: an entry (i, j) with i < j is taken as its mirror (j, i), so either
 * triangle (or a mix) may be given; duplicates are summed; rows come out sorted within
 * each column with no repeats. Entries that sum to zero are kept (the pattern is what was
 * given), which keeps the pattern stable when only values change between calls.
 *
 * Throws RangeError when the three arrays differ in length, when n is not a
 * non-negative integer, when an index is not an integer in [0, n), or when a value is
 * not finite; the message names the offending triplet.
 */
export function symmetricFromTriplets(
  n: number,
  rows: ArrayLike<number>,
  cols: ArrayLike<number>,
  values: ArrayLike<number>,
): SymmetricSparse {
  if (!Number.isInteger(n) || n < 0 || n > 0x7fffffff) {
    throw new RangeError(`symmetricFromTriplets: size n must be a non-negative integer, got ${n}`);
  }
  const count = rows.length;
  if (cols.length !== count || values.length !== count) {
    throw new RangeError(
      `symmetricFromTriplets: rows, cols and values must have the same length, got ${count}, ${cols.length} and ${values.length}`,
    );
  }
  const lo = new Int32Array(count);
  const hi = new Int32Array(count);
  for (let t = 0; t < count; t++) {
    const r = rows[t];
    const c = cols[t];
    const v = values[t];
    if (!Number.isInteger(r) || r < 0 || r >= n) {
      throw new RangeError(`symmetricFromTriplets: triplet ${t} has row ${r}, outside 0..${n - 1}`);
    }
    if (!Number.isInteger(c) || c < 0 || c >= n) {
      throw new RangeError(`symmetricFromTriplets: triplet ${t} has column ${c}, outside 0..${n - 1}`);
    }
    if (!Number.isFinite(v)) {
      throw new RangeError(`symmetricFromTriplets: triplet ${t} at (${r}, ${c}) has non-finite value ${v}`);
    }
    if (r >= c) {
      hi[t] = r;
      lo[t] = c;
    } else {
      hi[t] = c;
      lo[t] = r;
    }
  }

  // Two stable counting sorts (by row, then by column) leave each column's rows in
  // increasing order without a comparison sort.
  const rowStart = new Int32Array(n + 1);
  for (let t = 0; t < count; t++) rowStart[hi[t] + 1]++;
  for (let i = 0; i < n; i++) rowStart[i + 1] += rowStart[i];
  const byRow = new Int32Array(count);
  const fill = rowStart.slice(0, n);
  for (let t = 0; t < count; t++) byRow[fill[hi[t]]++] = t;

  const colStart = new Int32Array(n + 1);
  for (let t = 0; t < count; t++) colStart[lo[t] + 1]++;
  for (let j = 0; j < n; j++) colStart[j + 1] += colStart[j];
  const byCol = new Int32Array(count);
  const cfill = colStart.slice(0, n);
  for (let s = 0; s < count; s++) {
    const t = byRow[s];
    byCol[cfill[lo[t]]++] = t;
  }

  const colPtr = new Int32Array(n + 1);
  const rowIdxAll = new Int32Array(count);
  const valuesAll = new Float64Array(count);
  let nnz = 0;
  for (let j = 0; j < n; j++) {
    colPtr[j] = nnz;
    let last = -1;
    for (let s = colStart[j]; s < colStart[j + 1]; s++) {
      const t = byCol[s];
      const r = hi[t];
      if (r === last) {
        valuesAll[nnz - 1] += values[t];
      } else {
        rowIdxAll[nnz] = r;
        valuesAll[nnz] = values[t];
        nnz++;
        last = r;
      }
    }
  }
  colPtr[n] = nnz;
  return { n, colPtr, rowIdx: rowIdxAll.slice(0, nnz), values: valuesAll.slice(0, nnz) };
}

/**
 * out = A x for a lower-triangle-stored symmetric A (each off-diagonal entry acts in
 * both triangles).
 *
 * Guarantees: x is not modified; `out`, when given, is overwritten and returned (it must
 * not be x). Throws RangeError when x or out is not of length n.
 */
export function multiplySymmetric(A: SymmetricSparse, x: Float64Array, out?: Float64Array): Float64Array {
  const n = A.n;
  if (x.length !== n) throw new RangeError(`multiplySymmetric: x has length ${x.length}, expected ${n}`);
  const y = out ?? new Float64Array(n);
  if (y.length !== n) throw new RangeError(`multiplySymmetric: out has length ${y.length}, expected ${n}`);
  if (y === x) throw new RangeError('multiplySymmetric: out must not be the same array as x');
  y.fill(0);
  const { colPtr, rowIdx, values } = A;
  for (let j = 0; j < n; j++) {
    const xj = x[j];
    let sum = 0;
    for (let p = colPtr[j]; p < colPtr[j + 1]; p++) {
      const i = rowIdx[p];
      const v = values[p];
      y[i] += v * xj;
      if (i !== j) sum += v * x[i];
    }
    y[j] += sum;
  }
  return y;
}

/**
 * Checks that A is a well-formed SymmetricSparse (monotone column pointers, rows in
 * range, lower triangle, strictly increasing within each column). Used by the solver
 * before it trusts a hand-built matrix, since a malformed pattern would otherwise
 * surface as a wrong answer rather than an error.
 *
 * Throws RangeError naming the first defect found.
 */
export function assertSymmetricSparse(A: SymmetricSparse, who: string): void {
  const { n, colPtr, rowIdx, values } = A;
  if (!Number.isInteger(n) || n < 0) throw new RangeError(`${who}: matrix size ${n} is not a non-negative integer`);
  if (colPtr.length !== n + 1) {
    throw new RangeError(`${who}: colPtr has length ${colPtr.length}, expected n + 1 = ${n + 1}`);
  }
  const nnz = colPtr[n];
  if (colPtr[0] !== 0 || rowIdx.length < nnz || values.length < nnz) {
    throw new RangeError(`${who}: colPtr[0] must be 0 and rowIdx/values must hold colPtr[n] = ${nnz} entries`);
  }
  for (let j = 0; j < n; j++) {
    if (colPtr[j + 1] < colPtr[j]) throw new RangeError(`${who}: colPtr decreases at column ${j}`);
    let last = j - 1;
    for (let p = colPtr[j]; p < colPtr[j + 1]; p++) {
      const i = rowIdx[p];
      if (i <= last || i >= n) {
        throw new RangeError(
          `${who}: column ${j} has row ${i}; rows must lie in ${j}..${n - 1} (lower triangle) and strictly increase`,
        );
      }
      last = i;
    }
  }
}
