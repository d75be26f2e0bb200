import { AsciiWriter } from './ascii';
import type { Guides } from '../grow/guides';
import { CENTIMETRES_PER_UNIT } from '../spec/spec';

/** How the curves are interpolated: linear segments, or cubic through pinned end points. */
export type UsdCurveBasis = 'linear' | 'bspline' | 'catmullRom';

const PER_LINE = 8;
const INDENT = '            ';

/** Writes `[` + `count` items (PER_LINE to a line) + `]`. */
function list(out: AsciiWriter, count: number, item: (i: number) => void): void {
  out.text('[\n');
  for (let i = 0; i < count; i++) {
    if (i % PER_LINE === 0) out.text(INDENT);
    item(i);
    if (i + 1 < count) out.text(i % PER_LINE === PER_LINE - 1 ? ',\n' : ', ');
  }
  out.text(`\n${INDENT.slice(4)}]`);
}

/**
 * The guides as OpenUSD text (`.usda`): one `BasisCurves` prim `/Groom/Guides` holding every
 * guide, with `curveVertexCounts`, `points`, per-vertex `widths` (root width tapering to the tip)
 * and `extent`, in the surface's units (`metersPerUnit`) and up axis.
 *
 * Cubic bases are written with `wrap = "pinned"`, so the rendered curve starts exactly at the root
 * and ends at the tip. Guarantees: `curveVertexCounts` sums to the number of points; widths have
 * one value per point ("vertex" interpolation); the extent contains every point and, for cubic
 * curves, the whole curve (the hull of each segment's Bézier control points), widened by half
 * the largest width.
 */
export function guidesToUsda(guides: Guides, basis: UsdCurveBasis = 'linear'): string {
  const n = guides.pointsPerGuide;
  const total = guides.count * n;
  const p = guides.points;
  const positions = AsciiWriter.decimalsFor(p);
  const widthDecimals = AsciiWriter.decimalsFor([guides.rootWidth, guides.tipWidth]);
  const extent = curveExtent(guides, basis);
  const out = new AsciiWriter();
  out.text(`#usda 1.0
(
    defaultPrim = "Groom"
    metersPerUnit = ${CENTIMETRES_PER_UNIT[guides.units] / 100}
    upAxis = "${guides.upAxis.toUpperCase()}"
    doc = "Guide curves written by Whorlwind: ${guides.count} guides of ${n} points."
)

def Xform "Groom"
{
    def BasisCurves "Guides"
    {
`);
  out.text(
    basis === 'linear'
      ? '        uniform token type = "linear"\n        uniform token wrap = "nonperiodic"\n'
      : `        uniform token type = "cubic"\n        uniform token basis = "${basis}"\n        uniform token wrap = "pinned"\n`,
  );
  out.text('        int[] curveVertexCounts = ');
  list(out, guides.count, () => out.whole(n));
  out.text('\n        point3f[] points = ').precision(positions);
  list(out, total, (i) => out.text('(').number(p[3 * i]).text(', ').number(p[3 * i + 1]).text(', ').number(p[3 * i + 2]).text(')'));
  out.text('\n        float[] widths = ').precision(widthDecimals);
  list(out, total, (i) => out.number(guides.rootWidth + ((guides.tipWidth - guides.rootWidth) * (i % n)) / Math.max(1, n - 1)));
  out.text(' (\n            interpolation = "vertex"\n        )\n').precision(positions);
  out.text('        float3[] extent = [(').number(extent.min[0]).text(', ').number(extent.min[1]).text(', ').number(extent.min[2]);
  out.text('), (').number(extent.max[0]).text(', ').number(extent.max[1]).text(', ').number(extent.max[2]).text(')]\n');
  out.text(`        int primvars:hairsPerGuide = ${guides.hairsPerGuide} (
            interpolation = "constant"
        )
    }
}
`);
  return out.toString();
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
  const pad = Math.max(guides.rootWidth, guides.tipWidth) / 2;
  if (guides.count === 0) return { min: [0, 0, 0], max: [0, 0, 0] };
  return { min: min.map((x) => x - pad), max: max.map((x) => x + pad) };
}
