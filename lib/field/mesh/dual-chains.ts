/**
 * Walks from face to face across edges, the paths along which a connection's holonomy is summed:
 * vertex rings, partial fans beside curves, shortest paths for strokes and ties, and the
 * tree–cotree generators of a surface with handles.
 */
import { FieldError } from './errors';
import type { Topology } from './topology';
import { faceOfHalfedge, nextAroundVertex, nextHalfedge, prevHalfedge } from './topology';

/**
 * A walk through the dual graph (faces joined across interior edges), stored as the edges it
 * crosses and the direction of each crossing: +1 when it goes from the face of the edge's
 * canonical halfedge to the twin's face, −1 the other way. The holonomy of a connection along
 * the walk is Σ sign·angle[edge].
 */
export interface DualChain {
  readonly edges: Int32Array;
  readonly signs: Int8Array;
  readonly fromFace: number;
  readonly toFace: number;
}

/** Crossing sign for leaving a face through halfedge `h` (which lies in that face). */
export function crossingSign(topology: Topology, h: number): 1 | -1 {
  return topology.edgeHalfedge[topology.edgeOf[h]] === h ? 1 : -1;
}

/**
 * The counter-clockwise walk around vertex `v` through all its faces. For an interior vertex it
 * is the closed ring (from and to the same face); for a boundary vertex it is the open fan from
 * the face of the outgoing boundary halfedge to the face of the incoming one.
 */
export function vertexFan(topology: Topology, v: number): DualChain {
  const start = topology.vertexHalfedge[v];
  const edges: number[] = [];
  const signs: number[] = [];
  if (start === -1) return { edges: new Int32Array(0), signs: new Int8Array(0), fromFace: -1, toFace: -1 };
  let h = start;
  let last = h;
  for (;;) {
    const crossing = prevHalfedge(h);
    const next = topology.twin[crossing];
    if (next === -1) break;
    edges.push(topology.edgeOf[crossing]);
    signs.push(crossingSign(topology, crossing));
    last = next;
    if (next === start) break;
    h = next;
  }
  return { edges: Int32Array.from(edges), signs: Int8Array.from(signs), fromFace: faceOfHalfedge(start), toFace: faceOfHalfedge(last) };
}

/**
 * The counter-clockwise walk around the tail vertex of `fromOutgoing` (an outgoing halfedge)
 * until reaching the face that holds the incoming halfedge `toIncoming`. Throws when the walk
 * meets the boundary or a blocked edge first.
 */
export function partialFan(topology: Topology, fromOutgoing: number, toIncoming: number, blocked?: Uint8Array): DualChain {
  const edges: number[] = [];
  const signs: number[] = [];
  const target = faceOfHalfedge(toIncoming);
  let h = fromOutgoing;
  const limit = 3 * topology.faceCount;
  for (let guard = 0; faceOfHalfedge(h) !== target || prevHalfedge(h) !== toIncoming; guard++) {
    const crossing = prevHalfedge(h);
    const next = topology.twin[crossing];
    const e = topology.edgeOf[crossing];
    if (next === -1 || (blocked && blocked[e]) || guard > limit) {
      throw new FieldError('curve-crosses', `The walk around vertex ${topology.triangles[fromOutgoing]} meets the boundary or another curve before reaching the other side.`);
    }
    edges.push(e);
    signs.push(crossingSign(topology, crossing));
    h = next;
  }
  return { edges: Int32Array.from(edges), signs: Int8Array.from(signs), fromFace: faceOfHalfedge(fromOutgoing), toFace: target };
}

/** The reverse walk of a chain. */
export function reverseChain(chain: DualChain): DualChain {
  const n = chain.edges.length;
  const edges = new Int32Array(n);
  const signs = new Int8Array(n);
  for (let i = 0; i < n; i++) {
    edges[i] = chain.edges[n - 1 - i];
    signs[i] = -chain.signs[n - 1 - i] as -1 | 1;
  }
  return { edges, signs, fromFace: chain.toFace, toFace: chain.fromFace };
}

/**
 * A shortest walk (fewest crossings) from face `from` to face `to` that crosses no blocked edge.
 * Throws when no such walk exists.
 */
export function shortestDualPath(topology: Topology, from: number, to: number, blocked?: Uint8Array): DualChain {
  const nF = topology.faceCount;
  const cameThrough = new Int32Array(nF).fill(-1); // the halfedge (in the new face) crossed to arrive
  const seen = new Uint8Array(nF);
  const queue = new Int32Array(nF);
  let head = 0, tail = 0;
  queue[tail++] = from;
  seen[from] = 1;
  while (head < tail && !seen[to]) {
    const f = queue[head++];
    for (let k = 0; k < 3; k++) {
      const h = 3 * f + k;
      const t = topology.twin[h];
      if (t === -1 || (blocked && blocked[topology.edgeOf[h]])) continue;
      const g = faceOfHalfedge(t);
      if (seen[g]) continue;
      seen[g] = 1;
      cameThrough[g] = t;
      queue[tail++] = g;
    }
  }
  if (!seen[to]) throw new FieldError('unreachable', `Face ${to} cannot be reached from face ${from} without crossing a boundary or a curve.`);
  const edges: number[] = [];
  const signs: number[] = [];
  for (let f = to; f !== from; ) {
    const t = cameThrough[f];
    const h = topology.twin[t];
    edges.push(topology.edgeOf[h]);
    signs.push(crossingSign(topology, h));
    f = faceOfHalfedge(h);
  }
  edges.reverse();
  signs.reverse();
  return { edges: Int32Array.from(edges), signs: Int8Array.from(signs), fromFace: from, toFace: to };
}

/**
 * A basis of the non-contractible dual cycles (homology generators) by tree–cotree.
 *
 * Boundary loops are treated as if capped by a virtual vertex joined to the whole loop, and the
 * blocked edges (curves drawn on the surface) are put into the primal tree first, so no generator
 * crosses a boundary or a curve and each closed surface of genus g gets 2g generators.
 * Guarantees: each returned chain is closed (ends in the face it starts from) and crosses only
 * interior, unblocked edges.
 */
export function homologyGenerators(topology: Topology, blocked?: Uint8Array): DualChain[] {
  const nV = topology.vertexCount;
  const nE = topology.edgeCount;
  const tri = topology.triangles;
  const parent = new Int32Array(nV + topology.boundaryLoops.length);
  for (let i = 0; i < parent.length; i++) parent[i] = i;
  const find = (a: number): number => {
    while (parent[a] !== a) {
      parent[a] = parent[parent[a]];
      a = parent[a];
    }
    return a;
  };
  const union = (a: number, b: number): boolean => {
    const ra = find(a), rb = find(b);
    if (ra === rb) return false;
    parent[ra] = rb;
    return true;
  };
  const inPrimalTree = new Uint8Array(nE);
  topology.boundaryLoops.forEach((loop, i) => {
    for (const h of loop) union(nV + i, tri[h]);
  });
  if (blocked) {
    for (let e = 0; e < nE; e++) if (blocked[e] && union(tri[topology.edgeHalfedge[e]], tri[nextHalfedge(topology.edgeHalfedge[e])])) inPrimalTree[e] = 1;
  }
  // Breadth-first order keeps the tree shallow, which keeps the generator loops short.
  const visitedVertex = new Uint8Array(nV);
  const queue = new Int32Array(nV);
  for (let seed = 0; seed < nV; seed++) {
    if (visitedVertex[seed] || topology.vertexHalfedge[seed] === -1) continue;
    let head = 0, tail = 0;
    queue[tail++] = seed;
    visitedVertex[seed] = 1;
    while (head < tail) {
      const v = queue[head++];
      const start = topology.vertexHalfedge[v];
      let h = start;
      do {
        const w = tri[nextHalfedge(h)];
        if (union(v, w)) inPrimalTree[topology.edgeOf[h]] = 1;
        if (!visitedVertex[w]) {
          visitedVertex[w] = 1;
          queue[tail++] = w;
        }
        const n = nextAroundVertex(topology, h);
        if (n === -1) {
          // The last edge of an open fan is the incoming boundary halfedge's edge.
          const incoming = prevHalfedge(h);
          const u = tri[incoming];
          if (union(v, u)) inPrimalTree[topology.edgeOf[incoming]] = 1;
          if (!visitedVertex[u]) {
            visitedVertex[u] = 1;
            queue[tail++] = u;
          }
          break;
        }
        h = n;
      } while (h !== start);
    }
  }

  const nF = topology.faceCount;
  const parentHalfedge = new Int32Array(nF).fill(-1); // halfedge in the face, crossed to reach the parent
  const depth = new Int32Array(nF).fill(-1);
  const inDualTree = new Uint8Array(nE);
  const faceQueue = new Int32Array(nF);
  for (let root = 0; root < nF; root++) {
    if (depth[root] !== -1) continue;
    let head = 0, tail = 0;
    faceQueue[tail++] = root;
    depth[root] = 0;
    while (head < tail) {
      const f = faceQueue[head++];
      for (let k = 0; k < 3; k++) {
        const h = 3 * f + k;
        const t = topology.twin[h];
        const e = topology.edgeOf[h];
        if (t === -1 || inPrimalTree[e] || (blocked && blocked[e])) continue;
        const g = faceOfHalfedge(t);
        if (depth[g] !== -1) continue;
        depth[g] = depth[f] + 1;
        parentHalfedge[g] = t;
        inDualTree[e] = 1;
        faceQueue[tail++] = g;
      }
    }
  }

  const generators: DualChain[] = [];
  for (let e = 0; e < nE; e++) {
    const h = topology.edgeHalfedge[e];
    const t = topology.twin[h];
    if (t === -1 || inPrimalTree[e] || inDualTree[e] || (blocked && blocked[e])) continue;
    // Cycle: from face(h) across e to face(t), then up the dual tree from both ends to their meeting face.
    let a = faceOfHalfedge(h);
    let b = faceOfHalfedge(t);
    const fromA: { e: number; s: number }[] = []; // walking upward from a (leaving each face toward its parent)
    const fromB: { e: number; s: number }[] = [];
    while (a !== b) {
      if (depth[a] >= depth[b]) {
        const ph = parentHalfedge[a];
        fromA.push({ e: topology.edgeOf[ph], s: crossingSign(topology, ph) });
        a = faceOfHalfedge(topology.twin[ph]);
      } else {
        const ph = parentHalfedge[b];
        fromB.push({ e: topology.edgeOf[ph], s: crossingSign(topology, ph) });
        b = faceOfHalfedge(topology.twin[ph]);
      }
    }
    // Loop: meeting face → down to face(h) (reverse of fromA) → across e → face(t) → up to meeting face (fromB).
    const edges: number[] = [];
    const signs: number[] = [];
    for (let i = fromA.length - 1; i >= 0; i--) {
      edges.push(fromA[i].e);
      signs.push(-fromA[i].s);
    }
    edges.push(e);
    signs.push(1);
    for (const step of fromB) {
      edges.push(step.e);
      signs.push(step.s);
    }
    generators.push({ edges: Int32Array.from(edges), signs: Int8Array.from(signs), fromFace: a, toFace: a });
  }
  return generators;
}
