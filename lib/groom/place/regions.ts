import type { TriangleMesh } from '../../field';
import { GroomError } from '../errors';

/**
 * The faces guides may grow on: those of the named OBJ groups, or every face when no group is named.
 *
 * Guarantees: a GroomError `unknown-region` with the spec path `<path>[i]` (`guides.regions[i]`
 * unless told) for a name the surface does not have, listing the names it does have.
 */
export function growthMask(mesh: TriangleMesh, regions: readonly string[], path = 'guides.regions'): Uint8Array {
  const faceCount = mesh.triangles.length / 3;
  const mask = new Uint8Array(faceCount);
  if (regions.length === 0) return mask.fill(1);
  const names = mesh.groups?.names ?? [];
  const wanted = new Uint8Array(names.length);
  regions.forEach((region, i) => {
    const g = names.indexOf(region);
    if (g === -1) {
      const known = names.length > 0 ? `its groups are ${names.map((n) => JSON.stringify(n)).join(', ')}` : 'it has no named groups';
      throw new GroomError('unknown-region', `${path}[${i}]: the surface has no group ${JSON.stringify(region)}; ${known}.`, `${path}[${i}]`);
    }
    wanted[g] = 1;
  });
  const groupOfFace = mesh.groups!.groupOfFace;
  for (let f = 0; f < faceCount; f++) mask[f] = wanted[groupOfFace[f]];
  return mask;
}
