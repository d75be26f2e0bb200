import type { GroomSpecInput } from './spec';

/**
 * Starting points for common coats, as the part of a spec they decide (centimetre units).
 *
 * A human scalp carries about 175–300 hairs per cm² (Barman, Astore & Pecoraro, "The normal
 * trichogram of the adult", J. Invest. Dermatol. 44:233, 1965). Guides are far sparser than hairs:
 * the renderer grows `hairsPerGuide` hairs around each guide, so the preset's hair density is
 * density × hairsPerGuide = 2.2 × 100 = 220 hairs per cm².
 */
export const HUMAN_SCALP_PRESET = {
  units: 'cm',
  guides: {
    density: 2.2,
    hairsPerGuide: 100,
    length: 12,
    lift: 12,
    droop: 0.7,
    curl: { amplitude: 0, wavelength: 2 },
    jitter: 0.15,
    pointsPerGuide: 24,
    width: 0.008,
  },
} as const satisfies Pick<GroomSpecInput, 'units' | 'guides'>;
