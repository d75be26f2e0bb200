/**
 * The writer of each export format, paired with the ids of `formats.ts`: the one place that
 * knows which function makes which file, for the studio's export jobs, the market's packages, the
 * command line and the benchmark alike.
 */
import type { SolvedField } from '../../field';
import type { Guides } from '../grow/guides';
import type { GroomSurface } from '../place/surface';
import { specToJson, type GroomSpec } from '../spec/spec';
import { identityOfMesh } from '../transfer/identity';
import { withSurfacePositions } from '../transfer/features';
import { fieldToPly } from './field-ply';
import type { ExportFormat } from './formats';
import { guidesToGltf } from './gltf';
import { guidesToObj } from './obj';
import { guidesToUsda, type UsdCurveBasis } from './usda';
import type { BindingExportOptions, Provenance } from './binding-data';

/**
 * What an export is written from: the resolved spec, and as far as the format's `source` asks
 * (`EXPORT_FORMAT_FACTS`), the solved field on its prepared surface and the grown guides.
 */
export interface GroomMade {
  readonly spec: GroomSpec;
  readonly surface?: GroomSurface;
  readonly solved?: SolvedField;
  readonly guides?: Guides;
}

export interface ExportOptions {
  /** The plain `usda` format's curve basis (default linear); its B-spline variant is always B-spline. */
  readonly basis?: UsdCurveBasis;
  /** Write the growth surface beside the guides (USD, glTF and OBJ), from `made.surface`. */
  readonly withSurface?: boolean;
  /** Where the file came from, written into the USD, glTF and OBJ guides. */
  readonly provenance?: Provenance;
}

type Writer = (made: GroomMade, options: ExportOptions) => string | Uint8Array;

function guidesOf(made: GroomMade): Guides {
  if (!made.guides) throw new Error('this export is written from the grown guides, and none were given');
  return made.guides;
}

/** The binding extras a guides writer is asked for. */
function extrasOf(made: GroomMade, options: ExportOptions): BindingExportOptions {
  if (options.withSurface && !made.surface) throw new Error('the surface was asked to be written beside the guides, and none was given');
  return { ...(options.withSurface ? { surface: made.surface!.mesh } : {}), ...(options.provenance ? { provenance: options.provenance } : {}) };
}

const WRITERS: Readonly<Record<ExportFormat, Writer>> = {
  usda: (made, options) => guidesToUsda(guidesOf(made), options.basis ?? 'linear', extrasOf(made, options)),
  'usda-bspline': (made, options) => guidesToUsda(guidesOf(made), 'bspline', extrasOf(made, options)),
  gltf: (made, options) => guidesToGltf(guidesOf(made), { binary: false, ...extrasOf(made, options) }),
  glb: (made, options) => guidesToGltf(guidesOf(made), { binary: true, ...extrasOf(made, options) }),
  obj: (made, options) => guidesToObj(guidesOf(made), extrasOf(made, options)),
  // With the surface at hand, every place says where it sits in the file's own numbering too.
  json: (made) => specToJson(made.surface ? withSurfacePositions(made.spec, made.surface, identityOfMesh(made.surface.mesh)) : made.spec),
  ply: (made) => {
    if (!made.surface || !made.solved) throw new Error('the field export is written from the solved field on its surface, and none was given');
    return fieldToPly(made.surface.mesh, made.solved.field);
  },
};

/**
 * The file of one export format, as text (the text formats) or bytes.
 *
 * Guarantees: a pure function of what it is given; throws a plain Error (a caller's mistake, not
 * the groomer's) when `made` lacks what the format's `source` names.
 */
export function writeExport(format: ExportFormat, made: GroomMade, options: ExportOptions = {}): string | Uint8Array {
  return WRITERS[format](made, options);
}
