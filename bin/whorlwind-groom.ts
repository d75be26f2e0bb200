#!/usr/bin/env -S npx tsx
/**
 * whorlwind-groom: guides from a growth surface and a groom spec, for pipelines.
 *
 *   whorlwind-groom --surface head.obj --spec coat.json --out guides.usda [--out guides.glb]
 *                   [--with-surface] [--field flow.ply] [--thumbnail front.webp] [--stats]
 *                   [--map length=hair-length.png[@low,high] …]
 *   whorlwind-groom --surface head.obj --suggest [--order 4] [--spec base.json] --out suggestion.json
 *                   [--suggest-down x,y,z] [--suggest-follow-curvature] [--suggest-weight 1]
 *
 * --suggest lays out the singularities itself: the smoothest field of order --order (default 1, or
 * the base spec's) with free singularities, optionally pulled toward a direction (--suggest-down,
 * e.g. 0,-1,0 for fur that falls) or the directions of least bending (--suggest-follow-curvature,
 * even orders), as strongly as --suggest-weight says. The spec it writes (the base spec's settings,
 * or defaults in --units, with the suggested singularities by file vertex) solves to a field with
 * exactly those singularities; the other outputs are made from it.
 *   whorlwind-groom --surface new.obj --spec coat.json --from old.obj [--report report.json]
 *                   [--method auto|topology|uv|alignment] [--landmarks pairs.json]
 *                   [--region-map old=new …] [--units cm] [--up y|z] [--reach 0.05] [--out …]
 *
 * With --from, the spec was made on the old surface: its places are carried onto --surface first
 * and the transfer report is printed (--report writes it as JSON; --out new.json the carried
 * spec). Landmarks: a JSON list of {"from": [x, y, z], "to": [x, y, z]}, three or more.
 * Each --out's format comes from its extension: .usda (BasisCurves; --basis linear|bspline|catmullRom),
 * .gltf, .glb, .obj, .json (the resolved spec). Guides always carry where they grow (ids, source
 * polygons, weights, UVs); --with-surface also writes the growth surface into the .usda, .gltf,
 * .glb and .obj files. --thumbnail writes .png or .webp (--view, --size,
 * --colour). --map ATTRIBUTE=IMAGE paints a map (density, length, width, lift, droop, curl, jitter,
 * waver, gather, tuftDensity, innerTuftDensity, innerGather, gatherRise, loners, waves, tipWidth) from a PNG or TIFF (8 or 16 bits) through the surface's UVs: black is 0×, white
 * 1× the spec's value, or low× to high× with @low,high; it replaces the spec's map of that
 * attribute. Exits 0 on success; on bad input prints one line "whorlwind-groom: <reason>" to
 * stderr and exits 1 (2 for a bad command line). Uses the same library code as the app.
 */
import { readFileSync, writeFileSync } from 'node:fs';
import { extname } from 'node:path';
import { parseArgs } from 'node:util';
import { FieldError, readSurface, solveField, type SuggestedLayout } from '../lib/field';
import { encodeImage } from '../lib/groom/render/encode-image';
import { readImageMap } from '../lib/groom/render/image-map';
import {
  EXPORT_EXTENSIONS,
  EXPORT_FORMAT_FACTS,
  GroomError,
  MAP_ATTRIBUTES,
  encodeMap,
  type MapAttribute,
  fieldRequestFromSpec,
  formatOfExtension,
  growGuides,
  parseGroomSpecJson,
  prepareGroomSurface,
  renderThumbnail,
  SPEC_VERSION,
  suggestGroomSpec,
  THUMBNAIL_VIEWS,
  UNITS,
  type GroomSpec,
  type Unit,
  writeExport,
  type GuideColouring,
  type ThumbnailView,
  type UsdCurveBasis,
  identityOfMesh,
  transferReportText,
  transferSpec,
  type LandmarkPair,
  type TransferMethod,
} from '../lib/groom';

class UsageError extends Error {}

function describeSuggestion(layout: SuggestedLayout): string {
  const byIndex = new Map<number, number>();
  for (const s of layout.singularities) byIndex.set(s.index, (byIndex.get(s.index) ?? 0) + 1);
  const order = layout.order;
  const name = (index: number) => (order === 1 ? `${index > 0 ? '+' : ''}${index}` : `${index > 0 ? '+' : '−'}${Math.abs(Math.round(index * order))}/${order}`);
  const parts = [...byIndex.entries()].sort((a, b) => b[0] - a[0]).map(([index, count]) => `${count} × ${name(index)}`);
  return `${layout.singularities.length} singularities${parts.length ? ` (${parts.join(', ')})` : ''}, order ${order}, ${layout.iterations} inverse iterations`;
}

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
      suggest: { type: 'boolean', default: false },
      order: { type: 'string' },
      'suggest-down': { type: 'string' },
      'suggest-follow-curvature': { type: 'boolean', default: false },
      'suggest-weight': { type: 'string' },
      'with-surface': { type: 'boolean', default: false },
      stats: { type: 'boolean', default: false },
      from: { type: 'string' },
      report: { type: 'string' },
      method: { type: 'string', default: 'auto' },
      landmarks: { type: 'string' },
      'region-map': { type: 'string', multiple: true },
      map: { type: 'string', multiple: true },
      units: { type: 'string' },
      up: { type: 'string' },
      reach: { type: 'string' },
      help: { type: 'boolean', default: false },
    },
    strict: true,
    allowPositionals: false,
  });
  if (values.help) return null;
  if (!values.surface) throw new UsageError('--surface is required (the growth surface: .obj, .ply, .stl, .gltf or .glb)');
  if (!values.spec && !values.suggest) throw new UsageError('--spec is required (the groom spec, .json), unless --suggest lays the singularities out');
  const suggest = values.suggest ? suggestOptions(values) : null;
  if (!values.suggest && (values.order !== undefined || values['suggest-down'] !== undefined || values['suggest-follow-curvature'] || values['suggest-weight'] !== undefined)) {
    throw new UsageError('--order, --suggest-down, --suggest-follow-curvature and --suggest-weight go with --suggest');
  }
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
  const transferOnly = [values.report && '--report', values.landmarks && '--landmarks', values['region-map'] && '--region-map', values.up && '--up', values.reach && '--reach', values.method !== 'auto' && '--method'].filter(Boolean);
  if (!values.from && transferOnly.length > 0) throw new UsageError(`${transferOnly[0]} needs --from (the surface the spec was made on)`);
  if (values.units && !values.from && !values.suggest) throw new UsageError('--units (the units of --surface) goes with --from or --suggest');
  if (!['auto', 'topology', 'uv', 'alignment'].includes(values.method!)) throw new UsageError('--method must be auto, topology, uv or alignment');
  if (values.units && !(UNITS as readonly string[]).includes(values.units)) throw new UsageError(`--units must be one of ${UNITS.join(', ')}`);
  if (values.up && !['y', 'z'].includes(values.up)) throw new UsageError('--up must be y or z');
  const reach = values.reach === undefined ? undefined : Number(values.reach);
  if (reach !== undefined && !(reach > 0 && reach <= 1)) throw new UsageError('--reach must be a fraction of the surface size, above 0 and at most 1');
  const regionMap: Record<string, string> = {};
  for (const pair of values['region-map'] ?? []) {
    const [from, to, ...rest] = pair.split('=');
    if (!from || !to || rest.length > 0) throw new UsageError(`--region-map ${pair}: write it as old=new`);
    regionMap[from] = to;
  }
  const maps = (values.map ?? []).map(parseMapOption);
  if (values.report && extname(values.report).toLowerCase() !== '.json') throw new UsageError(`--report ${values.report}: the report is written as .json`);
  return {
    from: values.from,
    report: values.report,
    method: values.method as 'auto' | TransferMethod,
    landmarks: values.landmarks,
    regionMap,
    maps,
    units: values.units as Unit | undefined,
    up: values.up as 'y' | 'z' | undefined,
    reach,
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
    suggest,
  };
}

/** `attribute=image.png` or `attribute=image.png@low,high`. */
function parseMapOption(text: string): { attribute: MapAttribute; path: string; low: number; high: number } {
  const equals = text.indexOf('=');
  const attribute = text.slice(0, equals) as MapAttribute;
  if (equals < 0 || !MAP_ATTRIBUTES.includes(attribute)) throw new UsageError(`--map ${text}: write it as attribute=image.png, the attribute one of ${MAP_ATTRIBUTES.join(', ')}`);
  let path = text.slice(equals + 1), low = 0, high = 1;
  const range = /@([0-9.]+),([0-9.]+)$/.exec(path);
  if (range) {
    [low, high] = [Number(range[1]), Number(range[2])];
    path = path.slice(0, range.index);
    if (!(low >= 0 && high <= 10 && low <= high)) throw new UsageError(`--map ${text}: the range @low,high must run upward within 0 to 10`);
  }
  if (!path) throw new UsageError(`--map ${text}: name the image after the =`);
  return { attribute, path, low, high };
}

function suggestOptions(values: { order?: string; units?: string; 'suggest-down'?: string; 'suggest-follow-curvature'?: boolean; 'suggest-weight'?: string }) {
  const order = values.order === undefined ? undefined : Number(values.order);
  if (order !== undefined && (!Number.isInteger(order) || order < 1 || order > 12)) throw new UsageError('--order must be a whole number from 1 to 12 (1 hair direction, 2 lines, 4 crosses)');
  const units = values.units ?? 'cm';
  if (!UNITS.includes(units as Unit)) throw new UsageError(`--units must be one of ${UNITS.join(', ')}`);
  let direction: [number, number, number] | undefined;
  if (values['suggest-down'] !== undefined) {
    const parts = values['suggest-down'].split(',').map((x) => Number(x.trim()));
    if (parts.length !== 3 || parts.some((x) => !Number.isFinite(x)) || Math.hypot(...parts) === 0) throw new UsageError('--suggest-down must be three numbers x,y,z, not all zero (e.g. 0,-1,0)');
    direction = parts as [number, number, number];
  }
  const weight = values['suggest-weight'] === undefined ? undefined : Number(values['suggest-weight']);
  if (weight !== undefined && (!Number.isFinite(weight) || weight < 0)) throw new UsageError('--suggest-weight must be a number of at least 0');
  const curvature = values['suggest-follow-curvature'] ?? false;
  if (weight !== undefined && !direction && !curvature) throw new UsageError('--suggest-weight needs --suggest-down or --suggest-follow-curvature');
  return { order, units: units as Unit, align: direction || curvature ? { direction, curvature, weight } : undefined };
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
  const base = options.spec ? parseGroomSpecJson(new TextDecoder().decode(readInput(options.spec, 'spec'))) : null;
  const read = time('read surface', () => readSurface(readInput(options.surface, 'surface'), options.surface));
  const surface = time('prepare surface', () => prepareGroomSurface(read.mesh, { boundary: base?.field.boundary ?? 'free' }));
  let spec: GroomSpec;
  let suggested: SuggestedLayout | null = null;
  if (options.suggest) {
    const suggest = options.suggest;
    const made = time('suggest layout', () =>
      suggestGroomSpec(surface, base ?? { specVersion: SPEC_VERSION, units: suggest.units, field: {} }, { order: suggest.order ?? base?.field.order ?? 1, align: suggest.align }),
    );
    spec = made.spec;
    suggested = made.layout;
  } else {
    spec = base!;
  }
  let rootsFrom: ReturnType<typeof readSurface>['mesh'] | undefined;
  if (options.from) ({ spec, rootsFrom } = carryOver(spec, options, surface, read.mesh, time));
  for (const map of options.maps) {
    const values = await readImageMap(readInput(map.path, 'map image'), read.mesh, { low: map.low, high: map.high });
    const encoded = encodeMap(map.attribute, values, read.mesh);
    spec = { ...spec, maps: [...(spec.maps ?? []).filter((m) => m.attribute !== map.attribute), encoded] };
  }
  const request = time('place features', () => fieldRequestFromSpec(spec, surface));
  const solved = time('solve field', () => solveField(surface.field, request));
  const needsGuides = options.out.some((out) => extname(out).toLowerCase() !== '.json') || options.thumbnails.length > 0 || options.stats;
  const grown = needsGuides ? time('grow guides', () => growGuides(surface, solved, spec, { rootsFrom })) : null;
  const made = { spec, surface, solved, guides: grown?.guides };
  for (const out of options.out) {
    const ext = extname(out).toLowerCase();
    const exportOptions = { basis: options.basis, withSurface: options.withSurface, provenance: { whorlwindVersion: WHORLWIND_VERSION } };
    time(`write ${ext}`, () => writeFileSync(out, writeExport(formatOfExtension(ext)!, made, exportOptions)));
  }
  if (options.field) time('write field', () => writeFileSync(options.field!, writeExport('ply', made)));
  for (const path of options.thumbnails) {
    const image = time(`render ${options.size}²`, () => renderThumbnail(read.mesh, grown!.guides, { size: options.size, view: options.view, upAxis: spec.upAxis, colourBy: options.colour }));
    const t0 = performance.now();
    writeFileSync(path, await encodeImage(image, extname(path).toLowerCase() === '.png' ? 'png' : 'webp'));
    seconds[`encode ${extname(path)}`] = (performance.now() - t0) / 1000;
  }
  if (options.stats && grown) {
    const { guides } = grown;
    const { budget } = solved.connection;
    let checked = 0, mismatched = 0;
    solved.measuredIndex.forEach((measured, v) => {
      if (!solved.connection.constrainedVertex[v]) return;
      checked++;
      if (Math.abs(measured - solved.connection.requestedIndex[v]) > 1e-6) mismatched++;
    });
    const lines = [
      ...(suggested ? [`suggested   ${describeSuggestion(suggested)}`] : []),
      `surface     ${read.mesh.positions.length / 3} vertices, ${read.mesh.triangles.length / 3} faces (${read.format})`,
      `growth area ${grown.areaSquareCm.toFixed(2)} cm²`,
      `guides      ${guides.count} × ${guides.pointsPerGuide} points (${(guides.count / Math.max(grown.areaSquareCm, 1e-12)).toFixed(3)} per cm², ${guides.hairsPerGuide} hairs each)`,
      `index       ${budget.pieces.map((c) => `${budget.pieces.length > 1 ? `piece ${c.piece + 1}: ` : ''}placed ${c.placed}${c.demanded === null ? ' (free boundary)' : ` of ${c.demanded}`}`).join('; ')}; measured = requested at ${checked - mismatched} of ${checked} vertices`,
      `edges       ${solved.edgeProof.checkedEdges} crossed without a seam (largest turn ${((solved.edgeProof.largestTurn * 180) / Math.PI).toFixed(1)}°), ${solved.edgeProof.checkedCurveTurns} turns round curve vertices as drawn`,
      ...(guides.sets ?? []).map((set) => `  set       ${JSON.stringify(set.name)}: ${set.count} guides over ${set.areaSquareCm.toFixed(2)} cm², ${set.hairsPerGuide} hairs each`),
      ...(grown.tufts ? [`tufts       ${grown.tufts.centres} tufts${grown.tufts.innerCentres ? `, ${grown.tufts.innerCentres} inner tufts` : ''}; ${guides.tuft.filter((t) => t < 0).length} guides in none`] : []),
      `skin check  ${grown.pushedOut} points moved out from under the skin`,
      'timings',
      ...Object.entries(seconds).map(([name, s]) => `  ${name.padEnd(18)} ${(s * 1000).toFixed(1)} ms`),
    ];
    process.stdout.write(`${lines.join('\n')}\n`);
  }
}

type Options = NonNullable<ReturnType<typeof parseCommandLine>>;

function readLandmarks(path: string): LandmarkPair[] {
  let list: unknown;
  try {
    list = JSON.parse(new TextDecoder().decode(readInput(path, 'landmarks')));
  } catch (error) {
    if (error instanceof GroomError) throw error;
    throw new GroomError('bad-landmarks', `the landmarks ${path} are not valid JSON`);
  }
  const vec = (x: unknown) => Array.isArray(x) && x.length === 3 && x.every((c) => typeof c === 'number' && Number.isFinite(c));
  if (!Array.isArray(list) || !list.every((p) => p && vec(p.from) && vec(p.to))) {
    throw new GroomError('bad-landmarks', `the landmarks ${path} must be a list of {"from": [x, y, z], "to": [x, y, z]}`);
  }
  return list as LandmarkPair[];
}

/** The spec carried from --from onto the surface; the report printed (and written) before anything else is. */
/**
 * The spec carried from --from onto the surface, and — when the two have the same polygons (a
 * sculpt pass) — the old mesh, so the guides grow from the same roots with the same ids.
 */
function carryOver(
  spec: GroomSpec,
  options: Options,
  surface: ReturnType<typeof prepareGroomSurface>,
  mesh: ReturnType<typeof readSurface>['mesh'],
  time: <T>(name: string, work: () => T) => T,
): { spec: GroomSpec; rootsFrom?: ReturnType<typeof readSurface>['mesh'] } {
  const old = time('read old surface', () => readSurface(readInput(options.from!, 'old surface'), options.from!));
  const oldSurface = time('prepare old', () => prepareGroomSurface(old.mesh, { boundary: spec.field.boundary }));
  const landmarks = options.landmarks ? readLandmarks(options.landmarks) : [];
  const { spec: carried, report } = time('transfer', () =>
    transferSpec(
      spec,
      { surface: oldSurface, identity: identityOfMesh(old.mesh) },
      { surface, identity: identityOfMesh(mesh), units: options.units, upAxis: options.up },
      { method: options.method, landmarks, regionMap: options.regionMap, reach: options.reach },
    ),
  );
  process.stdout.write(transferReportText(report));
  if (options.report) writeFileSync(options.report, `${JSON.stringify(report, null, 2)}\n`);
  if (!report.field.solved) throw new GroomError(report.field.code, `the field does not solve on the new surface: ${report.field.message}`);
  return { spec: carried, rootsFrom: report.method === 'topology' ? old.mesh : undefined };
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
