/**
 * The one list of export formats: what each is called, which file extension and media type it
 * has, what it is made from, and how it is shown to people. Plain data without imports, so that
 * browser code (the studio's export buttons, the market's package choices) can read it without
 * pulling in the writers; the writers are paired with these ids in `write.ts`.
 */

/** Export formats by id, in the order they are offered. */
export const EXPORT_FORMATS = ['usda', 'usda-bspline', 'gltf', 'glb', 'obj', 'json', 'ply'] as const;
export type ExportFormat = (typeof EXPORT_FORMATS)[number];

/**
 * What a format is written from, so that a caller solves and grows only as far as it needs:
 * the spec alone, the solved field on its surface, or the grown guides.
 */
export type ExportSource = 'spec' | 'field' | 'guides';

export interface ExportFormatFacts {
  /** The file extension, lower case, with its dot. */
  readonly extension: string;
  /**
   * For a format sharing its extension with an earlier one (another way of writing the same file
   * type): the word file names add to tell the two apart. Such a format is never chosen by
   * extension alone.
   */
  readonly variant?: string;
  /** The media type files of the format are served as. */
  readonly mediaType: string;
  /** Its name for people, with the extension. */
  readonly label: string;
  readonly source: ExportSource;
}

const TEXT = 'text/plain; charset=utf-8';

export const EXPORT_FORMAT_FACTS: Readonly<Record<ExportFormat, ExportFormatFacts>> = {
  usda: { extension: '.usda', mediaType: TEXT, label: 'OpenUSD BasisCurves, linear (.usda)', source: 'guides' },
  'usda-bspline': { extension: '.usda', variant: 'bspline', mediaType: TEXT, label: 'OpenUSD BasisCurves, B-spline (.usda)', source: 'guides' },
  gltf: { extension: '.gltf', mediaType: 'model/gltf+json', label: 'glTF 2.0 line strips (.gltf)', source: 'guides' },
  glb: { extension: '.glb', mediaType: 'model/gltf-binary', label: 'glTF 2.0 binary (.glb)', source: 'guides' },
  obj: { extension: '.obj', mediaType: TEXT, label: 'OBJ polylines (.obj)', source: 'guides' },
  json: { extension: '.json', mediaType: 'application/json', label: 'Whorlwind groom spec (.json)', source: 'spec' },
  ply: { extension: '.ply', mediaType: 'application/octet-stream', label: 'Direction field on the growth surface (.ply)', source: 'field' },
};

/** The formats chosen by extension alone (every format but the variants), in table order. */
const BY_EXTENSION: ReadonlyMap<string, ExportFormat> = new Map(
  EXPORT_FORMATS.filter((format) => !EXPORT_FORMAT_FACTS[format].variant).map((format) => [EXPORT_FORMAT_FACTS[format].extension, format]),
);

/** The extensions `formatOfExtension` knows, in table order. */
export const EXPORT_EXTENSIONS: readonly string[] = [...BY_EXTENSION.keys()];

/**
 * The format a file extension names, for a command line's output file names.
 *
 * Guarantees: case-insensitive, with or without the dot; `undefined` for an extension no format
 * has; a variant is never returned (its extension names the plain format).
 */
export function formatOfExtension(extension: string): ExportFormat | undefined {
  const lower = extension.toLowerCase();
  return BY_EXTENSION.get(lower.startsWith('.') ? lower : `.${lower}`);
}
