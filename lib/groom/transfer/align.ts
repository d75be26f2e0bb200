import { GroomError } from '../errors';
import { CENTIMETRES_PER_UNIT, type GroomSpec, type Unit } from '../spec/spec';

/**
 * How one surface's space is laid onto another's: x ↦ scale · R x + t. Built from the declared
 * units and up axes first, then a similarity fit — of the bounding boxes, or of landmark pairs
 * the groomer picked (Horn's closed form).
 */
export interface Alignment {
  /** `features`: fitted afterwards to the carried features themselves (a transfer by polygon or UV). */
  readonly kind: 'bounding-box' | 'landmarks' | 'features';
  readonly scale: number;
  /** Row-major 3 × 3 rotation. */
  readonly rotation: readonly number[];
  readonly translation: readonly [number, number, number];
  /** Root mean square distance between mapped and target landmarks, in the new surface's units (landmarks only). */
  readonly landmarkError?: number;
}

export interface AlignedSpace {
  readonly units: Unit;
  readonly upAxis: GroomSpec['upAxis'];
  readonly positions: Float64Array;
}

/** A landmark pair: the same place on the old surface and on the new one, each in its own file's coordinates. */
export interface LandmarkPair {
  readonly from: readonly [number, number, number];
  readonly to: readonly [number, number, number];
}

/** Below this ratio of the landmarks' second to first spread they are taken as one line. */
const COLLINEAR_RATIO = 1e-2;

/** Applies an alignment to a point. */
export function alignPoint(a: Alignment, p: readonly number[]): [number, number, number] {
  const r = a.rotation;
  return [0, 1, 2].map((i) => a.scale * (r[3 * i] * p[0] + r[3 * i + 1] * p[1] + r[3 * i + 2] * p[2]) + a.translation[i]) as [number, number, number];
}

/** Turns a direction by an alignment's rotation (no scale, no translation). */
export function alignDirection(a: Alignment, d: readonly number[]): [number, number, number] {
  const r = a.rotation;
  return [0, 1, 2].map((i) => r[3 * i] * d[0] + r[3 * i + 1] * d[1] + r[3 * i + 2] * d[2]) as [number, number, number];
}

/** The rotation taking one up axis to another (a quarter turn about x, right-handed), row-major. */
function upRotation(from: GroomSpec['upAxis'], to: GroomSpec['upAxis']): number[] {
  if (from === to) return [1, 0, 0, 0, 1, 0, 0, 0, 1];
  // y up → z up: (x, y, z) ↦ (x, −z, y); z up → y up is its inverse.
  return from === 'y' ? [1, 0, 0, 0, 0, -1, 0, 1, 0] : [1, 0, 0, 0, 0, 1, 0, -1, 0];
}

function multiply(a: readonly number[], b: readonly number[]): number[] {
  const out = new Array<number>(9).fill(0);
  for (let i = 0; i < 3; i++) for (let j = 0; j < 3; j++) for (let k = 0; k < 3; k++) out[3 * i + j] += a[3 * i + k] * b[3 * k + j];
  return out;
}

function box(positions: Float64Array): { centre: number[]; diagonal: number } {
  const lo = [Infinity, Infinity, Infinity], hi = [-Infinity, -Infinity, -Infinity];
  for (let v = 0; v < positions.length / 3; v++) {
    for (let k = 0; k < 3; k++) {
      lo[k] = Math.min(lo[k], positions[3 * v + k]);
      hi[k] = Math.max(hi[k], positions[3 * v + k]);
    }
  }
  return { centre: [0, 1, 2].map((k) => (lo[k] + hi[k]) / 2), diagonal: Math.hypot(hi[0] - lo[0], hi[1] - lo[1], hi[2] - lo[2]) };
}

/**
 * Lays the old surface onto the new one. Without landmarks: the units' ratio and the up axes turn
 * the old space, then the bounding boxes' centres are matched and their diagonals scaled alike (no
 * further turn — a character turned in its file needs landmarks). With three or more landmark
 * pairs: the least-squares similarity (Horn, "Closed-form solution of absolute orientation using
 * unit quaternions", JOSA A 4(4), 1987; the scale as in Umeyama, IEEE TPAMI 13(4), 1991).
 *
 * Guarantees: a proper rotation (determinant +1) and a positive scale; a GroomError
 * `too-few-landmarks` for one or two pairs and `collinear-landmarks` when either side's
 * landmarks lie (nearly) on one line, naming them — they cannot fix a turn about that line.
 */
export function alignSurfaces(from: AlignedSpace, to: AlignedSpace, landmarks: readonly LandmarkPair[] = []): Alignment {
  const unitScale = CENTIMETRES_PER_UNIT[from.units] / CENTIMETRES_PER_UNIT[to.units];
  const up = upRotation(from.upAxis, to.upAxis);
  if (landmarks.length === 0) {
    const a = box(from.positions), b = box(to.positions);
    const pre: Alignment = { kind: 'bounding-box', scale: unitScale, rotation: up, translation: [0, 0, 0] };
    const centre = alignPoint(pre, a.centre);
    const scale = a.diagonal > 0 && b.diagonal > 0 ? b.diagonal / a.diagonal : unitScale;
    const fit = scale / unitScale;
    return { kind: 'bounding-box', scale, rotation: up, translation: [0, 1, 2].map((k) => b.centre[k] - fit * centre[k]) as [number, number, number] };
  }
  if (landmarks.length < 3) {
    throw new GroomError('too-few-landmarks', `An alignment by landmarks needs at least three pairs; ${landmarks.length} ${landmarks.length === 1 ? 'was' : 'were'} given.`, 'landmarks');
  }
  for (const side of ['from', 'to'] as const) {
    const points = landmarks.map((l) => l[side]);
    if (!points.every((p) => p.every(Number.isFinite))) throw new GroomError('bad-landmarks', `landmarks: a ${side === 'from' ? 'old' : 'new'} surface point is not finite.`, 'landmarks');
    const spread = spreadOf(points);
    if (!(spread[1] > COLLINEAR_RATIO * spread[0])) {
      throw new GroomError(
        'collinear-landmarks',
        `landmarks: the ${landmarks.length} ${side === 'from' ? 'old' : 'new'} surface points lie on one line (or on one point), so they cannot say how the surface is turned about it; pick at least three that make a triangle.`,
        'landmarks',
      );
    }
  }
  return hornFit(landmarks);
}

/** Square roots of the eigenvalues of the points' scatter matrix, largest first. */
function spreadOf(points: readonly (readonly number[])[]): number[] {
  const c = [0, 1, 2].map((k) => points.reduce((s, p) => s + p[k], 0) / points.length);
  const m = new Array<number>(9).fill(0);
  for (const p of points) for (let i = 0; i < 3; i++) for (let j = 0; j < 3; j++) m[3 * i + j] += (p[i] - c[i]) * (p[j] - c[j]);
  return jacobiEigen(m, 3).values.map((v) => Math.sqrt(Math.max(0, v))).sort((a, b) => b - a);
}

function hornFit(landmarks: readonly LandmarkPair[]): Alignment {
  const n = landmarks.length;
  const ca = [0, 1, 2].map((k) => landmarks.reduce((s, l) => s + l.from[k], 0) / n);
  const cb = [0, 1, 2].map((k) => landmarks.reduce((s, l) => s + l.to[k], 0) / n);
  const S = new Array<number>(9).fill(0);
  let sumA = 0;
  for (const l of landmarks) {
    const a = [0, 1, 2].map((k) => l.from[k] - ca[k]);
    const b = [0, 1, 2].map((k) => l.to[k] - cb[k]);
    sumA += a[0] ** 2 + a[1] ** 2 + a[2] ** 2;
    for (let i = 0; i < 3; i++) for (let j = 0; j < 3; j++) S[3 * i + j] += a[i] * b[j];
  }
  const [xx, xy, xz, yx, yy, yz, zx, zy, zz] = S;
  // Horn's symmetric 4 × 4 matrix; its top eigenvector is the rotation's unit quaternion.
  const N = [
    xx + yy + zz, yz - zy, zx - xz, xy - yx,
    yz - zy, xx - yy - zz, xy + yx, zx + xz,
    zx - xz, xy + yx, -xx + yy - zz, yz + zy,
    xy - yx, zx + xz, yz + zy, -xx - yy + zz,
  ];
  const { values, vectors } = jacobiEigen(N, 4);
  let top = 0;
  for (let i = 1; i < 4; i++) if (values[i] > values[top]) top = i;
  const [w, x, y, z] = [0, 1, 2, 3].map((k) => vectors[4 * k + top]);
  const rotation = [
    w * w + x * x - y * y - z * z, 2 * (x * y - w * z), 2 * (x * z + w * y),
    2 * (x * y + w * z), w * w - x * x + y * y - z * z, 2 * (y * z - w * x),
    2 * (x * z - w * y), 2 * (y * z + w * x), w * w - x * x - y * y + z * z,
  ];
  let cross = 0;
  for (const l of landmarks) {
    const a = [0, 1, 2].map((k) => l.from[k] - ca[k]);
    const b = [0, 1, 2].map((k) => l.to[k] - cb[k]);
    for (let i = 0; i < 3; i++) cross += b[i] * (rotation[3 * i] * a[0] + rotation[3 * i + 1] * a[1] + rotation[3 * i + 2] * a[2]);
  }
  const scale = sumA > 0 ? cross / sumA : 1;
  const turned = [0, 1, 2].map((i) => rotation[3 * i] * ca[0] + rotation[3 * i + 1] * ca[1] + rotation[3 * i + 2] * ca[2]);
  const fit: Alignment = { kind: 'landmarks', scale, rotation, translation: [0, 1, 2].map((k) => cb[k] - scale * turned[k]) as [number, number, number] };
  let squared = 0;
  for (const l of landmarks) {
    const p = alignPoint(fit, l.from);
    squared += (p[0] - l.to[0]) ** 2 + (p[1] - l.to[1]) ** 2 + (p[2] - l.to[2]) ** 2;
  }
  return { ...fit, landmarkError: Math.sqrt(squared / n) };
}

/** Eigenvalues and eigenvectors (columns, row-major n × n) of a small symmetric matrix by cyclic Jacobi rotations. */
export function jacobiEigen(matrix: readonly number[], n: number): { values: number[]; vectors: number[] } {
  const a = [...matrix];
  const v = new Array<number>(n * n).fill(0);
  for (let i = 0; i < n; i++) v[i * n + i] = 1;
  for (let sweep = 0; sweep < 60; sweep++) {
    let off = 0;
    for (let p = 0; p < n; p++) for (let q = p + 1; q < n; q++) off += a[p * n + q] ** 2;
    if (off < 1e-30) break;
    for (let p = 0; p < n; p++) {
      for (let q = p + 1; q < n; q++) {
        const apq = a[p * n + q];
        if (Math.abs(apq) < 1e-300) continue;
        const theta = (a[q * n + q] - a[p * n + p]) / (2 * apq);
        const t = Math.sign(theta || 1) / (Math.abs(theta) + Math.sqrt(theta * theta + 1));
        const c = 1 / Math.sqrt(t * t + 1), s = t * c;
        for (let k = 0; k < n; k++) {
          const akp = a[k * n + p], akq = a[k * n + q];
          a[k * n + p] = c * akp - s * akq;
          a[k * n + q] = s * akp + c * akq;
        }
        for (let k = 0; k < n; k++) {
          const apk = a[p * n + k], aqk = a[q * n + k];
          a[p * n + k] = c * apk - s * aqk;
          a[q * n + k] = s * apk + c * aqk;
        }
        for (let k = 0; k < n; k++) {
          const vkp = v[k * n + p], vkq = v[k * n + q];
          v[k * n + p] = c * vkp - s * vkq;
          v[k * n + q] = s * vkp + c * vkq;
        }
      }
    }
  }
  return { values: Array.from({ length: n }, (_, i) => a[i * n + i]), vectors: v };
}
