/**
 * Sparse Cholesky factorization P A Pᵀ = L Lᵀ for the field engine's symmetric
 * positive-definite systems, factored once per mesh and reused for many right-hand sides.
 *
 * Multifrontal and supernodal: columns of L with (nearly) the same pattern are grouped
 * into supernodes, each stored as dense blocks (a packed triangle and a row-major
 * rectangle below it), so the arithmetic runs in dense kernels over contiguous memory
 * instead of scattered scalar updates. Each supernode's contribution to its ancestors
 * (its Schur complement, the "update matrix") is kept on a stack; postorder guarantees a
 * parent finds its children's updates on top.
 *
 * Pure TypeScript on typed arrays: runs unchanged in a Web Worker and on the server.
 */
import { assertSymmetricSparse, type SymmetricSparse } from '../sparse';
import { graphOfSymmetric, minimumDegreeOrder, nestedDissectionOrder } from '../ordering/minimum-degree';
import { factorPanel, subtractGram } from './dense-kernels';

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

export interface CholeskyOptions {
  /**
   * Fill-reducing ordering. 'auto' (default) picks nested dissection for large matrices
   * and, for small ones, whichever of nested dissection and minimum degree gives the
   * smaller factor.
   */
  ordering?: 'auto' | 'nested-dissection' | 'minimum-degree' | 'natural';
}

export interface CholeskyAnalysisOptions extends CholeskyOptions {
  /**
   * A fill-reducing permutation computed beforehand (perm[k] = original index of the
   * k-th pivot), used instead of `ordering`. Must be a permutation of 0..n-1.
   */
  permutation?: Int32Array;
}

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
 * The pattern-only part of a factorization: ordering, supernodes, storage layout. Depends
 * on A's sparsity pattern only, so it can be reused for new values with `factorNumeric`.
 */
export interface CholeskySymbolic {
  readonly n: number;
  /** perm[k] = original index of the k-th pivot. */
  readonly perm: Int32Array;
  /** Exact entries of L for this ordering (diagonal included). */
  readonly nonZerosInFactor: number;
  /** Entries actually stored (supernodes are dense blocks; small ones are merged with a few zeros). */
  readonly storedEntries: number;
  readonly supernodeCount: number;
  /** Floating-point operations of the numeric factorization (multiply-adds count two). */
  readonly flops: number;
  /** @internal layout consumed by factorNumeric */
  readonly layout: SupernodalLayout;
}

interface SupernodalLayout {
  /** The pattern this analysis was made for, to refuse a different one in factorNumeric. */
  colPtr: Int32Array;
  rowIdx: Int32Array;
  /** supernode s owns pivots firstCol[s] .. firstCol[s+1]-1 */
  firstCol: Int32Array;
  /** rows of supernode s (pivot numbering): rows[rowPtr[s] .. rowPtr[s+1]), increasing */
  rowPtr: Int32Array;
  rows: Int32Array;
  /**
   * Supernode s's values start at valuePtr[s]: first its k×k diagonal block L₁₁, packed
   * lower triangle by rows (row i holds i+1 entries), then the r×k block L₂₁ below it,
   * by rows. Packing spares the upper half of each diagonal block, which on large
   * meshes is an eighth of the factor's memory.
   */
  valuePtr: Int32Array;
  /** largest k among supernodes, to size the dense scratch for one diagonal block */
  maxColumns: number;
  /** for each child's update row, its row position in the parent's front */
  relPtr: Int32Array;
  rel: Int32Array;
  /** number of leading update rows that fall into the parent's own pivot columns */
  relSplit: Int32Array;
  /** children of each supernode, in increasing order, as linked lists */
  childHead: Int32Array;
  childNext: Int32Array;
  /**
   * A's entries in factorization order: supernode s assembles entries
   * entryPtr[s] .. entryPtr[s+1]−1, adding values[entrySource[t]] at entryTarget[t]:
   * a position in L₂₁ if ≥ 0, else position −1−target in the unpacked diagonal block.
   * Assembling supernode by supernode touches L in order instead of at random.
   */
  entryPtr: Int32Array;
  entrySource: Int32Array;
  entryTarget: Int32Array;
  /** for each pivot, the position of A's diagonal entry, or -1 */
  diagonalEntry: Int32Array;
  stackSize: number;
}

const AUTO_COMPARE_LIMIT = 20000;
/** A Float64Array holds at most this many entries in V8 (4 GiB), and offsets stay int32. */
const MAX_STORED_ENTRIES = 2 ** 29;

/**
 * Symbolic analysis: fill-reducing ordering, elimination tree, column counts,
 * supernodes and the storage plan for L.
 *
 * Guarantees: the result depends only on the pattern of A (and the options); the exact
 * nonzero count of L is reported. Throws RangeError for a malformed matrix or permutation.
 */
export function analyzeCholesky(A: SymmetricSparse, options: CholeskyAnalysisOptions = {}): CholeskySymbolic {
  assertSymmetricSparse(A, 'analyzeCholesky');
  const perm = options.permutation
    ? checkedPermutation(options.permutation, A.n)
    : computeOrdering(A, options.ordering ?? 'auto');
  return analyzeWithPermutation(A, perm);
}

/**
 * The fill-reducing permutation `analyzeCholesky` would use (perm[k] = original index of
 * the k-th pivot). Exposed so callers can time or cache the ordering on its own.
 * Guarantees a permutation of 0..n−1 that depends only on A's pattern; throws
 * RangeError for an unknown ordering name.
 */
export function computeOrdering(
  A: SymmetricSparse,
  ordering: NonNullable<CholeskyOptions['ordering']> = 'auto',
): Int32Array {
  const n = A.n;
  if (ordering === 'natural') {
    const perm = new Int32Array(n);
    for (let i = 0; i < n; i++) perm[i] = i;
    return perm;
  }
  const graph = graphOfSymmetric(A);
  if (ordering === 'minimum-degree') return minimumDegreeOrder(graph);
  if (ordering === 'nested-dissection') return nestedDissectionOrder(graph);
  if (ordering !== 'auto') throw new RangeError(`Unknown ordering '${String(ordering)}'`);
  const nd = nestedDissectionOrder(graph);
  if (n > AUTO_COMPARE_LIMIT) return nd;
  // Small matrices: trying both costs little and minimum degree often wins there.
  const md = minimumDegreeOrder(graph);
  return factorNonZeros(A, md) < factorNonZeros(A, nd) ? md : nd;
}

function checkedPermutation(perm: Int32Array, n: number): Int32Array {
  if (perm.length !== n) throw new RangeError(`permutation has length ${perm.length}, expected ${n}`);
  const seen = new Uint8Array(n);
  for (let k = 0; k < n; k++) {
    const v = perm[k];
    if (!(v >= 0 && v < n) || seen[v]) throw new RangeError(`permutation is not a permutation of 0..${n - 1} (entry ${k} = ${v})`);
    seen[v] = 1;
  }
  return perm;
}

/** Lower-triangle pattern of P A Pᵀ by columns (rows > column only), with A's entry index. */
function permutedLower(A: SymmetricSparse, inverse: Int32Array, withSource: boolean) {
  const { n, colPtr, rowIdx } = A;
  const count = new Int32Array(n + 1);
  for (let j = 0; j < n; j++) {
    const pj = inverse[j];
    for (let q = colPtr[j]; q < colPtr[j + 1]; q++) {
      const pi = inverse[rowIdx[q]];
      if (pi !== pj) count[Math.min(pi, pj) + 1]++;
    }
  }
  for (let j = 0; j < n; j++) count[j + 1] += count[j];
  const ptr = count;
  const idx = new Int32Array(ptr[n]);
  const src = withSource ? new Int32Array(ptr[n]) : idx;
  const fill = ptr.slice(0, n);
  for (let j = 0; j < n; j++) {
    const pj = inverse[j];
    for (let q = colPtr[j]; q < colPtr[j + 1]; q++) {
      const pi = inverse[rowIdx[q]];
      if (pi === pj) continue;
      const col = Math.min(pi, pj);
      const at = fill[col]++;
      idx[at] = Math.max(pi, pj);
      if (withSource) src[at] = q;
    }
  }
  return { ptr, idx, src };
}

function inversePermutation(perm: Int32Array): Int32Array {
  const inverse = new Int32Array(perm.length);
  for (let k = 0; k < perm.length; k++) inverse[perm[k]] = k;
  return inverse;
}

/**
 * Elimination tree from the lower pattern (column j lists rows i > j): parent[j] is the
 * first row below j in column j of L. Each row's entries are walked up the tree with
 * path compression, visiting column entries in increasing row order via a row-wise pass.
 */
function eliminationTree(n: number, ptr: Int32Array, idx: Int32Array): Int32Array {
  // Liu's algorithm needs, for each k, the columns j < k with an entry in row k: that is
  // the transpose of the lower pattern.
  const rowCount = new Int32Array(n + 1);
  for (let q = 0; q < ptr[n]; q++) rowCount[idx[q] + 1]++;
  for (let i = 0; i < n; i++) rowCount[i + 1] += rowCount[i];
  const rowCols = new Int32Array(ptr[n]);
  const fill = rowCount.slice(0, n);
  for (let j = 0; j < n; j++) for (let q = ptr[j]; q < ptr[j + 1]; q++) rowCols[fill[idx[q]]++] = j;

  const parent = new Int32Array(n).fill(-1);
  const ancestor = new Int32Array(n).fill(-1);
  for (let k = 0; k < n; k++) {
    for (let q = rowCount[k]; q < rowCount[k + 1]; q++) {
      let r = rowCols[q];
      while (r !== -1 && r !== k) {
        const next = ancestor[r];
        ancestor[r] = k;
        if (next === -1) {
          parent[r] = k;
          break;
        }
        r = next;
      }
    }
  }
  return parent;
}

/** A postorder of the forest: post[k] = the k-th node; children visited in increasing order. */
function postorder(parent: Int32Array): Int32Array {
  const n = parent.length;
  const head = new Int32Array(n).fill(-1);
  const next = new Int32Array(n).fill(-1);
  for (let j = n - 1; j >= 0; j--) {
    const p = parent[j];
    if (p >= 0) {
      next[j] = head[p];
      head[p] = j;
    }
  }
  const post = new Int32Array(n);
  const stack = new Int32Array(n);
  let k = 0;
  for (let root = 0; root < n; root++) {
    if (parent[root] !== -1) continue;
    let top = 0;
    stack[0] = root;
    while (top >= 0) {
      const v = stack[top];
      const child = head[v];
      if (child === -1) {
        post[k++] = v;
        top--;
      } else {
        head[v] = next[child];
        stack[++top] = child;
      }
    }
  }
  return post;
}

/**
 * Column counts of L (diagonal included) for a postordered elimination tree, in
 * near-linear time: every row i contributes +1 to the columns of its row subtree, which
 * is the union of the tree paths from the columns j < i of row i up to i. Placing +1 at
 * each leaf of that subtree, −1 at the lowest common ancestor of consecutive leaves and
 * −1 above its root, the count of column j is the sum over j's subtree.
 */
function columnCounts(n: number, parent: Int32Array, ptr: Int32Array, idx: Int32Array): Int32Array {
  const first = new Int32Array(n).fill(-1);
  const delta = new Int32Array(n);
  for (let j = 0; j < n; j++) {
    // postorder: descendants of j precede j, so walking up from j marks their first descendant
    let v = j;
    delta[j] = first[j] === -1 ? 1 : 0;
    while (v !== -1 && first[v] === -1) {
      first[v] = j;
      v = parent[v];
    }
  }
  const previousColumn = new Int32Array(n).fill(-1); // last column seen in each row
  const prevLeaf = new Int32Array(n).fill(-1);
  const setParent = new Int32Array(n);
  for (let v = 0; v < n; v++) setParent[v] = v;
  const find = (v: number): number => {
    let root = v;
    while (setParent[root] !== root) root = setParent[root];
    while (setParent[v] !== root) {
      const up = setParent[v];
      setParent[v] = root;
      v = up;
    }
    return root;
  };
  for (let j = 0; j < n; j++) {
    if (parent[j] !== -1) delta[parent[j]]--;
    for (let q = ptr[j]; q < ptr[j + 1]; q++) {
      const i = idx[q];
      // j is a leaf of row i's subtree iff no earlier column of row i lies in j's subtree
      if (first[j] > previousColumn[i]) {
        previousColumn[i] = j;
        delta[j]++;
        const prev = prevLeaf[i];
        if (prev !== -1) delta[find(prev)]--;
        prevLeaf[i] = j;
      } else {
        previousColumn[i] = j;
      }
    }
    if (parent[j] !== -1) setParent[j] = parent[j];
  }
  const counts = delta;
  for (let j = 0; j < n; j++) if (parent[j] !== -1) counts[parent[j]] += counts[j];
  return counts;
}

/** nnz(L) for the given ordering, from the column counts alone. */
function factorNonZeros(A: SymmetricSparse, perm: Int32Array): number {
  const { counts } = postorderedStructure(A, perm, false);
  let total = 0;
  for (let j = 0; j < A.n; j++) total += counts[j];
  return total;
}

/**
 * The ordering perm0 refined by a postorder of its elimination tree, which changes no
 * fill but makes every subtree, and so every supernode, a contiguous range of pivots;
 * with the permuted lower pattern, the tree and the column counts in that final order.
 */
function postorderedStructure(A: SymmetricSparse, perm0: Int32Array, withSource: boolean) {
  const n = A.n;
  const lower0 = permutedLower(A, inversePermutation(perm0), false);
  const parent0 = eliminationTree(n, lower0.ptr, lower0.idx);
  const post = postorder(parent0);
  const perm = new Int32Array(n);
  for (let k = 0; k < n; k++) perm[k] = perm0[post[k]];
  const inverse = inversePermutation(perm);
  const parent = relabelTree(parent0, post);
  const lower = permutedLower(A, inverse, withSource);
  const counts = columnCounts(n, parent, lower.ptr, lower.idx);
  return { perm, inverse, parent, lower, counts };
}

function relabelTree(parent: Int32Array, post: Int32Array): Int32Array {
  const n = parent.length;
  const rank = inversePermutation(post);
  const out = new Int32Array(n);
  for (let k = 0; k < n; k++) {
    const p = parent[post[k]];
    out[k] = p === -1 ? -1 : rank[p];
  }
  return out;
}

function analyzeWithPermutation(A: SymmetricSparse, perm0: Int32Array): CholeskySymbolic {
  // Each step is its own function: V8 optimizes a long one-shot function loop by loop,
  // recompiling all of it each time, which made cold analyses several times slower.
  const n = A.n;
  const { perm, inverse, parent, lower, counts } = postorderedStructure(A, perm0, true);
  let nonZeros = 0;
  for (let j = 0; j < n; j++) nonZeros += counts[j];

  const firstCol = findSupernodes(n, parent, counts);
  const tree = supernodeTree(n, firstCol, parent);
  const { rowPtr, rows } = supernodeRows(n, firstCol, counts, tree, lower);
  const { valuePtr, flops, maxColumns } = storagePlan(firstCol, rowPtr);
  const assembly = assemblyPlan(A, inverse, firstCol, rowPtr, rows, valuePtr, tree, lower);
  const stackSize = stackPlan(firstCol, rowPtr, tree);
  const supernodes = firstCol.length - 1;
  return {
    n,
    perm,
    nonZerosInFactor: nonZeros,
    storedEntries: valuePtr[supernodes],
    supernodeCount: supernodes,
    flops,
    layout: {
      colPtr: A.colPtr,
      rowIdx: A.rowIdx,
      firstCol,
      rowPtr,
      rows,
      valuePtr,
      maxColumns,
      childHead: tree.childHead,
      childNext: tree.childNext,
      ...assembly,
      stackSize,
    },
  };
}

/**
 * Supernodes as ranges of pivots (firstCol[s] .. firstCol[s+1]−1). Fundamental ones
 * first — j+1 continues j's supernode when j is its only child and their columns share a
 * pattern — then relaxed amalgamation merges a supernode into its parent when the parent
 * immediately follows it and the explicit zeros this adds stay few: small dense blocks
 * waste more time in loop overhead than a few zeros cost.
 */
function findSupernodes(n: number, parent: Int32Array, counts: Int32Array): Int32Array {
  const childCount = new Int32Array(n);
  for (let j = 0; j < n; j++) if (parent[j] !== -1) childCount[parent[j]]++;
  const start = new Int32Array(n + 1);
  const exactCount = new Float64Array(n + 1); // exact nonzeros of the columns merged so far
  let groups = 0;
  let j = 0;
  while (j < n) {
    const first = j;
    let exact = counts[j];
    j++;
    while (j < n && parent[j - 1] === j && childCount[j] === 1 && counts[j - 1] === counts[j] + 1) {
      exact += counts[j];
      j++;
    }
    const last = j - 1;
    if (groups > 0 && parent[first - 1] === first) {
      const cols = last - start[groups - 1] + 1;
      const below = counts[last] - 1;
      const dense = cols * below + (cols * (cols + 1)) / 2;
      const total = exact + exactCount[groups - 1];
      if (acceptMerge(cols, (dense - total) / dense)) {
        exactCount[groups - 1] = total;
        continue;
      }
    }
    start[groups] = first;
    exactCount[groups] = exact;
    groups++;
  }
  start[groups] = n;
  return start.slice(0, groups + 1);
}

interface SupernodeTree {
  superParent: Int32Array;
  /** children of each supernode in increasing order, as linked lists */
  childHead: Int32Array;
  childNext: Int32Array;
}

function supernodeTree(n: number, firstCol: Int32Array, parent: Int32Array): SupernodeTree {
  const supernodes = firstCol.length - 1;
  const superOf = new Int32Array(n);
  for (let s = 0; s < supernodes; s++) for (let j = firstCol[s]; j < firstCol[s + 1]; j++) superOf[j] = s;
  const superParent = new Int32Array(supernodes);
  for (let s = 0; s < supernodes; s++) {
    const p = parent[firstCol[s + 1] - 1];
    superParent[s] = p === -1 ? -1 : superOf[p];
  }
  const childHead = new Int32Array(supernodes).fill(-1);
  const childNext = new Int32Array(supernodes).fill(-1);
  for (let s = supernodes - 1; s >= 0; s--) {
    const p = superParent[s];
    if (p !== -1) {
      childNext[s] = childHead[p];
      childHead[p] = s;
    }
  }
  return { superParent, childHead, childNext };
}

/** Row pattern of each supernode: its own pivots, A's entries below them, and its children's rows. */
function supernodeRows(
  n: number,
  firstCol: Int32Array,
  counts: Int32Array,
  tree: SupernodeTree,
  lower: { ptr: Int32Array; idx: Int32Array },
): { rowPtr: Int32Array; rows: Int32Array } {
  const supernodes = firstCol.length - 1;
  const rowPtr = new Int32Array(supernodes + 1);
  for (let s = 0; s < supernodes; s++) {
    const k = firstCol[s + 1] - firstCol[s];
    rowPtr[s + 1] = rowPtr[s] + k + counts[firstCol[s + 1] - 1] - 1;
  }
  const rows = new Int32Array(rowPtr[supernodes]);
  const { childHead, childNext } = tree;
  const marker = new Int32Array(n).fill(-1);
  for (let s = 0; s < supernodes; s++) {
    const f = firstCol[s];
    const l = firstCol[s + 1] - 1;
    let at = rowPtr[s];
    for (let j = f; j <= l; j++) {
      rows[at++] = j;
      marker[j] = s;
    }
    for (let q = lower.ptr[f]; q < lower.ptr[l + 1]; q++) {
      const i = lower.idx[q];
      if (marker[i] !== s) {
        marker[i] = s;
        rows[at++] = i;
      }
    }
    for (let c = childHead[s]; c !== -1; c = childNext[c]) {
      const ck = firstCol[c + 1] - firstCol[c];
      for (let q = rowPtr[c] + ck; q < rowPtr[c + 1]; q++) {
        const i = rows[q];
        if (i > l && marker[i] !== s) {
          marker[i] = s;
          rows[at++] = i;
        }
      }
    }
    if (at !== rowPtr[s + 1]) {
      throw new Error(`internal: supernode ${s} has ${at - rowPtr[s]} rows, expected ${rowPtr[s + 1] - rowPtr[s]}`);
    }
    rows.subarray(rowPtr[s] + (l - f + 1), at).sort();
  }
  return { rowPtr, rows };
}

/**
 * Where each supernode's values start, and the factorization's flop count. Offsets are
 * int32 on purpose: V8 compiles index arithmetic that has ever seen a non-integer-typed
 * number into much slower code, which the dense kernels feel.
 */
function storagePlan(firstCol: Int32Array, rowPtr: Int32Array): { valuePtr: Int32Array; flops: number; maxColumns: number } {
  const supernodes = firstCol.length - 1;
  const valuePtr = new Int32Array(supernodes + 1);
  let flops = 0;
  let stored = 0;
  let maxColumns = 0;
  for (let s = 0; s < supernodes; s++) {
    const k = firstCol[s + 1] - firstCol[s];
    const m = rowPtr[s + 1] - rowPtr[s];
    const r = m - k;
    stored += ((k * (k + 1)) >> 1) + r * k;
    if (stored > MAX_STORED_ENTRIES) {
      throw new RangeError(
        `analyzeCholesky: the factor would need more than ${MAX_STORED_ENTRIES} entries; the matrix is too large to factor in memory`,
      );
    }
    valuePtr[s + 1] = stored;
    // k³/3 for the diagonal block, r·k² for the panel solve, r²·k for the update
    flops += (k * k * k) / 3 + r * k * k + r * r * k;
    if (k > maxColumns) maxColumns = k;
  }
  return { valuePtr, flops, maxColumns };
}

/**
 * How the numeric phase assembles each front: for every child's update row, its row in
 * the parent's front (rel), how many of them are the parent's own pivots (relSplit), and
 * where A's entries go (entryPtr/entrySource/entryTarget, see SupernodalLayout).
 */
function assemblyPlan(
  A: SymmetricSparse,
  inverse: Int32Array,
  firstCol: Int32Array,
  rowPtr: Int32Array,
  rows: Int32Array,
  valuePtr: Int32Array,
  tree: SupernodeTree,
  lower: { ptr: Int32Array; idx: Int32Array; src: Int32Array },
) {
  const n = A.n;
  const supernodes = firstCol.length - 1;
  const { superParent, childHead, childNext } = tree;
  const relPtr = new Int32Array(supernodes + 1);
  for (let s = 0; s < supernodes; s++) {
    const k = firstCol[s + 1] - firstCol[s];
    const m = rowPtr[s + 1] - rowPtr[s];
    relPtr[s + 1] = relPtr[s] + (superParent[s] === -1 ? 0 : m - k);
  }
  const rel = new Int32Array(relPtr[supernodes]);
  const relSplit = new Int32Array(supernodes);
  const position = new Int32Array(n);
  const entryPtr = new Int32Array(supernodes + 1);
  const entrySource = new Int32Array(A.colPtr[n]);
  const entryTarget = new Int32Array(A.colPtr[n]);
  const diagonalEntry = new Int32Array(n).fill(-1);
  for (let j = 0; j < n; j++) {
    for (let q = A.colPtr[j]; q < A.colPtr[j + 1]; q++) if (A.rowIdx[q] === j) diagonalEntry[inverse[j]] = q;
  }
  let entries = 0;
  for (let s = 0; s < supernodes; s++) {
    const f = firstCol[s];
    const k = firstCol[s + 1] - f;
    for (let q = rowPtr[s]; q < rowPtr[s + 1]; q++) position[rows[q]] = q - rowPtr[s];
    for (let c = childHead[s]; c !== -1; c = childNext[c]) {
      const ck = firstCol[c + 1] - firstCol[c];
      let split = 0;
      for (let q = rowPtr[c] + ck, t = relPtr[c]; q < rowPtr[c + 1]; q++, t++) {
        const pos = position[rows[q]];
        rel[t] = pos;
        if (pos < k) split++;
      }
      relSplit[c] = split;
    }
    const below = valuePtr[s] + ((k * (k + 1)) >> 1) - k * k; // row p ≥ k starts at below + p·k
    entryPtr[s] = entries;
    for (let j = f; j < f + k; j++) {
      const c = j - f;
      const dq = diagonalEntry[j];
      if (dq >= 0) {
        entrySource[entries] = dq;
        entryTarget[entries++] = -1 - (c * k + c);
      }
      for (let q = lower.ptr[j]; q < lower.ptr[j + 1]; q++) {
        const p = position[lower.idx[q]];
        entrySource[entries] = lower.src[q];
        entryTarget[entries++] = p < k ? -1 - (p * k + c) : below + p * k + c;
      }
    }
  }
  entryPtr[supernodes] = entries;
  return { relPtr, rel, relSplit, entryPtr, entrySource, entryTarget, diagonalEntry };
}

/** Peak size of the update-matrix stack, by simulating the factorization order. */
function stackPlan(firstCol: Int32Array, rowPtr: Int32Array, tree: SupernodeTree): number {
  const supernodes = firstCol.length - 1;
  let stackTop = 0;
  let stackSize = 0;
  const updateAt = new Int32Array(supernodes);
  for (let s = 0; s < supernodes; s++) {
    const k = firstCol[s + 1] - firstCol[s];
    const r = rowPtr[s + 1] - rowPtr[s] - k;
    const firstChild = tree.childHead[s];
    const base = firstChild === -1 ? stackTop : updateAt[firstChild];
    stackSize = Math.max(stackSize, stackTop + r * r);
    if (stackSize > MAX_STORED_ENTRIES) {
      throw new RangeError('analyzeCholesky: the update matrices would not fit in memory; the matrix is too large to factor');
    }
    updateAt[s] = base;
    stackTop = base + r * r;
  }
  return stackSize;
}

/** How many explicit zeros a merged supernode of `cols` columns may carry. */
function acceptMerge(cols: number, zeroFraction: number): boolean {
  if (cols <= 4) return true;
  if (cols <= 16) return zeroFraction < 0.5;
  if (cols <= 48) return zeroFraction < 0.1;
  return zeroFraction < 0.05;
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
    stack.fill(0, uAt, uAt + r * r);
    for (let c = firstChild; c !== -1; c = childNext[c]) {
      const ck = firstCol[c + 1] - firstCol[c];
      const cr = rowPtr[c + 1] - rowPtr[c] - ck;
      extendAdd(stack, updateAt[c], cr, rel, relPtr[c], relSplit[c], D, L, below, k, stack, uAt, r);
    }
    const bad = factorPanel(D, L, below, k, r, pivotFloor, f, failedPivot);
    if (bad >= 0) throw new NotPositiveDefiniteError(symbolic.perm[f + bad], failedPivot[0]);
    for (let i = 0, t = off; i < k; i++) {
      const row = i * k;
      for (let j = 0; j <= i; j++) L[t++] = D[row + j];
    }
    if (r > 0) subtractGram(stack, uAt, r, r, L, below, k, k);
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
 * Adds a child's update matrix (cr×cr, lower part) into its parent's front: rows that are
 * the parent's own pivots go to the unpacked diagonal block D (k×k), other rows' pivot
 * columns to L₂₁ (row p ≥ k at below + (p−k)·k), the rest to the parent's update matrix.
 */
function extendAdd(
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
  stack: Float64Array,
  uAt: number,
  r: number,
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
      const uRow = uAt + (ra - k) * r - k;
      for (let b = split; b <= a; b++) stack[uRow + rel[relAt + b]] += child[src + b];
    }
  }
}

class SupernodalFactor implements CholeskyFactor {
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

/**
 * Orders, analyses and factors A in one call: A = Pᵀ L Lᵀ P.
 *
 * Guarantees: as `analyzeCholesky` then `factorNumeric`. Throws RangeError for a
 * malformed matrix, NotPositiveDefiniteError when A is not (numerically) positive definite.
 */
export function factorCholesky(A: SymmetricSparse, options: CholeskyOptions = {}): CholeskyFactor {
  return factorNumeric(analyzeCholesky(A, options), A);
}
