/**
 * The index budget (Poincaré–Hopf) and the checks a request must pass before anything is solved,
 * so that an impossible request is refused in words a groomer can act on.
 */
import { FieldError } from '../mesh/errors';
import type { FieldRequest } from './request';
import type { FieldSurface } from './surface';

/**
 * Whether a component's vertex rings (with held boundary fans) are bound by Poincaré–Hopf:
 * true for closed components, and for every component when the boundary is held.
 */
export function isBudgeted(surface: Pick<FieldSurface, 'components' | 'boundary'>, component: number): boolean {
  return surface.components[component].boundaryLoopCount === 0 || surface.boundary !== 'free';
}

/** How the placed indices stand against what each component demands. */
export interface IndexBudget {
  readonly components: readonly {
    readonly component: number;
    /** Σ index the component demands (its Euler characteristic), or null when its free boundary absorbs any sum. */
    readonly demanded: number | null;
    /** Σ index placed: point singularities, plus 1 for every open parting or crest. */
    readonly placed: number;
    /** demanded − placed, or null when free. */
    readonly remainder: number | null;
  }[];
  /** True when every budgeted component is balanced. */
  readonly balanced: boolean;
}

/**
 * The index budget (Poincaré–Hopf): on a closed component the indices must sum to its Euler
 * characteristic; an open parting or crest counts +1 (it acts as a source or a sink), a closed one
 * 0; with a free boundary any sum is possible. `remainderAt` is not applied here.
 */
export function indexBudget(surface: FieldSurface, request: FieldRequest): IndexBudget {
  const placed = new Float64Array(surface.components.length);
  for (const s of request.singularities ?? []) {
    const c = surface.componentOfVertex[s.vertex];
    if (c >= 0) placed[c] += s.index;
  }
  for (const curve of request.curves ?? []) {
    const c = surface.componentOfVertex[curve.vertices[0]];
    const closed = curve.vertices.length > 2 && curve.vertices[0] === curve.vertices[curve.vertices.length - 1];
    if (c >= 0 && !closed) placed[c] += 1;
  }
  let balanced = true;
  const components = surface.components.map((facts, c) => {
    if (!isBudgeted(surface, c)) return { component: c, demanded: null, placed: placed[c], remainder: null };
    const remainder = Math.round((facts.eulerCharacteristic - placed[c]) * 1e9) / 1e9;
    if (remainder !== 0) balanced = false;
    return { component: c, demanded: facts.eulerCharacteristic, placed: placed[c], remainder };
  });
  return { components, balanced };
}

export function validateRequest(surface: FieldSurface, request: FieldRequest, cutVertex: Uint8Array): { order: number; requestedIndex: Float64Array } {
  const topology = surface.topology;
  const order = request.order ?? 1;
  if (!Number.isInteger(order) || order < 1 || order > 12) throw new FieldError('bad-order', `The field order must be a whole number from 1 to 12, not ${order}.`);
  const requestedIndex = new Float64Array(topology.vertexCount);
  const placedAt = new Map<number, number>();
  (request.singularities ?? []).forEach((s, i) => {
    const what = `Singularity ${i + 1}`;
    if (!Number.isInteger(s.vertex) || s.vertex < 0 || s.vertex >= topology.vertexCount) throw new FieldError('vertex-out-of-range', `${what} is at vertex ${s.vertex}, but the surface has vertices 0 to ${topology.vertexCount - 1}.`);
    if (topology.vertexHalfedge[s.vertex] === -1) throw new FieldError('isolated-vertex', `${what} is at vertex ${s.vertex}, which no face uses.`);
    if (!Number.isFinite(s.index) || Math.abs(s.index * order - Math.round(s.index * order)) > 1e-9) {
      throw new FieldError('bad-index', `${what} has index ${s.index}; for a field of order ${order} an index must be a multiple of 1/${order}.`);
    }
    if (s.orientation !== undefined && !Number.isFinite(s.orientation)) throw new FieldError('bad-orientation', `${what} has a twist that is not a finite angle.`);
    if (placedAt.has(s.vertex)) throw new FieldError('duplicate-singularity', `Singularities ${placedAt.get(s.vertex)! + 1} and ${i + 1} are both at vertex ${s.vertex}; give one singularity with the summed index instead.`);
    if (topology.isBoundaryVertex[s.vertex] && surface.boundary === 'free') {
      throw new FieldError('singularity-on-free-boundary', `${what} is on the boundary at vertex ${s.vertex}; a boundary singularity needs the boundary held tangent or normal.`);
    }
    if (cutVertex[s.vertex]) throw new FieldError('singularity-on-curve', `${what} is at vertex ${s.vertex}, on a parting or crest; move it off the curve.`);
    placedAt.set(s.vertex, i);
    requestedIndex[s.vertex] = Math.round(s.index * order) / order;
  });
  const budget = indexBudget(surface, request);
  const unbalanced = budget.components.filter((c) => c.remainder !== null && c.remainder !== 0);
  if (request.remainderAt !== undefined) {
    const v = request.remainderAt;
    if (!Number.isInteger(v) || v < 0 || v >= topology.vertexCount || topology.vertexHalfedge[v] === -1) throw new FieldError('vertex-out-of-range', `The remainder vertex ${v} is not a vertex of the surface.`);
    if (cutVertex[v]) throw new FieldError('singularity-on-curve', `The remainder vertex ${v} lies on a parting or crest.`);
    if (topology.isBoundaryVertex[v] && surface.boundary === 'free') throw new FieldError('singularity-on-free-boundary', `The remainder vertex ${v} is on a free boundary.`);
    const c = surface.componentOfVertex[v];
    const entry = budget.components[c];
    if (entry.remainder !== null) requestedIndex[v] += entry.remainder;
    if (unbalanced.some((u) => u.component !== c)) {
      const other = unbalanced.find((u) => u.component !== c)!;
      throw new FieldError('index-budget', `Surface piece ${other.component + 1} needs indices summing to ${other.demanded}, but ${other.placed} are placed (the remainder vertex is on another piece).`);
    }
  } else if (unbalanced.length > 0) {
    const u = unbalanced[0];
    throw new FieldError(
      'index-budget',
      `The indices placed on ${surface.components.length > 1 ? `surface piece ${u.component + 1}` : 'the surface'} sum to ${u.placed}, but a surface of Euler characteristic ${u.demanded} needs ${u.demanded}: ${u.remainder! > 0 ? `add ${u.remainder}` : `remove ${-u.remainder!}`} (or name a vertex to take the remainder).`,
    );
  }
  return { order, requestedIndex };
}
