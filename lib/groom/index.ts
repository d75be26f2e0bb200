/**
 * Whorlwind's groom library: guide curves grown along a direction field, the groom spec, exports
 * and thumbnails. Plain TypeScript on typed arrays; runs in a Web Worker and on the server. The
 * one Node-only part, image encoding with sharp, lives in `./encode-image` and is not exported
 * here. README.md beside this file documents the spec and the exports.
 */
export { GroomError } from './errors';
export {
  SPEC_VERSION,
  UNITS,
  CENTIMETRES_PER_UNIT,
  PIN_ATTRIBUTES,
  parseGroomSpec,
  parseGroomSpecJson,
  validateGroomSpec,
  specToJson,
  type GroomSpec,
  type GroomSpecInput,
  type GuideSettings,
  type SingularitySpec,
  type CurveSpec,
  type StrokeSpec,
  type PinSpec,
  type PlaceSpec,
  type PinAttribute,
  type SpecProblem,
  type Unit,
} from './spec';
export { prepareGroomSurface, type GroomSurface } from './surface';
export { fieldRequestFromSpec, solveGroomField, downOf } from './request';
export { growGuides, MAX_GUIDES, type Guides, type GrowResult } from './guides';
export { sampleRoots, type Roots, type RootRequest } from './roots';
export { createTracer, STOP, type StopReason, type Tracer } from './trace';
export { shapeGuide, type ShapeParameters } from './shape';
export { buildSkin, SKIN_QUERY_SIZE, type Skin } from './skin';
export { growthMask } from './regions';
export { blendPins, type PinnedFactors } from './pins';
export { vertexOfPlace, surfacePointOf, edgePath } from './place';
export { guidesToUsda, type UsdCurveBasis } from './usda';
export { guidesToGltf } from './gltf';
export { guidesToObj } from './obj';
export { fieldToPly } from './field-ply';
export { renderThumbnail, THUMBNAIL_VIEWS, type ThumbnailView, type GuideColouring, type RgbaImage, type RenderOptions } from './render';
export { HUMAN_SCALP_PRESET } from './presets';
export { DEMO_GROOMS, DEMO_STUDIO, type DemoGroom } from './demo/grooms';
export { surfaceToObj } from './demo/obj';
