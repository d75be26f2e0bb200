/**
 * Benchmark of lib/groom on a 100,000-face growth surface (a torus, 400 × 125 quads split in two):
 * root sampling, tracing and shaping of 5,000 and 50,000 guides of 16 points, 50,000 with two
 * levels of tufts, loners and waver (spec version 3), the same under the seven breakup maps, 50,000
 * with a painted density and length map,
 * 50,000 in two guide sets, 50,000 in two guide sets with the painted maps and two tuft levels
 * together (issue 16's "Done when": ≤ 3 s), each export (the guide formats also with the surface
 * beside them), and a 1024² thumbnail (render, then encoding).
 *
 *   npx tsx bench/groom.ts            prints a Markdown table
 *   npx tsx bench/groom.ts --grow     only the growing rows (plain, tufts and waver, maps, sets)
 *
 * Each measurement is the best of three runs after one warm-up, so that the table reflects the
 * code rather than the JIT or a neighbour's burst of work on a shared machine; the step rows of a
 * guide count are those of its fastest run. The load average is printed with the table.
 */
import { cpus, loadavg } from 'node:os';
import { torus } from '../tests/fixtures/shapes';
import { encodeImage } from '../lib/groom/render/encode-image';
import {
  EXPORT_FORMATS,
  EXPORT_FORMAT_FACTS,
  growGuides,
  parseGroomSpec,
  prepareGroomSurface,
  renderThumbnail,
  solveGroomField,
  writeExport,
  type ExportSource,
  type GroomSpecInput,
  encodeMap,
} from '../lib/groom';
import { best } from './best-of';

const RUNS = 3;

/** As `best`, for work that is awaited; the time only. */
async function bestAsync(work: () => Promise<unknown>): Promise<number> {
  await work();
  let ms = Infinity;
  for (let i = 0; i < RUNS; i++) {
    const t0 = performance.now();
    await work();
    ms = Math.min(ms, performance.now() - t0);
  }
  return ms;
}

const rows: [string, string][] = [];
const row = (what: string, ms: number) => rows.push([what, ms < 10 ? ms.toFixed(2) : ms.toFixed(0)]);

const mesh = torus(30, 12, 400, 125);
const faces = mesh.triangles.length / 3;
const growOnly = process.argv.includes('--grow');
const specFor = (count: number, shaping: Record<string, unknown> = {}): GroomSpecInput => ({
  specVersion: 3,
  units: 'cm',
  upAxis: 'z',
  field: {
    singularities: [
      { point: [0, 42, 0], index: 1, twist: 60 },
      { point: [0, -18, 0], index: -1 },
    ],
  },
  guides: { count, length: 3, lift: 20, droop: 0.4, curl: { amplitude: 0.1, wavelength: 1 }, jitter: 0.3, pointsPerGuide: 16, ...shaping },
});
/**
 * The torus is about 14,200 cm²: 50,000 guides are 3.5 per cm², so 0.2 tufts per cm² gather some 18
 * guides each, and 0.8 inner tufts per cm² split each into about four.
 */
const SHAPED = { tufts: { density: 0.2, gather: { root: 0, tip: 0.9, rise: 1.5 }, inner: { density: 0.8, gather: { root: 0, tip: 0.7 } }, loners: 0.05 }, waver: { amplitude: 0.15, waves: 3 } };

/** Painted maps: density from 0.5× to 2.5× round the tube (by x), length from 0.5× to 1.5× (by z); 16 bits. */
function paintedMaps() {
  const p = mesh.positions, nV = p.length / 3;
  const density = Float64Array.from({ length: nV }, (_x, v) => 1.5 + p[3 * v] / 42);
  const length = Float64Array.from({ length: nV }, (_x, v) => 1 + p[3 * v + 2] / 24);
  return [encodeMap('density', density, mesh), encodeMap('length', length, mesh)];
}

const t0 = performance.now();
const surface = prepareGroomSurface(mesh);
row(`prepare surface (field factorization + skin index), ${faces} faces`, performance.now() - t0);
const solved = best(() => solveGroomField(parseGroomSpec(specFor(1)), surface));
row('solve field', solved.ms);

let large: ReturnType<typeof growGuides> | undefined;
for (const count of [5_000, 50_000]) {
  const spec = parseGroomSpec(specFor(count));
  const grown = best(() => growGuides(surface, solved.result, spec));
  const t = grown.result.timings;
  row(`${count} guides × 16: roots`, t.rootsMilliseconds);
  row(`${count} guides × 16: tracing`, t.traceMilliseconds);
  row(`${count} guides × 16: shaping and skin check`, t.shapeMilliseconds);
  row(`${count} guides × 16: total`, grown.ms);
  large = grown.result;
}
{
  const spec = parseGroomSpec(specFor(50_000, SHAPED));
  const grown = best(() => growGuides(surface, solved.result, spec));
  const t = grown.result.timings;
  const what = `50000 guides × 16 with ${grown.result.tufts!.centres} tufts, ${grown.result.tufts!.innerCentres} inner tufts, loners and waver`;
  row(`${what}: roots`, t.rootsMilliseconds);
  row(`${what}: tracing (guides and centre curves)`, t.traceMilliseconds);
  row(`${what}: tuft centres (sampling, shaping their curves, assigning guides)`, t.tuftsMilliseconds);
  row(`${what}: shaping, gathering, waver and skin check`, t.shapeMilliseconds);
  row(`${what}: total`, grown.ms);
}
{
  // The same shaped coat with every breakup setting painted (0.5× to 1.5× round the tube, by x).
  const p = mesh.positions, nV = p.length / 3;
  const ramp = Float64Array.from({ length: nV }, (_x, v) => 1 + p[3 * v] / 84);
  const maps = (['tuftDensity', 'innerTuftDensity', 'innerGather', 'gatherRise', 'loners', 'waves', 'tipWidth'] as const).map((a) => encodeMap(a, ramp, mesh));
  const spec = parseGroomSpec({ ...specFor(50_000, SHAPED), maps });
  const grown = best(() => growGuides(surface, solved.result, spec));
  const t = grown.result.timings;
  const what = `50000 guides × 16 with ${grown.result.tufts!.centres} tufts, ${grown.result.tufts!.innerCentres} inner tufts, loners and waver, the seven breakup maps painted`;
  row(`${what}: roots (decoding the maps included)`, t.rootsMilliseconds);
  row(`${what}: tuft centres`, t.tuftsMilliseconds);
  row(`${what}: shaping, gathering, waver and skin check`, t.shapeMilliseconds);
  row(`${what}: total`, grown.ms);
}
{
  const maps = paintedMaps();
  const nV = mesh.positions.length / 3;
  const spec = parseGroomSpec({ ...specFor(50_000), maps });
  const grown = best(() => growGuides(surface, solved.result, spec));
  const t = grown.result.timings;
  const what = `50000 guides × 16 with a density and a length map (${nV} vertices, 16 bits)`;
  row(`${what}: roots (decoding the maps included)`, t.rootsMilliseconds);
  row(`${what}: tracing`, t.traceMilliseconds);
  row(`${what}: shaping and skin check`, t.shapeMilliseconds);
  row(`${what}: total`, grown.ms);
}
/** The torus with its upper and lower halves as face groups, for the guide sets' rows; prepared once. */
let halves: ReturnType<typeof prepareGroomSurface> | undefined;
function groupedHalves() {
  if (halves) return halves;
  const groupOfFace = new Uint16Array(faces);
  for (let f = 0; f < faces; f++) groupOfFace[f] = mesh.positions[3 * mesh.triangles[3 * f] + 2] >= 0 ? 0 : 1;
  return (halves = prepareGroomSurface({ ...mesh, groups: { names: ['upper', 'lower'], groupOfFace } }));
}
{
  // Two guide sets (issue 16): the torus's upper and lower halves as face groups, 25,000 guides
  // each, the lower with the tufts and waver above; each set grows as one block would on its half.
  const grouped = groupedHalves();
  const { guides: block } = specFor(25_000) as { guides: Record<string, unknown> };
  const spec = parseGroomSpec({
    ...specFor(1),
    guideSets: [
      { name: 'upper', region: { groups: ['upper'] }, guides: block },
      { name: 'lower', region: { groups: ['lower'] }, guides: { ...block, length: 2, ...SHAPED } },
    ],
  });
  const twoSolved = solveGroomField(spec, grouped);
  const grown = best(() => growGuides(grouped, twoSolved, spec));
  const t = grown.result.timings;
  const what = `50000 guides × 16 in two sets (25,000 plain; 25,000 with ${grown.result.tufts!.centres} tufts, ${grown.result.tufts!.innerCentres} inner tufts and waver)`;
  row(`${what}: roots`, t.rootsMilliseconds);
  row(`${what}: tracing`, t.traceMilliseconds);
  row(`${what}: tufts`, t.tuftsMilliseconds);
  row(`${what}: shaping and skin check`, t.shapeMilliseconds);
  row(`${what}: total`, grown.ms);
}
{
  // Issue 16's "Done when": the whole coat at once — two guide sets of 25,000 guides on the torus's
  // halves, both with two levels of tufts (loners and waver too), under a painted density and length map.
  const grouped = groupedHalves();
  const { guides: block } = specFor(25_000, SHAPED) as { guides: Record<string, unknown> };
  const spec = parseGroomSpec({
    ...specFor(1),
    maps: paintedMaps(),
    guideSets: [
      { name: 'upper', region: { groups: ['upper'] }, guides: block },
      { name: 'lower', region: { groups: ['lower'] }, guides: { ...block, length: 2, seed: 7 } },
    ],
  });
  const coatSolved = solveGroomField(spec, grouped);
  const grown = best(() => growGuides(grouped, coatSolved, spec));
  const t = grown.result.timings;
  const what = `50000 guides × 16: two sets, density and length maps, ${grown.result.tufts!.centres} tufts and ${grown.result.tufts!.innerCentres} inner tufts`;
  row(`${what}: roots (maps decoded)`, t.rootsMilliseconds);
  row(`${what}: tracing`, t.traceMilliseconds);
  row(`${what}: tufts`, t.tuftsMilliseconds);
  row(`${what}: shaping and skin check`, t.shapeMilliseconds);
  row(`${what}: total`, grown.ms);
}
const finish = () => {
  process.stdout.write(`${cpus().length} cores, load average ${loadavg().map((x) => x.toFixed(1)).join(' / ')} (1 / 5 / 15 min) at the end, Node ${process.version}\n\n`);
  process.stdout.write(`| step | ms |\n| --- | ---: |\n${rows.map(([a, b]) => `| ${a} | ${b} |`).join('\n')}\n`);
};
if (growOnly) {
  finish();
  process.exit(0);
}
const made = { spec: parseGroomSpec(specFor(50_000)), surface, solved: solved.result, guides: large!.guides };
const SCALE: Record<ExportSource, string> = { guides: ' (50,000 guides)', field: ` (${faces} faces)`, spec: '' };
for (const format of EXPORT_FORMATS) {
  row(`export ${format}${SCALE[EXPORT_FORMAT_FACTS[format].source]}`, best(() => writeExport(format, made)).ms);
}
for (const format of ['usda', 'glb', 'obj'] as const) {
  row(`export ${format} with the surface (50,000 guides, ${faces} faces)`, best(() => writeExport(format, made, { withSurface: true })).ms);
}
const thumbnailGuides = growGuides(surface, solved.result, parseGroomSpec(specFor(5_000))).guides;
const image = best(() => renderThumbnail(mesh, thumbnailGuides, { size: 1024, view: 'top', upAxis: 'z', colourBy: 'length' }));
row('thumbnail 1024² render (5,000 guides)', image.ms);
row('thumbnail 1024² encode .png', await bestAsync(() => encodeImage(image.result, 'png')));
row('thumbnail 1024² encode .webp', await bestAsync(() => encodeImage(image.result, 'webp')));

finish();
