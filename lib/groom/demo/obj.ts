import type { TriangleMesh } from '../../field';
import { AsciiWriter } from '../export/ascii';

/**
 * A demo surface as OBJ text, with a `g` line wherever the face group changes, so that reading
 * it back gives the same vertices, faces and groups (the form the demo seed stores and the
 * command line reads).
 *
 * Guarantees: vertices and faces in the mesh's order (OBJ numbers from 1); the comment is written
 * as one line of printable ASCII.
 */
export function surfaceToObj(mesh: TriangleMesh, comment: string): string {
  const p = mesh.positions;
  const t = mesh.triangles;
  const out = new AsciiWriter().precisionFor(p);
  out.text(`# ${comment.replace(/[^\x20-\x7e]/g, '-')}\n`);
  for (let v = 0; v < p.length / 3; v++) out.text('v ').number(p[3 * v]).text(' ').number(p[3 * v + 1]).text(' ').number(p[3 * v + 2]).text('\n');
  let group = -1;
  for (let f = 0; f < t.length / 3; f++) {
    const g = mesh.groups ? mesh.groups.groupOfFace[f] : -1;
    if (mesh.groups && g !== group) {
      out.text(`g ${mesh.groups.names[g]}\n`);
      group = g;
    }
    out.text('f ').whole(t[3 * f] + 1).text(' ').whole(t[3 * f + 1] + 1).text(' ').whole(t[3 * f + 2] + 1).text('\n');
  }
  return out.toString();
}
