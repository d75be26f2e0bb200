/**
 * Partings and crests laid out on the surface: the edges they cut, the faces beside them with the
 * direction those faces must take, and the chains that link consecutive side faces.
 */
import { partialFan, reverseChain, type DualChain } from '../mesh/dual-chains';
import { FieldError } from '../mesh/errors';
import { faceOfHalfedge, facePieces, nextAroundVertex, nextHalfedge, type Topology } from '../mesh/topology';
import type { CurveFeature, CurveLink, CurveSide } from './request';
import type { FieldSurface } from './surface';

export interface CurveGeometry {
  readonly cutEdge: Uint8Array;
  readonly cutVertex: Uint8Array;
  /** Per curve: every chain between consecutive side faces (closing the loop on both sides of a closed curve, and round both ends of an open one). */
  readonly links: CurveLink[];
  readonly targets: Map<number, number>;
  readonly sides: CurveSide[];
  /** First side face of each curve (or of each side of a closed curve), to tie it to the rest. */
  readonly anchors: number[];
  /**
   * Per closed curve: its distinct vertices, the halfedge leaving each along the curve, and for
   * each a face on its left and on its right.
   */
  readonly closed: { curve: number; vertices: number[]; along: number[]; left: number[]; right: number[] }[];
  /** Per open curve: a face beside it (it never separates the surface). */
  readonly open: { curve: number; face: number }[];
}

/** The halfedge from `from` to `to`, or -1 when no face has that side. */
function findHalfedge(topology: Topology, from: number, to: number): number {
  const start = topology.vertexHalfedge[from];
  if (start === -1) return -1;
  let h = start;
  do {
    if (topology.triangles[nextHalfedge(h)] === to) return h;
    h = nextAroundVertex(topology, h);
  } while (h !== -1 && h !== start);
  return -1;
}

/** A curve's name as a groomer counts them, each kind on its own: "crest 1" is the first crest. */
export function curveName(curves: readonly CurveFeature[], ci: number): string {
  return `${curves[ci].kind} ${curves.slice(0, ci + 1).filter((c) => c.kind === curves[ci].kind).length}`;
}

export function layOutCurves(surface: FieldSurface, curves: readonly CurveFeature[]): CurveGeometry {
  const topology = surface.topology;
  const frames = surface.frames;
  const cutEdge = new Uint8Array(topology.edgeCount);
  const cutVertex = new Uint8Array(topology.vertexCount);
  const links: CurveLink[] = [];
  const targets = new Map<number, number>();
  const sides: CurveSide[] = [];
  const anchors: number[] = [];
  const closedCurves: CurveGeometry['closed'] = [];
  const openCurves: CurveGeometry['open'] = [];
  const owner = new Int32Array(topology.vertexCount).fill(-1);

  const nameOf = (ci: number) => curveName(curves, ci);
  curves.forEach((curve, ci) => {
    const name = nameOf(ci);
    const vs = curve.vertices;
    const closed = vs.length > 2 && vs[0] === vs[vs.length - 1];
    if (vs.length < 2) throw new FieldError('curve-too-short', `The ${name} needs at least two vertices.`);
    const distinct = closed ? vs.slice(0, -1) : vs;
    for (const v of distinct) {
      if (!Number.isInteger(v) || v < 0 || v >= topology.vertexCount) throw new FieldError('vertex-out-of-range', `The ${name} passes through vertex ${v}, which the surface does not have.`);
      if (topology.isBoundaryVertex[v]) throw new FieldError('curve-on-boundary', `The ${name} touches the boundary at vertex ${v}; partings and crests must stay inside the surface.`);
      if (owner[v] === ci) throw new FieldError('curve-self-crossing', `The ${name} passes through vertex ${v} twice.`);
      if (owner[v] >= 0) throw new FieldError('curves-meet', `The ${name} meets ${nameOf(owner[v])} at vertex ${v}; curves must not touch.`);
      owner[v] = ci;
      cutVertex[v] = 1;
    }
    if (closed && distinct.length < 3) throw new FieldError('curve-too-short', `The closed ${name} needs at least three distinct vertices.`);
    // Halfedges along the curve: the left side is the face of h, the right side the face of twin(h).
    const along: number[] = [];
    for (let i = 0; i + 1 < vs.length; i++) {
      const h = findHalfedge(topology, vs[i], vs[i + 1]);
      if (h === -1) throw new FieldError('curve-not-on-edges', `The ${name} jumps from vertex ${vs[i]} to ${vs[i + 1]}, which share no edge.`);
      if (topology.twin[h] === -1) throw new FieldError('curve-on-boundary', `The ${name} runs along the boundary between vertices ${vs[i]} and ${vs[i + 1]}.`);
      along.push(h);
      cutEdge[topology.edgeOf[h]] = 1;
    }
    const sign: 1 | -1 = curve.kind === 'parting' ? 1 : -1;
    const left = along.map((h) => faceOfHalfedge(h));
    const right = along.map((h) => faceOfHalfedge(topology.twin[h]));
    along.forEach((h, i) => {
      // Perpendicular to the edge: a quarter turn left of it in the left face, right of it in the right face.
      const tLeft = frames.halfedgeAngle[h] + sign * (Math.PI / 2);
      const tRight = frames.halfedgeAngle[topology.twin[h]] + sign * (Math.PI / 2);
      for (const [f, a, edge] of [[left[i], tLeft, h], [right[i], tRight, topology.twin[h]]] as const) {
        if (targets.has(f) && Math.abs(Math.sin(targets.get(f)! - a)) > 1e-9) {
          throw new FieldError('curve-too-tight', `The ${name} bends so tightly that face ${f} would have to point two ways; draw it with gentler turns.`);
        }
        if (!targets.has(f)) sides.push({ face: f, halfedge: edge, sense: sign });
        targets.set(f, a);
      }
    });
    const m = along.length;
    const link = (chain: DualChain, preferred: number, vertex: number) => links.push({ from: chain.fromFace, to: chain.toFace, chain, preferred, curve: ci, vertex });
    // Along each side, consecutive side faces are joined around the shared curve vertex; round a
    // closed curve the last joins the first, so each side's whole turning is held.
    for (let i = 0; i + 1 < (closed ? m + 1 : m); i++) {
      const hIn = along[i], hOut = along[(i + 1) % m];
      const vertex = vs[i + 1];
      link(reverseChain(partialFan(topology, hOut, hIn, cutEdge)), 0, vertex);
      link(partialFan(topology, topology.twin[hIn], topology.twin[hOut], cutEdge), 0, vertex);
    }
    if (closed) {
      anchors.push(left[0], right[0]);
      closedCurves.push({ curve: ci, vertices: [...distinct], along, left, right });
    } else {
      // Around each end the flow turns half a circle, counter-clockwise seen from outside.
      link(partialFan(topology, along[0], topology.twin[along[0]], cutEdge), Math.PI, vs[0]);
      link(partialFan(topology, topology.twin[along[m - 1]], along[m - 1], cutEdge), Math.PI, vs[m]);
      anchors.push(left[0]);
      openCurves.push({ curve: ci, face: left[0] });
    }
  });
  return { cutEdge, cutVertex, links, targets, sides, anchors, closed: closedCurves, open: openCurves };
}

/** Pieces of the dual graph once the curve edges are cut: the field is continuous within each. */
export function dualPieces(topology: Topology, cutEdge: Uint8Array): Uint32Array {
  return facePieces(topology.faceCount, topology.twin, topology.edgeOf, cutEdge).piece;
}
