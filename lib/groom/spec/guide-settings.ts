import { z } from 'zod';

/**
 * One block of guide settings (the spec's `guides`, and each guide set's): how many guides, their
 * shape, tufts and waver, and the groom's points budget. lib/groom/README.md ("The groom spec")
 * documents each field; spec.ts puts the blocks into the spec.
 */

export const degrees = (low: number, high: number) => z.number().min(low).max(high);
export const size = z.number().positive().max(1e6);

/**
 * The hard budget of a groom: guides × points per guide. 4,000,000 points (250,000 guides of 16
 * points, 62,500 of 64) grow and write as USD text in about 650–850 MB, what a job worker with a
 * 1.5 GB budget holds with room to spare; see lib/groom/README.md, "Budgets", for the measurement.
 */
export const MAX_GUIDE_POINTS = 4_000_000;
/** Most guides, at the fewest points per guide (2). */
export const MAX_GUIDES = MAX_GUIDE_POINTS / 2;

/** The budget's words, shared by the schema (counts) and the grower (densities). */
export function guidePointsProblem(guides: number, pointsPerGuide: number): string | null {
  const points = guides * pointsPerGuide;
  if (points <= MAX_GUIDE_POINTS) return null;
  const fits = Math.floor(MAX_GUIDE_POINTS / pointsPerGuide);
  return (
    `${guides.toLocaleString('en')} guides × ${pointsPerGuide} points is ${points.toLocaleString('en')} points; a groom may have at most ` +
    `${MAX_GUIDE_POINTS.toLocaleString('en')} (at ${pointsPerGuide} points per guide, ${fits.toLocaleString('en')} guides). Lower the guide count or the points per guide.`
  );
}

/** The tip's width as a share of the root's when the spec gives none (what every guide had before version 3). */
export const TIP_TAPER = 0.2;

export const guideAmount = {
  density: z.number().positive().max(10_000).optional(),
  count: z.int().min(1).max(MAX_GUIDES).optional(),
};

export function notBothAmounts(value: { density?: number; count?: number }, ctx: z.RefinementCtx): void {
  if (value.density !== undefined && value.count !== undefined) {
    ctx.addIssue({ code: 'custom', message: 'give either "density" or "count", not both' });
  }
}

/**
 * How strongly a guide is drawn onto its tuft's centre curve along its length: the share of the
 * way at the root and at the tip, with `rise` shaping the curve between them (the share at
 * s ∈ [0, 1] along the guide is root + (tip − root) · s^rise; 1 is a straight ramp, more holds the
 * guide free longer and closes the tuft near the tip).
 */
const gatherSchema = z.strictObject({
  root: z.number().min(0).max(1).default(0),
  tip: z.number().min(0).max(1).default(0.8),
  rise: z.number().min(0.1).max(10).default(1),
});

/** One level of tufts: centres sampled over the growth area at `density` per cm², and the draw toward them. */
const tuftLevelSchema = z.strictObject({
  density: z.number().positive().max(10_000),
  gather: gatherSchema.prefault({}),
});

/** Guides gathered into tufts, optionally split again into finer tufts inside each one. */
const tuftsSchema = z.strictObject({
  ...tuftLevelSchema.shape,
  inner: tuftLevelSchema.optional(),
  /** Share (0–1) of guides, chosen by the seed, that keep out of every tuft. */
  loners: z.number().min(0).max(1).default(0),
});

/** A wander of each guide off its combed line: smooth noise across the guide, growing from the root. */
const waverSchema = z.strictObject({
  /** Largest sideways wander, in units, reached at the tip. */
  amplitude: z.number().min(0).max(1e6),
  /** Waves of the noise along one guide's length. */
  waves: z.number().min(0).max(64).default(3),
});

export const guidesSchemaV3 = z
  .strictObject({
    ...guideAmount,
    regions: z.array(z.string().min(1).max(200)).max(1000).default([]),
    length: size.optional(),
    lift: degrees(0, 90).default(20),
    droop: z.number().min(0).max(1).default(0.3),
    curl: z.strictObject({ amplitude: z.number().min(0).max(1e6).optional(), wavelength: size.optional() }).prefault({}),
    jitter: z.number().min(0).max(1).default(0.1),
    pointsPerGuide: z.int().min(2).max(64).default(16),
    seed: z.int().min(0).max(2 ** 32 - 1).default(1),
    width: size.optional(),
    tipWidth: z.number().min(0).max(1e6).optional(),
    hairsPerGuide: z.int().min(1).max(100_000).default(100),
    tufts: tuftsSchema.optional(),
    waver: waverSchema.optional(),
  })
  .superRefine(notBothAmounts)
  .superRefine((value, ctx) => {
    const problem = value.count === undefined ? null : guidePointsProblem(value.count, value.pointsPerGuide);
    if (problem) ctx.addIssue({ code: 'custom', path: ['count'], message: problem });
  });

export type GuidesInput = z.output<typeof guidesSchemaV3>;

/** The bounds a number field of the schema accepts; `above` when the lower bound itself is refused (`positive()`). */
export interface SettingRange {
  readonly min: number;
  readonly max: number;
  readonly above: boolean;
}

/** Reads a number's bounds off its zod schema (through `.default`/`.optional`), so a form's ranges are the schema's own. */
function rangeOf(schema: z.ZodType): SettingRange {
  let inner: z.ZodType = schema;
  while (inner instanceof z.ZodDefault || inner instanceof z.ZodOptional || inner instanceof z.ZodPrefault) inner = inner.unwrap() as z.ZodType;
  if (!(inner instanceof z.ZodNumber)) throw new Error('rangeOf: not a number schema');
  const checks = (inner.def.checks ?? []) as unknown as { _zod: { def: { check: string; value: number; inclusive: boolean } } }[];
  const low = checks.map((c) => c._zod.def).find((d) => d.check === 'greater_than');
  return { min: inner.minValue ?? -Infinity, max: inner.maxValue ?? Infinity, above: low ? !low.inclusive : false };
}

/**
 * The ranges of the coat's shaping settings, read from the schema above: the editor's fields refuse
 * what the spec would, in the same bounds, and cannot drift from it.
 */
export const COAT_SETTING_RANGES = {
  width: rangeOf(size),
  tipWidth: rangeOf(guidesSchemaV3.shape.tipWidth),
  tuftDensity: rangeOf(tuftLevelSchema.shape.density),
  gatherRoot: rangeOf(gatherSchema.shape.root),
  gatherTip: rangeOf(gatherSchema.shape.tip),
  gatherRise: rangeOf(gatherSchema.shape.rise),
  loners: rangeOf(tuftsSchema.shape.loners),
  waverAmplitude: rangeOf(waverSchema.shape.amplitude),
  waverWaves: rangeOf(waverSchema.shape.waves),
} as const;

/** The defaults the schema fills in a tuft level's gather, and a waver's waves (what a new tuft level or waver starts from). */
export const GATHER_DEFAULTS = gatherSchema.parse({});
export const WAVER_WAVES_DEFAULT = waverSchema.shape.waves.parse(undefined);

/** Fills the guide settings' defaults that depend on the units, so the written spec states every decision. */
export function resolveGuides(g: GuidesInput, perCm: number) {
  const length = g.length ?? 2 * perCm;
  const amount = g.count !== undefined ? { count: g.count } : { density: g.density ?? 1 };
  const width = g.width ?? 0.01 * perCm;
  return {
    ...amount,
    regions: g.regions,
    length,
    lift: g.lift,
    droop: g.droop,
    curl: { amplitude: g.curl.amplitude ?? 0, wavelength: g.curl.wavelength ?? perCm },
    jitter: g.jitter,
    pointsPerGuide: g.pointsPerGuide,
    seed: g.seed,
    width,
    tipWidth: g.tipWidth ?? width * TIP_TAPER,
    hairsPerGuide: g.hairsPerGuide,
    ...(g.tufts ? { tufts: g.tufts } : {}),
    ...(g.waver ? { waver: g.waver } : {}),
  };
}
