import type { CurveSpec, PinSpec, SingularitySpec, StrokeSpec, SymmetrySpec } from './spec';

/**
 * A mirror plane: the points x with normal · x = offset, `normal` of unit length. Its positive side
 * (normal · x > offset) is the side features are mirrored from when a whole spec is mirrored.
 * Plain arithmetic on the spec's points, safe in the editor (the surface-aware parts are in
 * place/mirror-plane.ts and place/mirror-features.ts).
 */
export interface MirrorPlane {
  readonly normal: readonly [number, number, number];
  readonly offset: number;
}

type Point = [number, number, number];

/** The plane a spec's `symmetry` names: an axis name is the plane across that axis, `offset` along it. */
export function planeOfSymmetry(symmetry: SymmetrySpec): MirrorPlane {
  if ('axis' in symmetry) {
    const normal: Point = [0, 0, 0];
    normal['xyz'.indexOf(symmetry.axis)] = 1;
    return { normal, offset: symmetry.offset ?? 0 };
  }
  const [x, y, z] = symmetry.normal;
  const length = Math.hypot(x, y, z);
  return { normal: [x / length, y / length, z / length], offset: symmetry.offset / length };
}

/** Signed distance of p from the plane (positive on the normal's side). */
export function planeDistance(plane: MirrorPlane, p: readonly number[]): number {
  const n = plane.normal;
  return n[0] * p[0] + n[1] * p[1] + n[2] * p[2] - plane.offset;
}

/** The mirror image of a point. Guarantees: mirroring twice gives the point back (up to rounding). */
export function mirrorPoint(plane: MirrorPlane, p: readonly number[]): Point {
  const d = 2 * planeDistance(plane, p);
  const n = plane.normal;
  return [p[0] - d * n[0], p[1] - d * n[1], p[2] - d * n[2]];
}

/** The mirror image of a direction (the plane's offset does not move directions). */
export function mirrorDirection(plane: MirrorPlane, v: readonly number[]): Point {
  const n = plane.normal;
  const d = 2 * (n[0] * v[0] + n[1] * v[1] + n[2] * v[2]);
  return [v[0] - d * n[0], v[1] - d * n[1], v[2] - d * n[2]];
}

/**
 * The mirror image of a singularity placed by a point, by the whorl's rule: the point mirrored,
 * the index kept (a reflection keeps every index), the twist kept and its handedness reversed — a
 * mirror reverses every turning seen from outside, so a clockwise spiral becomes an anticlockwise
 * one (outflow 0 and inflow 180 look the same either way); a `twistFrom` direction is mirrored
 * too. Exact for a whorl, and for any index when the twist has a `twistFrom`; otherwise see
 * `mirrorSingularity` in place/mirror-features.ts, which states the mirror's twist exactly.
 * Null for a singularity placed by file vertex (its point needs the surface).
 */
export function mirrorSingularityPoint(plane: MirrorPlane, s: SingularitySpec): SingularitySpec | null {
  if (!s.point) return null;
  const handedness = s.handedness === 'clockwise' ? 'counterclockwise' : 'clockwise';
  return {
    point: mirrorPoint(plane, s.point),
    index: s.index,
    ...(s.twist !== undefined ? { twist: s.twist } : {}),
    handedness,
    ...(s.twistFrom ? { twistFrom: mirrorDirection(plane, s.twistFrom) } : {}),
  };
}

/** The mirror image of a pin placed by a point (null when placed by file vertex). */
export function mirrorPinPoint(plane: MirrorPlane, pin: PinSpec): PinSpec | null {
  return pin.point ? { attribute: pin.attribute, point: mirrorPoint(plane, pin.point), value: pin.value } : null;
}

/** The mirror image of a parting or crest drawn by points, point by point (null when by file vertices). */
export function mirrorCurvePoints(plane: MirrorPlane, curve: CurveSpec): CurveSpec | null {
  return curve.points ? { points: curve.points.map((p) => mirrorPoint(plane, p)), closed: curve.closed } : null;
}

/**
 * The mirror image of a stroke, point by point in the same order, so each of its directions (from
 * one point to the next) is the mirror image of the stroke's direction there.
 */
export function mirrorStroke(plane: MirrorPlane, stroke: StrokeSpec): StrokeSpec {
  return { points: stroke.points.map((p) => mirrorPoint(plane, p)) };
}
