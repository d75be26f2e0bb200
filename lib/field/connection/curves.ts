/**
 * Partings and crests laid out on the surface: the edges they cut, the faces beside them with the
 * direction those faces must take, and the chains that link consecutive side faces.
 */
import { partialFan, reverseChain, type DualChain } from '../mesh/dual-chains';
import { FieldError } from '../mesh/errors';
import { faceOfHalfedge, facePieces, nextAroundVertex, nextHalfedge, type Topology } from '../mesh/topology';
import { isBudgeted } from './budget';
import type { CurveFeature } from './request';
import type { FieldSurface } from './surface';

export interface CurveGeometry {
  readonly cutEdge: Uint8Array;
  readonly cutVertex: Uint8Array;
  /** Per curve: chains between consecutive side faces, with targets and preferred turning. */
  readonly links: { from: number; to: number; chain: DualChain; preferred: number }[];
  readonly targets: Map<number, number>;
  /** First side face of each curve (or of each side of a closed curve), to tie it to the rest. */
  readonly anchors: number[];
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

export function layOutCurves(surface: FieldSurface, curves: readonly CurveFeature[]): CurveGeometry {
  const topology = surface.topology;
  const frames = surface.frames;
  const cutEdge = new Uint8Array(topology.edgeCount);
  const cutVertex = new Uint8Array(topology.vertexCount);
  const links: CurveGeometry['links'] = [];
  const targets = new Map<number, number>();
  const anchors: number[] = [];
  const owner = new Int32Array(topology.vertexCount).fill(-1);

  // Each kind is numbered on its own, as a groomer counts them: "crest 1" is the first crest.
  const nameOf = (ci: number) => `${curves[ci].kind} ${curves.slice(0, ci + 1).filter((c) => c.kind === curves[ci].kind).length}`;
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
    const sign = curve.kind === 'parting' ? 1 : -1;
    const left = along.map((h) => faceOfHalfedge(h));
    const right = along.map((h) => faceOfHalfedge(topology.twin[h]));
    along.forEach((h, i) => {
      // Perpendicular to the edge: a quarter turn left of it in the left face, right of it in the right face.
      const tLeft = frames.halfedgeAngle[h] + sign * (Math.PI / 2);
      const tRight = frames.halfedgeAngle[topology.twin[h]] + sign * (Math.PI / 2);
      for (const [f, a] of [[left[i], tLeft], [right[i], tRight]] as const) {
        if (targets.has(f) && Math.abs(Math.sin(targets.get(f)! - a)) > 1e-9) {
          throw new FieldError('curve-too-tight', `The ${name} bends so tightly that face ${f} would have to point two ways; draw it with gentler turns.`);
        }
        targets.set(f, a);
      }
    });
    const m = along.length;
    const chains: { chain: DualChain; preferred: number }[] = [];
    // Along each side, consecutive side faces are joined around the shared curve vertex.
    for (let i = 0; i + 1 < m; i++) {
      const hIn = along[i], hOut = along[i + 1];
      chains.push({ chain: reverseChain(partialFan(topology, hOut, hIn, cutEdge)), preferred: 0 });
      chains.push({ chain: partialFan(topology, topology.twin[hIn], topology.twin[hOut], cutEdge), preferred: 0 });
    }
    if (closed) {
      anchors.push(left[0], right[0]);
    } else {
      // Around each end the flow turns half a circle, counter-clockwise seen from outside.
      chains.push({ chain: partialFan(topology, along[0], topology.twin[along[0]], cutEdge), preferred: Math.PI });
      chains.push({ chain: partialFan(topology, topology.twin[along[m - 1]], along[m - 1], cutEdge), preferred: Math.PI });
      anchors.push(left[0]);
      // The loop of links around an open curve closes up; where the vertex rings already fix the
      // turning around the curve (budgeted components), the last link is implied and must go.
      if (isBudgeted(surface, surface.componentOfVertex[vs[0]])) chains.splice(m === 1 ? chains.length - 1 : chains.length - 3, 1);
    }
    for (const c of chains) links.push({ from: c.chain.fromFace, to: c.chain.toFace, chain: c.chain, preferred: c.preferred });
  });
  return { cutEdge, cutVertex, links, targets, anchors };
}

/** Pieces of the dual graph once the curve edges are cut: the field is continuous within each. */
export function dualPieces(topology: Topology, cutEdge: Uint8Array): Uint32Array {
  return facePieces(topology.faceCount, topology.twin, topology.edgeOf, cutEdge).piece;
}
