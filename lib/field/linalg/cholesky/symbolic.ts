/**
 * Symbolic analysis of a sparse Cholesky factorization: everything that depends on the pattern
 * of A only (ordering, elimination tree, supernodes, storage and assembly plans), done once so
 * that new values of the same pattern cost only the numeric factorization.
 */
import { assertSymmetricSparse, type SymmetricSparse } from '../sparse';
import { graphOfSymmetric } from '../ordering/graph';
import { minimumDegreeOrder } from '../ordering/minimum-degree';
import { nestedDissectionOrder } from '../ordering/nested-dissection';
import { factorNonZeros, postorderedStructure } from './elimination-tree';
import { assemblyPlan, findSupernodes, stackPlan, storagePlan, supernodeRows, supernodeTree } from './supernodes';

export interface CholeskyOptions {
  /**
   * Fill-reducing ordering. 'auto' (default) picks nested dissection for large matrices
   * and, for small ones, whichever of nested dissection and minimum degree gives the
   * smaller factor.
   */
  ordering?: 'auto' | 'nested-dissection' | 'minimum-degree' | 'natural';
  /**
   * A point in space (x, y, z) per row, when A comes from a mesh: nested dissection then also
   * tries plane cuts (see NestedDissectionOptions.points). The pattern alone still decides
   * everything else.
   */
  points?: Float64Array;
}

export interface CholeskyAnalysisOptions extends CholeskyOptions {
  /**
   * A fill-reducing permutation computed beforehand (perm[k] = original index of the
   * k-th pivot), used instead of `ordering`. Must be a permutation of 0..n-1.
   */
  permutation?: Int32Array;
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

export interface SupernodalLayout {
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
    : computeOrdering(A, options.ordering ?? 'auto', options.points);
  return analyzeWithPermutation(A, perm);
}

/**
 * The fill-reducing permutation `analyzeCholesky` would use (perm[k] = original index of
 * the k-th pivot). Exposed so callers can time or cache the ordering on its own.
 * Guarantees a permutation of 0..n−1 that depends only on A's pattern (and `points`, when
 * given); throws RangeError for an unknown ordering name or a points array of the wrong length.
 */
export function computeOrdering(
  A: SymmetricSparse,
  ordering: NonNullable<CholeskyOptions['ordering']> = 'auto',
  points?: Float64Array,
): Int32Array {
  const n = A.n;
  if (ordering === 'natural') {
    const perm = new Int32Array(n);
    for (let i = 0; i < n; i++) perm[i] = i;
    return perm;
  }
  const graph = graphOfSymmetric(A);
  if (ordering === 'minimum-degree') return minimumDegreeOrder(graph);
  if (ordering === 'nested-dissection') return nestedDissectionOrder(graph, { points });
  if (ordering !== 'auto') throw new RangeError(`Unknown ordering '${String(ordering)}'`);
  const nd = nestedDissectionOrder(graph, { points });
  if (n > AUTO_COMPARE_LIMIT) return nd;
  // Small matrices: trying both costs little and minimum degree often wins there.
  const md = minimumDegreeOrder(graph);
  return factorNonZeros(A, md) < factorNonZeros(A, nd) ? md : nd;
}

/**
 * Why `perm` is not a permutation of 0..n−1 (wrong length, an entry out of range or repeated),
 * or null when it is one. Linear in n; reads nothing but `perm`, so it may be given any bytes.
 */
export function permutationFault(perm: ArrayLike<number>, n: number): string | null {
  if (perm.length !== n) return `it has length ${perm.length}, expected ${n}`;
  const seen = new Uint8Array(n);
  for (let k = 0; k < n; k++) {
    const v = perm[k];
    if (!(v >= 0 && v < n) || seen[v]) return `entry ${k} is ${v}, which is ${v >= 0 && v < n ? 'repeated' : `outside 0..${n - 1}`}`;
    seen[v] = 1;
  }
  return null;
}

function checkedPermutation(perm: Int32Array, n: number): Int32Array {
  const fault = permutationFault(perm, n);
  if (fault) throw new RangeError(`permutation is not a permutation of 0..${n - 1}: ${fault}`);
  return perm;
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
