import { GroomError } from '../errors';
import { curveVertices } from './request';
import { surfacePointOf, vertexOfPlace } from './place';
import { decodeMask } from './maps';
import { facesOfMask } from './paint';
import { growthMask } from './regions';
import type { GroomSpec, GuideSetRegion } from '../spec/spec';
import type { GroomSurface } from './surface';

/**
 * The faces a guide set grows on (1 per face it may use): its OBJ groups (none named: every face),
 * or the side of its partings — the faces reachable from `from` over shared edges without crossing
 * an edge of those partings (a flood fill over the dual graph), or its painted mask (the faces
 * whose three corners' mean share is at least ½, `facesOfMask`).
 *
 * Guarantees: a GroomError naming `path` (`guideSets[i].region…`) for a group the surface lacks
 * (`unknown-region`), a `from` vertex lying on one of the partings (`ambiguous-side`: it has no
 * side), or partings that do not cut the piece of surface `from` lies on in two (`parting-does-not-separate`:
 * every face of that piece is reachable without crossing them); for a mask, `empty-region` when
 * no face reaches ½ (nothing painted in it yet), and `map-surface-mismatch` as `decodeMask` says.
 */
export function setRegionMask(surface: GroomSurface, spec: GroomSpec, region: GuideSetRegion, path: string): Uint8Array {
  if (region.mask !== undefined) return paintedRegion(surface, spec, region.mask, path);
  if (!region.partings || !region.from) {
    return growthMask(surface.mesh, region.groups ?? [], `${path}.groups`);
  }
  const topology = surface.field.topology;
  const tri = topology.triangles;
  const vertexCount = topology.vertexCount;
  // Parting edges by their two vertices (lower · V + higher: exact below 2^53 for any mesh we hold).
  const blocked = new Set<number>();
  const onParting = new Uint8Array(vertexCount);
  for (const p of region.partings) {
    const chain = curveVertices(surface, spec.field.partings[p], `field.partings[${p}]`);
    for (let i = 0; i < chain.length; i++) onParting[chain[i]] = 1;
    for (let i = 1; i < chain.length; i++) blocked.add(Math.min(chain[i - 1], chain[i]) * vertexCount + Math.max(chain[i - 1], chain[i]));
  }
  const fromPath = `${path}.from`;
  let seedFace: number;
  if (region.from.point) {
    seedFace = surfacePointOf(surface, region.from.point, fromPath).face;
  } else {
    const v = vertexOfPlace(surface, region.from, fromPath);
    if (onParting[v]) throw new GroomError('ambiguous-side', `${fromPath}: the vertex lies on the parting, so it is on neither side; choose a place off it.`, fromPath);
    seedFace = Math.floor(topology.vertexHalfedge[v] / 3);
  }
  const mask = fill(tri, topology.twin, seedFace, (h) => {
    const a = tri[h], b = tri[h % 3 === 2 ? h - 2 : h + 1];
    return blocked.has(Math.min(a, b) * vertexCount + Math.max(a, b));
  });
  const piece = topology.componentOfFace[seedFace];
  let inPiece = 0, filled = 0;
  for (let f = 0; f < topology.faceCount; f++) {
    if (topology.componentOfFace[f] === piece) inPiece++;
    filled += mask[f];
  }
  if (filled === inPiece) {
    const which = region.partings.length === 1 ? `parting ${region.partings[0]} does` : `partings ${region.partings.join(', ')} do`;
    throw new GroomError(
      'parting-does-not-separate',
      `${path}: ${which} not cut the surface in two: every face of the piece ${fromPath} lies on is reachable from it without crossing ${region.partings.length === 1 ? 'it' : 'them'}. ` +
        'Close the parting into a loop, or run it from one edge of the surface to another.',
      `${path}.partings`,
    );
  }
  return mask;
}

/** Faces reachable from `seed` through halfedges with a twin that `stops` does not refuse. */
function fill(tri: Uint32Array, twin: Int32Array, seed: number, stops: (halfedge: number) => boolean): Uint8Array {
  const mask = new Uint8Array(tri.length / 3);
  const stack = [seed];
  mask[seed] = 1;
  while (stack.length > 0) {
    const f = stack.pop()!;
    for (let k = 0; k < 3; k++) {
      const h = 3 * f + k;
      const t = twin[h];
      if (t < 0) continue;
      const g = Math.floor(t / 3);
      if (mask[g] || stops(h)) continue;
      mask[g] = 1;
      stack.push(g);
    }
  }
  return mask;
}

/** The faces of a named painted mask; refused in words when it holds none. */
function paintedRegion(surface: GroomSurface, spec: GroomSpec, name: string, path: string): Uint8Array {
  const index = spec.masks?.findIndex((m) => m.name === name) ?? -1;
  if (index < 0) throw new GroomError('unknown-region', `${path}.mask: there is no mask named ${JSON.stringify(name)} in the spec's masks.`, `${path}.mask`);
  const faces = facesOfMask(surface.mesh, decodeMask(spec.masks![index], surface.mesh, `masks[${index}]`));
  if (!faces.includes(1)) {
    throw new GroomError(
      'empty-region',
      `${path}.mask: the mask ${JSON.stringify(name)} covers no face (a face belongs when its corners' mean is at least ½). Paint the mask over the part of the surface this set should grow on.`,
      `${path}.mask`,
    );
  }
  return faces;
}
