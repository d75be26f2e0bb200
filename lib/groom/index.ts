/**
 * Whorlwind's groom library: guide curves grown along a direction field, the groom spec, exports
 * and thumbnails. Plain TypeScript on typed arrays; runs in a Web Worker and on the server. The
 * one Node-only part, image encoding with sharp, lives in `./render/encode-image` and is not
 * exported here; nor are the demo grooms (`./demo`). README.md beside this file documents the
 * spec and the exports.
 */
export { GroomError } from './errors';
export {
  SPEC_VERSION,
  UNITS,
  CENTIMETRES_PER_UNIT,
  PIN_ATTRIBUTES,
  MAP_ATTRIBUTES,
  parseGroomSpec,
  parseGroomSpecJson,
  validateGroomSpec,
  specToJson,
  MAX_GUIDE_POINTS,
  MAX_GUIDES,
  TIP_TAPER,
  guidePointsProblem,
  type GroomSpec,
  type GroomSpecInput,
  type GuideSettings,
  type GuideSetSpec,
  type GuideSetRegion,
  type SingularitySpec,
  type CurveSpec,
  type StrokeSpec,
  type PinSpec,
  type MapSpec,
  type MaskSpec,
  type MapAttribute,
  type SymmetrySpec,
  type PlaceSpec,
  type SurfacePosition,
  type PinAttribute,
  type SpecProblem,
  type Unit,
} from './spec/spec';
export { HUMAN_SCALP_PRESET } from './spec/presets';
export { prepareGroomSurface, type GroomSurface } from './place/surface';
export { buildSkin, SKIN_QUERY_SIZE, type Skin } from './place/skin';
export { vertexOfPlace, surfacePointOf, edgePath } from './place/place';
export { fieldRequestFromSpec, solveGroomField, downOf, curveVertices } from './place/request';
export { suggestGroomSpec, specFromSuggestion, fileVertexOfVertex } from './place/suggest';
export { blendPins, blendValues, type PinnedFactors } from './place/pins';
export { surfaceSignature, encodeMap, decodeMap, encodeMask, decodeMask, attributeFactors, type AttributeFactors } from './place/maps';
export { dabReach, applyDab, falloffWeight, facesOfMask, MAP_PAINT_RANGE, MASK_PAINT_RANGE, type BrushSettings, type BrushFalloff, type BrushMode, type PaintRange, type DabReach } from './place/paint';
export { geodesicDistances, vertexFaces, type VertexFaces } from './place/geodesic';
export { growthMask } from './place/regions';
export {
  planeOfSymmetry,
  planeDistance,
  mirrorPoint,
  mirrorDirection,
  mirrorSingularityPoint,
  mirrorPinPoint,
  mirrorCurvePoints,
  type MirrorPlane,
} from './spec/symmetry';
export { detectMirrorPlane, mirrorMismatch, SYMMETRIC_MISMATCH, type DetectedMirror } from './place/mirror-plane';
export { mirrorSpecFeatures, mirrorSingularity, mirrorPin, mirrorCurve, mirrorStroke, isOnPlane, pointOfPlace, twistFaceOf } from './place/mirror-features';
export { mirroredRoots } from './grow/mirror-roots';
export { setRegionMask } from './place/set-region';
export { growGuides, type Guides, type GrowOptions, type GrowResult } from './grow/guides';
export { growGuideSets, guidesOfSet, type GuideSetRange } from './grow/guide-sets';
export { coatFacts, type CoatFacts } from './grow/coat-facts';
export { sampleRoots, FIRST_LEVEL_ROOTS, type Roots, type RootRequest } from './grow/roots';
export { bindRoots, rootsOnSculpt, type RootBinding } from './grow/binding';
export { createTracer, STOP, type StopReason, type Tracer } from './grow/trace';
export { shapeGuide, waver, type ShapeParameters, type WaverParameters } from './grow/shape';
export { gatherOnto, nearestCentres, type Gather } from './grow/tufts';
export { planTufts, type TuftPlan } from './grow/tuft-plan';
export { EXPORT_FORMATS, EXPORT_FORMAT_FACTS, EXPORT_EXTENSIONS, formatOfExtension, type ExportFormat, type ExportFormatFacts, type ExportSource } from './export/formats';
export { writeExport, type GroomMade, type ExportOptions } from './export/write';
export { guidesToUsda, usdPrimNames, type UsdCurveBasis } from './export/usda';
export { guidesToGltf, NO_TUFT } from './export/gltf';
export { previewGuides, previewToGlb, PUBLIC_PREVIEW, type PreviewGuides, type PreviewLimits } from './export/preview';
export { guidesToObj, objGroupNames, OBJ_ROOT_RECORD, OBJ_SHAPE_RECORD, OBJ_SET_RECORD } from './export/obj';
export { writtenSurface, type Provenance, type BindingExportOptions, type WrittenSurface } from './export/binding-data';
export { fieldToPly } from './export/field-ply';
export { renderThumbnail, THUMBNAIL_VIEWS, type ThumbnailView, type GuideColouring, type RgbaImage, type RenderOptions } from './render/render';
export { identityOfMesh, withoutUv, sameTopology, positionOnFace, pointOfPosition, type SurfaceIdentity } from './transfer/identity';
export { alignSurfaces, alignPoint, alignDirection, type Alignment, type LandmarkPair } from './transfer/align';
export { buildUvLocator, type UvLocator } from './transfer/uv-locate';
export {
  transferSpec,
  type TransferMethod,
  type TransferSide,
  type TransferOptions,
  type TransferReport,
  type TransferResult,
  type FeatureTransfer,
  type SurfaceFacts,
} from './transfer/transfer';
export { transferReportText } from './transfer/report-text';
export { withSurfacePositions } from './transfer/features';
export { carryMaps, type MapTransfer, type MaskTransfer } from './transfer/maps';
