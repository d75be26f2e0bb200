// The brush's side of the editor, shared by the tint tool, the tool rail and the Tints panel:
// what the brush paints and with which settings, the surface it paints on (prepared once), and
// the painted values read from and written into the spec (lib/groom/place/maps.ts's compact form).
import { vertexFaces, type VertexFaces } from '@/lib/groom/place/geodesic';
import { decodeMap, decodeMask, encodeMap, encodeMask } from '@/lib/groom/place/maps';
import { buildNearestVertex, type NearestVertex } from '@/lib/groom/place/nearest-vertex';
import { MAP_PAINT_RANGE, MASK_PAINT_RANGE, type BrushSettings } from '@/lib/groom/place/paint';
import type { GroomSpec, MapAttribute } from '@/lib/groom/spec/spec';
import type { TriangleMesh } from '@/lib/field';
import type { SpecEdit } from './spec-edits';

/** What the brush paints: a map of an attribute, or a mask by its name. */
export type PaintTarget = { readonly kind: 'map'; readonly attribute: MapAttribute } | { readonly kind: 'mask'; readonly name: string };

/** The brush's choices (the tool rail's options): what it paints and how. */
export interface BrushOptions extends BrushSettings {
  /** What the brush paints; null until the groomer picks a map or mask. */
  readonly paints: PaintTarget | null;
}

/** The brush as the editor first offers it: eight mean edges across, half strength, soft edge, painting 2×. */
export function defaultBrush(meanEdge: number): BrushOptions {
  return { paints: null, radius: 8 * meanEdge, strength: 0.5, falloff: 'smooth', mode: 'paint', target: 2 };
}

/** The surface the brush paints on, prepared once per surface: the welded mesh, its faces per vertex, a nearest-vertex look-up for mirrored dabs. */
export interface PaintSurface {
  readonly mesh: TriangleMesh;
  readonly around: VertexFaces;
  readonly nearest: NearestVertex;
}

export function preparePaintSurface(mesh: TriangleMesh): PaintSurface {
  return { mesh, around: vertexFaces(mesh), nearest: buildNearestVertex(mesh.positions) };
}

/** The target in words ("the length map", "mask “cap”"). */
export function targetLabel(target: PaintTarget): string {
  return target.kind === 'map' ? `the ${target.attribute} map` : `mask “${target.name}”`;
}

/** The values a target holds in the spec (decoded), or its unpainted values when the spec has none yet. */
export function paintedValues(spec: GroomSpec, target: PaintTarget, mesh: TriangleMesh): Float64Array {
  const nV = mesh.positions.length / 3;
  if (target.kind === 'map') {
    const i = spec.maps?.findIndex((m) => m.attribute === target.attribute) ?? -1;
    return i >= 0 ? decodeMap(spec.maps![i], mesh, `maps[${i}]`) : new Float64Array(nV).fill(MAP_PAINT_RANGE.blank);
  }
  const i = spec.masks?.findIndex((m) => m.name === target.name) ?? -1;
  return i >= 0 ? decodeMask(spec.masks![i], mesh, `masks[${i}]`) : new Float64Array(nV).fill(MASK_PAINT_RANGE.blank);
}

/** The edit that writes a target's values into the spec (16-bit maps, 8-bit masks). */
export function writeValues(target: PaintTarget, values: Float64Array, mesh: TriangleMesh, label?: string): SpecEdit {
  return target.kind === 'map'
    ? { type: 'set-map', map: encodeMap(target.attribute, values, mesh, 16), ...(label ? { label } : {}) }
    : { type: 'set-mask', mask: encodeMask(target.name, values, mesh, 8), ...(label ? { label } : {}) };
}

