import { AsciiWriter } from './ascii';
import type { Guides } from '../grow/guides';
import { writtenSurface, type BindingExportOptions } from './binding-data';

/** The comment every binding record starts with; OBJ readers skip it, a pipeline greps it. */
export const OBJ_ROOT_RECORD = '#whorlwind-root';
/** The comment each guide's shaping record starts with. */
export const OBJ_SHAPE_RECORD = '#whorlwind-shape';
/** The comment each guide set's record starts with. */
export const OBJ_SET_RECORD = '#whorlwind-set';

/**
 * OBJ group names for the sets' names: a group name is one word (readers split `g` lines at
 * spaces), so every run of white space becomes `_`; a name already taken gets `_2`, `_3`, … after it.
 */
export function objGroupNames(names: readonly string[]): string[] {
  const taken = new Set<string>();
  return names.map((name) => {
    const base = name.trim().replace(/\s+/g, '_') || '_';
    let group = base;
    for (let k = 2; taken.has(group); k++) group = `${base}_${k}`;
    taken.add(group);
    return group;
  });
}

/**
 * The guides as Wavefront OBJ text: every point a `v` line, every guide one `l` polyline through
 * its points in order, all in one object `guides`, in the surface's units. Where each guide grows
 * follows as one comment record per guide, in id order:
 * `#whorlwind-root guideId rootFace rootTriangle c0 c1 c2 w0 w1 w2 length [u v]` (the file polygon,
 * which of its triangles, that triangle's polygon corners rising, the root's weights on them, the
 * curve's length, and the root's UV when the surface has UVs); then one shaping record per guide,
 * `#whorlwind-shape guideId tuft innerTuft rootWidth tipWidth` (tufts −1 for none, widths in the
 * surface's units). With `options.surface`, the growth
 * surface comes first as object `surface`, its `v` lines the file's vertices in the file's order
 * and its `f` lines the file's polygons (with `vt` per corner when it has UVs), so vertex and face
 * numbers are the artist's; the guides' vertices follow. With guide sets, each set's `l` lines
 * follow a `g <set>` line (the set's name, white space turned to `_`), and one record per set,
 * `#whorlwind-set group first count "name"`, comes before the guides' records.
 *
 * Guarantees: `v` lines in guide order (point j of guide g is vertex V + g·pointsPerGuide + j + 1,
 * V being the surface's vertex count when it is written, else 0); one `l` element per guide; one
 * record per guide.
 */
export function guidesToObj(guides: Guides, options: BindingExportOptions = {}): string {
  const n = guides.pointsPerGuide;
  const p = guides.points;
  const out = new AsciiWriter();
  out.text(`# Whorlwind guides: ${guides.count} guides of ${n} points; units ${guides.units}, up axis ${guides.upAxis}; each guide stands for ${guides.hairsPerGuide} hairs\n`);
  const source = options.provenance;
  if (source) out.text(`# written by Whorlwind ${source.whorlwindVersion}${source.groomId ? `; groom ${source.groomId}` : ''}${source.specRevision !== undefined ? `, revision ${source.specRevision}` : ''}\n`);
  let offset = 0;
  if (options.surface) {
    const surface = writtenSurface(options.surface);
    const q = surface.points;
    out.text('o surface\n').precisionFor(q);
    for (let v = 0; v < q.length / 3; v++) out.text('v ').number(q[3 * v]).text(' ').number(q[3 * v + 1]).text(' ').number(q[3 * v + 2]).text('\n');
    const uv = surface.uvs;
    if (uv) {
      out.precision(Math.max(7, AsciiWriter.decimalsFor(uv)));
      for (let c = 0; c < uv.length / 2; c++) out.text('vt ').number(uv[2 * c]).text(' ').number(uv[2 * c + 1]).text('\n');
    }
    for (let f = 0, c = 0; f < surface.counts.length; f++) {
      out.text('f');
      for (let k = 0; k < surface.counts[f]; k++, c++) {
        out.text(' ').whole(surface.indices[c] + 1);
        if (uv) out.text('/').whole(c + 1);
      }
      out.text('\n');
    }
    offset = q.length / 3;
  }
  out.text('o guides\n').precisionFor(p);
  for (let i = 0; i < guides.count * n; i++) {
    out.text('v ').number(p[3 * i]).text(' ').number(p[3 * i + 1]).text(' ').number(p[3 * i + 2]).text('\n');
  }
  const groups = guides.sets ? objGroupNames(guides.sets.map((set) => set.name)) : [];
  for (let g = 0, set = 0; g < guides.count; g++) {
    // Each guide set is a group of its own, named by the set.
    while (guides.sets && set < guides.sets.length && guides.sets[set].first === g) out.text(`g ${groups[set++]}\n`);
    out.text('l');
    for (let j = 0; j < n; j++) out.text(' ').whole(offset + g * n + j + 1);
    out.text('\n');
  }
  const b = guides.binding;
  if (guides.sets) {
    out.text(`# ${OBJ_SET_RECORD.slice(1)} records: group first count name (guides first … first + count − 1, in the order of the l lines; ids are each set's own)\n`);
    guides.sets.forEach((set, i) => out.text(`${OBJ_SET_RECORD} ${groups[i]} `).whole(set.first).text(' ').whole(set.count).text(` ${JSON.stringify(set.name)}\n`));
  }
  out.text(`# ${OBJ_ROOT_RECORD.slice(1)} records: guideId rootFace rootTriangle c0 c1 c2 w0 w1 w2 length${b.uv ? ' u v' : ''}\n`);
  const lengthDecimals = AsciiWriter.decimalsFor(guides.length);
  for (let g = 0; g < guides.count; g++) {
    out.text(OBJ_ROOT_RECORD).text(' ').whole(guides.guideId[g]).text(' ').whole(b.polygon[g]).text(' ').whole(b.triangle[g]);
    for (let i = 0; i < 3; i++) out.text(' ').whole(b.corners[3 * g + i]);
    out.precision(9);
    for (let i = 0; i < 3; i++) out.text(' ').number(b.weights[3 * g + i]);
    out.precision(lengthDecimals).text(' ').number(guides.length[g]);
    if (b.uv) out.precision(9).text(' ').number(b.uv[2 * g]).text(' ').number(b.uv[2 * g + 1]);
    out.text('\n');
  }
  out.text(`# ${OBJ_SHAPE_RECORD.slice(1)} records: guideId tuft innerTuft rootWidth tipWidth\n`);
  out.precision(Math.max(AsciiWriter.decimalsFor(guides.guideRootWidth), AsciiWriter.decimalsFor(guides.guideTipWidth)));
  const signed = (x: number) => (x < 0 ? out.text('-').whole(-x) : out.whole(x));
  for (let g = 0; g < guides.count; g++) {
    out.text(OBJ_SHAPE_RECORD).text(' ').whole(guides.guideId[g]).text(' ');
    signed(guides.tuft[g]).text(' ');
    signed(guides.innerTuft[g]).text(' ').number(guides.guideRootWidth[g]).text(' ').number(guides.guideTipWidth[g]).text('\n');
  }
  return out.toString();
}
