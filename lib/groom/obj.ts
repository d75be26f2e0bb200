import type { Guides } from './guides';
import { decimalFormatter } from './number-text';

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
  const number = decimalFormatter(p);
  const lines: string[] = [
    `# Whorlwind guides: ${guides.count} guides of ${n} points; units ${guides.units}, up axis ${guides.upAxis}; each guide stands for ${guides.hairsPerGuide} hairs`,
    'o guides',
  ];
  for (let i = 0; i < guides.count * n; i++) lines.push(`v ${number(p[3 * i])} ${number(p[3 * i + 1])} ${number(p[3 * i + 2])}`);
  for (let g = 0; g < guides.count; g++) {
    const ids: number[] = [];
    for (let j = 0; j < n; j++) ids.push(g * n + j + 1);
    lines.push(`l ${ids.join(' ')}`);
  }
  return `${lines.join('\n')}\n`;
}
