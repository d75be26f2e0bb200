// What a grown coat is, in numbers that mean something on another character: guides and hairs
// per cm² of the area they grow on, their lengths, points per guide, the regions asked for. The
// guide count alone depends on the size of the mesh it was grown on; these do not.
import { growthMask } from '../place/regions';
import { setRegionMask } from '../place/set-region';
import type { GroomSurface } from '../place/surface';
import { CENTIMETRES_PER_UNIT, type GroomSpec, type Unit } from '../spec/spec';
import type { Guides } from './guides';

export interface CoatFacts {
  readonly units: Unit;
  readonly upAxis: 'y' | 'z';
  readonly guideCount: number;
  /** The area of the faces the guides may grow on (the spec's regions, or the whole surface), in cm². */
  readonly growthAreaSquareCm: number;
  /** guideCount / growthAreaSquareCm: the mean over that area (density pins make it vary within it). */
  readonly guidesPerSquareCm: number;
  readonly hairsPerGuide: number;
  /** guidesPerSquareCm × hairsPerGuide. */
  readonly hairsPerSquareCm: number;
  readonly pointsPerGuide: number;
  /** Lengths in the spec's units: the combed length it asks for, and the grown polylines' shortest, median and longest. */
  readonly length: { readonly combed: number; readonly shortest: number; readonly median: number; readonly longest: number };
  /** The regions (OBJ groups) the spec grows on; empty: the whole surface. */
  readonly regions: readonly string[];
  /** The regions the surface has, in file order. */
  readonly surfaceRegions: readonly string[];
}

/**
 * The coat's facts from the spec, the surface it grew on and its guides.
 *
 * Guarantees: areas are converted from the spec's declared units (cm per unit squared), whatever
 * the units; densities are means over the unweighted growth area, so a spec of `density` d
 * without density pins gives d up to the rounding of the guide count; lengths are the guides'
 * polyline lengths (curl and jitter included), 0 for a groom of no guides; a region the surface
 * lacks is a GroomError `unknown-region`, as when growing. With guide sets: the area is the union of
 * the sets' regions, hairs per guide and the combed length are means over the guides (weighted by
 * each set's count), and the regions are the sets' groups.
 */
export function coatFacts(surface: GroomSurface, spec: GroomSpec, guides: Guides): CoatFacts {
  // With guide sets, the union of their regions; hairs per guide, the mean over the guides.
  const masks = spec.guideSets ? spec.guideSets.map((set, i) => setRegionMask(surface, spec, set.region, `guideSets[${i}].region`)) : [growthMask(surface.mesh, spec.guides.regions)];
  let area = 0;
  for (let f = 0; f < surface.faceArea.length; f++) if (masks.some((m) => m[f])) area += surface.faceArea[f];
  const sets = guides.sets;
  const hairsPerGuide = sets && guides.count > 0 ? sets.reduce((sum, set) => sum + set.count * set.hairsPerGuide, 0) / guides.count : spec.guides.hairsPerGuide;
  const combed = spec.guideSets && guides.count > 0 ? spec.guideSets.reduce((sum, set, i) => sum + set.guides.length * (sets?.[i]?.count ?? 0), 0) / guides.count : spec.guides.length;
  const regions = spec.guideSets ? [...new Set(spec.guideSets.flatMap((set) => set.region.groups ?? []))] : spec.guides.regions;
  const growthAreaSquareCm = area * CENTIMETRES_PER_UNIT[spec.units] ** 2;
  const guidesPerSquareCm = growthAreaSquareCm > 0 ? guides.count / growthAreaSquareCm : 0;
  const sorted = Float64Array.from(guides.length).sort();
  const n = sorted.length;
  const median = n === 0 ? 0 : n % 2 === 1 ? sorted[(n - 1) / 2] : (sorted[n / 2 - 1] + sorted[n / 2]) / 2;
  return {
    units: spec.units,
    upAxis: spec.upAxis,
    guideCount: guides.count,
    growthAreaSquareCm,
    guidesPerSquareCm,
    hairsPerGuide,
    hairsPerSquareCm: guidesPerSquareCm * hairsPerGuide,
    pointsPerGuide: guides.pointsPerGuide,
    length: { combed, shortest: n ? sorted[0] : 0, median, longest: n ? sorted[n - 1] : 0 },
    regions: [...regions],
    surfaceRegions: [...(surface.mesh.groups?.names ?? [])],
  };
}
