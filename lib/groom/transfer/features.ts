import { GroomError } from '../errors';
import { vertexOfPlace } from '../place/place';
import { SKIN_QUERY_SIZE } from '../place/skin';
import type { GroomSurface } from '../place/surface';
import type { CurveSpec, GroomSpec, GuideSetSpec, PlaceSpec, StrokeSpec, SurfacePosition } from '../spec/spec';
import { barycentricOnFace, pointOfPosition, positionOnFace, type SurfaceIdentity } from './identity';

/**
 * The placed features of a spec, one by one, as they sit on the surface the spec was made on:
 * singularities and pins at the vertex they snap to, curve vertices and stroke samples at the
 * surface point nearest what was drawn.
 */

/** `parting side`: the `from` place of a guide set grown on the side of a parting. */
export type FeatureKind = 'singularity' | 'pin' | 'curve vertex' | 'stroke sample' | 'parting side';

/** Where a feature lives in the spec: the list, the item, and the point within a curve or stroke. */
export interface FeatureSlot {
  /** `sides`: guide set `item`'s `region.from`. */
  readonly list: 'singularities' | 'pins' | 'partings' | 'crests' | 'strokes' | 'sides';
  readonly item: number;
  readonly point?: number;
}

export interface AnchoredFeature {
  readonly kind: FeatureKind;
  /** Dotted spec path, e.g. `field.partings[0].points[3]`. */
  readonly path: string;
  readonly slot: FeatureSlot;
  /** The world point on the old surface. */
  readonly point: [number, number, number];
  /** Unit outward normal there (vertex normals blended over the face). */
  readonly normal: [number, number, number];
  readonly face: number;
  readonly position: SurfacePosition;
}

/** How far (fraction of the diagonal) a drawn point may be from the surface: as the spec's own places allow. */
const NEAR_FRACTION = 0.1;
/** A stored position farther than this (fraction of the diagonal) from the place's own point is stale. */
const STALE_FRACTION = 1e-6;

function onFace(surface: GroomSurface, identity: SurfaceIdentity, face: number, point: readonly number[]) {
  const weights = barycentricOnFace(surface.mesh, face, point);
  const tri = surface.mesh.triangles;
  const vn = surface.vertexNormal;
  const normal: [number, number, number] = [0, 0, 0];
  for (let k = 0; k < 3; k++) for (let i = 0; i < 3; i++) normal[i] += weights[k] * vn[3 * tri[3 * face + k] + i];
  const l = Math.hypot(...normal) || 1;
  return { face, normal: normal.map((x) => x / l) as [number, number, number], position: positionOnFace(identity, face, weights) };
}

function nearestOnSurface(surface: GroomSurface, identity: SurfaceIdentity, point: readonly number[], path: string) {
  const out = new Float64Array(SKIN_QUERY_SIZE);
  if (!point.every(Number.isFinite) || !surface.skin.closest(point[0], point[1], point[2], NEAR_FRACTION * surface.diagonal, out)) {
    throw new GroomError('point-off-surface', `${path}: the point (${point.join(', ')}) is not on the surface the spec was made on.`, path);
  }
  const at: [number, number, number] = [out[0], out[1], out[2]];
  return { point: at, ...onFace(surface, identity, out[7], at) };
}

/**
 * A stored surface position, when it still names a polygon of this surface: kept exactly (it is
 * the artist's numbering), with the face of that polygon the point lies in for the normal.
 */
function fromStored(surface: GroomSurface, identity: SurfaceIdentity, position: SurfacePosition | undefined, drawn: readonly number[]) {
  const point = position ? pointOfPosition(identity, surface.mesh, position) : null;
  if (!point || !position) return null;
  // A place moved in the editor after its position was stored: the position is stale, the point wins.
  if (Math.hypot(point[0] - drawn[0], point[1] - drawn[1], point[2] - drawn[2]) > STALE_FRACTION * surface.diagonal) return null;
  const out = new Float64Array(SKIN_QUERY_SIZE);
  surface.skin.closest(point[0], point[1], point[2], surface.diagonal, out);
  return { point, face: out[7], normal: [out[3], out[4], out[5]].map((x, _i, n) => x / (Math.hypot(...n) || 1)) as [number, number, number], position };
}

function atVertex(surface: GroomSurface, identity: SurfaceIdentity, vertex: number) {
  const p = surface.mesh.positions;
  const point: [number, number, number] = [p[3 * vertex], p[3 * vertex + 1], p[3 * vertex + 2]];
  const h = surface.field.topology.vertexHalfedge[vertex];
  const face = (h / 3) | 0;
  const weights = [0, 1, 2].map((k) => (surface.mesh.triangles[3 * face + k] === vertex ? 1 : 0));
  const normal: [number, number, number] = [surface.vertexNormal[3 * vertex], surface.vertexNormal[3 * vertex + 1], surface.vertexNormal[3 * vertex + 2]];
  return { point, face, normal, position: positionOnFace(identity, face, weights) };
}

function anchorPlace(surface: GroomSurface, identity: SurfaceIdentity, place: PlaceSpec, path: string) {
  const vertex = vertexOfPlace(surface, place, path);
  const p = surface.mesh.positions;
  const drawn = place.point ?? [p[3 * vertex], p[3 * vertex + 1], p[3 * vertex + 2]];
  return fromStored(surface, identity, place.surface, drawn) ?? atVertex(surface, identity, vertex);
}

function anchorCurvePoints(surface: GroomSurface, identity: SurfaceIdentity, curve: CurveSpec | StrokeSpec, path: string) {
  const vertices = 'vertices' in curve ? curve.vertices : undefined;
  const count = curve.points?.length ?? vertices?.length ?? 0;
  return Array.from({ length: count }, (_, j) => {
    if (curve.points) {
      return fromStored(surface, identity, curve.surface?.[j], curve.points[j]) ?? nearestOnSurface(surface, identity, curve.points[j], `${path}.points[${j}]`);
    }
    const vertex = vertexOfPlace(surface, { vertex: vertices![j] }, `${path}.vertices[${j}]`);
    const p = surface.mesh.positions;
    return fromStored(surface, identity, curve.surface?.[j], [p[3 * vertex], p[3 * vertex + 1], p[3 * vertex + 2]]) ?? atVertex(surface, identity, vertex);
  });
}

/**
 * Every placed feature of `spec` on the surface it was made on, in spec order.
 *
 * Guarantees: one entry per singularity, pin, curve point (or vertex) and stroke point, each with
 * its world point on the surface, the face it lies on and its position in the file's numbering; a
 * stored `surface` position is used where it names a polygon this surface has. A GroomError
 * naming the path for a place the surface cannot hold.
 */
export function anchorFeatures(spec: GroomSpec, surface: GroomSurface, identity: SurfaceIdentity): AnchoredFeature[] {
  const out: AnchoredFeature[] = [];
  spec.field.singularities.forEach((s, i) => {
    const path = `field.singularities[${i}]`;
    out.push({ kind: 'singularity', path, slot: { list: 'singularities', item: i }, ...anchorPlace(surface, identity, s, path) });
  });
  for (const list of ['partings', 'crests'] as const) {
    spec.field[list].forEach((curve, i) => {
      const path = `field.${list}[${i}]`;
      anchorCurvePoints(surface, identity, curve, path).forEach((a, j) => {
        out.push({ kind: 'curve vertex', path: `${path}.${curve.points ? 'points' : 'vertices'}[${j}]`, slot: { list, item: i, point: j }, ...a });
      });
    });
  }
  spec.field.strokes.forEach((stroke, i) => {
    const path = `field.strokes[${i}]`;
    anchorCurvePoints(surface, identity, stroke, path).forEach((a, j) => {
      out.push({ kind: 'stroke sample', path: `${path}.points[${j}]`, slot: { list: 'strokes', item: i, point: j }, ...a });
    });
  });
  spec.pins.forEach((pin, i) => {
    const path = `pins[${i}]`;
    out.push({ kind: 'pin', path, slot: { list: 'pins', item: i }, ...anchorPlace(surface, identity, pin, path) });
  });
  spec.guideSets?.forEach((set, i) => {
    const from = set.region.from;
    if (!from) return;
    const path = `guideSets[${i}].region.from`;
    // A point names its side by the surface point nearest it (setRegionMask), not by a vertex, which may lie on the parting.
    const at = from.point ? (fromStored(surface, identity, from.surface, from.point) ?? nearestOnSurface(surface, identity, from.point, path)) : anchorPlace(surface, identity, from, path);
    out.push({ kind: 'parting side', path, slot: { list: 'sides', item: i }, ...at });
  });
  return out;
}

/**
 * The spec with every placed feature's surface position (file polygon, barycentric, UV when the
 * surface has them) written beside its point or vertex, as `surface` on the surface it was made
 * on: what a later transfer carries it by, and what a pipeline reading the spec binds it with.
 *
 * Guarantees: points and vertices are left exactly as they are (no feature moves); a position
 * already stored and still matching its point is kept; throws a GroomError naming the path for a
 * place the surface cannot hold, as `anchorFeatures`.
 */
export function withSurfacePositions(spec: GroomSpec, surface: GroomSurface, identity: SurfaceIdentity): GroomSpec {
  const at = new Map(anchorFeatures(spec, surface, identity).map((f) => [key(f.slot), f.position]));
  const position = (slot: FeatureSlot) => at.get(key(slot))!;
  const along = (list: 'partings' | 'crests' | 'strokes', item: number, count: number) => Array.from({ length: count }, (_, point) => position({ list, item, point }));
  const curves = (list: 'partings' | 'crests') => spec.field[list].map((curve, item) => ({ ...curve, surface: along(list, item, curve.points?.length ?? curve.vertices!.length) }));
  return {
    ...spec,
    field: {
      ...spec.field,
      singularities: spec.field.singularities.map((s, item) => ({ ...s, surface: position({ list: 'singularities', item }) })),
      partings: curves('partings'),
      crests: curves('crests'),
      strokes: spec.field.strokes.map((stroke, item) => ({ ...stroke, surface: along('strokes', item, stroke.points.length) })),
    },
    pins: spec.pins.map((pin, item) => ({ ...pin, surface: position({ list: 'pins', item }) })),
    ...(spec.guideSets
      ? { guideSets: spec.guideSets.map((set, item) => (set.region.from ? { ...set, region: { ...set.region, from: { ...set.region.from, surface: position({ list: 'sides', item }) } } } : set)) }
      : {}),
  };
}

/** Where a feature landed on the new surface (null: not carried). */
export interface Landing {
  readonly point: [number, number, number];
  readonly position: SurfacePosition;
  /** The file vertex to keep, when the topology is the same and the spec named a vertex. */
  readonly vertex?: number;
}

function key(slot: FeatureSlot): string {
  return `${slot.list}/${slot.item}/${slot.point ?? ''}`;
}

/**
 * The spec with every carried feature at its landing: places as `point` (or the same `vertex` on
 * the same topology) with their `surface` position; a curve any of whose points was not carried is
 * left out whole (and listed in `droppedCurves`), as is a stroke left with fewer than two points.
 *
 * A guide set grown on the side of partings keeps its side: its `from` at its landing, its
 * partings renumbered as the partings left out close up; when its `from` was not carried, or none
 * of its partings was, it grows on the whole surface instead (listed in `droppedSides`).
 *
 * Guarantees: the result parses as a spec; features not in `landings` (or landing null) are gone.
 */
export function placeFeatures(
  spec: GroomSpec,
  features: readonly AnchoredFeature[],
  landings: readonly (Landing | null)[],
  dropCurves: ReadonlySet<string>,
): { spec: GroomSpec; droppedCurves: string[]; droppedStrokes: string[]; droppedSides: { path: string; reason: string }[] } {
  const landed = new Map<string, Landing | null>();
  features.forEach((f, i) => landed.set(key(f.slot), landings[i]));
  const place = (slot: FeatureSlot, keepVertex: boolean) => {
    const l = landed.get(key(slot));
    if (!l) return null;
    return keepVertex && l.vertex !== undefined ? { vertex: l.vertex, surface: l.position } : { point: l.point, surface: l.position };
  };
  const droppedCurves: string[] = [];
  const curves = (list: 'partings' | 'crests'): CurveSpec[] =>
    spec.field[list].flatMap((curve, i): CurveSpec[] => {
      const path = `field.${list}[${i}]`;
      const count = curve.points?.length ?? curve.vertices!.length;
      const places = Array.from({ length: count }, (_, j) => place({ list, item: i, point: j }, curve.vertices !== undefined));
      if (dropCurves.has(path) || places.some((p) => p === null)) {
        droppedCurves.push(path);
        return [];
      }
      const surface = places.map((p) => p!.surface);
      return places.every((p) => 'vertex' in p!)
        ? [{ vertices: places.map((p) => (p as { vertex: number }).vertex), closed: curve.closed, surface }]
        : [{ points: places.map((p) => (p as { point: [number, number, number] }).point), closed: curve.closed, surface }];
    });
  const droppedStrokes: string[] = [];
  const strokes = spec.field.strokes.flatMap((stroke, i) => {
    const kept = stroke.points.flatMap((_, j) => {
      const p = place({ list: 'strokes', item: i, point: j }, false) as { point: [number, number, number]; surface: SurfacePosition } | null;
      return p ? [p] : [];
    });
    if (kept.length < 2) {
      droppedStrokes.push(`field.strokes[${i}]`);
      return [];
    }
    return [{ points: kept.map((p) => p.point), surface: kept.map((p) => p.surface) }];
  });
  const singularities = spec.field.singularities.flatMap((s, i) => {
    const p = place({ list: 'singularities', item: i }, s.vertex !== undefined);
    const { point: _p, vertex: _v, surface: _s, ...rest } = s;
    return p ? [{ ...rest, ...p }] : [];
  });
  const pins = spec.pins.flatMap((pin, i) => {
    const p = place({ list: 'pins', item: i }, pin.vertex !== undefined);
    const { point: _p, vertex: _v, surface: _s, ...rest } = pin;
    return p ? [{ ...rest, ...p }] : [];
  });
  const partings = curves('partings');
  // Each old parting's number among those kept (−1: left out).
  const keptParting: number[] = [];
  let next = 0;
  spec.field.partings.forEach((_curve, i) => keptParting.push(droppedCurves.includes(`field.partings[${i}]`) ? -1 : next++));
  const droppedSides: { path: string; reason: string }[] = [];
  const side = (set: GuideSetSpec, i: number): GuideSetSpec => {
    const region = set.region;
    if (!region.from || !region.partings) return set;
    const from = place({ list: 'sides', item: i }, region.from.vertex !== undefined);
    const kept = region.partings.map((p) => keptParting[p]).filter((p) => p >= 0);
    if (from && kept.length > 0) return { ...set, region: { partings: kept, from } };
    const why = !from ? 'its place on the side (region.from) could not be carried' : `its ${region.partings.length === 1 ? 'parting was' : 'partings were'} left out`;
    droppedSides.push({ path: `guideSets[${i}].region`, reason: `${why}, so the set grows on the whole surface` });
    return { ...set, region: { groups: [] } };
  };
  return {
    spec: {
      ...spec,
      field: { ...spec.field, singularities, partings, crests: curves('crests'), strokes },
      pins,
      ...(spec.guideSets ? { guideSets: spec.guideSets.map(side) } : {}),
    },
    droppedCurves,
    droppedStrokes,
    droppedSides,
  };
}
