// A listing's facts, made by the asset job from what it grew (lib/groom's coatFacts), the check of
// the seller's surface (lib/field's checkSurfaceFile, the same check whose facts the studio
// stores for the surface) and the public preview: what the listing page, the market API and the
// search filters read. The search filters on two of them, kept in columns of their own.
import type { SurfaceFacts } from '../field';
import { CENTIMETRES_PER_UNIT, type CoatFacts, type PreviewGuides } from '../groom';
import type { ListingFacts } from './types';

export type MeasuredListing = {
  facts: ListingFacts;
  /** Columns the search filters on: guides per cm², and the median guide length in cm. */
  guidesPerCm2: number;
  typicalLengthCm: number;
};

/**
 * The facts of a listing.
 *
 * Guarantees: every number is finite; the transfer by UV is offered only when the seller's surface
 * has UVs of which no triangle overlaps another (what lib/groom's transfer needs on both sides);
 * the transfer by alignment always (it needs nothing of either surface); typicalLengthCm is the
 * median guide length converted from the spec's units.
 */
export function measureListing(coat: CoatFacts, surface: SurfaceFacts, preview: Pick<PreviewGuides, 'count' | 'pointsPerGuide'>): MeasuredListing {
  const uvOverlappingFaces = surface.uvs.overlappingFaces.count;
  const facts: ListingFacts = {
    units: coat.units,
    upAxis: coat.upAxis,
    guidesPerCm2: coat.guidesPerSquareCm,
    hairsPerGuide: coat.hairsPerGuide,
    hairsPerCm2: coat.hairsPerSquareCm,
    growthAreaCm2: coat.growthAreaSquareCm,
    pointsPerGuide: coat.pointsPerGuide,
    length: { ...coat.length },
    regions: { expected: [...coat.regions], surface: [...coat.surfaceRegions] },
    surface: {
      faces: surface.faceCount,
      genus: surface.genus,
      openings: surface.boundaryLoopCount,
      pieces: surface.componentCount,
      uvs: surface.uvs.present,
      uvOverlappingFaces,
    },
    transfer: { uv: surface.uvs.present && uvOverlappingFaces === 0, alignment: true },
    preview: { guides: preview.count, pointsPerGuide: preview.pointsPerGuide },
  };
  return { facts, guidesPerCm2: coat.guidesPerSquareCm, typicalLengthCm: coat.length.median * CENTIMETRES_PER_UNIT[coat.units] };
}
