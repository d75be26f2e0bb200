/**
 * A growth surface made ready for field solves, once per surface and boundary mode: everything a
 * solve reads and nothing it changes, except the ring solver's caches.
 */
import { now } from '../clock';
import { homologyGenerators, type DualChain } from '../mesh/dual-chains';
import { checkSurface } from '../mesh/check';
import { FieldError } from '../mesh/errors';
import { angleDefects, componentFacts, cornerAngles, type ComponentFacts } from '../mesh/geometry';
import type { TriangleMesh } from '../mesh/mesh';
import type { RingOrderings } from '../mesh/read/prepared';
import { buildTopology, type Topology } from '../mesh/topology';
import { buildFaceFrames, type FaceFrames } from '../mesh/transport';
import type { BoundaryMode } from './request';
import { buildRingSolver, ringOrdering, type RingSolver } from './ring-solver';

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
  /**
   * Seconds spent preparing, by step: `check` (0 when vouched for) and the rest of the geometry,
   * generators, the factorization, and of it the `ordering` (0 when a given one was used).
   */
  readonly setupSeconds: { readonly geometry: number; readonly generators: number; readonly factorization: number; readonly check: number; readonly ordering: number };
  /**
   * What was taken from the caller instead of worked out: the ring system's ordering (and when
   * one was given but did not fit, why it was set aside), and the check (vouched for).
   */
  readonly reused: { readonly ordering: boolean; readonly orderingRefused: string | null; readonly check: boolean };
  /** @internal state reused between solves */
  readonly solver: RingSolver;
}

/** How `prepareSurface` may take what was worked out before instead of working it out again. */
export interface PrepareSurfaceOptions {
  boundary?: BoundaryMode;
  /**
   * The ring system's fill-reducing orderings, as `ringOrderings` worked them out for this mesh
   * (the prepared form keeps them). The one for the boundary mode is used when it is a
   * permutation of the rows, checked entry by entry; otherwise it is set aside (see
   * `FieldSurface.reused`) and worked out again. Never trusted blindly: a wrong one costs speed,
   * never correctness, since the matrix factored is always this surface's.
   */
  ringOrderings?: RingOrderings;
  /**
   * The caller vouches that this very mesh passed `checkSurface` without errors (the studio's
   * worker, for a prepared form its own server checked and wrote), so the check is not run again.
   * Anything read from a file the caller did not check itself must leave this unset.
   */
  checked?: boolean;
}

/**
 * Prepares a surface for solving: checks it as an upload is checked (`checkSurface`: throws a
 * FieldError with the first problem's code and words — non-finite coordinates, missing vertices,
 * non-manifold edges or vertices, inconsistent orientation, faces without area, too many faces;
 * skipped only when the caller vouches for it with `checked`), builds topology, frames,
 * curvature, generators, and factors the vertex-ring system once (in a given ordering when one
 * fits, see PrepareSurfaceOptions).
 *
 * Guarantees: the factorization is never repeated by `solveConnection` for this surface, whatever
 * singularities, strokes or curves are asked for; given the ordering `ringOrderings` works out for
 * the same mesh, every solve gives the same numbers, to the last bit, as without it.
 */
export function prepareSurface(mesh: TriangleMesh, options: PrepareSurfaceOptions = {}): FieldSurface {
  const boundary = options.boundary ?? 'free';
  const t0 = now();
  if (!options.checked) {
    // Only the errors: the topology is built below anyway, and UV overlaps are no concern of the field.
    const problem = checkSurface(mesh, { describe: false }).problems.find((p) => p.severity === 'error');
    if (problem) throw new FieldError(problem.code, problem.message);
  }
  const tChecked = now();
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
  const given = options.ringOrderings && orderingFor(options.ringOrderings, boundary, topology);
  const solver = buildRingSolver(topology, defects, components, componentOfVertex, boundary, mesh.positions, given);
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
    setupSeconds: { geometry: (t1 - t0) / 1000, generators: (t2 - t1) / 1000, factorization: (t3 - t2) / 1000, check: (tChecked - t0) / 1000, ordering: solver.orderingSeconds },
    reused: {
      ordering: solver.orderingGiven,
      orderingRefused: given === undefined && options.ringOrderings ? `no stored ordering of the ring system fits a ${boundary} boundary; it was worked out` : solver.orderingRefused,
      check: options.checked === true,
    },
    solver,
  };
}

/** The stored ordering for a boundary mode: held modes share their rows, and without a boundary every mode has the free rows. */
function orderingFor(orderings: RingOrderings, boundary: BoundaryMode, topology: Topology): Int32Array | undefined {
  if (boundary === 'free') return orderings.free;
  return orderings.held ?? (topology.boundaryLoops.length === 0 ? orderings.free : undefined);
}

/**
 * The ring system's fill-reducing orderings `prepareSurface` would work out for this mesh: `free`
 * always, and `held` (for `tangent` and `normal`) when the surface has a boundary (without one,
 * every mode has the free rows). For a mesh that passed `checkSurface`; costs topology and the
 * orderings, no factorization. Kept in the prepared form so the editor need not work them out.
 */
export function ringOrderings(mesh: TriangleMesh): RingOrderings {
  const topology = buildTopology(mesh);
  const components = componentFacts(topology);
  const componentOfVertex = vertexComponents(topology);
  const free = ringOrdering(topology, components, componentOfVertex, 'free', mesh.positions);
  if (topology.boundaryLoops.length === 0) return { free };
  try {
    return { free, held: ringOrdering(topology, components, componentOfVertex, 'tangent', mesh.positions) };
  } catch (error) {
    // A boundary loop no field can be held along (boundary-without-fans): only the free rows exist.
    if (error instanceof FieldError) return { free };
    throw error;
  }
}

function vertexComponents(topology: Topology): Int32Array {
  const componentOfVertex = new Int32Array(topology.vertexCount).fill(-1);
  for (let f = 0; f < topology.faceCount; f++) {
    for (let k = 0; k < 3; k++) componentOfVertex[topology.triangles[3 * f + k]] = topology.componentOfFace[f];
  }
  return componentOfVertex;
}
