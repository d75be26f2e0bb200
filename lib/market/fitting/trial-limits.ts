// How much of a coat a trial shows: the public preview's reduction (lib/groom's previewGuides and
// previewToGlb: bare glTF lines, no widths, no binding, no surface) with a trial's own limits, so
// that it is a look at the coat on the buyer's character, not a file that can stand in for the
// package's guides.
import type { PreviewLimits } from '../../groom';

/** The share of the listing's guides a trial may show (at most 5 %). */
export const TRIAL_GUIDE_SHARE = 0.05;
/** The most points per guide a trial shows. */
export const TRIAL_POINTS_PER_GUIDE = 8;

/**
 * A trial's limits: 5 % of the guides grown on the buyer's surface, and never more than 5 % of
 * the listing's own guide count (the buyer's surface may be larger and grow more), ≤ 8 points each.
 */
export function trialLimits(listingGuideCount: number): PreviewLimits {
  return { share: TRIAL_GUIDE_SHARE, pointsPerGuide: TRIAL_POINTS_PER_GUIDE, maxGuides: Math.floor(TRIAL_GUIDE_SHARE * listingGuideCount + 1e-9) };
}
