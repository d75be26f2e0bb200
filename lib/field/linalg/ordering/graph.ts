/**
 * The graph a fill-reducing ordering works on: the off-diagonal pattern of a symmetric sparse
 * matrix as undirected adjacency lists, shared by the minimum degree and nested dissection
 * orderings.
 */
import type { SymmetricSparse } from '../sparse';

/** An undirected graph without self-loops, in compressed adjacency form. */
export interface AdjacencyGraph {
  readonly n: number;
  /** Neighbours of v are `adjacency[offsets[v] .. offsets[v+1])`. */
  readonly offsets: Int32Array;
  readonly adjacency: Int32Array;
}

/**
 * The graph of a symmetric matrix's off-diagonal pattern (both directions, no self-loops).
 * Guarantees each edge {i, j} of the stored lower triangle appears in both lists.
 */
export function graphOfSymmetric(A: SymmetricSparse): AdjacencyGraph {
  const { n, colPtr, rowIdx } = A;
  const degree = new Int32Array(n + 1);
  for (let j = 0; j < n; j++) {
    for (let p = colPtr[j]; p < colPtr[j + 1]; p++) {
      const i = rowIdx[p];
      if (i !== j) {
        degree[i + 1]++;
        degree[j + 1]++;
      }
    }
  }
  for (let v = 0; v < n; v++) degree[v + 1] += degree[v];
  const offsets = degree;
  const adjacency = new Int32Array(offsets[n]);
  const fill = offsets.slice(0, n);
  for (let j = 0; j < n; j++) {
    for (let p = colPtr[j]; p < colPtr[j + 1]; p++) {
      const i = rowIdx[p];
      if (i !== j) {
        adjacency[fill[i]++] = j;
        adjacency[fill[j]++] = i;
      }
    }
  }
  return { n, offsets, adjacency };
}
