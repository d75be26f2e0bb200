import { PIN_ATTRIBUTES, type GroomSpec, type PinAttribute } from '../spec/spec';
import { vertexOfPlace } from './place';
import type { GroomSurface } from './surface';

/** Per-vertex factors of each pinned attribute; an attribute without pins is absent (factor 1 everywhere). */
export type PinnedFactors = Partial<Record<PinAttribute, Float64Array>>;

/**
 * Blends each attribute's pins over the surface (harmonically, by the field engine) into a factor
 * per vertex that multiplies the spec's global value.
 *
 * Guarantees: equal to each pin's value at its vertex, never negative, finite everywhere;
 * attributes without pins are left out. Pins are placed like singularities (GroomError with the
 * spec path for a bad place).
 */
export function blendPins(spec: GroomSpec, surface: GroomSurface): PinnedFactors {
  const out: PinnedFactors = {};
  for (const attribute of PIN_ATTRIBUTES) {
    const pins = spec.pins.flatMap((pin, i) => (pin.attribute === attribute ? [{ vertex: vertexOfPlace(surface, pin, `pins[${i}]`), value: pin.value }] : []));
    if (pins.length === 0) continue;
    const values = surface.harmonic().interpolate(pins);
    for (let v = 0; v < values.length; v++) values[v] = Math.max(0, values[v]);
    out[attribute] = values;
  }
  return out;
}
