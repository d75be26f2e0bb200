/**
 * Supernodes and the plans the numeric factorization follows: which pivots share a dense block,
 * each block's rows, where its values are stored, how children's updates and A's entries are
 * assembled into it, and how deep the update-matrix stack gets.
 */
import type { SymmetricSparse } from '../sparse';

/** A Float64Array holds at most this many entries in V8 (4 GiB), and offsets stay int32. */
const MAX_STORED_ENTRIES = 2 ** 29;

/**
 * Supernodes as ranges of pivots (firstCol[s] .. firstCol[s+1]−1). Fundamental ones
 * first — j+1 continues j's supernode when j is its only child and their columns share a
 * pattern — then relaxed amalgamation merges a supernode into its parent when the parent
 * immediately follows it and the explicit zeros this adds stay few: small dense blocks
 * waste more time in loop overhead than a few zeros cost.
 */
export function findSupernodes(n: number, parent: Int32Array, counts: Int32Array): Int32Array {
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

export interface SupernodeTree {
  superParent: Int32Array;
  /** children of each supernode in increasing order, as linked lists */
  childHead: Int32Array;
  childNext: Int32Array;
}

export function supernodeTree(n: number, firstCol: Int32Array, parent: Int32Array): SupernodeTree {
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
export function supernodeRows(
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
export function storagePlan(firstCol: Int32Array, rowPtr: Int32Array): { valuePtr: Int32Array; flops: number; maxColumns: number } {
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
export function assemblyPlan(
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
export function stackPlan(firstCol: Int32Array, rowPtr: Int32Array, tree: SupernodeTree): number {
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
