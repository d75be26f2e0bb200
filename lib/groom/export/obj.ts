import { AsciiWriter } from './ascii';
import type { Guides } from '../grow/guides';

/**
 * The guides as Wavefront OBJ text: every point a `v` line, every guide one `l` polyline through
 * its points in order, all in one object `guides`, in the surface's units.
 *
 * Guarantees: `v` lines in guide order (point j of guide g is vertex g·pointsPerGuide + j + 1);
 * one `l` element per guide.
 */
export function guidesToObj(guides: Guides): string {
  const n = guides.pointsPerGuide;
  const p = guides.points;
  const out = new AsciiWriter().precisionFor(p);
  out.text(`# Whorlwind guides: ${guides.count} guides of ${n} points; units ${guides.units}, up axis ${guides.upAxis}; each guide stands for ${guides.hairsPerGuide} hairs\no guides\n`);
  for (let i = 0; i < guides.count * n; i++) {
    out.text('v ').number(p[3 * i]).text(' ').number(p[3 * i + 1]).text(' ').number(p[3 * i + 2]).text('\n');
  }
  for (let g = 0; g < guides.count; g++) {
    out.text('l');
    for (let j = 0; j < n; j++) out.text(' ').whole(g * n + j + 1);
    out.text('\n');
  }
  return out.toString();
}
