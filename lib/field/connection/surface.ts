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
import { buildTopology, type Topology } from '../mesh/topology';
import { buildFaceFrames, type FaceFrames } from '../mesh/transport';
import type { BoundaryMode } from './request';
import { buildRingSolver, type RingSolver } from './ring-solver';

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

/**
 * Prepares a surface for solving: checks it as an upload is checked (`checkSurface`: throws a
 * FieldError with the first problem's code and words — non-finite coordinates, missing vertices,
 * non-manifold edges or vertices, inconsistent orientation, faces without area, too many faces),
 * builds topology, frames, curvature, generators, and factors the vertex-ring system once.
 *
 * Guarantees: the factorization is never repeated by `solveConnection` for this surface, whatever
 * singularities, strokes or curves are asked for.
 */
export function prepareSurface(mesh: TriangleMesh, options: { boundary?: BoundaryMode } = {}): FieldSurface {
  const boundary = options.boundary ?? 'free';
  const t0 = now();
  // Only the errors: the topology is built below anyway, and UV overlaps are no concern of the field.
  const problem = checkSurface(mesh, { describe: false }).problems.find((p) => p.severity === 'error');
  if (problem) throw new FieldError(problem.code, problem.message);
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
  const solver = buildRingSolver(topology, defects, components, componentOfVertex, boundary, mesh.positions);
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
