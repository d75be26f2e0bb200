import { now } from '../clock';
import { factorCholesky, type CholeskyFactor } from '../linalg/cholesky';
import { factorDenseLU, type DenseLU } from '../linalg/dense';
import {
  homologyGenerators,
  partialFan,
  reverseChain,
  shortestDualPath,
  vertexFan,
  type DualChain,
} from '../mesh/dual-chains';
import { angleDefects, componentFacts, cornerAngles, type ComponentFacts } from '../mesh/geometry';
import { FieldError, describeFirst } from '../mesh/errors';
import type { TriangleMesh } from '../mesh/mesh';
import { symmetricFromTriplets } from '../linalg/sparse';
import { buildTopology, faceOfHalfedge, facePieces, nextAroundVertex, nextHalfedge, type Topology } from '../mesh/topology';
import { TWO_PI, angleInFace, buildFaceFrames, type FaceFrames } from '../mesh/transport';

/**
 * What the field does along the surface's boundary loops: `free` leaves it to the smoothest
 * solution; `tangent` holds it along the boundary (in the loop's direction, surface on the left);
 * `normal` holds it across the boundary, pointing into the surface.
 */
export type BoundaryMode = 'free' | 'tangent' | 'normal';

/** A point singularity: a whorl (index +1), a saddle (−1) or any multiple of 1/order. */
export interface PointSingularity {
  readonly vertex: number;
  readonly index: number;
  /**
   * Optional twist: the field's angle (radians) in the vertex's first face, measured from the
   * direction pointing from the vertex into that face. For a whorl, 0 is outflow, π inflow,
   * ±π/2 a spiral.
   */
  readonly orientation?: number;
}

/** A face whose direction is fixed: one sample of a flow stroke. */
export interface FaceAlignment {
  readonly face: number;
  /** A 3D direction; its projection onto the face plane is what the field follows. */
  readonly direction: readonly [number, number, number];
}

/**
 * A curve along mesh edges, given as the vertices it passes through (consecutive ones share an
 * edge; first = last for a closed curve). A parting sends the flow away from the curve on both
 * sides, a crest brings it in from both sides; either way perpendicular to the curve.
 */
export interface CurveFeature {
  readonly kind: 'parting' | 'crest';
  readonly vertices: readonly number[];
}

export interface FieldRequest {
  /** n of an n-direction field: 1 for hair direction. */
  readonly order?: number;
  readonly singularities?: readonly PointSingularity[];
  /** Flow strokes, each a chain of faces with the direction to follow there. */
  readonly strokes?: readonly (readonly FaceAlignment[])[];
  readonly curves?: readonly CurveFeature[];
  /**
   * Holonomy (radians) around each homology generator, in the order `FieldSurface.generators`
   * lists them; `null` or missing picks the multiple of 2π/order nearest to Levi-Civita's.
   */
  readonly generatorHolonomies?: readonly (number | null)[];
  /** Rotation (radians) of the whole field where no alignment fixes its direction. */
  readonly rotation?: number;
  /** World direction the field starts from where no alignment fixes it (projected onto the surface). */
  readonly referenceDirection?: readonly [number, number, number];
  /** A vertex that receives whatever index the surface still demands (see `indexBudget`). */
  readonly remainderAt?: number;
}

/**
 * A growth surface made ready for field solves: topology, geometry, frames, and the factored
 * vertex-ring system. Prepare once per surface and boundary mode; every solve reuses it.
 */
export interface FieldSurface {
  readonly mesh: TriangleMesh;
  readonly topology: Topology;
  readonly frames: FaceFrames;
  readonly cornerAngles: Float64Array;
  /** Angle defect per vertex (2π − Σ angles inside, π − Σ angles on the boundary). */
  readonly angleDefects: Float64Array;
  /**
   * The curvature each vertex ring's holonomy is measured against: the angle defect, except on a
   * held boundary, where a corner vertex with a single face hands its defect to the next vertex
   * along the loop (it has no edge of its own to turn across).
   */
  readonly ringDefect: Float64Array;
  readonly boundary: BoundaryMode;
  /** Euler characteristic, boundary loop count and closedness per component. */
  readonly components: readonly ComponentFacts[];
  readonly componentOfVertex: Int32Array;
  /** Homology generators of the uncut surface (2g per closed component of genus g). */
  readonly generators: readonly DualChain[];
  /** Seconds spent preparing, by step. */
  readonly setupSeconds: { readonly geometry: number; readonly generators: number; readonly factorization: number };
  /** @internal state reused between solves */
  readonly solver: RingSolver;
}

/** The connection found by a solve: rotation angles per edge on top of Levi-Civita transport. */
export interface ConnectionResult {
  readonly order: number;
  /** Extra rotation per edge (0 on boundary and curve edges); crossing sign as in `DualChain`. */
  readonly angles: Float64Array;
  /** Index asked for at each vertex (after `remainderAt`). */
  readonly requestedIndex: Float64Array;
  /** 1 where the index is defined and was prescribed: interior vertices off curves (and boundary vertices when held). */
  readonly constrainedVertex: Uint8Array;
  /** Edges that the field does not cross continuously (the curves). */
  readonly cutEdge: Uint8Array;
  /** Faces whose direction is fixed, with the fixed angle in the face frame. */
  readonly fixedFaces: ReadonlyMap<number, number>;
  /** Largest |angle| over all edges: below π/order, the index measurement sees exactly the prescribed indices. */
  readonly largestAngle: number;
  readonly solveMilliseconds: number;
}

interface ExtraRow {
  readonly key: string;
  /** The row as a dual chain, or null for a "this vertex row is switched off" row. */
  readonly chain: DualChain | null;
  readonly removedVertex: number;
  value: number;
}

interface RowCacheEntry {
  readonly couplingIdx: Int32Array;
  readonly couplingVal: Float64Array;
  readonly schur: Map<string, number>;
  /** L⁻¹Pᵣ, kept while memory allows so a re-solve needs one sparse solve instead of two. */
  response: Float64Array | null;
}

/** Doubles of L⁻¹Pᵣ columns kept per surface (≈ 200 MB). */
const RESPONSE_BUDGET = 24_000_000;
/** Extra rows remembered per surface before the caches start over. */
const ROW_CACHE_LIMIT = 4000;

/** The factored vertex-ring system C Cᵀ and the Schur-complement caches for extra rows. */
interface RingSolver {
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

/**
 * Prepares a surface for solving: builds topology (throws FieldError on non-manifold input),
 * frames, curvature, generators, and factors the vertex-ring system once.
 *
 * Guarantees: the factorization is never repeated by `solveConnection` for this surface, whatever
 * singularities, strokes or curves are asked for.
 */
export function prepareSurface(mesh: TriangleMesh, options: { boundary?: BoundaryMode } = {}): FieldSurface {
  const boundary = options.boundary ?? 'free';
  const t0 = now();
  const topology = buildTopology(mesh);
  if (topology.faceCount === 0) throw new FieldError('empty', 'The surface has no faces.');
  const frames = buildFaceFrames(mesh, topology);
  const corners = cornerAngles(mesh);
  const defects = angleDefects(mesh, topology, corners);
  const components = componentFacts(topology);
  const componentOfVertex = vertexComponents(topology);
  const t1 = now();
  const generators = homologyGenerators(topology);
  const t2 = now();
  const solver = buildRingSolver(topology, defects, components, componentOfVertex, boundary);
  const t3 = now();
  return {
    mesh,
    topology,
    frames,
    cornerAngles: corners,
    angleDefects: defects,
    ringDefect: solver.ringDefect,
    boundary,
    components,
    componentOfVertex,
    generators,
    setupSeconds: { geometry: (t1 - t0) / 1000, generators: (t2 - t1) / 1000, factorization: (t3 - t2) / 1000 },
    solver,
  };
}

function vertexComponents(topology: Topology): Int32Array {
  const componentOfVertex = new Int32Array(topology.vertexCount).fill(-1);
  for (let f = 0; f < topology.faceCount; f++) {
    for (let k = 0; k < 3; k++) componentOfVertex[topology.triangles[3 * f + k]] = topology.componentOfFace[f];
  }
  return componentOfVertex;
}

/**
 * Whether a component's vertex rings (with held boundary fans) are bound by Poincaré–Hopf:
 * true for closed components, and for every component when the boundary is held.
 */
function isBudgeted(surface: Pick<FieldSurface, 'components' | 'boundary'>, component: number): boolean {
  return surface.components[component].boundaryLoopCount === 0 || surface.boundary !== 'free';
}

function buildRingSolver(
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

interface CurveGeometry {
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

function layOutCurves(surface: FieldSurface, curves: readonly CurveFeature[]): CurveGeometry {
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

function validateRequest(surface: FieldSurface, request: FieldRequest, cutVertex: Uint8Array): { order: number; requestedIndex: Float64Array } {
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

/** Σ sign·values[edge] along a chain. */
function chainSum(chain: DualChain, values: Float64Array): number {
  let s = 0;
  for (let i = 0; i < chain.edges.length; i++) s += chain.signs[i] * values[chain.edges[i]];
  return s;
}

/** The value of Σ sign·angle along `chain` that turns `fromTarget` into `toTarget` with the multiple of 2π/n nearest `preferred`. */
function alignmentValue(surface: FieldSurface, chain: DualChain, fromTarget: number, toTarget: number, order: number, preferred: number): number {
  const base = toTarget - fromTarget - chainSum(chain, surface.frames.edgeRotation);
  const step = TWO_PI / order;
  return base + step * Math.round((preferred - base) / step);
}

function chainKey(prefix: string, chain: DualChain): string {
  return `${prefix}:${chain.fromFace}>${chain.toFace}:${Array.from(chain.edges, (e, i) => (chain.signs[i] > 0 ? e : -e - 1)).join(',')}`;
}

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
      rowCache.set(row.key, entry);
    }
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
    if (solver.storedResponses + w.length <= RESPONSE_BUDGET) {
      entry.response = w;
      solver.storedResponses += w.length;
    }
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
 * Minimal-norm angles subject to the ring rows (right-hand side `ringValues`) and the extra rows:
 * x = Cᵀy with C Cᵀ y = b, the extra rows entering through a dense Schur complement.
 */
function solveRows(surface: FieldSurface, ringValues: Float64Array, rows: readonly ExtraRow[]): Float64Array {
  const { factor, luCache, vertexOfRow } = surface.solver;
  const topology = surface.topology;
  const entries = cacheRows(surface, rows);
  const k = rows.length;
  const t = factor.solve(ringValues);
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
  const { rowOfVertex } = surface.solver;
  for (let e = 0; e < topology.edgeCount; e++) {
    const h = topology.edgeHalfedge[e];
    if (topology.twin[h] === -1) continue;
    const head = rowOfVertex[topology.triangles[nextHalfedge(h)]];
    const tail = rowOfVertex[topology.triangles[h]];
    x[e] = (head >= 0 && !removed[head] ? y[head] : 0) - (tail >= 0 && !removed[tail] ? y[tail] : 0);
  }
  rows.forEach((r, i) => {
    if (!r.chain) return;
    for (let q = 0; q < r.chain.edges.length; q++) x[r.chain.edges[q]] += z[i] * r.chain.signs[q];
  });
  return x;
}

/**
 * Solves for the trivial connection: the smallest (least-squares) set of extra rotations per edge
 * such that the holonomy around every vertex ring is 2π × its index (Levi-Civita's curvature
 * cancelled), around every generator the asked value, along every stroke and curve the asked
 * turning, with the boundary free or held.
 *
 * Guarantees: never refactors the surface's matrix; throws FieldError naming the reason for an
 * infeasible request (index not a multiple of 1/order, unbalanced index budget, singularity on a
 * free boundary or on a curve, conflicting alignments, curves that cross); never returns NaN.
 */
export function solveConnection(surface: FieldSurface, request: FieldRequest): ConnectionResult {
  const started = now();
  const topology = surface.topology;
  const { rowOfVertex, vertexOfRow, droppedVertexOfComponent, ringDefect } = surface.solver;
  const curves = layOutCurves(surface, request.curves ?? []);
  const { order, requestedIndex } = validateRequest(surface, request, curves.cutVertex);
  const frames = surface.frames;

  const ringValues = new Float64Array(vertexOfRow.length);
  const constrainedVertex = new Uint8Array(topology.vertexCount);
  for (let r = 0; r < vertexOfRow.length; r++) {
    const v = vertexOfRow[r];
    if (curves.cutVertex[v]) continue;
    ringValues[r] = TWO_PI * requestedIndex[v] - ringDefect[v];
    constrainedVertex[v] = 1;
  }

  const stage1: ExtraRow[] = [];
  const hasCurves = (request.curves ?? []).length > 0;
  const generators = hasCurves ? homologyGenerators(topology, curves.cutEdge) : surface.generators;
  const given = request.generatorHolonomies ?? [];
  generators.forEach((g, i) => {
    const levelCivita = chainSum(g, frames.edgeRotation);
    const wanted = given[i] ?? (TWO_PI / order) * Math.round((levelCivita * order) / TWO_PI);
    if (!Number.isFinite(wanted)) throw new FieldError('bad-holonomy', `The holonomy given for generator ${i + 1} is not a finite angle.`);
    stage1.push({ key: chainKey('g', g), chain: g, removedVertex: -1, value: wanted - levelCivita });
  });
  if (hasCurves) {
    for (let v = 0; v < topology.vertexCount; v++) {
      if (curves.cutVertex[v] && rowOfVertex[v] >= 0) stage1.push({ key: `off:${v}`, chain: null, removedVertex: v, value: 0 });
    }
    // A cut gives a closed piece a boundary, so the ring left out to make the system definite counts again.
    droppedVertexOfComponent.forEach((v, c) => {
      if (v < 0 || curves.cutVertex[v]) return;
      const cutHere = (request.curves ?? []).some((curve) => surface.componentOfVertex[curve.vertices[0]] === c);
      if (!cutHere) return;
      const fan = vertexFan(topology, v);
      stage1.push({ key: chainKey('ring', fan), chain: fan, removedVertex: -1, value: TWO_PI * requestedIndex[v] - ringDefect[v] });
      constrainedVertex[v] = 1;
    });
  }
  for (const v of droppedVertexOfComponent) if (v >= 0 && !curves.cutVertex[v]) constrainedVertex[v] = 1;

  // Fixed directions: curve sides, stroke samples, twists, held boundary loops.
  const fixedFaces = new Map<number, number>(curves.targets);
  const features: number[] = [...curves.anchors];
  for (const link of curves.links) {
    stage1.push({
      key: chainKey('curve', link.chain),
      chain: link.chain,
      removedVertex: -1,
      value: alignmentValue(surface, link.chain, fixedFaces.get(link.from)!, fixedFaces.get(link.to)!, order, link.preferred),
    });
  }
  const fix = (face: number, angle: number, what: string) => {
    if (!Number.isInteger(face) || face < 0 || face >= topology.faceCount) throw new FieldError('face-out-of-range', `${what} is on face ${face}, which the surface does not have.`);
    if (!Number.isFinite(angle)) throw new FieldError('bad-direction', `${what} has a direction that is not finite or lies across the face.`);
    if (fixedFaces.has(face)) throw new FieldError('conflicting-constraints', `${what} fixes face ${face}, which another stroke, curve or twist already fixes.`);
    fixedFaces.set(face, angle);
  };
  (request.strokes ?? []).forEach((stroke, si) => {
    let previous = -1;
    stroke.forEach((sample, k) => {
      if (sample.face === previous) return;
      const [dx, dy, dz] = sample.direction;
      const f = sample.face;
      const angle = f >= 0 && f < topology.faceCount ? angleInFace(frames, f, dx, dy, dz) : NaN;
      fix(f, angle, `Stroke ${si + 1}, sample ${k + 1}`);
      if (previous === -1) features.push(f);
      else {
        const chain = shortestDualPath(topology, previous, f, curves.cutEdge);
        stage1.push({ key: chainKey('stroke', chain), chain, removedVertex: -1, value: alignmentValue(surface, chain, fixedFaces.get(previous)!, angle, order, 0) });
      }
      previous = f;
    });
  });
  const tri = topology.triangles;
  const p = surface.mesh.positions;
  for (const s of request.singularities ?? []) {
    if (s.orientation === undefined) continue;
    const h = topology.vertexHalfedge[s.vertex];
    const f = faceOfHalfedge(h);
    let cx = 0, cy = 0, cz = 0;
    for (let k = 0; k < 3; k++) {
      const w = 3 * tri[3 * f + k];
      cx += p[w] / 3; cy += p[w + 1] / 3; cz += p[w + 2] / 3;
    }
    const o = 3 * s.vertex;
    const outward = angleInFace(frames, f, cx - p[o], cy - p[o + 1], cz - p[o + 2]);
    fix(f, outward + s.orientation, `The twist of the singularity at vertex ${s.vertex}`);
    features.push(f);
  }
  if (surface.boundary !== 'free') {
    const quarter = surface.boundary === 'normal' ? Math.PI / 2 : 0;
    for (const loop of topology.boundaryLoops) {
      const h = loop[0];
      fix(faceOfHalfedge(h), frames.halfedgeAngle[h] + quarter, `The held boundary at vertex ${tri[h]}`);
      features.push(faceOfHalfedge(h));
    }
  }

  // Tie each feature to the first fixed face of its piece of surface; the turning along the tie
  // is whatever the field would do without it, rounded to a whole symmetry step.
  const piece = features.length > 0 ? dualPieces(topology, curves.cutEdge) : topology.componentOfFace;
  const referenceOfPiece = new Map<number, number>();
  const stage2: ExtraRow[] = [];
  for (const f of features) {
    const reference = referenceOfPiece.get(piece[f]);
    if (reference === undefined) {
      referenceOfPiece.set(piece[f], f);
      continue;
    }
    const chain = shortestDualPath(topology, reference, f, curves.cutEdge);
    stage2.push({ key: chainKey('tie', chain), chain, removedVertex: -1, value: 0 });
  }
  let angles: Float64Array;
  if (stage2.length === 0) {
    angles = solveRows(surface, ringValues, stage1);
  } else {
    const natural = solveRows(surface, ringValues, stage1);
    for (const row of stage2) {
      const chain = row.chain!;
      row.value = alignmentValue(surface, chain, fixedFaces.get(chain.fromFace)!, fixedFaces.get(chain.toFace)!, order, chainSum(chain, natural));
    }
    angles = solveRows(surface, ringValues, [...stage1, ...stage2]);
  }
  let largestAngle = 0;
  for (let e = 0; e < angles.length; e++) {
    if (!Number.isFinite(angles[e])) throw new FieldError('numerical-failure', 'The solve produced a non-finite angle; the surface may have degenerate faces.');
    largestAngle = Math.max(largestAngle, Math.abs(angles[e]));
  }
  return {
    order,
    angles,
    requestedIndex,
    constrainedVertex,
    cutEdge: curves.cutEdge,
    fixedFaces,
    largestAngle,
    solveMilliseconds: now() - started,
  };
}

/** Pieces of the dual graph once the curve edges are cut: the field is continuous within each. */
export function dualPieces(topology: Topology, cutEdge: Uint8Array): Uint32Array {
  return facePieces(topology.faceCount, topology.twin, topology.edgeOf, cutEdge).piece;
}
