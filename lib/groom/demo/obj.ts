import type { TriangleMesh } from '../../field';
import { decimalFormatter } from '../number-text';

/**
 * A demo surface as OBJ text, with a `g` line wherever the face group changes, so that reading
 * it back gives the same vertices, faces and groups (the form the demo seed stores and the
 * command line reads).
 */
export function surfaceToObj(mesh: TriangleMesh, comment: string): string {
  const p = mesh.positions;
  const t = mesh.triangles;
  const number = decimalFormatter(p);
  const lines = [`# ${comment}`];
  for (let v = 0; v < p.length / 3; v++) lines.push(`v ${number(p[3 * v])} ${number(p[3 * v + 1])} ${number(p[3 * v + 2])}`);
  let group = -1;
  for (let f = 0; f < t.length / 3; f++) {
    const g = mesh.groups ? mesh.groups.groupOfFace[f] : -1;
    if (mesh.groups && g !== group) {
      lines.push(`g ${mesh.groups.names[g]}`);
      group = g;
    }
    lines.push(`f ${t[3 * f] + 1} ${t[3 * f + 1] + 1} ${t[3 * f + 2] + 1}`);
  }
  return `${lines.join('\n')}\n`;
}
