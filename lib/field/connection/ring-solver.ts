/**
 * The vertex-ring system: one row per vertex ring whose holonomy is prescribed, the matrix C Cᵀ
 * (the graph Laplacian on those vertices) factored once per surface, and the caches the extra
 * rows keep beside it.
 */
import { factorCholesky, type CholeskyFactor } from '../linalg/cholesky';
import type { DenseLU } from '../linalg/dense';
import { symmetricFromTriplets } from '../linalg/sparse';
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
  const n = rows.length;
  // Typed triplet arrays: plain arrays of millions of pushed numbers cost seconds on big surfaces.
  const capacity = 3 * topology.edgeCount;
  const ti = new Int32Array(capacity), tj = new Int32Array(capacity), tv = new Float64Array(capacity);
  let count = 0;
  const add = (i: number, j: number, v: number) => {
    ti[count] = i;
    tj[count] = j;
    tv[count++] = v;
  };
  for (let e = 0; e < topology.edgeCount; e++) {
    const h = topology.edgeHalfedge[e];
    if (topology.twin[h] === -1) continue;
    const a = rowOfVertex[tri[h]], b = rowOfVertex[tri[nextHalfedge(h)]];
    if (a >= 0) add(a, a, 1);
    if (b >= 0) add(b, b, 1);
    if (a >= 0 && b >= 0) add(a, b, -1);
  }
  const matrix = symmetricFromTriplets(n, ti.subarray(0, count), tj.subarray(0, count), tv.subarray(0, count));
  const factor = factorCholesky(matrix);
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
