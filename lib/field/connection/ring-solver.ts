/**
 * The vertex-ring system: one row per vertex ring whose holonomy is prescribed, the matrix C Cᵀ
 * (the graph Laplacian on those vertices) factored once per surface, and the caches the extra
 * rows keep beside it.
 */
import { factorCholesky, type CholeskyFactor } from '../linalg/cholesky';
import type { DenseLU } from '../linalg/dense';
import type { SymmetricSparse } from '../linalg/sparse';
import { vertexFan } from '../mesh/dual-chains';
import { FieldError } from '../mesh/errors';
import type { ComponentFacts } from '../mesh/geometry';
import { nextHalfedge, type Topology } from '../mesh/topology';
import type { BoundaryMode } from './request';

export interface RowCacheEntry {
  readonly couplingIdx: Int32Array;
  readonly couplingVal: Float64Array;
  readonly schur: Map<string, number>;
  /** L⁻¹Pᵣ, kept while memory allows so a re-solve needs one sparse solve instead of two. */
  response: Float64Array | null;
}

/** The factored vertex-ring system C Cᵀ and the Schur-complement caches for extra rows. */
export interface RingSolver {
  readonly rowOfVertex: Int32Array;
  readonly vertexOfRow: Int32Array;
  readonly droppedVertexOfComponent: Int32Array;
  /** Angle defect to prescribe per row vertex (boundary corners folded into their neighbour). */
  readonly ringDefect: Float64Array;
  readonly factor: CholeskyFactor;
  readonly rowCache: Map<string, RowCacheEntry>;
  readonly luCache: Map<string, DenseLU>;
  storedResponses: number;
  readonly scratch: Float64Array;
}

export function buildRingSolver(
  topology: Topology,
  defects: Float64Array,
  components: readonly ComponentFacts[],
  componentOfVertex: Int32Array,
  boundary: BoundaryMode,
  positions?: Float64Array,
): RingSolver {
  const nV = topology.vertexCount;
  const tri = topology.triangles;
  const ringDefect = new Float64Array(nV);
  const hasRow = new Uint8Array(nV);
  for (let v = 0; v < nV; v++) {
    if (topology.vertexHalfedge[v] === -1) continue;
    if (!topology.isBoundaryVertex[v]) {
      hasRow[v] = 1;
      ringDefect[v] = defects[v];
    } else if (boundary !== 'free') {
      hasRow[v] = vertexFan(topology, v).edges.length > 0 ? 1 : 0;
    }
  }
  if (boundary !== 'free') {
    // A boundary vertex with a single face has no dual edge around it; its corner's turning is
    // carried by the next vertex along the loop, as if the field followed the cut-off chord.
    for (const loop of topology.boundaryLoops) {
      let carried = 0;
      const n = loop.length;
      let firstWithRow = -1;
      for (let i = 0; i < n; i++) if (hasRow[tri[loop[i]]]) { firstWithRow = i; break; }
      if (firstWithRow === -1) throw new FieldError('boundary-without-fans', 'A boundary loop has no vertex with an interior edge; the field cannot be held along it.');
      for (let step = 1; step <= n; step++) {
        const v = tri[loop[(firstWithRow + step) % n]];
        carried += defects[v];
        if (hasRow[v]) {
          ringDefect[v] = carried;
          carried = 0;
        }
      }
    }
  }
  const droppedVertexOfComponent = new Int32Array(components.length).fill(-1);
  for (let v = nV - 1; v >= 0; v--) {
    const c = componentOfVertex[v];
    if (c < 0 || !hasRow[v] || droppedVertexOfComponent[c] !== -1) continue;
    if (components[c].boundaryLoopCount === 0 || boundary !== 'free') droppedVertexOfComponent[c] = v;
  }
  for (const v of droppedVertexOfComponent) if (v >= 0) hasRow[v] = 0;

  const rowOfVertex = new Int32Array(nV).fill(-1);
  const rows: number[] = [];
  for (let v = 0; v < nV; v++) if (hasRow[v]) {
    rowOfVertex[v] = rows.length;
    rows.push(v);
  }
  const matrix = ringLaplacian(topology, rowOfVertex, rows.length);
  // Where each row's vertex is, so the ordering may also cut large pieces by planes: on a torus
  // the plane across the tube finds the two short rings (1.6M faces: 35.4 -> 29.7 GFlop).
  let points: Float64Array | undefined;
  if (positions) {
    points = new Float64Array(3 * rows.length);
    for (let r = 0; r < rows.length; r++) for (let k = 0; k < 3; k++) points[3 * r + k] = positions[3 * rows[r] + k];
  }
  const factor = factorCholesky(matrix, { points });
  return {
    rowOfVertex,
    vertexOfRow: Int32Array.from(rows),
    droppedVertexOfComponent,
    ringDefect,
    factor,
    rowCache: new Map(),
    luCache: new Map(),
    storedResponses: 0,
    scratch: new Float64Array(topology.edgeCount),
  };
}

/**
 * C Cᵀ for the rows numbered by `rowOfVertex` (−1: no row): on the diagonal, the number of
 * interior edges at the row's vertex; −1 for each interior edge joining two rows.
 *
 * Guarantees: the matrix `symmetricFromTriplets` makes from one (a, a, 1), (b, b, 1),
 * (a, b, −1) triplet per interior edge, entry for entry. Built column by column directly: on
 * a million vertices the triplets' two counting sorts cost several times more.
 */
export function ringLaplacian(topology: Topology, rowOfVertex: Int32Array, n: number): SymmetricSparse {
  const tri = topology.triangles;
  const colPtr = new Int32Array(n + 1);
  const diagonal = new Float64Array(n);
  for (let e = 0; e < topology.edgeCount; e++) {
    const h = topology.edgeHalfedge[e];
    if (topology.twin[h] === -1) continue;
    const a = rowOfVertex[tri[h]], b = rowOfVertex[tri[nextHalfedge(h)]];
    if (a >= 0) diagonal[a]++;
    if (b >= 0) diagonal[b]++;
    if (a >= 0 && b >= 0 && a !== b) colPtr[Math.min(a, b) + 1]++;
  }
  for (let j = 0; j < n; j++) colPtr[j + 1] += colPtr[j] + 1;
  const rowIdx = new Int32Array(colPtr[n]);
  const values = new Float64Array(colPtr[n]);
  const fill = new Int32Array(n);
  for (let j = 0; j < n; j++) {
    // the diagonal leads its column: every other row in it is larger
    rowIdx[colPtr[j]] = j;
    values[colPtr[j]] = diagonal[j];
    fill[j] = colPtr[j] + 1;
  }
  for (let e = 0; e < topology.edgeCount; e++) {
    const h = topology.edgeHalfedge[e];
    if (topology.twin[h] === -1) continue;
    const a = rowOfVertex[tri[h]], b = rowOfVertex[tri[nextHalfedge(h)]];
    if (a < 0 || b < 0 || a === b) continue;
    const at = fill[Math.min(a, b)]++;
    rowIdx[at] = Math.max(a, b);
    values[at] = -1;
  }
  // rows in increasing order within each column (a handful each: insertion sort), repeats summed
  let write = 0;
  let start = 0;
  for (let j = 0; j < n; j++) {
    const end = colPtr[j + 1];
    for (let p = start + 2; p < end; p++) {
      const r = rowIdx[p], v = values[p];
      let q = p - 1;
      while (q > start && rowIdx[q] > r) {
        rowIdx[q + 1] = rowIdx[q];
        values[q + 1] = values[q];
        q--;
      }
      rowIdx[q + 1] = r;
      values[q + 1] = v;
    }
    colPtr[j] = write;
    for (let p = start; p < end; p++) {
      if (p > start && rowIdx[p] === rowIdx[write - 1]) {
        values[write - 1] += values[p];
        continue;
      }
      rowIdx[write] = rowIdx[p];
      values[write++] = values[p];
    }
    start = end;
  }
  colPtr[n] = write;
  return { n, colPtr, rowIdx: rowIdx.slice(0, write), values: values.slice(0, write) };
}
