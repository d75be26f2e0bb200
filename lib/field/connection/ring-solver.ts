/**
 * The vertex-ring system: one row per vertex ring whose holonomy is prescribed, the matrix C Cᵀ
 * (the graph Laplacian on those vertices) factored once per surface, and the caches the extra
 * rows keep beside it.
 */
import { now } from '../clock';
import { analyzeCholesky, computeOrdering, factorNumeric, permutationFault, type CholeskyFactor } from '../linalg/cholesky';
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
  /** The fill-reducing ordering the factor was made with (before its postorder), given or worked out. */
  readonly ordering: Int32Array;
  /** Whether `ordering` was given by the caller; when one was given and refused, why (else null). */
  readonly orderingGiven: boolean;
  readonly orderingRefused: string | null;
  /** Seconds spent working out the ordering (0 when a given one was used). */
  readonly orderingSeconds: number;
  readonly rowCache: Map<string, RowCacheEntry>;
  readonly luCache: Map<string, DenseLU>;
  storedResponses: number;
  readonly scratch: Float64Array;
}

/** Which vertices have a ring row, and their numbering. */
interface RingRows {
  readonly hasRow: Uint8Array;
  readonly rowOfVertex: Int32Array;
  readonly vertexOfRow: Int32Array;
  readonly droppedVertexOfComponent: Int32Array;
}

/**
 * The rows of the system: every interior vertex, and with a held boundary every boundary vertex
 * with an interior edge at it; one vertex per component whose rings are dependent is left out
 * (the last such vertex). Depends on the topology and whether the boundary is held, nothing else,
 * so `tangent` and `normal` have the same rows, and on a surface without boundary all three do.
 */
function ringRows(topology: Topology, components: readonly ComponentFacts[], componentOfVertex: Int32Array, boundary: BoundaryMode): RingRows {
  const nV = topology.vertexCount;
  const hasRow = new Uint8Array(nV);
  for (let v = 0; v < nV; v++) {
    if (topology.vertexHalfedge[v] === -1) continue;
    if (!topology.isBoundaryVertex[v]) hasRow[v] = 1;
    else if (boundary !== 'free') hasRow[v] = vertexFan(topology, v).edges.length > 0 ? 1 : 0;
  }
  if (boundary !== 'free') {
    for (const loop of topology.boundaryLoops) {
      if (!loop.some((h) => hasRow[topology.triangles[h]])) throw new FieldError('boundary-without-fans', 'A boundary loop has no vertex with an interior edge; the field cannot be held along it.');
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
  let count = 0;
  for (let v = 0; v < nV; v++) if (hasRow[v]) rowOfVertex[v] = count++;
  const vertexOfRow = new Int32Array(count);
  for (let v = 0; v < nV; v++) if (hasRow[v]) vertexOfRow[rowOfVertex[v]] = v;
  return { hasRow, rowOfVertex, vertexOfRow, droppedVertexOfComponent };
}

/** The matrix of the rows, and where each row's vertex is (for the ordering's plane cuts). */
function ringSystem(topology: Topology, rows: RingRows, positions?: Float64Array): { matrix: SymmetricSparse; points?: Float64Array } {
  const matrix = ringLaplacian(topology, rows.rowOfVertex, rows.vertexOfRow.length);
  // Where each row's vertex is, so the ordering may also cut large pieces by planes: on a torus
  // the plane across the tube finds the two short rings (1.6M faces: 35.4 -> 29.7 GFlop).
  if (!positions) return { matrix };
  const points = new Float64Array(3 * rows.vertexOfRow.length);
  for (let r = 0; r < rows.vertexOfRow.length; r++) for (let k = 0; k < 3; k++) points[3 * r + k] = positions[3 * rows.vertexOfRow[r] + k];
  return { matrix, points };
}

/**
 * The fill-reducing ordering `buildRingSolver` works out for these rows when none is given: the
 * same permutation, so that giving it back later factors the same matrix in the same order and
 * every solve gives the same numbers to the last bit. Costs the ordering alone (no factorization).
 */
export function ringOrdering(
  topology: Topology,
  components: readonly ComponentFacts[],
  componentOfVertex: Int32Array,
  boundary: BoundaryMode,
  positions?: Float64Array,
): Int32Array {
  const { matrix, points } = ringSystem(topology, ringRows(topology, components, componentOfVertex, boundary), positions);
  return computeOrdering(matrix, 'auto', points);
}

/**
 * Builds and factors the system. `givenOrdering`, when it is a permutation of the rows (checked
 * entry by entry: it may come from stored bytes), is used instead of working one out; anything
 * else is set aside with the reason in `orderingRefused` and the ordering worked out as before.
 * A permutation of the right length from another surface still factors this matrix exactly
 * (only more slowly): correctness never depends on the given ordering, only the speed does.
 */
export function buildRingSolver(
  topology: Topology,
  defects: Float64Array,
  components: readonly ComponentFacts[],
  componentOfVertex: Int32Array,
  boundary: BoundaryMode,
  positions?: Float64Array,
  givenOrdering?: Int32Array,
): RingSolver {
  const nV = topology.vertexCount;
  const tri = topology.triangles;
  const rows = ringRows(topology, components, componentOfVertex, boundary);
  const { hasRow } = rows;
  const ringDefect = new Float64Array(nV);
  for (let v = 0; v < nV; v++) if (topology.vertexHalfedge[v] !== -1 && !topology.isBoundaryVertex[v]) ringDefect[v] = defects[v];
  if (boundary !== 'free') {
    // A boundary vertex with a single face has no dual edge around it; its corner's turning is
    // carried by the next vertex along the loop, as if the field followed the cut-off chord.
    for (const loop of topology.boundaryLoops) {
      let carried = 0;
      const n = loop.length;
      let firstWithRow = -1;
      for (let i = 0; i < n; i++) if (hasRow[tri[loop[i]]] || isDropped(rows, tri[loop[i]], componentOfVertex)) { firstWithRow = i; break; }
      for (let step = 1; step <= n; step++) {
        const v = tri[loop[(firstWithRow + step) % n]];
        carried += defects[v];
        if (hasRow[v] || isDropped(rows, v, componentOfVertex)) {
          ringDefect[v] = carried;
          carried = 0;
        }
      }
    }
  }
  const { matrix, points } = ringSystem(topology, rows, positions);
  const n = rows.vertexOfRow.length;
  const orderingRefused = givenOrdering ? permutationFault(givenOrdering, n) : null;
  const t0 = now();
  const ordering = givenOrdering && !orderingRefused ? givenOrdering : computeOrdering(matrix, 'auto', points);
  const orderingSeconds = givenOrdering && !orderingRefused ? 0 : (now() - t0) / 1000;
  const factor = factorNumeric(analyzeCholesky(matrix, { permutation: ordering }), matrix);
  return {
    rowOfVertex: rows.rowOfVertex,
    vertexOfRow: rows.vertexOfRow,
    droppedVertexOfComponent: rows.droppedVertexOfComponent,
    ringDefect,
    factor,
    ordering,
    orderingGiven: givenOrdering !== undefined && !orderingRefused,
    orderingRefused: orderingRefused && `the stored ordering of the ring system was not used (${orderingRefused}); it was worked out again`,
    orderingSeconds,
    rowCache: new Map(),
    luCache: new Map(),
    storedResponses: 0,
    scratch: new Float64Array(topology.edgeCount),
  };
}

/** The vertex a component leaves out of the rows still carries its ring's defect, as before. */
function isDropped(rows: RingRows, v: number, componentOfVertex: Int32Array): boolean {
  const c = componentOfVertex[v];
  return c >= 0 && rows.droppedVertexOfComponent[c] === v;
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
