/**
 * The curves of a request laid out and the pieces they cut the surface into, kept per prepared
 * surface for the curves last asked. Both are linear in the surface and depend on the curves
 * alone, so a request that moves a singularity or turns a twist — every step of a drag — takes
 * them as they were instead of building them again.
 */
import { layOutCurves, type CurveGeometry } from './curves';
import { cutIntoPieces, type SurfacePieces } from './pieces';
import type { CurveFeature } from './request';
import type { FieldSurface } from './surface';

export interface LaidOut {
  readonly curves: CurveGeometry;
  readonly cut: SurfacePieces;
}

const lastOf = new WeakMap<FieldSurface, { key: string; laidOut: LaidOut }>();

/**
 * `layOutCurves` and `cutIntoPieces` for these curves on this surface.
 *
 * Guarantees: the same values as calling both anew (the curves are compared by kind and vertices,
 * in order); the arrays returned are shared by every request with the same curves, so callers
 * must not change them (nothing in lib/field does); curves that cannot be laid out throw as
 * `layOutCurves` does, every time, and are not kept.
 */
export function laidOut(surface: FieldSurface, curves: readonly CurveFeature[]): LaidOut {
  const key = JSON.stringify(curves.map((c) => [c.kind, Array.from(c.vertices)]));
  const last = lastOf.get(surface);
  if (last?.key === key) return last.laidOut;
  const geometry = layOutCurves(surface, curves);
  const made = { curves: geometry, cut: cutIntoPieces(surface.topology, geometry, surface.boundary) };
  lastOf.set(surface, { key, laidOut: made });
  return made;
}
