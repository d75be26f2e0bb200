// Mirrored editing: with the spec's `symmetry` on, every feature edit is done on both sides of the
// plane as one edit. Partners are found by geometry, never stored: a feature's partner is the one
// of the same kind (and index, or pin attribute) whose points are its mirror image. So turning
// symmetry off leaves two independent features, and turning it on again pairs them again.
import { buildNearestVertex, type NearestVertex } from '@/lib/groom/place/nearest-vertex';
import type { CurveSpec, GroomSpec, PinSpec, SingularitySpec, StrokeSpec, SymmetrySpec } from '@/lib/groom/spec/spec';
import { mirrorCurvePoints, mirrorDirection, mirrorPinPoint, mirrorSingularityPoint, mirrorStroke, planeDistance, planeOfSymmetry, type MirrorPlane } from '@/lib/groom/spec/symmetry';
import type { FeatureKind, FeatureRef } from './features';
import type { OpenedSurface, TwistFaces } from './protocol';

/**
 * What twin sides read of the open surface: where a twist without `twistFrom` is fixed. A twist is
 * an angle measured from a direction at its vertex — its `twistFrom`, else the direction into the
 * vertex's first face — and the mirror of the first face need not be the mirror vertex's first
 * face, so a mirror stated by points alone is not the exact mirror image. With this the twin gets
 * the mirrored first-face direction as its `twistFrom`, as lib/groom's `mirrorSingularity` gives it.
 */
export interface TwinSurface {
  /** The welded vertex a point snaps to, as the worker snaps a spec's point (nearest; lowest number on a tie). */
  vertexOf(point: readonly number[]): number;
  /** The direction from vertex v into the face its twist is fixed in (to the face's centroid); null for a vertex of no face. */
  twistOrigin(v: number): [number, number, number] | null;
}

/**
 * The open surface as twin sides read it: the worker's positions and triangles (the prepared
 * surface's own, in its numbering) and its first faces (`twist-faces`). The nearest-vertex grid is
 * built at the first look-up. Guarantees: the vertex and the direction `mirrorSingularity` uses
 * for the same point on the same surface, bit for bit (the same arithmetic in the same order).
 */
export function twinSurfaceOf(opened: Pick<OpenedSurface, 'positions' | 'triangles'>, faces: TwistFaces): TwinSurface {
  const p = opened.positions, tri = opened.triangles;
  let nearest: NearestVertex | null = null;
  return {
    vertexOf(point) {
      nearest ??= buildNearestVertex(p);
      return nearest.find(point[0], point[1], point[2]).vertex;
    },
    twistOrigin(v) {
      const f = faces.firstFace[v];
      if (f === undefined || f < 0) return null;
      const out: [number, number, number] = [0, 0, 0];
      for (let k = 0; k < 3; k++) out[k] = (p[3 * tri[3 * f] + k] + p[3 * tri[3 * f + 1] + k] + p[3 * tri[3 * f + 2] + k]) / 3 - p[3 * v + k];
      return out;
    },
  };
}

export interface Mirror {
  readonly plane: MirrorPlane;
  /** Places nearer the plane than this (surface units) are on it: not doubled, no partner. */
  readonly seam: number;
  /** The open surface, when known: a twisted singularity's mirror then gets its exact `twistFrom`. */
  readonly surface?: TwinSurface;
}

/** A feature's value, whatever its kind. */
export type FeatureValue = SingularitySpec | PinSpec | CurveSpec | StrokeSpec;

/** The mirror the spec's `symmetry` asks for, on the open surface when it is given; null when symmetry is off. */
export function mirrorOf(spec: GroomSpec, surface?: TwinSurface | null): Mirror | null {
  return spec.symmetry ? { plane: planeOfSymmetry(spec.symmetry), seam: spec.symmetry.seam ?? 0, ...(surface ? { surface } : {}) } : null;
}

export function featureValue(spec: GroomSpec, ref: FeatureRef): FeatureValue | undefined {
  switch (ref.kind) {
    case 'singularity':
      return spec.field.singularities[ref.index];
    case 'parting':
      return spec.field.partings[ref.index];
    case 'crest':
      return spec.field.crests[ref.index];
    case 'stroke':
      return spec.field.strokes[ref.index];
    case 'pin':
      return spec.pins[ref.index];
  }
}

function featureCount(spec: GroomSpec, kind: FeatureKind): number {
  const lists = { singularity: spec.field.singularities, parting: spec.field.partings, crest: spec.field.crests, stroke: spec.field.strokes, pin: spec.pins };
  return lists[kind].length;
}

/** The points a feature is placed by; null for one placed by file vertices (its points need the surface). */
function pointsOf(kind: FeatureKind, value: FeatureValue): readonly (readonly number[])[] | null {
  if (kind === 'singularity' || kind === 'pin') {
    const point = (value as SingularitySpec | PinSpec).point;
    return point ? [point] : null;
  }
  return (value as CurveSpec | StrokeSpec).points ?? null;
}

function onPlane(mirror: Mirror, points: readonly (readonly number[])[]): boolean {
  return points.every((p) => Math.abs(planeDistance(mirror.plane, p)) <= mirror.seam);
}

/**
 * The mirror image of a feature (see lib/groom/spec/symmetry.ts: a whorl's twist kept with its
 * handedness reversed, curves and strokes point by point); null when it lies on the plane (every
 * point within the seam) or is placed by file vertices. A twisted singularity without `twistFrom`
 * gets, on a mirror that knows the surface, the mirror image of its first-face direction as its
 * twin's `twistFrom` — exactly the singularity lib/groom's `mirrorSingularity` makes.
 */
export function mirroredValue(mirror: Mirror, kind: FeatureKind, value: FeatureValue): FeatureValue | null {
  const points = pointsOf(kind, value);
  if (!points || onPlane(mirror, points)) return null;
  if (kind === 'singularity') return mirroredSingularity(mirror, value as SingularitySpec);
  if (kind === 'pin') return mirrorPinPoint(mirror.plane, value as PinSpec);
  if (kind === 'stroke') return mirrorStroke(mirror.plane, value as StrokeSpec);
  return mirrorCurvePoints(mirror.plane, value as CurveSpec);
}

function mirroredSingularity(mirror: Mirror, s: SingularitySpec): SingularitySpec {
  const image = mirrorSingularityPoint(mirror.plane, s)!;
  if (s.twist === undefined || s.twistFrom || !mirror.surface) return image;
  const from = mirror.surface.twistOrigin(mirror.surface.vertexOf(s.point!));
  return from ? { ...image, twistFrom: mirrorDirection(mirror.plane, from) } : image;
}

function sameKindOf(kind: FeatureKind, a: FeatureValue, b: FeatureValue): boolean {
  if (kind === 'singularity') return (a as SingularitySpec).index === (b as SingularitySpec).index;
  if (kind === 'pin') return (a as PinSpec).attribute === (b as PinSpec).attribute;
  if (kind === 'parting' || kind === 'crest') return (a as CurveSpec).closed === (b as CurveSpec).closed;
  return true;
}

/**
 * The feature's partner on the other side: the first other feature of the same kind (same index
 * for singularities, same attribute for pins) whose points are the mirror images of its points,
 * in order, each within the seam (or a millionth of the coordinates' size, for rounding). Null
 * when the feature is on the plane, is placed by file vertices, or has none.
 */
export function partnerOf(spec: GroomSpec, ref: FeatureRef, mirror: Mirror): number | null {
  const value = featureValue(spec, ref);
  if (!value) return null;
  const image = mirroredValue(mirror, ref.kind, value);
  const target = image && pointsOf(ref.kind, image);
  if (!image || !target) return null;
  for (let j = 0; j < featureCount(spec, ref.kind); j++) {
    if (j === ref.index) continue;
    const other = featureValue(spec, { kind: ref.kind, index: j })!;
    const points = pointsOf(ref.kind, other);
    if (!points || points.length !== target.length || !sameKindOf(ref.kind, value, other)) continue;
    const close = points.every((p, i) => {
      const q = target[i];
      const tolerance = Math.max(mirror.seam, 1e-6 * Math.max(1, Math.abs(q[0]), Math.abs(q[1]), Math.abs(q[2])));
      return Math.hypot(p[0] - q[0], p[1] - q[1], p[2] - q[2]) <= tolerance;
    });
    if (close) return j;
  }
  return null;
}

/**
 * The spec's `symmetry` for a found plane: by axis name when its normal is a world axis (to a
 * millionth), else by normal and offset; the seam as found (the surface's mean edge).
 */
export function symmetryOfPlane(found: { readonly normal: readonly number[]; readonly offset: number; readonly seam: number }): SymmetrySpec {
  const axis = [0, 1, 2].find((k) => Math.abs(Math.abs(found.normal[k]) - 1) < 1e-6);
  // Rounded to a millionth, and never −0 (which JSON writes as 0).
  const round = (x: number) => Math.round(x * 1e6) / 1e6 || 0;
  const seam = round(found.seam);
  if (axis !== undefined) return { axis: (['x', 'y', 'z'] as const)[axis], offset: round(found.offset * Math.sign(found.normal[axis])), seam };
  const [x, y, z] = found.normal;
  return { normal: [x, y, z], offset: found.offset, seam };
}

/** The plane in words: "x = 0", "z = 1.25", or "0.707x + 0.707y = 0". */
export function planeWords(symmetry: SymmetrySpec): string {
  const figure = (x: number) => String(Number(x.toFixed(3)) || 0);
  if ('axis' in symmetry) return `${symmetry.axis} = ${figure(symmetry.offset ?? 0)}`;
  const plane = planeOfSymmetry(symmetry);
  const terms = plane.normal.map((c, k) => (Math.abs(c) < 5e-4 ? null : `${figure(c)}${'xyz'[k]}`)).filter((t) => t !== null);
  return `${terms.join(' + ').replace(/\+ -/g, '− ')} = ${figure(plane.offset)}`;
}
