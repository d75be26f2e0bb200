/**
 * The writer of each export format, paired with the ids of `formats.ts`: the one place that
 * knows which function makes which file, for the studio's export jobs, the market's packages, the
 * command line and the benchmark alike.
 */
import type { SolvedField } from '../../field';
import type { Guides } from '../grow/guides';
import type { GroomSurface } from '../place/surface';
import { specToJson, type GroomSpec } from '../spec/spec';
import { fieldToPly } from './field-ply';
import type { ExportFormat } from './formats';
import { guidesToGltf } from './gltf';
import { guidesToObj } from './obj';
import { guidesToUsda, type UsdCurveBasis } from './usda';

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
}

type Writer = (made: GroomMade, options: ExportOptions) => string | Uint8Array;

function guidesOf(made: GroomMade): Guides {
  if (!made.guides) throw new Error('this export is written from the grown guides, and none were given');
  return made.guides;
}

const WRITERS: Readonly<Record<ExportFormat, Writer>> = {
  usda: (made, options) => guidesToUsda(guidesOf(made), options.basis ?? 'linear'),
  'usda-bspline': (made) => guidesToUsda(guidesOf(made), 'bspline'),
  gltf: (made) => guidesToGltf(guidesOf(made), { binary: false }),
  glb: (made) => guidesToGltf(guidesOf(made), { binary: true }),
  obj: (made) => guidesToObj(guidesOf(made)),
  json: (made) => specToJson(made.spec),
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
