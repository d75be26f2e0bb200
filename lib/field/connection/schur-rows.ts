/**
 * Extra rows — generators, switched-off rings, curve and stroke links, twists, ties — solved
 * beside the factored ring system through a small dense Schur complement, with each row's
 * coupling, Schur entries and L⁻¹Pᵣ column cached so an edit costs one sparse solve.
 */
import { factorDenseLU } from '../linalg/dense';
import type { DualChain } from '../mesh/dual-chains';
import { FieldError } from '../mesh/errors';
import { nextHalfedge } from '../mesh/topology';
import type { RingSolver, RowCacheEntry } from './ring-solver';
import type { FieldSurface } from './surface';

export interface ExtraRow {
  readonly key: string;
  /** The row as a dual chain, or null for a "this vertex row is switched off" row. */
  readonly chain: DualChain | null;
  readonly removedVertex: number;
  value: number;
}

/** Doubles of L⁻¹Pᵣ columns kept per surface (≈ 200 MB). */
const RESPONSE_BUDGET = 24_000_000;
/** Extra rows remembered per surface before the caches start over. */
const ROW_CACHE_LIMIT = 4000;

/** Row couplings Pᵣ = C_base · cᵣᵀ as a sparse vector over ring rows. */
function coupling(surface: FieldSurface, row: ExtraRow): { idx: Int32Array; val: Float64Array } {
  const { rowOfVertex } = surface.solver;
  if (!row.chain) return { idx: Int32Array.of(rowOfVertex[row.removedVertex]), val: Float64Array.of(1) };
  const topology = surface.topology;
  const acc = new Map<number, number>();
  const { edges, signs } = row.chain;
  for (let i = 0; i < edges.length; i++) {
    const h = topology.edgeHalfedge[edges[i]];
    const head = rowOfVertex[topology.triangles[nextHalfedge(h)]];
    const tail = rowOfVertex[topology.triangles[h]];
    if (head >= 0) acc.set(head, (acc.get(head) ?? 0) + signs[i]);
    if (tail >= 0) acc.set(tail, (acc.get(tail) ?? 0) - signs[i]);
  }
  const idx = new Int32Array(acc.size);
  const val = new Float64Array(acc.size);
  let k = 0;
  for (const [r, v] of acc) {
    idx[k] = r;
    val[k++] = v;
  }
  return { idx, val };
}

const edgeRowsOf = new WeakMap<FieldSurface, { head: Int32Array; tail: Int32Array }>();

/**
 * The ring rows at the head and tail of every edge (−1 where the vertex has no row, and at both
 * ends of a boundary edge, which carries no angle), worked out once per surface: every solve
 * turns the ring solution into edge angles through them.
 */
function edgeRows(surface: FieldSurface): { head: Int32Array; tail: Int32Array } {
  const known = edgeRowsOf.get(surface);
  if (known) return known;
  const { topology } = surface;
  const { rowOfVertex } = surface.solver;
  const head = new Int32Array(topology.edgeCount).fill(-1);
  const tail = new Int32Array(topology.edgeCount).fill(-1);
  for (let e = 0; e < topology.edgeCount; e++) {
    const h = topology.edgeHalfedge[e];
    if (topology.twin[h] === -1) continue;
    head[e] = rowOfVertex[topology.triangles[nextHalfedge(h)]];
    tail[e] = rowOfVertex[topology.triangles[h]];
  }
  const made = { head, tail };
  edgeRowsOf.set(surface, made);
  return made;
}

function sparseDot(idx: Int32Array, val: Float64Array, dense: Float64Array): number {
  let s = 0;
  for (let i = 0; i < idx.length; i++) s += val[i] * dense[idx[i]];
  return s;
}

/** Makes sure every row has its coupling and its Schur entries against all the others cached. */
function cacheRows(surface: FieldSurface, rows: readonly ExtraRow[]): RowCacheEntry[] {
  const solver = surface.solver;
  const { rowCache, factor, scratch } = solver;
  if (rowCache.size + rows.length > ROW_CACHE_LIMIT) {
    rowCache.clear();
    solver.luCache.clear();
    solver.storedResponses = 0;
  }
  const entries = rows.map((row) => {
    let entry = rowCache.get(row.key);
    if (!entry) {
      const { idx, val } = coupling(surface, row);
      entry = { couplingIdx: idx, couplingVal: val, schur: new Map(), response: null };
    } else {
      // Most recently used last: responses are given up oldest first (see `keepResponse`).
      rowCache.delete(row.key);
    }
    rowCache.set(row.key, entry);
    return entry;
  });
  const rhs = new Float64Array(factor.n);
  rows.forEach((row, i) => {
    const entry = entries[i];
    const missing = rows.some((other) => !entry.schur.has(other.key));
    if (!missing) return;
    rhs.fill(0);
    for (let k = 0; k < entry.couplingIdx.length; k++) rhs[entry.couplingIdx[k]] = entry.couplingVal[k];
    const w = factor.solve(rhs);
    keepResponse(solver, entry, w, entries);
    if (row.chain) for (let k = 0; k < row.chain.edges.length; k++) scratch[row.chain.edges[k]] += row.chain.signs[k];
    rows.forEach((other, j) => {
      if (entry.schur.has(other.key)) return;
      let direct = 0;
      if (row.chain && other.chain) for (let k = 0; k < other.chain.edges.length; k++) direct += other.chain.signs[k] * scratch[other.chain.edges[k]];
      const value = direct - sparseDot(entries[j].couplingIdx, entries[j].couplingVal, w);
      entry.schur.set(other.key, value);
      entries[j].schur.set(row.key, value);
    });
    if (row.chain) for (let k = 0; k < row.chain.edges.length; k++) scratch[row.chain.edges[k]] = 0;
  });
  return entries;
}

/**
 * Keeps a row's L⁻¹Pᵣ column within the budget, giving up the columns of the rows least recently
 * used (never those of `inUse`) to make room: a dragged twist or stroke makes a new row at every
 * step, and without this the budget would fill with rows of positions long left, after which no
 * new row could keep its column and every re-solve would pay a second sparse solve.
 */
export function keepResponse(solver: Pick<RingSolver, 'rowCache' | 'storedResponses'>, entry: RowCacheEntry, w: Float64Array, inUse: readonly RowCacheEntry[], budget = RESPONSE_BUDGET): void {
  if (entry.response) {
    solver.storedResponses -= entry.response.length;
    entry.response = null;
  }
  if (w.length > budget) return;
  if (solver.storedResponses + w.length > budget) {
    for (const old of solver.rowCache.values()) {
      if (solver.storedResponses + w.length <= budget) break;
      if (!old.response || inUse.includes(old)) continue;
      solver.storedResponses -= old.response.length;
      old.response = null;
    }
  }
  if (solver.storedResponses + w.length > budget) return;
  entry.response = w;
  solver.storedResponses += w.length;
}

/**
 * Whether `candidate` fixes something the rings and `rows` leave free: false when its holonomy
 * already follows from them (its row would make the Schur complement singular).
 */
export function isIndependentRow(surface: FieldSurface, rows: readonly ExtraRow[], candidate: ExtraRow): boolean {
  const all = [...rows, candidate];
  const entries = cacheRows(surface, all);
  const k = all.length;
  const s = new Float64Array(k * k);
  for (let i = 0; i < k; i++) for (let j = 0; j < k; j++) s[i * k + j] = entries[i].schur.get(all[j].key)!;
  return factorDenseLU(s, k) !== null;
}

/** The ring system's solution for these ring values alone, shared by the solves of one request. */
export function ringSolution(surface: FieldSurface, ringValues: Float64Array): Float64Array {
  return surface.solver.factor.solve(ringValues);
}

/**
 * Minimal-norm angles subject to the ring rows (right-hand side `ringValues`, whose solution
 * `ringSolution` gave `t`) and the extra rows: x = Cᵀy with C Cᵀ y = b, the extra rows entering
 * through a dense Schur complement.
 */
export function solveRows(surface: FieldSurface, ringValues: Float64Array, t: Float64Array, rows: readonly ExtraRow[]): Float64Array {
  const { factor, luCache, vertexOfRow } = surface.solver;
  const topology = surface.topology;
  const entries = cacheRows(surface, rows);
  const k = rows.length;
  let y: Float64Array = t;
  let z: Float64Array = new Float64Array(0);
  if (k > 0) {
    const signature = rows.map((r) => r.key).join('|');
    let lu = luCache.get(signature);
    if (!lu) {
      const s = new Float64Array(k * k);
      for (let i = 0; i < k; i++) for (let j = 0; j < k; j++) s[i * k + j] = entries[i].schur.get(rows[j].key)!;
      const factored = factorDenseLU(s, k);
      if (!factored) {
        throw new FieldError('conflicting-constraints', 'Some of the strokes, curves, twists or generator holonomies fix the same thing twice (for example two strokes through one face); remove one of them.');
      }
      lu = factored;
      if (luCache.size > 32) luCache.clear();
      luCache.set(signature, lu);
    }
    const rhs = new Float64Array(k);
    for (let i = 0; i < k; i++) rhs[i] = rows[i].value - sparseDot(entries[i].couplingIdx, entries[i].couplingVal, t);
    z = lu.solve(rhs);
    if (entries.every((e) => e.response)) {
      y = t.slice();
      for (let i = 0; i < k; i++) {
        const w = entries[i].response!;
        const zi = z[i];
        for (let r = 0; r < y.length; r++) y[r] -= zi * w[r];
      }
    } else {
      const corrected = ringValues.slice();
      for (let i = 0; i < k; i++) {
        const e = entries[i];
        for (let q = 0; q < e.couplingIdx.length; q++) corrected[e.couplingIdx[q]] -= z[i] * e.couplingVal[q];
      }
      y = factor.solve(corrected);
    }
  }
  const removed = new Uint8Array(vertexOfRow.length);
  rows.forEach((r) => {
    if (!r.chain) removed[surface.solver.rowOfVertex[r.removedVertex]] = 1;
  });
  const x = new Float64Array(topology.edgeCount);
  const { head, tail } = edgeRows(surface);
  for (let e = 0; e < topology.edgeCount; e++) {
    const a = head[e], b = tail[e];
    x[e] = (a >= 0 && !removed[a] ? y[a] : 0) - (b >= 0 && !removed[b] ? y[b] : 0);
  }
  rows.forEach((r, i) => {
    if (!r.chain) return;
    for (let q = 0; q < r.chain.edges.length; q++) x[r.chain.edges[q]] += z[i] * r.chain.signs[q];
  });
  return x;
}

