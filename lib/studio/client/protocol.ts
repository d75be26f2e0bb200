// The messages between the studio page and its field worker (field-worker.ts). The worker holds
// the prepared growth surface and runs every solve, trace and guide growth with lib/field and
// lib/groom — the same code the server runs for exports — so the page never waits on them.
import type { GroomSpec } from '@/lib/groom/spec/spec';
import type { BoundaryMode, IndexBudget } from '@/lib/field';
import type { Vec3 } from './features';

/** Where the worker gets the surface's bytes. */
export type SurfaceSource =
  /** `fallback`: where to read the surface when this cannot be fetched or read (the file behind its prepared form). */
  | { readonly kind: 'url'; readonly url: string; readonly fileName: string; readonly fallback?: SurfaceSource }
  | { readonly kind: 'bytes'; readonly bytes: ArrayBuffer; readonly fileName: string }
  /** One of lib/groom's demo characters (DEMO_GROOMS[i].id), built in the worker. */
  | { readonly kind: 'demo'; readonly demoId: string };

/**
 * The earlier sculpt a groom's roots are sampled on (a groom moved onto a new sculpt by polygon):
 * guides grow from it so that the preview shows the same guides as an export. `key` names the
 * surface (the file's URL changes with every presign).
 */
export interface RootsSource {
  readonly key: string;
  readonly source: SurfaceSource;
}

export type FieldDrawing = 'strokes' | 'streamlines';

export interface DisplayOptions {
  readonly drawing: FieldDrawing;
  /** About how many strokes (or streamline seeds ×4) to spread over the surface. */
  readonly density: number;
}

export interface WorkerError {
  readonly code: string;
  readonly message: string;
  /** Dotted spec path when the problem is in the spec (`field.singularities[1].point`). */
  readonly path?: string;
}

export type WorkerRequest =
  | { readonly id: number; readonly type: 'open'; readonly source: SurfaceSource; readonly boundary: BoundaryMode }
  | { readonly id: number; readonly type: 'inspect'; readonly source: SurfaceSource }
  | { readonly id: number; readonly type: 'solve'; readonly spec: GroomSpec; readonly display: DisplayOptions; readonly quick: boolean }
  | { readonly id: number; readonly type: 'grow'; readonly spec: GroomSpec; readonly rootsFrom?: RootsSource }
  | { readonly id: number; readonly type: 'curve-path'; readonly points: readonly Vec3[]; readonly closed: boolean }
  | { readonly id: number; readonly type: 'read-grain'; readonly spec: GroomSpec; readonly follow: GrainFollow }
  | { readonly id: number; readonly type: 'find-mirror' }
  | { readonly id: number; readonly type: 'twist-faces' };

/**
 * A request as the page posts it: with `lane`, only the newest request of that lane counts — an
 * older one still waiting when a newer one arrives is answered `superseded`, not carried out
 * (request-queue.ts).
 */
export type WorkerMessage = WorkerRequest & { readonly lane?: string };

/**
 * What a solve request carries of a spec: all but its painted maps, guide sets and symmetry,
 * which a solve never reads (it reads the field, the up axis and the pins) and which can weigh
 * megabytes — a drag sends a solve request at every pointer move.
 */
export function solvePart(spec: GroomSpec): GroomSpec {
  const { maps: _maps, guideSets: _sets, symmetry: _symmetry, ...part } = spec;
  return part;
}

export type WorkerRequestBody = WorkerRequest extends infer R ? (R extends { id: number } ? Omit<R, 'id'> : never) : never;

export interface ProgressReport {
  /** What is happening, in plain words ("factoring the surface"). */
  readonly stage: string;
  /** 0–1 when known. */
  readonly fraction: number | null;
  /** For steps that report no progress of their own: how long the step is expected to take. */
  readonly expectedMilliseconds?: number;
  /** When the worker sent it (ms since the epoch, `performance.timeOrigin + performance.now()`): replies held before the page listened keep their time. */
  readonly at?: number;
  /** Opening only: the surface as read, sent once before its preparation, so the page can show it at once. */
  readonly preview?: SurfacePreview;
}

/**
 * The surface as read, before the one-off preparation: enough to draw it (the editor shows it while
 * the solver is prepared). Single precision: it is only drawn; points and picks wait for the
 * prepared surface (OpenedSurface).
 */
export interface SurfacePreview {
  readonly positions: Float32Array;
  readonly triangles: Uint32Array;
  /** Area-weighted vertex normals. */
  readonly vertexNormals: Float32Array;
  readonly vertexCount: number;
  readonly faceCount: number;
  /** The middle of the bounding box and half its diagonal, as OpenedSurface's `center` and `radius`. */
  readonly center: Vec3;
  readonly radius: number;
}

export type WorkerReply =
  | { readonly id: number; readonly type: 'progress'; readonly progress: ProgressReport }
  | { readonly id: number; readonly type: 'done'; readonly result: unknown }
  | { readonly id: number; readonly type: 'failed'; readonly error: WorkerError }
  /** A lane's request that a newer one of the same lane replaced before the worker started on it. */
  | { readonly id: number; readonly type: 'superseded' };

export interface ComponentSummary {
  readonly faceCount: number;
  readonly eulerCharacteristic: number;
  readonly boundaryLoopCount: number;
  readonly genus: number;
}

/** The prepared surface as the page draws it. */
export interface OpenedSurface {
  readonly vertexCount: number;
  readonly faceCount: number;
  /** Vertices as numbered in the surface file (before welding). */
  readonly fileVertexCount: number;
  readonly positions: Float64Array;
  readonly triangles: Uint32Array;
  readonly vertexNormals: Float32Array;
  readonly componentOfVertex: Int32Array;
  readonly components: readonly ComponentSummary[];
  /** Boundary edges as segment end points (x, y, z pairs), for drawing the border. */
  readonly boundaryLines: Float32Array;
  readonly groups: readonly string[];
  readonly center: Vec3;
  readonly radius: number;
  readonly diagonal: number;
  readonly meanEdge: number;
  readonly boundary: BoundaryMode;
  readonly timings: { readonly downloadMilliseconds: number; readonly readMilliseconds: number; readonly prepareMilliseconds: number };
  /**
   * The picking hierarchy the worker built with the surface (three-mesh-bvh's serialization,
   * indirect, over single-precision `positions` and `triangles`): the page deserializes it instead
   * of building its own on the main thread (half a second at a million faces).
   */
  readonly pickHierarchy?: { readonly roots: ArrayBuffer[]; readonly indirectBuffer: Uint32Array | Uint16Array };
}

/** A surface read for inspection only (it may be broken): enough to draw it and point at faces. */
export interface InspectedSurface {
  readonly positions: Float64Array;
  readonly triangles: Uint32Array;
}


export interface SingularityCheck {
  /** The welded vertex the singularity sits on. */
  readonly vertex: number;
  readonly requested: number;
  /** Measured from the solved field alone; null in a quick solve (measured once the drag ends). */
  readonly measured: number | null;
}

export interface IndexProof {
  /** Vertices where the index was measured (interior ones, and the boundary when it is held). */
  readonly measuredVertices: number;
  /** Every vertex whose measured index is not zero (at most `NONZERO_LIMIT`). */
  readonly nonZero: readonly { readonly vertex: number; readonly index: number }[];
  readonly nonZeroCount: number;
  /** Measured singularities where none was placed. */
  readonly strays: number;
  /** Placed singularities whose measured index differs. */
  readonly mismatches: number;
  /** Sum of the measured indices. */
  readonly measuredSum: number;
  /** Interior edges off the curves, each checked to turn the field by its connection angle (no seam). */
  readonly checkedEdges: number;
  /** The largest turn across one of them, in degrees. */
  readonly largestTurnDegrees: number;
  /** Turns round curve vertices checked against what the curves demand. */
  readonly checkedCurveTurns: number;
}

export const NONZERO_LIMIT = 64;

export interface SolveReport {
  /** Echo of the request: quick solves skip the independent index measurement. */
  readonly quick: boolean;
  /** Field drawing as segment end points (x, y, z pairs), or null when the solve failed. */
  readonly lines: Float32Array | null;
  /** Where along each drawn line a point lies (0 at the tail, 1 at the head), for shading; null for short strokes (tail and head alternate). */
  readonly lineShade: Float32Array | null;
  readonly error: WorkerError | null;
  /** Null when the spec's places could not be resolved on the surface. */
  readonly budget: IndexBudget | null;
  /** Per singularity of the spec, in its order. */
  readonly singularities: readonly SingularityCheck[];
  /** Per pin of the spec, its vertex. */
  readonly pinVertices: readonly number[];
  /** Partings then crests, as the spec orders them: the vertex chain each runs along, as points. */
  readonly curves: readonly { readonly kind: 'parting' | 'crest'; readonly points: Float32Array }[];
  readonly proof: IndexProof | null;
  readonly milliseconds: number;
  /** Where the worker's milliseconds went: resolving the spec's places, the solve (with the proof when full), the drawing. */
  readonly stages?: { readonly request: number; readonly solve: number; readonly drawing: number };
}

export interface GrownGuides {
  readonly count: number;
  readonly pointsPerGuide: number;
  /** Guide after guide, point after point, x y z. */
  readonly points: Float32Array;
  readonly areaSquareCm: number;
  readonly milliseconds: number;
  /** With guide sets: each set's name and run of guides (set after set, in the spec's order). */
  readonly sets?: readonly { readonly name: string; readonly first: number; readonly count: number }[];
}

export interface CurvePath {
  /** The chain of vertices joining the points along mesh edges, as points. */
  readonly points: Float32Array;
}

/** What "Read the grain" pulls the suggested layout toward besides smoothness. */
export interface GrainFollow {
  /** `fall`: the spec's down; `bending`: the directions of least bending (even orders). */
  readonly toward: 'nothing' | 'fall' | 'bending';
  /** How strongly (the engine's alignment weight, ≥ 0). */
  readonly weight: number;
}

/** A grain mark: one singularity of the suggested layout, not yet placed. */
export interface GrainMark {
  /** The welded vertex it sits on. */
  readonly vertex: number;
  readonly index: number;
  readonly point: Vec3;
  readonly normal: Vec3;
}

export interface GrainReading {
  readonly order: number;
  readonly marks: readonly GrainMark[];
  readonly iterations: number;
  readonly milliseconds: number;
}

/** The open surface's mirror plane as `detectMirrorPlane` finds it, with the seam the editor uses (the mean edge). */
export interface FoundMirror {
  readonly normal: Vec3;
  readonly offset: number;
  /** Largest distance from a mirrored vertex to the surface, over the bounding-box diagonal. */
  readonly mismatch: number;
  readonly symmetric: boolean;
  /** Places nearer the plane than this are on it (surface units): the mean edge length. */
  readonly seam: number;
}

/**
 * Where the open surface fixes a twist that has no `twistFrom`: per welded vertex, the face it is
 * measured in (its first face, `twistFaceOf`), −1 for a vertex of no face. Twin sides read it to
 * give a twisted singularity's mirror the `twistFrom` that makes it its exact mirror image.
 */
export interface TwistFaces {
  readonly firstFace: Int32Array;
}

export interface ResultOf {
  open: OpenedSurface;
  inspect: InspectedSurface;
  solve: SolveReport;
  grow: GrownGuides;
  'curve-path': CurvePath;
  'read-grain': GrainReading;
  'find-mirror': FoundMirror;
  'twist-faces': TwistFaces;
}
