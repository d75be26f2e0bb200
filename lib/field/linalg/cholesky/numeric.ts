/**
 * Numeric factorization: the values of L for a symbolic analysis, supernode by supernode in
 * postorder, each front assembled from A's entries and its children's update matrices and
 * factored by the dense kernels.
 */
import type { SymmetricSparse } from '../sparse';
import { factorPanel, negatedGram } from './dense-kernels';
import { SupernodalFactor, type CholeskyFactor } from './solve';
import type { CholeskySymbolic, SupernodalLayout } from './symbolic';

/** Thrown when A has no Cholesky factor: a pivot is zero, negative, or lost to rounding. */
export class NotPositiveDefiniteError extends Error {
  /** Column (and row) of A, in the caller's numbering, where elimination broke down. */
  readonly column: number;
  constructor(column: number, pivot: number) {
    super(
      `Matrix is not positive definite: the pivot of column ${column} is ${pivot} after eliminating the columns before it ` +
        '(is the matrix singular, e.g. a Laplacian with no Dirichlet vertex in some component?)',
    );
    this.name = 'NotPositiveDefiniteError';
    this.column = column;
  }
}

/**
 * Numeric factorization of A with a symbolic analysis made for A's pattern (the values
 * may differ from those analysed).
 *
 * Guarantees: on success, the factor solves A x = b to working precision (backward
 * stable for SPD A). Throws NotPositiveDefiniteError naming the column where a pivot is
 * not safely positive (≤ n·ε·|a_jj|, or not finite) — never returns a factor that would
 * yield NaN. Throws RangeError when A's pattern is not the analysed one.
 */
export function factorNumeric(symbolic: CholeskySymbolic, A: SymmetricSparse): CholeskyFactor {
  const lay = symbolic.layout;
  const n = symbolic.n;
  if (A.n !== n || !samePattern(lay, A)) {
    throw new RangeError('factorNumeric: A does not have the sparsity pattern the symbolic analysis was made for');
  }
  const supernodes = symbolic.supernodeCount;
  const { firstCol, rowPtr, valuePtr, relPtr, rel, relSplit, entryPtr, entrySource, entryTarget, diagonalEntry } = lay;
  const L = new Float64Array(valuePtr[supernodes]);
  const aValues = A.values;
  const stack = new Float64Array(lay.stackSize);
  const updateAt = new Int32Array(supernodes);
  const { childHead, childNext } = lay;
  // A pivot this small relative to its diagonal is rounding noise on a singular matrix.
  const pivotFloor = new Float64Array(n);
  for (let j = 0; j < n; j++) {
    const q = diagonalEntry[j];
    pivotFloor[j] = q >= 0 ? n * 2.220446049250313e-16 * Math.abs(aValues[q]) : 0;
  }
  const failedPivot = new Float64Array(1);
  // the diagonal block being factored, unpacked to full rows for the dense kernels
  const D = new Float64Array(lay.maxColumns * lay.maxColumns);
  let stackTop = 0;
  for (let s = 0; s < supernodes; s++) {
    const f = firstCol[s];
    const k = firstCol[s + 1] - f;
    const m = rowPtr[s + 1] - rowPtr[s];
    const r = m - k;
    const off = valuePtr[s];
    const below = off + ((k * (k + 1)) >> 1);
    D.fill(0, 0, k * k);
    for (let t = entryPtr[s]; t < entryPtr[s + 1]; t++) {
      const target = entryTarget[t];
      if (target >= 0) L[target] += aValues[entrySource[t]];
      else D[-1 - target] += aValues[entrySource[t]];
    }
    const firstChild = childHead[s];
    const base = firstChild === -1 ? stackTop : updateAt[firstChild];
    // the new update matrix goes above the children's, then slides down over them
    const uAt = stackTop;
    for (let c = firstChild; c !== -1; c = childNext[c]) {
      const ck = firstCol[c + 1] - firstCol[c];
      const cr = rowPtr[c + 1] - rowPtr[c] - ck;
      addToPivots(stack, updateAt[c], cr, rel, relPtr[c], relSplit[c], D, L, below, k);
    }
    const bad = factorPanel(D, L, below, k, r, pivotFloor, f, failedPivot);
    if (bad >= 0) throw new NotPositiveDefiniteError(symbolic.perm[f + bad], failedPivot[0]);
    for (let i = 0, t = off; i < k; i++) {
      const row = i * k;
      for (let j = 0; j <= i; j++) L[t++] = D[row + j];
    }
    if (r > 0) {
      // written rather than subtracted, so the children's parts are added after it
      negatedGram(stack, uAt, r, r, L, below, k, k);
      for (let c = firstChild; c !== -1; c = childNext[c]) {
        const ck = firstCol[c + 1] - firstCol[c];
        const cr = rowPtr[c + 1] - rowPtr[c] - ck;
        addToUpdate(stack, updateAt[c], cr, rel, relPtr[c], relSplit[c], uAt, r, k);
      }
    }
    if (uAt !== base) stack.copyWithin(base, uAt, uAt + r * r);
    updateAt[s] = base;
    stackTop = base + r * r;
  }
  return new SupernodalFactor(symbolic, L);
}

function samePattern(lay: SupernodalLayout, A: SymmetricSparse): boolean {
  if (lay.colPtr === A.colPtr && lay.rowIdx === A.rowIdx) return true;
  const n = A.n;
  if (A.colPtr.length !== lay.colPtr.length || A.colPtr[n] !== lay.colPtr[n]) return false;
  for (let j = 0; j <= n; j++) if (A.colPtr[j] !== lay.colPtr[j]) return false;
  for (let q = 0; q < A.colPtr[n]; q++) if (A.rowIdx[q] !== lay.rowIdx[q]) return false;
  return true;
}

/**
 * Adds the part of a child's update matrix (cr×cr, lower part) that falls in its parent's
 * pivot columns: rows that are the parent's own pivots go to the unpacked diagonal block D
 * (k×k), the pivot columns of other rows to L₂₁ (row p ≥ k at below + (p−k)·k).
 */
function addToPivots(
  child: Float64Array,
  childAt: number,
  cr: number,
  rel: Int32Array,
  relAt: number,
  split: number,
  D: Float64Array,
  L: Float64Array,
  below: number,
  k: number,
): void {
  for (let a = 0; a < cr; a++) {
    const ra = rel[relAt + a];
    const src = childAt + a * cr;
    if (a < split) {
      const dRow = ra * k;
      for (let b = 0; b <= a; b++) D[dRow + rel[relAt + b]] += child[src + b];
    } else {
      const panelRow = below + (ra - k) * k;
      for (let b = 0; b < split; b++) L[panelRow + rel[relAt + b]] += child[src + b];
    }
  }
}

/** Adds the rest of a child's update matrix, rows and columns beyond the parent's pivots, into the parent's (r×r at uAt). */
function addToUpdate(
  stack: Float64Array,
  childAt: number,
  cr: number,
  rel: Int32Array,
  relAt: number,
  split: number,
  uAt: number,
  r: number,
  k: number,
): void {
  for (let a = split; a < cr; a++) {
    const src = childAt + a * cr;
    const uRow = uAt + (rel[relAt + a] - k) * r - k;
    for (let b = split; b <= a; b++) stack[uRow + rel[relAt + b]] += stack[src + b];
  }
}
