import { icosphere, torus, uvSphere } from './primitives';
import type { TriangleMesh, Vec3 } from '../../field';

/**
 * Growth surfaces of the demo studio's characters, made by code: each is a sphere or torus
 * pushed into shape vertex by vertex, so it stays manifold and keeps its faces wound outward,
 * with OBJ-style face groups for growth regions.
 */

const normalize = (v: readonly number[]): Vec3 => {
  const l = Math.hypot(v[0], v[1], v[2]);
  return [v[0] / l, v[1] / l, v[2] / l];
};
const dot = (a: readonly number[], b: readonly number[]) => a[0] * b[0] + a[1] * b[1] + a[2] * b[2];

function grouped(mesh: TriangleMesh, names: string[], groupOf: (centre: Vec3) => number): TriangleMesh {
  const nF = mesh.triangles.length / 3;
  const groupOfFace = new Uint16Array(nF);
  const p = mesh.positions;
  for (let f = 0; f < nF; f++) {
    const c: Vec3 = [0, 0, 0];
    for (let k = 0; k < 3; k++) for (let i = 0; i < 3; i++) c[i] += p[3 * mesh.triangles[3 * f + k] + i] / 3;
    groupOfFace[f] = groupOf(c);
  }
  return { ...mesh, groups: { names, groupOfFace } };
}

/** Bramble's head, in cm, Y up, facing +Z: a 6 cm skull with a muzzle and two pointed ears. */
export const FOX = {
  radius: 6,
  muzzle: normalize([0, -0.25, 1]),
  ears: [normalize([0.55, 0.8, 0.05]), normalize([-0.55, 0.8, 0.05])],
  /** The head's radius in the unit direction d, as a multiple of `radius`. */
  radial(d: readonly number[]): number {
    const muzzle = Math.max(0, dot(d, FOX.muzzle) - 0.55) / 0.45;
    const ear = Math.max(...FOX.ears.map((e) => Math.max(0, dot(d, e) - 0.9) / 0.1));
    return 1 + 0.55 * muzzle ** 1.5 + 0.8 * ear ** 2;
  },
  /** The surface point in the unit direction of v. */
  at(v: readonly number[]): Vec3 {
    const d = normalize(v);
    const r = FOX.radius * FOX.radial(d);
    return [0.92 * r * d[0], r * d[1], r * d[2]];
  },
};

/** Bramble the fox: a stylised head (genus 0). Groups: muzzle, ears, crown, neck. */
export function foxHead(level = 5): TriangleMesh {
  const mesh = icosphere(level, 1);
  const p = mesh.positions as Float64Array;
  for (let v = 0; v < p.length / 3; v++) {
    const q = FOX.at([p[3 * v], p[3 * v + 1], p[3 * v + 2]]);
    p[3 * v] = q[0]; p[3 * v + 1] = q[1]; p[3 * v + 2] = q[2];
  }
  return grouped(mesh, ['muzzle', 'ears', 'crown', 'neck'], (c) => {
    const d = normalize(c);
    if (FOX.ears.some((e) => dot(d, e) > 0.86)) return 1;
    if (dot(d, FOX.muzzle) > 0.6) return 0;
    return d[1] < -0.55 ? 3 : 2;
  });
}

const bump = (x: number, centre: number, width: number) => Math.exp(-0.5 * ((x - centre) / width) ** 2);
/** A bump in an angle, measured the short way round. */
const angleBump = (angle: number, centre: number, width: number) => bump(Math.atan2(Math.sin(angle - centre), Math.cos(angle - centre)), 0, width);

/**
 * Brisquette's body, in cm, Y up, nose toward +Z: a long body (44 cm nose to rump) with a round
 * head on a narrower neck, two ears, four legs and a tail lifted behind, so that it reads as a cat
 * from the front (the market's card picture) and not as a ball.
 */
export const CAT = {
  rings: 72,
  segments: 56,
  radii: [7, 6, 22] as const,
  /** The surface point at polar angle θ (0 at the nose, π at the tail's tip) and longitude φ (π/2 along the spine, −π/2 along the belly). */
  at(theta: number, phi: number): Vec3 {
    const [a, b, c] = CAT.radii;
    const t = theta / Math.PI;
    const s = Math.sin(theta);
    const raised = Math.max(0, Math.cos(theta) - 0.55) / 0.45;
    // The cross-section swells into the head and narrows at the neck.
    const girth = (1 - 0.3 * bump(t, 0.21, 0.045)) * (1 + 1.3 * bump(t, 0.06, 0.06));
    const ears = 3 * bump(t, 0.1, 0.028) * (angleBump(phi, Math.PI / 2 - 0.6, 0.28) + angleBump(phi, Math.PI / 2 + 0.6, 0.28));
    const legs = 10 * (bump(t, 0.32, 0.04) + bump(t, 0.76, 0.04)) * (angleBump(phi, -Math.PI / 2 - 0.62, 0.3) + angleBump(phi, -Math.PI / 2 + 0.62, 0.3));
    // The rear pole drawn out backwards and up; z falls with θ throughout, so the surface never folds.
    const tail = Math.max(0, (t - 0.84) / 0.16) ** 2;
    return [a * s * Math.cos(phi) * girth, b * s * Math.sin(phi) * girth + 3 * raised ** 2 + ears - legs + 7 * tail, c * Math.cos(theta) - 14 * tail];
  },
};

/** Brisquette the long-bodied cat (genus 0). Its spine is an edge line from nose to tail. Groups: head, back, belly. */
export function longCat(): TriangleMesh {
  const mesh = uvSphere(CAT.rings, CAT.segments, 1);
  const p = mesh.positions as Float64Array;
  for (let v = 0; v < p.length / 3; v++) {
    const theta = Math.acos(Math.max(-1, Math.min(1, p[3 * v + 2])));
    const phi = Math.atan2(p[3 * v + 1], p[3 * v]);
    const q = CAT.at(theta, phi);
    p[3 * v] = q[0]; p[3 * v + 1] = q[1]; p[3 * v + 2] = q[2];
  }
  return grouped(mesh, ['head', 'back', 'belly'], (c) => (c[2] > 0.6 * CAT.radii[2] ? 0 : c[1] > 0 ? 1 : 2));
}

/** Loop's ring, in mm, Z up: a plush torus 120 mm across (genus 1). */
export const RING = {
  major: 45,
  minor: 18,
  /** The surface point at angle u around the axis and v around the tube (v = 0 outermost, π/2 on top). */
  at(u: number, v: number): Vec3 {
    const w = RING.major + RING.minor * Math.cos(v);
    return [w * Math.cos(u), w * Math.sin(u), RING.minor * Math.sin(v)];
  },
};

/** Loop the plush ring toy (genus 1). Groups: top, underside. */
export function plushRing(): TriangleMesh {
  return grouped(torus(RING.major, RING.minor, 96, 40), ['top', 'underside'], (c) => (c[2] >= 0 ? 0 : 1));
}
