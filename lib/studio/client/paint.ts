// The brush's side of the editor, shared by the tint tool, the tool rail and the Tints panel:
// what the brush paints and with which settings, the surface it paints on (prepared once), and
// the painted values read from and written into the spec (lib/groom/place/maps.ts's compact form).
import { vertexFaces, type VertexFaces } from '@/lib/groom/place/geodesic';
import { decodeMap, decodeMask, encodeMap, encodeMask } from '@/lib/groom/place/maps';
import { buildNearestVertex, type NearestVertex } from '@/lib/groom/place/nearest-vertex';
import { MAP_PAINT_RANGE, MASK_PAINT_RANGE, type BrushSettings } from '@/lib/groom/place/paint';
import type { GroomSpec, MapAttribute, MapSpec, MaskSpec } from '@/lib/groom/spec/spec';
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

/** The target's coded values in the spec, with their path there; undefined when the spec has none yet. */
export function codedOf(spec: GroomSpec, target: PaintTarget): { readonly coded: MapSpec | MaskSpec; readonly path: string } | undefined {
  const i = target.kind === 'map' ? (spec.maps?.findIndex((m) => m.attribute === target.attribute) ?? -1) : (spec.masks?.findIndex((m) => m.name === target.name) ?? -1);
  if (i < 0) return undefined;
  return target.kind === 'map' ? { coded: spec.maps![i], path: `maps[${i}]` } : { coded: spec.masks![i], path: `masks[${i}]` };
}

/** Coded values decoded on `mesh` (refused as `decodeMap` says on another surface), or the unpainted values of a target the spec lacks. */
export function decodeTarget(found: ReturnType<typeof codedOf>, kind: PaintTarget['kind'], mesh: TriangleMesh): Float64Array {
  if (!found) return new Float64Array(mesh.positions.length / 3).fill(kind === 'map' ? MAP_PAINT_RANGE.blank : MASK_PAINT_RANGE.blank);
  return 'attribute' in found.coded ? decodeMap(found.coded, mesh, found.path) : decodeMask(found.coded, mesh, found.path);
}

/** The values a target holds in the spec (decoded), or its unpainted values when the spec has none yet. */
export function paintedValues(spec: GroomSpec, target: PaintTarget, mesh: TriangleMesh): Float64Array {
  return decodeTarget(codedOf(spec, target), target.kind, mesh);
}

/** The edit that writes a target's values into the spec (16-bit maps, 8-bit masks). */
export function writeValues(target: PaintTarget, values: Float64Array, mesh: TriangleMesh, label?: string): SpecEdit {
  return target.kind === 'map'
    ? { type: 'set-map', map: encodeMap(target.attribute, values, mesh, 16), ...(label ? { label } : {}) }
    : { type: 'set-mask', mask: encodeMask(target.name, values, mesh, 8), ...(label ? { label } : {}) };
}


/**
 * Whorlwind's tint ramp, as linear RGB in [0, 1]. A map's factor is shown on a doubling scale
 * (¼× and less lake blue, 1× the bare surface's sand, 4× and more ember), so halving and doubling
 * look equally strong; a mask's share runs from the sand (0) to heather (1).
 */
export const TINT_RAMP = {
  low: [0.18, 0.36, 0.49] as const,
  bare: [0.89, 0.85, 0.76] as const,
  high: [0.82, 0.41, 0.17] as const,
  mask: [0.48, 0.24, 0.56] as const,
  /** The factors at the ends of a map's scale. */
  lowest: 0.25,
  highest: 4,
};

/**
 * Each vertex's colour (r, g, b per vertex) for `values` of a map (`kind` 'map') or a mask.
 * Guarantees: every channel in [0, 1]; a map's 1× and a mask's 0 are exactly the bare colour.
 */
export function tintColours(values: ArrayLike<number>, kind: PaintTarget['kind'], out: Float32Array<ArrayBufferLike> = new Float32Array(3 * values.length)): Float32Array<ArrayBufferLike> {
  const { bare, low, high, mask } = TINT_RAMP;
  for (let v = 0; v < values.length; v++) {
    const x = values[v];
    let to: readonly number[], t: number;
    if (kind === 'mask') (to = mask), (t = Math.min(1, Math.max(0, x)));
    else {
      const octaves = x > 0 ? Math.log2(x) / Math.log2(TINT_RAMP.highest) : -1;
      (to = octaves < 0 ? low : high), (t = Math.min(1, Math.abs(octaves)));
    }
    for (let k = 0; k < 3; k++) out[3 * v + k] = bare[k] + t * (to[k] - bare[k]);
  }
  return out;
}
