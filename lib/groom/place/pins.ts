import { PIN_ATTRIBUTES, type GroomSpec, type PinAttribute } from '../spec/spec';
import { geodesicDistances, vertexFaces, type VertexFaces } from './geodesic';
import { vertexOfPlace } from './place';
import type { GroomSurface } from './surface';

/** Per-vertex factors of each pinned attribute; an attribute without pins is absent (factor 1 everywhere). */
export type PinnedFactors = Partial<Record<PinAttribute, Float64Array>>;

/**
 * The power of the inverse distance in the blend's weights. 2 is Shepard's own choice (Shepard
 * 1968): the blend is flat at each pin (no cusp) and a far pin still counts.
 */
const POWER = 2;

/**
 * Blends pinned values over the surface by Shepard's inverse-distance weighting on distances along
 * the surface: at a vertex x, f(x) = Σ wᵢ vᵢ / Σ wᵢ with wᵢ = 1 / dᵢ(x)², dᵢ the geodesic distance
 * (fast marching, geodesic.ts) from pin i's vertex.
 *
 * Guarantees: equal to each pin's value at its vertex; a convex combination of the pins' values
 * everywhere (positive weights summing to one), so it never leaves [min vᵢ, max vᵢ] whatever the
 * triangles' shapes — the discrete maximum principle that a harmonic blend keeps only on meshes
 * without obtuse angles; a pin's share at a vertex depends only on the distances, which converge
 * as the mesh is refined, so the blend's reach does not shrink with the edge length. Vertices no
 * pin's piece of surface reaches take the pins' mean. Two pins on one vertex: the later wins.
 */
export function blendValues(surface: GroomSurface, around: VertexFaces, pins: readonly { vertex: number; value: number }[]): Float64Array {
  const nV = surface.mesh.positions.length / 3;
  const sum = new Float64Array(nV);
  const weight = new Float64Array(nV);
  const exact = new Float64Array(nV).fill(NaN);
  let mean = 0;
  for (const pin of pins) {
    mean += pin.value / pins.length;
    exact[pin.vertex] = pin.value;
    const d = geodesicDistances(surface.mesh, around, pin.vertex);
    for (let v = 0; v < nV; v++) {
      if (!(d[v] > 0) || d[v] === Infinity) continue;
      const w = d[v] ** -POWER;
      sum[v] += w * pin.value;
      weight[v] += w;
    }
  }
  const out = new Float64Array(nV);
  for (let v = 0; v < nV; v++) out[v] = !Number.isNaN(exact[v]) ? exact[v] : weight[v] > 0 ? sum[v] / weight[v] : mean;
  return out;
}

/**
 * Blends each attribute's pins over the surface into a factor per vertex that multiplies the
 * spec's global value (`blendValues`: bounded by the pins' values, the same reach at any mesh
 * resolution).
 *
 * Guarantees: equal to each pin's value at its vertex, within the pins' range everywhere, finite;
 * attributes without pins are left out. Pins are placed like singularities (GroomError with the
 * spec path for a bad place).
 */
export function blendPins(spec: GroomSpec, surface: GroomSurface): PinnedFactors {
  const out: PinnedFactors = {};
  let around: VertexFaces | undefined;
  for (const attribute of PIN_ATTRIBUTES) {
    const pins = spec.pins.flatMap((pin, i) => (pin.attribute === attribute ? [{ vertex: vertexOfPlace(surface, pin, `pins[${i}]`), value: pin.value }] : []));
    if (pins.length === 0) continue;
    around ??= vertexFaces(surface.mesh);
    out[attribute] = blendValues(surface, around, pins);
  }
  return out;
}
