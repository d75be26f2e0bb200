import { SKIN_QUERY_SIZE } from '../place/skin';
import { mirrorPoint, planeDistance, planeOfSymmetry, type MirrorPlane } from '../spec/symmetry';
import type { SymmetrySpec } from '../spec/spec';
import type { GroomSurface } from '../place/surface';
import type { Roots } from './roots';

/** Roots nearer the plane than this fraction of the bounding-box diagonal count as on it (kept once). */
const ON_PLANE_FRACTION = 1e-9;

/**
 * The plane growing mirrors across: the one the caller names, else the spec's `symmetry`, else
 * none (so every path that grows a spec — preview, exports, thumbnails, packages, the command
 * line — mirrors exactly when the spec says so).
 */
export function growthPlane(symmetry: SymmetrySpec | undefined, across?: MirrorPlane): MirrorPlane | undefined {
  return across ?? (symmetry ? planeOfSymmetry(symmetry) : undefined);
}

/** The number a root's random choices are keyed by: its source's for a mirror image, else its own. */
export function randomKey(mirrorOf: Int32Array | undefined, r: number): number {
  return mirrorOf && mirrorOf[r] >= 0 ? mirrorOf[r] : r;
}

/** Roots made mirror-symmetric, with each root's partner. */
export interface MirroredRoots extends Roots {
  /**
   * For a mirror image, the root it mirrors (always the one just before it); −1 for a root of the
   * positive side or of the plane. A mirror takes every random choice of the root it mirrors.
   */
  readonly mirrorOf: Int32Array;
}

/**
 * Roots made mirror-symmetric from one side. The sampler draws its candidates face by face from a
 * hash, so its roots are not symmetric even on a symmetric surface; this keeps the roots on the
 * plane's positive side (and those on the plane), in their order, each followed by its mirror
 * image: the surface point nearest the mirrored root, with its face and weights there. Roots on
 * the negative side are dropped.
 *
 * Guarantees: every kept root's mirror is the skin's closest point to its mirror image, so on a
 * surface that is its own mirror image the pair mirror each other to rounding; the order is fixed
 * by the roots' order (a root's mirror comes right after it).
 */
export function mirroredRoots(surface: GroomSurface, roots: Roots, plane: MirrorPlane): MirroredRoots {
  const tri = surface.mesh.triangles, p = surface.mesh.positions;
  const position: number[] = [], face: number[] = [], barycentric: number[] = [], mirrorOf: number[] = [];
  const out = new Float64Array(SKIN_QUERY_SIZE);
  const near = ON_PLANE_FRACTION * surface.diagonal;
  for (let r = 0; r < roots.count; r++) {
    const x = [roots.position[3 * r], roots.position[3 * r + 1], roots.position[3 * r + 2]];
    const d = planeDistance(plane, x);
    if (d < -near) continue;
    position.push(x[0], x[1], x[2]);
    face.push(roots.face[r]);
    mirrorOf.push(-1);
    barycentric.push(roots.barycentric[3 * r], roots.barycentric[3 * r + 1], roots.barycentric[3 * r + 2]);
    if (d <= near) continue;
    const m = mirrorPoint(plane, x);
    if (!surface.skin.closest(m[0], m[1], m[2], surface.diagonal, out)) continue;
    const f = out[7];
    position.push(out[0], out[1], out[2]);
    face.push(f);
    mirrorOf.push(face.length - 2);
    barycentric.push(...weightsIn(p, tri, f, out));
  }
  return { count: face.length, position: Float64Array.from(position), face: Uint32Array.from(face), barycentric: Float64Array.from(barycentric), mirrorOf: Int32Array.from(mirrorOf) };
}

/**
 * Each root's partner across the plane: a mirror's source, a source's mirror, and itself for a
 * root on the plane (or one whose mirror found no skin).
 *
 * Guarantees: partner(partner(r)) = r for every root.
 */
export function mirrorPartners(mirrorOf: Int32Array): Int32Array {
  const partner = Int32Array.from(mirrorOf, (m, r) => (m >= 0 ? m : r));
  for (let r = 0; r < mirrorOf.length; r++) if (mirrorOf[r] >= 0) partner[mirrorOf[r]] = r;
  return partner;
}

/**
 * The first roots, at most `most` of them, never splitting a pair (a mirror goes with its
 * source), so a capped count of mirrored roots stays mirror-symmetric.
 */
export function firstMirroredRoots(roots: MirroredRoots, most: number): MirroredRoots {
  if (roots.count <= most) return roots;
  let k = Math.max(0, most);
  while (k > 0 && roots.mirrorOf[k] >= 0) k--;
  return {
    count: k,
    position: roots.position.slice(0, 3 * k),
    face: roots.face.slice(0, k),
    barycentric: roots.barycentric.slice(0, 3 * k),
    mirrorOf: roots.mirrorOf.slice(0, k),
  };
}

/** Barycentric weights of a point of face f (on it, as the skin's closest point is), by sub-triangle areas. */
function weightsIn(p: Float64Array, tri: Uint32Array, f: number, q: Float64Array): [number, number, number] {
  const corner = (k: number) => [p[3 * tri[3 * f + k]], p[3 * tri[3 * f + k] + 1], p[3 * tri[3 * f + k] + 2]];
  const [a, b, c] = [corner(0), corner(1), corner(2)];
  const area = (u: number[], v: number[], w: readonly number[] | Float64Array) => {
    const e = [v[0] - u[0], v[1] - u[1], v[2] - u[2]], g = [w[0] - u[0], w[1] - u[1], w[2] - u[2]];
    return Math.hypot(e[1] * g[2] - e[2] * g[1], e[2] * g[0] - e[0] * g[2], e[0] * g[1] - e[1] * g[0]);
  };
  const wa = area(b, c, q), wb = area(c, a, q), wc = area(a, b, q);
  const total = wa + wb + wc;
  return total > 0 ? [wa / total, wb / total, wc / total] : [1 / 3, 1 / 3, 1 / 3];
}
