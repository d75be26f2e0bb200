/**
 * The elimination tree of P A Pᵀ, its postorder and the column counts of L: the structure of
 * the factor, computed from A's pattern in near-linear time without forming L.
 */
import type { SymmetricSparse } from '../sparse';

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
export function factorNonZeros(A: SymmetricSparse, perm: Int32Array): number {
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
export function postorderedStructure(A: SymmetricSparse, perm0: Int32Array, withSource: boolean) {
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
