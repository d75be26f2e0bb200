/**
 * Whorlwind's field engine: direction fields with singularities exactly where they are placed,
 * by trivial connections. Plain TypeScript on typed arrays; runs in a Web Worker and on the server.
 * See README.md beside this file for what each function guarantees.
 */
export { FieldError, type TriangleMesh, type FaceGroups } from './mesh';
export { buildTopology, type Topology } from './topology';
export { cornerAngles, angleDefects, faceAreas, faceNormals, vertexNormals, surfaceArea, boundingBox, eulerCharacteristic, componentFacts, genus, type ComponentFacts, type BoundingBox } from './geometry';
export { buildFaceFrames, type FaceFrames } from './transport';
export {
  prepareSurface,
  indexBudget,
  solveConnection,
  type BoundaryMode,
  type PointSingularity,
  type FaceAlignment,
  type CurveFeature,
  type FieldRequest,
  type FieldSurface,
  type ConnectionResult,
  type IndexBudget,
} from './connection';
export { buildDirectionField, type DirectionField, type FieldStart } from './direction-field';
export { measureIndices, compareIndices, type IndexMismatch } from './indices';
export { solveField, type SolvedField } from './solve-field';
export { prepareHarmonic, type HarmonicInterpolator, type Pin } from './harmonic';
export { readSurface, sniffContent, DEFAULT_MAX_FACES, DEFAULT_WELD_FRACTION, type SurfaceFormat, type ReadSurfaceOptions, type SurfaceReadResult } from './read';
export { checkSurface, checkSurfaceFile, type SurfaceReport } from './check';
