/**
 * The pieces a surface falls into once its closed partings and crests cut it, and what each piece
 * asks of the field: the index sum Poincaré–Hopf demands of it, and the loops round it that no
 * vertex ring, curve or held boundary already fixes.
 *
 * Why pieces: the field is perpendicular to a curve on both of its sides, like a held boundary, so
 * a closed curve splits the index budget too. A sphere cut by a closed parting is two discs, and
 * each disc's indices must sum to 1 (Poincaré–Hopf for a disc whose field is perpendicular to its
 * boundary), not just the sphere's to 2. An open curve never separates (curves may not touch each
 * other or the boundary) and keeps its old standing: it counts +1, like a source or a sink.
 */
import type { DualChain } from '../mesh/dual-chains';
import { vertexFan } from '../mesh/dual-chains';
import { facePieces, faceOfHalfedge, type Topology } from '../mesh/topology';
import type { CurveGeometry } from './curves';
import type { BoundaryMode } from './request';

export interface SurfacePiece {
  /** The connected component of the uncut surface the piece belongs to. */
  readonly component: number;
  /** χ of the piece, its closed curves counted as boundary loops. */
  readonly eulerCharacteristic: number;
  /** Boundary loops of the surface (indices into `topology.boundaryLoops`) on this piece. */
  readonly boundaryLoops: readonly number[];
  /** Closed curves bordering the piece (request indices; twice when both sides are on it). */
  readonly closedCurves: readonly number[];
  /** Open curves on the piece (request indices). */
  readonly openCurves: readonly number[];
  /** True when every loop round the piece is held (no free boundary): its indices must sum to χ. */
  readonly budgeted: boolean;
}

export interface SurfacePieces {
  readonly pieceOfFace: Uint32Array;
  readonly pieces: readonly SurfacePiece[];
}

/**
 * Cuts the surface along the curves and describes each piece. Pieces are numbered in order of
 * their lowest face, so an uncut surface's pieces are its components, in the same order.
 */
export function cutIntoPieces(topology: Topology, curves: Pick<CurveGeometry, 'cutEdge' | 'closed' | 'open'>, boundary: BoundaryMode): SurfacePieces {
  const { piece: pieceOfFace, count } = facePieces(topology.faceCount, topology.twin, topology.edgeOf, curves.cutEdge);
  const closedEdge = new Uint8Array(topology.edgeCount);
  const onClosedCurve = new Uint8Array(topology.vertexCount);
  for (const c of curves.closed) {
    for (const v of c.vertices) onClosedCurve[v] = 1;
    for (const h of c.along) closedEdge[topology.edgeOf[h]] = 1;
  }
  // χ = V − E + F per piece, a closed curve's vertices and edges counted once on each side.
  const twiceChi = new Float64Array(count);
  for (let f = 0; f < topology.faceCount; f++) {
    const p = pieceOfFace[f];
    twiceChi[p] += 2;
    for (let k = 0; k < 3; k++) {
      const h = 3 * f + k;
      twiceChi[p] -= topology.twin[h] === -1 || closedEdge[topology.edgeOf[h]] ? 2 : 1;
    }
  }
  for (let v = 0; v < topology.vertexCount; v++) {
    const h = topology.vertexHalfedge[v];
    if (h !== -1 && !onClosedCurve[v]) twiceChi[pieceOfFace[faceOfHalfedge(h)]] += 2;
  }
  for (const c of curves.closed) {
    c.vertices.forEach((_, i) => {
      twiceChi[pieceOfFace[c.left[i]]] += 2;
      twiceChi[pieceOfFace[c.right[i]]] += 2;
    });
  }
  const loopsOf = Array.from({ length: count }, () => [] as number[]);
  topology.boundaryLoops.forEach((loop, i) => loopsOf[pieceOfFace[faceOfHalfedge(loop[0])]].push(i));
  const closedOf = Array.from({ length: count }, () => [] as number[]);
  for (const c of curves.closed) {
    closedOf[pieceOfFace[c.left[0]]].push(c.curve);
    closedOf[pieceOfFace[c.right[0]]].push(c.curve);
  }
  const openOf = Array.from({ length: count }, () => [] as number[]);
  for (const c of curves.open) openOf[pieceOfFace[c.face]].push(c.curve);
  const componentOf = new Int32Array(count).fill(-1);
  for (let f = 0; f < topology.faceCount; f++) if (componentOf[pieceOfFace[f]] === -1) componentOf[pieceOfFace[f]] = topology.componentOfFace[f];
  const pieces = Array.from({ length: count }, (_, p): SurfacePiece => ({
    component: componentOf[p],
    eulerCharacteristic: twiceChi[p] / 2,
    boundaryLoops: loopsOf[p],
    closedCurves: closedOf[p],
    openCurves: openOf[p],
    budgeted: boundary !== 'free' || loopsOf[p].length === 0,
  }));
  return { pieceOfFace, pieces };
}

/**
 * The dual cycle round a boundary loop: the fans of its vertices joined end to end (each fan ends
 * in the face where the next one starts), as one chain with each crossed edge once. Its holonomy is
 * what the field turns going once round the opening.
 */
export function boundaryLoopChain(topology: Topology, loop: Uint32Array): DualChain {
  const coefficient = new Map<number, number>();
  for (const h of loop) {
    const fan = vertexFan(topology, topology.triangles[h]);
    for (let i = 0; i < fan.edges.length; i++) coefficient.set(fan.edges[i], (coefficient.get(fan.edges[i]) ?? 0) + fan.signs[i]);
  }
  const edges: number[] = [];
  const signs: number[] = [];
  for (const [e, c] of coefficient) {
    if (c === 0) continue;
    edges.push(e);
    signs.push(c);
  }
  const face = faceOfHalfedge(loop[0]);
  return { edges: Int32Array.from(edges), signs: Int8Array.from(signs), fromFace: face, toFace: face };
}
