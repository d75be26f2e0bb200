import type { TriangleMesh } from '../../field';
import { AsciiWriter } from './ascii';
import type { Guides } from '../grow/guides';
import { guidesOfSet } from '../grow/guide-sets';
import { CENTIMETRES_PER_UNIT } from '../spec/spec';
import { writtenSurface, type BindingExportOptions, type Provenance } from './binding-data';

/** How the curves are interpolated: linear segments, or cubic through pinned end points. */
export type UsdCurveBasis = 'linear' | 'bspline' | 'catmullRom';

const PER_LINE = 8;
const INDENT = '            ';

/** Writes `[` + `count` items (PER_LINE to a line) + `]`; `pad` indents a prim nested one level deeper. */
function list(out: AsciiWriter, count: number, item: (i: number) => void, pad = ''): void {
  out.text('[\n');
  for (let i = 0; i < count; i++) {
    if (i % PER_LINE === 0) out.text(pad + INDENT);
    item(i);
    if (i + 1 < count) out.text(i % PER_LINE === PER_LINE - 1 ? ',\n' : ', ');
  }
  out.text(`\n${pad}${INDENT.slice(4)}]`);
}

/**
 * The guides as OpenUSD text (`.usda`): one `BasisCurves` prim `/Groom/Guides` holding every
 * guide, with `curveVertexCounts`, `points`, per-vertex `widths` (each guide's root width tapering to its tip width)
 * and `extent`, in the surface's units (`metersPerUnit`) and up axis; per curve ("uniform")
 * the binding primvars `whorlwind:guideId`, `rootFace` (file polygon), `rootTriangle`,
 * `rootCorners` (int3, the polygon corners of that triangle, ascending), `rootBarycentric`
 * (float3 on those corners), `rootUv` (texCoord2f, when the surface has UVs) and `length`,
 * and the shaping data `tuft`, `innerTuft` (int, −1 for none), `rootWidth`, `tipWidth` (float);
 * with `options.surface`, the growth surface as a `Mesh` prim `/Groom/Surface` in the file's
 * numbering (UVs as faceVarying `primvars:st`); with `options.provenance`, `customLayerData`.
 * With guide sets, `/Groom/Guides` is a `Scope` holding one such `BasisCurves` prim per set,
 * `/Groom/Guides/<set>` (the name made a valid prim name by `usdPrimNames`), each with its own
 * extent, hairs per guide and binding primvars, and the set's own name in `string whorlwind:guideSet`.
 *
 * Cubic bases are written with `wrap = "pinned"`, so the rendered curve starts exactly at the root
 * and ends at the tip. Guarantees: `curveVertexCounts` sums to the number of points; widths have
 * one value per point ("vertex" interpolation); the extent contains every point and, for cubic
 * curves, the whole curve (the hull of each segment's Bézier control points), widened by half
 * the largest width.
 */
export function guidesToUsda(guides: Guides, basis: UsdCurveBasis = 'linear', options: BindingExportOptions = {}): string {
  const n = guides.pointsPerGuide;
  const out = new AsciiWriter();
  out.text(`#usda 1.0
(
    defaultPrim = "Groom"
    metersPerUnit = ${CENTIMETRES_PER_UNIT[guides.units] / 100}
    upAxis = "${guides.upAxis.toUpperCase()}"
    doc = "Guide curves written by Whorlwind: ${guides.count} guides of ${n} points."
${options.provenance ? layerData(options.provenance) : ''})

def Xform "Groom"
{
`);
  const rel = options.surface ? '</Groom/Surface>' : undefined;
  if (guides.sets) {
    // Each set its own curve prim, named by the set (as a valid prim name; the name itself beside it).
    out.text('    def Scope "Guides"\n    {\n');
    const prims = usdPrimNames(guides.sets.map((set) => set.name));
    guides.sets.forEach((set, i) => {
      out.text(`${i > 0 ? '\n' : ''}        def BasisCurves "${prims[i]}"\n        {\n`);
      out.text(`            string whorlwind:guideSet = ${JSON.stringify(set.name)}\n`);
      writeCurves(out, guidesOfSet(guides, set), basis, '    ', rel);
      out.text('        }\n');
    });
  } else {
    out.text('    def BasisCurves "Guides"\n    {\n');
    writeCurves(out, guides, basis, '', rel);
  }
  out.text('    }\n');
  if (options.surface) writeSurface(out, options.surface);
  out.text('}\n');
  return out.toString();
}

/** One `BasisCurves` prim's body: its curves, widths, extent and per-curve data; `pad` indents a prim nested under a set's scope. */
function writeCurves(out: AsciiWriter, guides: Guides, basis: UsdCurveBasis, pad: string, surface: string | undefined): void {
  const n = guides.pointsPerGuide;
  const total = guides.count * n;
  const p = guides.points;
  const positions = AsciiWriter.decimalsFor(p);
  const widthDecimals = Math.max(AsciiWriter.decimalsFor(guides.guideRootWidth), AsciiWriter.decimalsFor(guides.guideTipWidth));
  const extent = curveExtent(guides, basis);
  const at = pad + '        ', inner = pad + '            ';
  out.text(
    basis === 'linear'
      ? `${at}uniform token type = "linear"\n${at}uniform token wrap = "nonperiodic"\n`
      : `${at}uniform token type = "cubic"\n${at}uniform token basis = "${basis}"\n${at}uniform token wrap = "pinned"\n`,
  );
  out.text(`${at}int[] curveVertexCounts = `);
  list(out, guides.count, () => out.whole(n), pad);
  out.text(`\n${at}point3f[] points = `).precision(positions);
  list(out, total, (i) => out.text('(').number(p[3 * i]).text(', ').number(p[3 * i + 1]).text(', ').number(p[3 * i + 2]).text(')'), pad);
  out.text(`\n${at}float[] widths = `).precision(widthDecimals);
  list(out, total, (i) => {
    const g = Math.floor(i / n), root = guides.guideRootWidth[g];
    out.number(root + ((guides.guideTipWidth[g] - root) * (i % n)) / Math.max(1, n - 1));
  }, pad);
  out.text(` (\n${inner}interpolation = "vertex"\n${at})\n`).precision(positions);
  out.text(`${at}float3[] extent = [(`).number(extent.min[0]).text(', ').number(extent.min[1]).text(', ').number(extent.min[2]);
  out.text('), (').number(extent.max[0]).text(', ').number(extent.max[1]).text(', ').number(extent.max[2]).text(')]\n');
  out.text(`${at}int primvars:hairsPerGuide = ${guides.hairsPerGuide} (\n${inner}interpolation = "constant"\n${at})\n`);
  writeBinding(out, guides, pad);
  if (surface) out.text(`${at}rel whorlwind:surface = ${surface}\n`);
}

/**
 * Valid, distinct prim names for the sets' names (OpenUSD identifiers: a letter or `_`, then
 * letters, digits and `_`): every other character becomes `_`, a leading digit gets a `_` before
 * it, and a name already taken gets `_2`, `_3`, … after it.
 */
export function usdPrimNames(names: readonly string[]): string[] {
  const taken = new Set<string>();
  return names.map((name) => {
    let base = name.replace(/[^A-Za-z0-9_]/g, '_');
    if (!/^[A-Za-z_]/.test(base)) base = `_${base}`;
    let prim = base;
    for (let k = 2; taken.has(prim); k++) prim = `${base}_${k}`;
    taken.add(prim);
    return prim;
  });
}

/** Writes one per-curve primvar: `count` items, then its interpolation. */
function uniform(out: AsciiWriter, declaration: string, count: number, item: (i: number) => void, pad = ''): void {
  out.text(`${pad}        ${declaration} = `);
  list(out, count, item, pad);
  out.text(` (\n${pad}            interpolation = "uniform"\n${pad}        )\n`);
}

function writeBinding(out: AsciiWriter, guides: Guides, pad: string): void {
  const b = guides.binding;
  const count = guides.count;
  uniform(out, 'int[] primvars:whorlwind:guideId', count, (g) => out.whole(guides.guideId[g]), pad);
  uniform(out, 'int[] primvars:whorlwind:rootFace', count, (g) => out.whole(b.polygon[g]), pad);
  uniform(out, 'int[] primvars:whorlwind:rootTriangle', count, (g) => out.whole(b.triangle[g]), pad);
  uniform(out, 'int3[] primvars:whorlwind:rootCorners', count, (g) => out.text('(').whole(b.corners[3 * g]).text(', ').whole(b.corners[3 * g + 1]).text(', ').whole(b.corners[3 * g + 2]).text(')'), pad);
  out.precision(9);
  uniform(out, 'float3[] primvars:whorlwind:rootBarycentric', count, (g) => out.text('(').number(b.weights[3 * g]).text(', ').number(b.weights[3 * g + 1]).text(', ').number(b.weights[3 * g + 2]).text(')'), pad);
  if (b.uv) {
    const uv = b.uv;
    out.precision(Math.max(7, AsciiWriter.decimalsFor(uv)));
    uniform(out, 'texCoord2f[] primvars:whorlwind:rootUv', count, (g) => out.text('(').number(uv[2 * g]).text(', ').number(uv[2 * g + 1]).text(')'), pad);
  }
  out.precisionFor(guides.length);
  uniform(out, 'float[] primvars:whorlwind:length', count, (g) => out.number(guides.length[g]), pad);
  writeShapeData(out, guides, pad);
}

/** The per-guide shaping data (spec version 3): tuft and inner tuft (−1 for none), width at the root and at the tip. */
function writeShapeData(out: AsciiWriter, guides: Guides, pad: string): void {
  const count = guides.count;
  const signed = (x: number) => (x < 0 ? out.text('-').whole(-x) : out.whole(x));
  uniform(out, 'int[] primvars:whorlwind:tuft', count, (g) => signed(guides.tuft[g]), pad);
  uniform(out, 'int[] primvars:whorlwind:innerTuft', count, (g) => signed(guides.innerTuft[g]), pad);
  out.precision(Math.max(AsciiWriter.decimalsFor(guides.guideRootWidth), AsciiWriter.decimalsFor(guides.guideTipWidth)));
  uniform(out, 'float[] primvars:whorlwind:rootWidth', count, (g) => out.number(guides.guideRootWidth[g]), pad);
  uniform(out, 'float[] primvars:whorlwind:tipWidth', count, (g) => out.number(guides.guideTipWidth[g]), pad);
}

/** The growth surface as a `Mesh` prim: file vertices, file polygons, UVs per corner. */
function writeSurface(out: AsciiWriter, mesh: TriangleMesh): void {
  const surface = writtenSurface(mesh);
  const p = surface.points;
  out.text('\n    def Mesh "Surface"\n    {\n        uniform token subdivisionScheme = "none"\n        int[] faceVertexCounts = ');
  list(out, surface.counts.length, (i) => out.whole(surface.counts[i]));
  out.text('\n        int[] faceVertexIndices = ');
  list(out, surface.indices.length, (i) => out.whole(surface.indices[i]));
  out.text('\n        point3f[] points = ').precisionFor(p);
  list(out, p.length / 3, (i) => out.text('(').number(p[3 * i]).text(', ').number(p[3 * i + 1]).text(', ').number(p[3 * i + 2]).text(')'));
  const min = [Infinity, Infinity, Infinity], max = [-Infinity, -Infinity, -Infinity];
  for (let i = 0; i < p.length; i++) {
    min[i % 3] = Math.min(min[i % 3], p[i]);
    max[i % 3] = Math.max(max[i % 3], p[i]);
  }
  if (p.length === 0) min.fill(0), max.fill(0);
  out.text('\n        float3[] extent = [(').number(min[0]).text(', ').number(min[1]).text(', ').number(min[2]);
  out.text('), (').number(max[0]).text(', ').number(max[1]).text(', ').number(max[2]).text(')]\n');
  if (surface.uvs) {
    const uv = surface.uvs;
    out.text('        texCoord2f[] primvars:st = ').precision(Math.max(7, AsciiWriter.decimalsFor(uv)));
    list(out, uv.length / 2, (i) => out.text('(').number(uv[2 * i]).text(', ').number(uv[2 * i + 1]).text(')'));
    out.text(' (\n            interpolation = "faceVarying"\n        )\n');
  }
  if (surface.sourcePolygon) {
    const source = surface.sourcePolygon;
    uniform(out, 'int[] primvars:whorlwind:sourcePolygon', source.length, (i) => out.whole(source[i]));
  }
  out.text('    }\n');
}

/** The provenance as layer metadata, a dictionary any USD reader keeps. */
function layerData(provenance: Provenance): string {
  const lines = [`            string version = ${JSON.stringify(provenance.whorlwindVersion)}`];
  if (provenance.groomId !== undefined) lines.push(`            string groomId = ${JSON.stringify(provenance.groomId)}`);
  if (provenance.specRevision !== undefined) lines.push(`            int specRevision = ${Math.trunc(provenance.specRevision)}`);
  return `    customLayerData = {\n        dictionary whorlwind = {\n${lines.join('\n')}\n        }\n    }\n`;
}

/** Bounds of the rendered curves, widened by half the largest width. */
function curveExtent(guides: Guides, basis: UsdCurveBasis): { min: number[]; max: number[] } {
  const n = guides.pointsPerGuide;
  const p = guides.points;
  const min = [Infinity, Infinity, Infinity];
  const max = [-Infinity, -Infinity, -Infinity];
  const include = (x: number, k: number) => {
    if (x < min[k]) min[k] = x;
    if (x > max[k]) max[k] = x;
  };
  for (let g = 0; g < guides.count; g++) {
    for (let i = 0; i < n; i++) {
      const q = 3 * (g * n + i);
      for (let k = 0; k < 3; k++) {
        include(p[q + k], k);
        if (basis === 'catmullRom') {
          // A Catmull-Rom segment from Pᵢ to Pᵢ₊₁ is the Bézier segment with inner control points
          // Pᵢ ± (Pᵢ₊₁ − Pᵢ₋₁)/6 (the pinned ends repeat the end point), which bound it.
          const before = 3 * (g * n + Math.max(0, i - 1)), after = 3 * (g * n + Math.min(n - 1, i + 1));
          const tangent = (p[after + k] - p[before + k]) / 6;
          include(p[q + k] + tangent, k);
          include(p[q + k] - tangent, k);
        }
      }
    }
  }
  // A B-spline lies in the hull of its control points, and the pinned ends only repeat points.
  let widest = 0;
  for (let g = 0; g < guides.count; g++) widest = Math.max(widest, guides.guideRootWidth[g], guides.guideTipWidth[g]);
  const pad = widest / 2;
  if (guides.count === 0) return { min: [0, 0, 0], max: [0, 0, 0] };
  return { min: min.map((x) => x - pad), max: max.map((x) => x + pad) };
}
