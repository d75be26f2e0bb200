import { vertexOfPlace } from './place';
import { mirrorCurvePoints, mirrorDirection, mirrorPinPoint, mirrorPoint, mirrorSingularityPoint, mirrorStroke, planeDistance, type MirrorPlane } from '../spec/symmetry';
import type { CurveSpec, GroomSpec, PinSpec, PlaceSpec, SingularitySpec, StrokeSpec } from '../spec/spec';
import type { GroomSurface } from './surface';

/**
 * A spec's features mirrored across a plane. A mirrored feature is always written by its points
 * (a `vertex` place becomes the point of that vertex, mirrored) and without `surface` positions:
 * the mirror names no polygon of the file until it is next carried (`withSurfacePositions`).
 *
 * The twist. `twist` with `handedness` is one signed angle o (counterclockwise seen from outside
 * positive), measured from a direction at the singular vertex: its `twistFrom` direction when it
 * has one, else the direction out of the vertex into its first face. A mirror reverses every
 * turning seen from outside, so the mirror's angle is −o measured from the mirror image of that
 * direction: the same `twist`, the other `handedness` (a clockwise spiral becomes an anticlockwise
 * one; outflow 0 and inflow 180 stay), and the mirrored direction written as the mirror's
 * `twistFrom`. The field engine then fixes the mirror's twist in the mirror image of the face it
 * fixes the original's in (lib/field connection/twist.ts chooses that face by the direction, not by
 * the face order), so a mirrored pair of twisted singularities of any index solves to a mirrored
 * field on a symmetric surface. The original is kept as it was.
 */

/** The point a place names (a vertex's own position for `vertex` places). */
export function pointOfPlace(surface: GroomSurface, place: PlaceSpec, path: string): [number, number, number] {
  if (place.point) return [place.point[0], place.point[1], place.point[2]];
  const v = vertexOfPlace(surface, place, path);
  const p = surface.mesh.positions;
  return [p[3 * v], p[3 * v + 1], p[3 * v + 2]];
}

/**
 * Whether a place lies on the plane as far as the surface can tell: its mirror image snaps to the
 * vertex it snaps to itself. Such places are not doubled.
 */
export function isOnPlane(surface: GroomSurface, plane: MirrorPlane, place: PlaceSpec, path = 'place'): boolean {
  const point = pointOfPlace(surface, place, path);
  return vertexOfPlace(surface, { point }, path) === vertexOfPlace(surface, { point: mirrorPoint(plane, point) }, path);
}

/**
 * The face a twist without `twistFrom` is fixed in at vertex v: its first face (lib/field's
 * `twistReference`), −1 for a vertex of no face. The editor's twin sides read it from the field
 * worker to state a mirror's `twistFrom` as `mirrorSingularity` does.
 */
export function twistFaceOf(surface: GroomSurface, v: number): number {
  const h = surface.field.topology.vertexHalfedge[v];
  return h < 0 ? -1 : (h / 3) | 0;
}

/** Direction from vertex v into its first face (the face the field's twist is fixed in). */
function outwardOfFirstFace(surface: GroomSurface, v: number): [number, number, number] {
  const f = twistFaceOf(surface, v);
  const p = surface.mesh.positions, tri = surface.field.topology.triangles;
  const out: [number, number, number] = [0, 0, 0];
  for (let k = 0; k < 3; k++) out[k] = (p[3 * tri[3 * f] + k] + p[3 * tri[3 * f + 1] + k] + p[3 * tri[3 * f + 2] + k]) / 3 - p[3 * v + k];
  return out;
}

export { mirrorStroke };

/**
 * The mirror image of a singularity: its point mirrored, its index kept (a reflection keeps every
 * index), its twist reversed as stated above.
 */
export function mirrorSingularity(surface: GroomSurface, plane: MirrorPlane, s: SingularitySpec, path = 'singularity'): SingularitySpec {
  const mirrored = mirrorSingularityPoint(plane, { ...s, vertex: undefined, point: pointOfPlace(surface, s, path) })!;
  if (s.twist === undefined) return mirrored;
  const from = s.twistFrom ?? outwardOfFirstFace(surface, vertexOfPlace(surface, s, path));
  return { ...mirrored, twistFrom: mirrorDirection(plane, from) };
}

/** The mirror image of a pin: its point mirrored, attribute and value kept. */
export function mirrorPin(surface: GroomSurface, plane: MirrorPlane, pin: PinSpec, path = 'pin'): PinSpec {
  return mirrorPinPoint(plane, { ...pin, vertex: undefined, point: pointOfPlace(surface, pin, path) })!;
}

function curvePoints(surface: GroomSurface, curve: CurveSpec, path: string): [number, number, number][] {
  return curve.points ? curve.points.map((p) => [p[0], p[1], p[2]]) : curve.vertices!.map((vertex, i) => pointOfPlace(surface, { vertex }, `${path}.vertices[${i}]`));
}

/** The mirror image of a parting or crest, point by point. */
export function mirrorCurve(surface: GroomSurface, plane: MirrorPlane, curve: CurveSpec, path = 'curve'): CurveSpec {
  return mirrorCurvePoints(plane, { points: curvePoints(surface, curve, path), closed: curve.closed })!;
}

/** Whether every point of a polyline lies on the plane (its mirror snaps to the same vertex). */
function polylineOnPlane(surface: GroomSurface, plane: MirrorPlane, points: readonly (readonly number[])[], path: string): boolean {
  return points.every((point) => isOnPlane(surface, plane, { point: [point[0], point[1], point[2]] }, path));
}

/**
 * The spec made symmetric from one side: every feature on the plane's positive side (a curve or
 * stroke by its first point) is kept and gains its mirror image; every feature on the plane itself
 * (see `isOnPlane`; a curve or stroke when all its points are) is kept once; features on the
 * negative side are dropped, their place taken by the mirrors. Mirrors follow the originals in
 * each list. Nothing else of the spec changes (growing does not depend on `symmetry`).
 *
 * Guarantees: the result's negative-side features are exactly the mirror images of its positive
 * side's; a GroomError names the path of a place the surface cannot hold.
 */
export function mirrorSpecFeatures(spec: GroomSpec, surface: GroomSurface, plane: MirrorPlane): GroomSpec {
  const side = (point: readonly number[]) => planeDistance(plane, point);
  const field = spec.field;
  const singularities: SingularitySpec[] = [];
  field.singularities.forEach((s, i) => {
    const path = `field.singularities[${i}]`;
    if (isOnPlane(surface, plane, s, path)) singularities.push(s);
    else if (side(pointOfPlace(surface, s, path)) > 0) singularities.push(s, mirrorSingularity(surface, plane, s, path));
  });
  const pins: PinSpec[] = [];
  spec.pins.forEach((pin, i) => {
    const path = `pins[${i}]`;
    if (isOnPlane(surface, plane, pin, path)) pins.push(pin);
    else if (side(pointOfPlace(surface, pin, path)) > 0) pins.push(pin, mirrorPin(surface, plane, pin, path));
  });
  const curves = (list: readonly CurveSpec[], name: string) => {
    const kept: CurveSpec[] = [];
    list.forEach((curve, i) => {
      const path = `field.${name}[${i}]`;
      const points = curvePoints(surface, curve, path);
      if (polylineOnPlane(surface, plane, points, path)) kept.push(curve);
      else if (side(points[0]) > 0) kept.push(curve, mirrorCurve(surface, plane, curve, path));
    });
    return kept;
  };
  const strokes: StrokeSpec[] = [];
  field.strokes.forEach((stroke, i) => {
    const path = `field.strokes[${i}]`;
    if (polylineOnPlane(surface, plane, stroke.points, path)) strokes.push(stroke);
    else if (side(stroke.points[0]) > 0) strokes.push(stroke, mirrorStroke(plane, stroke));
  });
  return { ...spec, field: { ...field, singularities, partings: curves(field.partings, 'partings'), crests: curves(field.crests, 'crests'), strokes }, pins };
}
