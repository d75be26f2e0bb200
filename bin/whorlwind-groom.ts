#!/usr/bin/env -S npx tsx
/**
 * whorlwind-groom: guides from a growth surface and a groom spec, for pipelines.
 *
 *   whorlwind-groom --surface head.obj --spec coat.json --out guides.usda [--out guides.glb]
 *                   [--with-surface] [--field flow.ply] [--thumbnail front.webp] [--stats]
 *
 * Each --out's format comes from its extension: .usda (BasisCurves; --basis linear|bspline|catmullRom),
 * .gltf, .glb, .obj, .json (the resolved spec). Guides always carry where they grow (ids, source
 * polygons, weights, UVs); --with-surface also writes the growth surface into the .usda, .gltf,
 * .glb and .obj files. --thumbnail writes .png or .webp (--view, --size,
 * --colour). Exits 0 on success; on bad input prints one line "whorlwind-groom: <reason>" to
 * stderr and exits 1 (2 for a bad command line). Uses the same library code as the app.
 */
import { readFileSync, writeFileSync } from 'node:fs';
import { extname } from 'node:path';
import { parseArgs } from 'node:util';
import { FieldError, indexBudget, readSurface, solveField } from '../lib/field';
import { encodeImage } from '../lib/groom/render/encode-image';
import {
  EXPORT_EXTENSIONS,
  EXPORT_FORMAT_FACTS,
  GroomError,
  fieldRequestFromSpec,
  formatOfExtension,
  growGuides,
  parseGroomSpecJson,
  prepareGroomSurface,
  renderThumbnail,
  THUMBNAIL_VIEWS,
  writeExport,
  type GuideColouring,
  type ThumbnailView,
  type UsdCurveBasis,
} from '../lib/groom';

class UsageError extends Error {}

/** The release written into every export's provenance. */
const WHORLWIND_VERSION: string = JSON.parse(readFileSync(new URL('../package.json', import.meta.url), 'utf8')).version;

/** Extensions --out takes: every export format's but the field's, which has its own --field. */
const OUT_FORMATS = EXPORT_EXTENSIONS.filter((extension) => EXPORT_FORMAT_FACTS[formatOfExtension(extension)!].source !== 'field');

function parseCommandLine(argv: string[]) {
  const { values } = parseArgs({
    args: argv,
    options: {
      surface: { type: 'string' },
      spec: { type: 'string' },
      out: { type: 'string', multiple: true },
      field: { type: 'string' },
      thumbnail: { type: 'string', multiple: true },
      view: { type: 'string', default: 'front' },
      size: { type: 'string', default: '1024' },
      colour: { type: 'string', default: 'length' },
      basis: { type: 'string', default: 'linear' },
      'with-surface': { type: 'boolean', default: false },
      stats: { type: 'boolean', default: false },
      help: { type: 'boolean', default: false },
    },
    strict: true,
    allowPositionals: false,
  });
  if (values.help) return null;
  if (!values.surface) throw new UsageError('--surface is required (the growth surface: .obj, .ply, .stl, .gltf or .glb)');
  if (!values.spec) throw new UsageError('--spec is required (the groom spec, .json)');
  for (const out of values.out ?? []) {
    if (!OUT_FORMATS.includes(extname(out).toLowerCase())) throw new UsageError(`--out ${out}: the extension must be one of ${OUT_FORMATS.join(', ')}`);
  }
  if (values.field && extname(values.field).toLowerCase() !== '.ply') throw new UsageError(`--field ${values.field}: the field is written as .ply`);
  for (const t of values.thumbnail ?? []) {
    if (!['.png', '.webp'].includes(extname(t).toLowerCase())) throw new UsageError(`--thumbnail ${t}: the extension must be .png or .webp`);
  }
  if (!THUMBNAIL_VIEWS.includes(values.view as ThumbnailView)) throw new UsageError(`--view must be one of ${THUMBNAIL_VIEWS.join(', ')}`);
  const size = Number(values.size);
  if (!Number.isInteger(size) || size < 16 || size > 4096) throw new UsageError('--size must be a whole number of pixels from 16 to 4096');
  if (!['length', 'direction', 'uniform'].includes(values.colour!)) throw new UsageError('--colour must be length, direction or uniform');
  if (!['linear', 'bspline', 'catmullRom'].includes(values.basis!)) throw new UsageError('--basis must be linear, bspline or catmullRom');
  return {
    surface: values.surface,
    spec: values.spec,
    out: values.out ?? [],
    field: values.field,
    thumbnails: values.thumbnail ?? [],
    view: values.view as ThumbnailView,
    size,
    colour: values.colour as GuideColouring,
    basis: values.basis as UsdCurveBasis,
    withSurface: values['with-surface'] ?? false,
    stats: values.stats ?? false,
  };
}

function readInput(path: string, what: string): Uint8Array {
  try {
    return readFileSync(path);
  } catch (error) {
    throw new GroomError('unreadable-file', `cannot read the ${what} ${path}: ${(error as NodeJS.ErrnoException).code ?? (error as Error).message}`);
  }
}

async function main(argv: string[]): Promise<void> {
  const options = parseCommandLine(argv);
  if (!options) {
    process.stdout.write(`${readFileSync(new URL(import.meta.url)).toString().split('*/')[0].split('\n').slice(2).map((l) => l.replace(/^ \* ?/, '')).join('\n').trim()}\n`);
    return;
  }
  const seconds: Record<string, number> = {};
  const time = <T>(name: string, work: () => T): T => {
    const t0 = performance.now();
    const result = work();
    seconds[name] = (performance.now() - t0) / 1000;
    return result;
  };
  const spec = parseGroomSpecJson(new TextDecoder().decode(readInput(options.spec, 'spec')));
  const read = time('read surface', () => readSurface(readInput(options.surface, 'surface'), options.surface));
  const surface = time('prepare surface', () => prepareGroomSurface(read.mesh, { boundary: spec.field.boundary }));
  const request = time('place features', () => fieldRequestFromSpec(spec, surface));
  const solved = time('solve field', () => solveField(surface.field, request));
  const grown = time('grow guides', () => growGuides(surface, solved, spec));
  const { guides } = grown;
  const made = { spec, surface, solved, guides };
  for (const out of options.out) {
    const ext = extname(out).toLowerCase();
    const exportOptions = { basis: options.basis, withSurface: options.withSurface, provenance: { whorlwindVersion: WHORLWIND_VERSION } };
    time(`write ${ext}`, () => writeFileSync(out, writeExport(formatOfExtension(ext)!, made, exportOptions)));
  }
  if (options.field) time('write field', () => writeFileSync(options.field!, writeExport('ply', made)));
  for (const path of options.thumbnails) {
    const image = time(`render ${options.size}²`, () => renderThumbnail(read.mesh, guides, { size: options.size, view: options.view, upAxis: spec.upAxis, colourBy: options.colour }));
    const t0 = performance.now();
    writeFileSync(path, await encodeImage(image, extname(path).toLowerCase() === '.png' ? 'png' : 'webp'));
    seconds[`encode ${extname(path)}`] = (performance.now() - t0) / 1000;
  }
  if (options.stats) {
    const budget = indexBudget(surface.field, request);
    let checked = 0, mismatched = 0;
    solved.measuredIndex.forEach((measured, v) => {
      if (!solved.connection.constrainedVertex[v]) return;
      checked++;
      if (Math.abs(measured - solved.connection.requestedIndex[v]) > 1e-6) mismatched++;
    });
    const lines = [
      `surface     ${read.mesh.positions.length / 3} vertices, ${read.mesh.triangles.length / 3} faces (${read.format})`,
      `growth area ${grown.areaSquareCm.toFixed(2)} cm²`,
      `guides      ${guides.count} × ${guides.pointsPerGuide} points (${(guides.count / Math.max(grown.areaSquareCm, 1e-12)).toFixed(3)} per cm², ${guides.hairsPerGuide} hairs each)`,
      `index       ${budget.pieces.map((c) => `${budget.pieces.length > 1 ? `piece ${c.piece + 1}: ` : ''}placed ${c.placed}${c.demanded === null ? ' (free boundary)' : ` of ${c.demanded}`}`).join('; ')}; measured = requested at ${checked - mismatched} of ${checked} vertices`,
      `edges       ${solved.edgeProof.checkedEdges} crossed without a seam (largest turn ${((solved.edgeProof.largestTurn * 180) / Math.PI).toFixed(1)}°), ${solved.edgeProof.checkedCurveTurns} turns round curve vertices as drawn`,
      `skin check  ${grown.pushedOut} points moved out from under the skin`,
      'timings',
      ...Object.entries(seconds).map(([name, s]) => `  ${name.padEnd(18)} ${(s * 1000).toFixed(1)} ms`),
    ];
    process.stdout.write(`${lines.join('\n')}\n`);
  }
}

main(process.argv.slice(2)).then(
  () => process.exit(0),
  (error: unknown) => {
    const usage = error instanceof UsageError || (error as { code?: string }).code?.startsWith('ERR_PARSE_ARGS');
    const message = error instanceof Error ? error.message : String(error);
    const known = usage || error instanceof GroomError || error instanceof FieldError;
    process.stderr.write(`whorlwind-groom: ${known ? message : `unexpected failure: ${message}`}`.split('\n')[0] + '\n');
    process.exit(usage ? 2 : 1);
  },
);
