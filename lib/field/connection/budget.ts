/**
 * The index budget (Poincaré–Hopf) and the checks a request must pass before anything is solved,
 * so that an impossible request is refused in words a groomer can act on.
 */
import { FieldError } from '../mesh/errors';
import { faceOfHalfedge } from '../mesh/topology';
import { curveName, type CurveGeometry } from './curves';
import { laidOut } from './laid-out';
import type { SurfacePieces } from './pieces';
import type { FieldRequest, IndexBudget, PieceBudget } from './request';
import type { FieldSurface } from './surface';

/**
 * The index budget (Poincaré–Hopf) per piece of the surface: the indices on a piece with no free
 * boundary must sum to its Euler characteristic (closed curves count as its boundary, held like a
 * held boundary); an open parting or crest counts +1 (it acts as a source or a sink); a piece with
 * a free boundary loop takes any sum. `remainderAt` is not applied here. Throws FieldError for
 * curves that cannot be laid out (as `solveConnection` would).
 */
export function indexBudget(surface: FieldSurface, request: FieldRequest): IndexBudget {
  return budgetOfPieces(surface, request, laidOut(surface, request.curves ?? []).cut);
}

/** The piece a vertex off every curve lies on. */
function pieceOf(surface: FieldSurface, pieces: SurfacePieces, v: number): number {
  return pieces.pieceOfFace[faceOfHalfedge(surface.topology.vertexHalfedge[v])];
}

function budgetOfPieces(surface: FieldSurface, request: FieldRequest, cut: SurfacePieces): IndexBudget {
  const placed = new Float64Array(cut.pieces.length);
  for (const s of request.singularities ?? []) {
    if (Number.isInteger(s.vertex) && s.vertex >= 0 && s.vertex < surface.topology.vertexCount && surface.topology.vertexHalfedge[s.vertex] !== -1) placed[pieceOf(surface, cut, s.vertex)] += s.index;
  }
  const curves = request.curves ?? [];
  let balanced = true;
  const pieces = cut.pieces.map((facts, p): PieceBudget => {
    placed[p] += facts.openCurves.length;
    const borderedBy = [...new Set(facts.closedCurves)].map((ci) => curveName(curves, ci));
    if (!facts.budgeted) return { piece: p, component: facts.component, borderedBy, demanded: null, placed: placed[p], remainder: null };
    const remainder = Math.round((facts.eulerCharacteristic - placed[p]) * 1e9) / 1e9;
    if (remainder !== 0) balanced = false;
    return { piece: p, component: facts.component, borderedBy, demanded: facts.eulerCharacteristic, placed: placed[p], remainder };
  });
  const pieceOfVertex = new Int32Array(surface.topology.vertexCount).fill(-1);
  for (let v = 0; v < pieceOfVertex.length; v++) if (surface.topology.vertexHalfedge[v] !== -1) pieceOfVertex[v] = pieceOf(surface, cut, v);
  for (const c of request.curves ?? []) for (const v of c.vertices) if (Number.isInteger(v) && v >= 0 && v < pieceOfVertex.length) pieceOfVertex[v] = -1;
  return { pieces, balanced, pieceOfVertex };
}

/** A piece in a groomer's words: "the surface", "surface piece 2", "surface piece 2 (inside parting 1)". */
export function pieceName(budget: IndexBudget, p: number): string {
  if (budget.pieces.length === 1) return 'the surface';
  const { borderedBy } = budget.pieces[p];
  return `surface piece ${p + 1}${borderedBy.length > 0 ? ` (bordered by ${borderedBy.join(' and ')})` : ''}`;
}

/**
 * Checks a request before anything is solved: order, each singularity, the remainder vertex and
 * the budget of every piece (the error names the piece that is off).
 */
export function validateRequest(surface: FieldSurface, request: FieldRequest, curves: CurveGeometry, cut: SurfacePieces): { order: number; requestedIndex: Float64Array; budget: IndexBudget } {
  const cutVertex = curves.cutVertex;
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
    if (topology.isBoundaryVertex[s.vertex] && surface.solver.rowOfVertex[s.vertex] < 0 && surface.solver.droppedVertexOfComponent[surface.componentOfVertex[s.vertex]] !== s.vertex) {
      throw new FieldError('singularity-on-corner', `${what} is at vertex ${s.vertex}, a corner of the held boundary with a single face: the field has no edge there to turn across. Move it to a neighbouring vertex.`);
    }
    placedAt.set(s.vertex, i);
    requestedIndex[s.vertex] = Math.round(s.index * order) / order;
  });
  const budget = budgetOfPieces(surface, request, cut);
  const unbalanced = budget.pieces.filter((p) => p.remainder !== null && p.remainder !== 0);
  if (request.remainderAt !== undefined) {
    const v = request.remainderAt;
    if (!Number.isInteger(v) || v < 0 || v >= topology.vertexCount || topology.vertexHalfedge[v] === -1) throw new FieldError('vertex-out-of-range', `The remainder vertex ${v} is not a vertex of the surface.`);
    if (cutVertex[v]) throw new FieldError('singularity-on-curve', `The remainder vertex ${v} lies on a parting or crest.`);
    if (topology.isBoundaryVertex[v] && surface.boundary === 'free') throw new FieldError('singularity-on-free-boundary', `The remainder vertex ${v} is on a free boundary.`);
    const p = pieceOf(surface, cut, v);
    const entry = budget.pieces[p];
    if (entry.remainder !== null) requestedIndex[v] += entry.remainder;
    const other = unbalanced.find((u) => u.piece !== p);
    if (other) {
      throw new FieldError('index-budget', `The indices on ${pieceName(budget, other.piece)} sum to ${other.placed}, but it needs ${other.demanded} (the remainder vertex ${v} is on another piece).`);
    }
  } else if (unbalanced.length > 0) {
    const u = unbalanced[0];
    const what = u.borderedBy.length > 0 ? `a piece of Euler characteristic ${u.demanded} with the field across its curves` : `a surface of Euler characteristic ${u.demanded}`;
    throw new FieldError(
      'index-budget',
      `The indices placed on ${pieceName(budget, u.piece)} sum to ${u.placed}, but ${what} needs ${u.demanded}: ${u.remainder! > 0 ? `add ${u.remainder}` : `remove ${-u.remainder!}`} (or name a vertex to take the remainder).`,
    );
  }
  return { order, requestedIndex, budget };
}
