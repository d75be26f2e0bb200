import type { DirectionField, TriangleMesh } from '../../field';
import { AsciiWriter } from './ascii';

/**
 * The field as PLY, the layout the groom spec's fixed core publishes: the surface's vertices
 * (`x y z`, then the smoothed direction at the vertex `dx dy dz`) and faces (`vertex_indices`,
 * then the field's unit direction in the face `dx dy dz`; for an n-direction field the first of
 * its n directions), all float32.
 *
 * Guarantees: binary little-endian by default, ASCII on request, with identical header
 * properties; vertex and face counts and order are the mesh's.
 */
export function fieldToPly(mesh: TriangleMesh, field: DirectionField, options: { ascii?: boolean } = {}): Uint8Array {
  const nV = mesh.positions.length / 3;
  const nF = mesh.triangles.length / 3;
  const header = [
    'ply',
    `format ${options.ascii ? 'ascii' : 'binary_little_endian'} 1.0`,
    `comment Whorlwind direction field of order ${field.order}`,
    `element vertex ${nV}`,
    'property float x',
    'property float y',
    'property float z',
    'property float dx',
    'property float dy',
    'property float dz',
    `element face ${nF}`,
    'property list uchar int vertex_indices',
    'property float dx',
    'property float dy',
    'property float dz',
    'end_header',
  ].join('\n') + '\n';
  const p = mesh.positions, t = mesh.triangles, vd = field.vertexDirection, fd = field.faceDirection;
  if (options.ascii) {
    // Positions keep the model's precision; unit directions that of numbers up to 1.
    const position = AsciiWriter.decimalsFor(p);
    const direction = AsciiWriter.decimalsFor([1]);
    const out = new AsciiWriter().text(header);
    for (let v = 0; v < nV; v++) {
      out.precision(position).number(p[3 * v]).text(' ').number(p[3 * v + 1]).text(' ').number(p[3 * v + 2]).text(' ');
      out.precision(direction).number(vd[3 * v]).text(' ').number(vd[3 * v + 1]).text(' ').number(vd[3 * v + 2]).text('\n');
    }
    for (let f = 0; f < nF; f++) {
      out.text('3 ').whole(t[3 * f]).text(' ').whole(t[3 * f + 1]).text(' ').whole(t[3 * f + 2]).text(' ');
      out.number(fd[3 * f]).text(' ').number(fd[3 * f + 1]).text(' ').number(fd[3 * f + 2]).text('\n');
    }
    return out.toBytes();
  }
  const head = new TextEncoder().encode(header);
  const out = new Uint8Array(head.length + 24 * nV + 25 * nF);
  out.set(head, 0);
  const view = new DataView(out.buffer);
  let o = head.length;
  for (let v = 0; v < nV; v++) {
    for (let k = 0; k < 3; k++, o += 4) view.setFloat32(o, p[3 * v + k], true);
    for (let k = 0; k < 3; k++, o += 4) view.setFloat32(o, vd[3 * v + k], true);
  }
  for (let f = 0; f < nF; f++) {
    view.setUint8(o++, 3);
    for (let k = 0; k < 3; k++, o += 4) view.setInt32(o, t[3 * f + k], true);
    for (let k = 0; k < 3; k++, o += 4) view.setFloat32(o, fd[3 * f + k], true);
  }
  return out;
}
