// Where the editor shows a feature on the surface: the vertex the last solve snapped it to when
// the solve still fits the spec, or its own point; and where the view looks to show it.
import type { GroomSpec } from '@/lib/groom/spec/spec';
import type { FeatureRef, Vec3 } from './features';
import type { OpenedSurface, SolveReport } from './protocol';

export interface SurfacePlace {
  readonly point: Vec3;
  readonly normal: Vec3;
}

/** Where a feature's marker stands: the vertex the last solve snapped it to, or its own point (its normal pointing away from the centre). */
export function placeOnSurface(surface: OpenedSurface, vertex: number | undefined, point: readonly number[] | undefined): SurfacePlace | null {
  if (vertex !== undefined && vertex >= 0 && vertex < surface.vertexCount) {
    const p = surface.positions;
    const n = surface.vertexNormals;
    return { point: [p[3 * vertex], p[3 * vertex + 1], p[3 * vertex + 2]], normal: [n[3 * vertex], n[3 * vertex + 1], n[3 * vertex + 2]] };
  }
  if (!point) return null;
  const d: Vec3 = [point[0] - surface.center[0], point[1] - surface.center[1], point[2] - surface.center[2]];
  return { point: [point[0], point[1], point[2]], normal: d };
}

/** Where the view should look to show a feature: its marker, or the middle point of a curve or stroke. */
export function featurePlace(surface: OpenedSurface, spec: GroomSpec, solve: SolveReport | null, feature: FeatureRef): SurfacePlace | null {
  switch (feature.kind) {
    case 'singularity':
      return placeOnSurface(surface, solve?.singularities.length === spec.field.singularities.length ? solve.singularities[feature.index]?.vertex : undefined, spec.field.singularities[feature.index]?.point);
    case 'pin':
      return placeOnSurface(surface, solve?.pinVertices.length === spec.pins.length ? solve.pinVertices[feature.index] : undefined, spec.pins[feature.index]?.point);
    case 'parting':
    case 'crest': {
      const curve = (feature.kind === 'parting' ? spec.field.partings : spec.field.crests)[feature.index];
      const points = curve?.points;
      return points ? placeOnSurface(surface, undefined, points[Math.floor(points.length / 2)]) : null;
    }
    case 'stroke': {
      const points = spec.field.strokes[feature.index]?.points;
      return points ? placeOnSurface(surface, undefined, points[Math.floor(points.length / 2)]) : null;
    }
  }
}
