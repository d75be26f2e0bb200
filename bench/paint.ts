/**
 * Benchmark of the tint brush on the 50,000-vertex torus of bench/groom.ts (400 × 125 quads): what
 * a stroke costs at its press (preparing the surface once, decoding a 16-bit map), per dab (the reach
 * along the surface and the dab itself, at radii of 4, 8 and 16 mean edges; tinting, evening out,
 * and a dab mirrored with twin sides on; the stage's recolouring of every vertex) and at its
 * release (encoding the map for the spec).
 *
 *   node --import tsx bench/paint.ts      prints a Markdown table
 *
 * Each row is the best of three runs after one warm-up (bench/best-of.ts).
 */
import { cpus, loadavg } from 'node:os';
import { decodeMap, encodeMap, parseGroomSpec } from '../lib/groom';
import { applyDab, dabReach, MAP_PAINT_RANGE } from '../lib/groom/place/paint';
import { preparePaintSurface, tintColours } from '../lib/studio/client/paint';
import { strokeReach } from '../lib/studio/client/tools/tint';
import { torus } from '../tests/fixtures/shapes';
import { best } from './best-of';

const mesh = torus(30, 12, 400, 125);
const nV = mesh.positions.length / 3;
const p = mesh.positions, tri = mesh.triangles;
let edges = 0, sum = 0;
for (let f = 0; f < tri.length / 3; f++) {
  for (let k = 0; k < 3; k++) {
    const a = tri[3 * f + k], b = tri[3 * f + ((k + 1) % 3)];
    sum += Math.hypot(p[3 * b] - p[3 * a], p[3 * b + 1] - p[3 * a + 1], p[3 * b + 2] - p[3 * a + 2]);
    edges++;
  }
}
const meanEdge = sum / edges;
const rows: [string, string][] = [];
const row = (what: string, ms: number) => rows.push([what, ms < 10 ? ms.toFixed(2) : ms.toFixed(0)]);

const prepared = best(() => preparePaintSurface(mesh), 3);
row(`press, once per surface: prepare the brush's surface (${nV} vertices)`, prepared.ms);
const paint = prepared.result;
const values = Float64Array.from({ length: nV }, (_x, v) => 1 + 0.5 * Math.sin(p[3 * v]));
const map = encodeMap('length', values, mesh, 16);
row('press: decode the 16-bit length map', best(() => decodeMap(map, mesh)).ms);

// A dab on the outer equator (face 0 lies there).
const face = 0;
const centre = [0, 1, 2].map((k) => (p[3 * tri[0] + k] + p[3 * tri[1] + k] + p[3 * tri[2] + k]) / 3);
for (const edgesAcross of [4, 8, 16]) {
  const radius = edgesAcross * meanEdge;
  const reach = dabReach(mesh, paint.around, face, centre, radius);
  row(`dab, radius ${edgesAcross} mean edges (${reach.vertices.length} vertices): reach along the surface`, best(() => dabReach(mesh, paint.around, face, centre, radius)).ms);
  const work = Float64Array.from(values);
  row(`… tint`, best(() => applyDab(work, reach, { radius, strength: 0.5, falloff: 'smooth', mode: 'paint', target: 2 }, MAP_PAINT_RANGE, mesh, paint.around)).ms);
  row(`… even out`, best(() => applyDab(work, reach, { radius, strength: 0.5, falloff: 'smooth', mode: 'smooth', target: 2 }, MAP_PAINT_RANGE, mesh, paint.around)).ms);
}
const twin = parseGroomSpec({ specVersion: 3, units: 'cm', field: {}, symmetry: { axis: 'x' } });
row('dab, radius 8 mean edges, twin sides on: both reaches', best(() => strokeReach(paint, twin, { point: centre as [number, number, number], face }, 8 * meanEdge)).ms);
const colours = new Float32Array(3 * nV);
row('each dab, on the stage: recolour every vertex in the tint ramp', best(() => tintColours(values, 'map', colours)).ms);
row('release: encode the map (16 bits)', best(() => encodeMap('length', values, mesh, 16)).ms);

const [one, five, fifteen] = loadavg();
console.log(`Tint brush on a torus of ${nV} vertices, ${tri.length / 3} faces; mean edge ${meanEdge.toFixed(3)} cm. ${cpus().length} cores, load ${one.toFixed(1)} / ${five.toFixed(1)} / ${fifteen.toFixed(1)}.\n`);
console.log('| step | ms |\n| --- | ---: |');
for (const [what, ms] of rows) console.log(`| ${what} | ${ms} |`);
