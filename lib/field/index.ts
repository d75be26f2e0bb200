/**
 * Whorlwind's field engine: direction fields with singularities exactly where they are placed,
 * by trivial connections. Plain TypeScript on typed arrays; runs in a Web Worker and on the server.
 * See README.md beside this file for what each function guarantees. Code outside lib/field
 * imports from here only.
 */
export { now } from './clock';

// The surface: mesh, errors, halfedges, geometry, frames, reading and checking files.
export { FieldError } from './mesh/errors';
export type { TriangleMesh, FaceGroups, SourcePolygons, Vec3 } from './mesh/mesh';
export { buildTopology, nextHalfedge, prevHalfedge, nextAroundVertex, type Topology } from './mesh/topology';
export { cornerAngles, angleDefects, faceAreas, faceNormals, vertexNormals, surfaceArea, boundingBox, eulerCharacteristic, componentFacts, genus, type ComponentFacts, type BoundingBox } from './mesh/geometry';
export { buildFaceFrames, type FaceFrames } from './mesh/transport';
export { readSurface, sniffContent, DEFAULT_MAX_FACES, DEFAULT_WELD_FRACTION, type SurfaceFormat, type ReadSurfaceOptions, type SurfaceReadResult, type UvPresence } from './mesh/read';
export { readPreparedSurface, readSurfaceOrPrepared, writePreparedSurface, PREPARED_EXTENSION, type PreparedGroundwork, type PreparedSurfaceRead, type RingOrderings } from './mesh/read/prepared';
export { checkSurface, checkSurfaceFile, type Problem, type SurfaceReport, type SurfaceFacts } from './mesh/check';
export { uvFacts, UV_RASTER_SIZE, type UvFacts } from './mesh/uv-check';

// The field: the connection, the directions it carries, and the proof by measured indices.
export {
  prepareSurface,
  ringOrderings,
  indexBudget,
  solveConnection,
  type BoundaryMode,
  type PointSingularity,
  type FaceAlignment,
  type CurveFeature,
  type FieldRequest,
  type FieldSurface,
  type PrepareSurfaceOptions,
  type ConnectionResult,
  type IndexBudget,
} from './connection';
export { buildDirectionField, type DirectionField, type FieldStart } from './direction-field';
export { measureIndices, compareIndices, type IndexMismatch } from './indices';
export { solveField, type SolvedField } from './solve-field';
export { prepareHarmonic, type HarmonicInterpolator, type Pin } from './harmonic';

// The sparse linear algebra underneath, for benchmarks that time its stages (bench/cholesky.ts).
export { symmetricFromTriplets, multiplySymmetric, type SymmetricSparse } from './linalg/sparse';
export { analyzeCholesky, computeOrdering, factorNumeric } from './linalg/cholesky';

// A suggested layout: the smoothest field with free singularities, measured, as a starting point.
export { suggestLayout, type SuggestOptions, type SuggestAlignment, type SuggestedLayout, type SuggestedSingularity } from './suggest';
