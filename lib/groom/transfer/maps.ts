import { decodeMap, decodeMask, encodeMap, encodeMask } from '../place/maps';
import { SKIN_QUERY_SIZE } from '../place/skin';
import type { GroomSurface } from '../place/surface';
import type { GroomSpec, MapAttribute, MapSpec, MaskSpec } from '../spec/spec';
import type { Alignment } from './align';
import { barycentricOnFace, type SurfaceIdentity } from './identity';
import { buildNormalProbe, type NormalProbe } from './ray';
import type { UvLocator } from './uv-locate';

/** How one painted map reached the new surface. */
export interface MapTransfer {
  readonly path: string;
  readonly attribute: MapAttribute;
  /**
   * `polygon`: each vertex's value read at the same polygon corner (same topology), unchanged;
   * `uv`: interpolated where the vertex's UV lies in the old UV layout (the features went by UV);
   * `closest point`: interpolated where the alignment puts the vertex.
   */
  readonly how: 'polygon' | 'uv' | 'closest point';
  /** For `uv`: new vertices whose UV lies on no part of the old layout (or that have none), read at the nearest facing point instead. */
  readonly unlocated?: number;
  /** For `closest point`: the farthest a new vertex lay from the old surface, over the new surface's diagonal. */
  readonly farthest?: number;
  /** For `closest point`: new vertices that found no old surface facing their way within reach, and took the nearest point whatever its side. */
  readonly unchecked?: number;
}

/** How one painted mask reached the new surface (as a map does). */
export type MaskTransfer = Omit<MapTransfer, 'attribute'> & { readonly name: string };

interface Side {
  readonly surface: GroomSurface;
  readonly identity: SurfaceIdentity;
}

/**
 * Carries every painted map of a spec from the old surface onto the new one: on the same
 * topology (`samePolygons`), each new vertex takes the value of the old vertex at the same polygon
 * corner; by UV (`uv`, the old surface's UV locator, given when the features went by UV) each new
 * vertex reads the old map barycentrically where its UV (its first polygon corner's) lies in the old
 * layout, within 10⁻³ of it as the features are; otherwise — and for a vertex whose UV lies on no
 * part of the old layout — each new vertex is laid back into the old space (the inverse of `alignment`,
 * the one the features were carried by) and takes the value interpolated barycentrically at the
 * nearest point of the old surface that faces its way (its normal turned back likewise): the
 * nearest point when it does, else the nearest face facing that way along the normal within
 * `reach` (old units), else — counted in `unchecked` — the nearest point whatever its side.
 *
 * Guarantees: by polygon every value is the old one and the map is written with the same bits,
 * low and high, so it decodes to the very same values; every map is carried (a map always finds
 * a nearest point) and appears once in the returned list; a map that was not painted on the old
 * surface is refused as `decodeMap` says (GroomError `map-surface-mismatch`). The side check is
 * what keeps a vertex on one side of a thin gap (lips, an ear's two sheets) from reading the other
 * sheet's value.
 */
export function carryMaps(spec: GroomSpec, from: Side, to: Side, samePolygons: boolean, alignment: Alignment, reach: number, uv?: UvLocator): { maps: MapSpec[]; report: MapTransfer[]; masks: MaskSpec[]; maskReport: MaskTransfer[] } {
  const maps: MapSpec[] = [];
  const report: MapTransfer[] = [];
  const masks: MaskSpec[] = [];
  const maskReport: MaskTransfer[] = [];
  const toMesh = to.surface.mesh;
  const nV = toMesh.positions.length / 3;
  // Where each new vertex reads the old map: an old vertex (by polygon) or a face and weights.
  let readAt: ((old: Float64Array, blank: number) => Float64Array) | undefined;
  let farthest = 0, unchecked = 0, unlocated = 0;
  const byUv = !samePolygons && uv !== undefined && to.identity.cornerUv !== undefined;
  const read = (old: Float64Array, blank: number) => {
    if (!readAt) {
      if (samePolygons) ({ readAt, farthest, unchecked } = byPolygon(from.identity, to.identity, nV));
      else ({ readAt, farthest, unchecked, unlocated } = byUv ? byUvOrClosestPoint(from.surface, to, alignment, reach, uv) : byUvOrClosestPoint(from.surface, to, alignment, reach));
    }
    return readAt(old, blank);
  };
  const how = () =>
    samePolygons ? { how: 'polygon' as const } : byUv ? { how: 'uv' as const, unlocated } : { how: 'closest point' as const, farthest: farthest / to.surface.diagonal, unchecked };
  for (const [i, map] of (spec.maps ?? []).entries()) {
    const path = `maps[${i}]`;
    const values = read(decodeMap(map, from.surface.mesh, path), 1);
    // By polygon: the same values coded between the same low and high — the very codes, so the map decodes identically.
    maps.push(encodeMap(map.attribute, values, toMesh, map.bits, samePolygons ? { low: map.low, high: map.high } : undefined));
    report.push({ path, attribute: map.attribute, ...how() });
  }
  // Masks travel as maps do: a share per vertex, read at the same corner or the nearest facing point.
  for (const [i, mask] of (spec.masks ?? []).entries()) {
    const path = `masks[${i}]`;
    const values = read(decodeMask(mask, from.surface.mesh, path), 0);
    const coded = encodeMask(mask.name, values.map((x) => Math.min(1, x)), toMesh, mask.bits);
    masks.push(samePolygons ? { ...coded, ...encodeRange(mask, values, toMesh) } : coded);
    maskReport.push({ path, name: mask.name, ...how() });
  }
  return { maps, report, masks, maskReport };
}

/** A mask's values coded between the old mask's own low and high, so that carrying by polygon keeps its codes. */
function encodeRange(mask: MaskSpec, values: Float64Array, mesh: GroomSurface['mesh']): Pick<MaskSpec, 'low' | 'high' | 'data'> {
  const { low, high, data } = encodeMap('density', values, mesh, mask.bits, { low: mask.low, high: mask.high });
  return { low, high, data };
}

/** Each new vertex's old vertex: the old welded vertex at the first polygon corner that uses it. */
function byPolygon(from: SurfaceIdentity, to: SurfaceIdentity, nV: number) {
  const source = new Int32Array(nV).fill(-1);
  for (let k = 0; k < to.cornerVertex.length; k++) if (source[to.cornerVertex[k]] < 0) source[to.cornerVertex[k]] = from.cornerVertex[k];
  // A vertex on no polygon weighs on nothing; it keeps the unpainted value (a map's 1×, a mask's 0).
  return { readAt: (old: Float64Array, blank: number) => Float64Array.from(source, (v) => (v >= 0 ? old[v] : blank)), farthest: 0, unchecked: 0 };
}

/**
 * Where each new vertex reads the old surface: with `uv`, at its first polygon corner's UV located
 * in the old layout; otherwise (and for a vertex the layout does not hold) laid into the old space
 * by the inverse alignment at the nearest old point facing its way.
 */
function byUvOrClosestPoint(from: GroomSurface, to: Side, a: Alignment, reach: number, uv?: UvLocator) {
  const nV = to.surface.mesh.positions.length / 3;
  const face = new Uint32Array(nV), weights = new Float64Array(3 * nV);
  const corner = new Int32Array(nV).fill(-1);
  const cornerUv = to.identity.cornerUv;
  if (uv && cornerUv) for (let k = 0; k < to.identity.cornerVertex.length; k++) if (corner[to.identity.cornerVertex[k]] < 0) corner[to.identity.cornerVertex[k]] = k;
  const nearest = closestPointOf(from, to.surface, a, reach);
  let unlocated = 0;
  for (let v = 0; v < nV; v++) {
    const c = corner[v];
    const hit = uv && c >= 0 ? uv.locate(cornerUv![2 * c], cornerUv![2 * c + 1], 1e-3) : null;
    if (hit) {
      face[v] = hit.face;
      weights.set(hit.weights, 3 * v);
      continue;
    }
    if (uv) unlocated++;
    face[v] = nearest.locate(v, v > 0 ? face[v - 1] : undefined, weights);
  }
  const tri = from.mesh.triangles;
  return {
    readAt: (old: Float64Array) =>
      Float64Array.from({ length: nV }, (_x, v) => {
        const f = face[v];
        const value = weights[3 * v] * old[tri[3 * f]] + weights[3 * v + 1] * old[tri[3 * f + 1]] + weights[3 * v + 2] * old[tri[3 * f + 2]];
        return Math.min(10, Math.max(0, value));
      }),
    farthest: nearest.farthest,
    unchecked: nearest.unchecked,
    unlocated,
  };
}

/** New vertices laid into the old space by the inverse alignment, each at the nearest old point facing its way (see `carryMaps`). */
function closestPointOf(from: GroomSurface, to: GroomSurface, a: Alignment, reach: number) {
  const q = to.mesh.positions;
  const query = new Float64Array(SKIN_QUERY_SIZE);
  const r = a.rotation;
  const turnBack = (d: readonly number[]) => [r[0] * d[0] + r[3] * d[1] + r[6] * d[2], r[1] * d[0] + r[4] * d[1] + r[7] * d[2], r[2] * d[0] + r[5] * d[1] + r[8] * d[2]];
  const normal = to.vertexNormal;
  let probe: NormalProbe | undefined;
  const out = {
    farthest: 0,
    unchecked: 0,
    /** The old face vertex v reads, its weights written into `weights` at 3v; `hint`: a face to start the search from. */
    locate(v: number, hint: number | undefined, weights: Float64Array): number {
      // x_old = Rᵀ (x_new − t) / s, R being a rotation; the normal turned back by Rᵀ alone.
      const [x, y, z] = turnBack([0, 1, 2].map((k) => (q[3 * v + k] - a.translation[k]) / a.scale));
      const n = turnBack([normal[3 * v], normal[3 * v + 1], normal[3 * v + 2]]);
      from.skin.closest(x, y, z, Infinity, query, hint);
      let point: [number, number, number] = [query[0], query[1], query[2]];
      let face = query[7];
      if (query[3] * n[0] + query[4] * n[1] + query[5] * n[2] <= 0) {
        probe ??= buildNormalProbe(from.mesh);
        const hit = probe.along([x, y, z], n, reach);
        if (hit) {
          point = hit.point;
          face = hit.face;
        } else out.unchecked++;
      }
      weights.set(barycentricOnFace(from.mesh, face, point), 3 * v);
      out.farthest = Math.max(out.farthest, Math.hypot(point[0] - x, point[1] - y, point[2] - z) * a.scale);
      return face;
    },
  };
  return out;
}
