/**
 * Connectivity without pointers: halfedges numbered by face and corner, so that every walk over
 * the surface is integer arithmetic on typed arrays, and non-manifold input is refused up front.
 */
import { FieldError, describeFirst } from './errors';
import { faceCount, vertexCount, type TriangleMesh } from './mesh';

/**
 * Halfedge connectivity of a manifold, consistently oriented triangle mesh, stored implicitly:
 * halfedge `h = 3f + k` runs in face `f` from vertex `triangles[h]` to `triangles[next(h)]`,
 * with the face on its left.
 */
export interface Topology {
  readonly vertexCount: number;
  readonly faceCount: number;
  readonly edgeCount: number;
  readonly triangles: Uint32Array;
  /** The opposite halfedge, or -1 where the halfedge lies on the boundary. */
  readonly twin: Int32Array;
  /** Halfedge → undirected edge. */
  readonly edgeOf: Uint32Array;
  /**
   * Edge → its canonical halfedge: the lower-numbered of the pair, or the only one on the boundary.
   * The canonical halfedge fixes the edge's orientation: its dual edge runs from the canonical
   * halfedge's face to the twin's face.
   */
  readonly edgeHalfedge: Uint32Array;
  /**
   * Vertex → an outgoing halfedge from which `nextAroundVertex` visits every face at the vertex
   * once, counter-clockwise. At a boundary vertex it is the outgoing boundary halfedge, so the walk
   * ends at the boundary. -1 for a vertex no face uses.
   */
  readonly vertexHalfedge: Int32Array;
  readonly isBoundaryVertex: Uint8Array;
  /** Each boundary loop as its boundary halfedges in order, surface on the left. */
  readonly boundaryLoops: readonly Uint32Array[];
  /** Connected component (through shared edges) of each face, numbered from 0. */
  readonly componentOfFace: Uint32Array;
  readonly componentCount: number;
}

export const nextHalfedge = (h: number): number => (h % 3 === 2 ? h - 2 : h + 1);
export const prevHalfedge = (h: number): number => (h % 3 === 0 ? h + 2 : h - 1);
export const faceOfHalfedge = (h: number): number => (h / 3) | 0;
export const headVertex = (t: Topology, h: number): number => t.triangles[nextHalfedge(h)];

/**
 * The next outgoing halfedge counter-clockwise around the tail vertex of `h`, or -1 when the
 * walk reaches the boundary.
 */
export function nextAroundVertex(t: Topology, h: number): number {
  return t.twin[prevHalfedge(h)];
}

/**
 * Builds the halfedge connectivity.
 *
 * Guarantees: on success every edge has one or two faces, neighbouring faces are oriented
 * consistently, and the faces around every vertex form a single fan (closed, or open at the
 * boundary). Throws a FieldError naming the first offending edges or vertices otherwise
 * (codes `non-manifold-edge`, `inconsistent-orientation`, `non-manifold-vertex`,
 * `vertex-out-of-range`, `degenerate-faces` for a face that uses a vertex twice).
 */
export function buildTopology(mesh: TriangleMesh): Topology {
  const nV = vertexCount(mesh);
  const nF = faceCount(mesh);
  const tri = mesh.triangles;
  const nH = 3 * nF;
  for (let h = 0; h < nH; h++) {
    if (tri[h] >= nV) throw new FieldError('vertex-out-of-range', `Face ${(h / 3) | 0} uses vertex ${tri[h]}, but the surface has ${nV} vertices.`);
  }
  // A face that repeats a vertex would pair its own sides as twins below.
  const repeated: number[] = [];
  for (let f = 0; f < nF; f++) {
    const a = tri[3 * f], b = tri[3 * f + 1], c = tri[3 * f + 2];
    if (a === b || b === c || c === a) repeated.push(f);
  }
  if (repeated.length > 0) {
    throw new FieldError('degenerate-faces', `${repeated.length} faces use the same vertex twice, so they have no area (faces ${describeFirst(repeated)}).`);
  }

  // Outgoing halfedges grouped by tail vertex (compressed rows), so twins are found by a short scan.
  const outStart = new Int32Array(nV + 1);
  for (let h = 0; h < nH; h++) outStart[tri[h] + 1]++;
  for (let v = 0; v < nV; v++) outStart[v + 1] += outStart[v];
  const outList = new Int32Array(nH);
  const fill = outStart.slice(0, nV);
  for (let h = 0; h < nH; h++) outList[fill[tri[h]]++] = h;

  const twin = new Int32Array(nH).fill(-1);
  const nonManifoldEdges: number[] = [];
  const misorientedEdges: number[] = [];
  for (let h = 0; h < nH; h++) {
    // Paired from its twin's side already: that scan found exactly one halfedge each way.
    if (twin[h] !== -1) continue;
    const a = tri[h];
    const b = tri[nextHalfedge(h)];
    let sameDirection = 0;
    for (let i = outStart[a]; i < outStart[a + 1]; i++) {
      const g = outList[i];
      if (g !== h && tri[nextHalfedge(g)] === b) sameDirection++;
    }
    let opposite = 0;
    let found = -1;
    for (let i = outStart[b]; i < outStart[b + 1]; i++) {
      const g = outList[i];
      if (tri[nextHalfedge(g)] === a) {
        opposite++;
        found = g;
      }
    }
    if (sameDirection + opposite >= 2) nonManifoldEdges.push(h);
    else if (sameDirection === 1) misorientedEdges.push(h);
    else if (opposite === 1) {
      twin[h] = found;
      twin[found] = h;
    }
  }
  const describeEdges = (hs: number[]) => describeFirst(hs.map((h) => `${tri[h]}–${tri[nextHalfedge(h)]}`));
  if (nonManifoldEdges.length > 0) {
    throw new FieldError(
      'non-manifold-edge',
      `${nonManifoldEdges.length} face sides lie on edges shared by more than two faces (edges between vertices ${describeEdges(nonManifoldEdges)}).`,
    );
  }
  if (misorientedEdges.length > 0) {
    throw new FieldError(
      'inconsistent-orientation',
      `Neighbouring faces disagree on orientation across ${misorientedEdges.length / 2} edges (between vertices ${describeEdges(misorientedEdges)}).`,
    );
  }

  const edgeOf = new Uint32Array(nH);
  const edgeHalfedgeAll = new Uint32Array(nH);
  let edgeCount = 0;
  for (let h = 0; h < nH; h++) {
    const t = twin[h];
    if (t === -1 || h < t) {
      edgeOf[h] = edgeCount;
      if (t !== -1) edgeOf[t] = edgeCount;
      edgeHalfedgeAll[edgeCount++] = h;
    }
  }
  const edgeHalfedge = edgeHalfedgeAll.slice(0, edgeCount);

  const vertexHalfedge = new Int32Array(nV).fill(-1);
  const isBoundaryVertex = new Uint8Array(nV);
  const nonManifoldVertices: number[] = [];
  const topo: Topology = {
    vertexCount: nV,
    faceCount: nF,
    edgeCount: edgeHalfedge.length,
    triangles: tri,
    twin,
    edgeOf,
    edgeHalfedge,
    vertexHalfedge,
    isBoundaryVertex,
    boundaryLoops: [],
    componentOfFace: new Uint32Array(nF),
    componentCount: 0,
  };
  for (let v = 0; v < nV; v++) {
    const degree = outStart[v + 1] - outStart[v];
    if (degree === 0) continue;
    let start = outList[outStart[v]];
    let boundaryOutgoing = 0;
    for (let i = outStart[v]; i < outStart[v + 1]; i++) {
      if (twin[outList[i]] === -1) {
        boundaryOutgoing++;
        start = outList[i];
      }
    }
    vertexHalfedge[v] = start;
    if (boundaryOutgoing > 0) isBoundaryVertex[v] = 1;
    // One fan means the walk from the start visits every outgoing halfedge of the vertex.
    let visited = 0;
    let h = start;
    do {
      visited++;
      h = nextAroundVertex(topo, h);
    } while (h !== -1 && h !== start && visited <= degree);
    if (boundaryOutgoing > 1 || visited !== degree) nonManifoldVertices.push(v);
  }
  if (nonManifoldVertices.length > 0) {
    throw new FieldError(
      'non-manifold-vertex',
      `${nonManifoldVertices.length} vertices join surface pieces that share only the vertex (vertices ${describeFirst(nonManifoldVertices)}).`,
    );
  }

  const boundaryLoops: Uint32Array[] = [];
  const onLoop = new Uint8Array(nH);
  for (let h0 = 0; h0 < nH; h0++) {
    if (twin[h0] !== -1 || onLoop[h0]) continue;
    const loop: number[] = [];
    let h = h0;
    do {
      onLoop[h] = 1;
      loop.push(h);
      h = vertexHalfedge[tri[nextHalfedge(h)]];
    } while (h !== h0);
    boundaryLoops.push(Uint32Array.from(loop));
  }

  const { piece: componentOfFace, count: componentCount } = facePieces(nF, twin, edgeOf);
  return { ...topo, boundaryLoops, componentOfFace, componentCount };
}

/**
 * Groups faces into pieces that are joined across shared edges, not crossing the edges marked in
 * `cutEdge` (none when omitted). Pieces are numbered from 0 in order of their lowest face.
 */
export function facePieces(faceCount: number, twin: Int32Array, edgeOf: Uint32Array, cutEdge?: Uint8Array): { piece: Uint32Array; count: number } {
  const piece = new Uint32Array(faceCount).fill(0xffffffff);
  const stack = new Int32Array(faceCount);
  let count = 0;
  for (let f0 = 0; f0 < faceCount; f0++) {
    if (piece[f0] !== 0xffffffff) continue;
    let top = 0;
    stack[top++] = f0;
    piece[f0] = count;
    while (top > 0) {
      const f = stack[--top];
      for (let k = 0; k < 3; k++) {
        const h = 3 * f + k;
        const t = twin[h];
        if (t === -1 || (cutEdge && cutEdge[edgeOf[h]])) continue;
        const g = faceOfHalfedge(t);
        if (piece[g] === 0xffffffff) {
          piece[g] = count;
          stack[top++] = g;
        }
      }
    }
    count++;
  }
  return { piece, count };
}
