// zod schemas of the market's inputs, shared by the route handlers and the market's forms.
import { z } from 'zod';
import {
  ANIMALS,
  BODY_REGIONS,
  COAT_LENGTHS,
  CURRENCIES,
  MAX_PRICE_CENTS,
  MIN_PRICE_CENTS,
  PACKAGE_FORMATS,
  SALES_BUCKETS,
  SEARCH_SORTS,
  STYLES,
} from './vocabulary';
import { FIELD_NEEDS_SURFACE, RIGHTS_REFUSED, SURFACE_CARRYING_FORMAT } from './rights';

const oneOf = <T extends readonly [string, ...string[]]>(values: T, what: string) =>
  z.enum(values, { error: `Choose ${what}: ${values.join(', ')}.` });

export const tagsSchema = z.object({
  animal: oneOf(ANIMALS, 'the animal'),
  coatLength: oneOf(COAT_LENGTHS, 'the coat length'),
  style: oneOf(STYLES, 'the style'),
  bodyRegion: oneOf(BODY_REGIONS, 'the body region'),
});

const title = z.string().trim().min(3, 'Give the preset a title of at least 3 characters.').max(120, 'Keep the title under 120 characters.');
const description = z
  .string()
  .trim()
  .min(20, 'Describe the preset in at least 20 characters: the coat, what it suits, what is in it.')
  .max(5000, 'Keep the description under 5000 characters.');
const priceCents = z
  .number({ error: 'Give the price in cents as a whole number.' })
  .int('Give the price in cents as a whole number.')
  .min(MIN_PRICE_CENTS, `The price must be at least ${MIN_PRICE_CENTS / 100}.00.`)
  .max(MAX_PRICE_CENTS, `The price must be at most ${(MAX_PRICE_CENTS / 100).toLocaleString('en-GB')}.00.`);
const currency = z
  .string()
  .transform((value) => value.toLowerCase())
  .pipe(oneOf(CURRENCIES, 'the currency'));
const licenceSlug = z.string().min(1, 'Choose a licence.').max(60);
const formats = z
  .array(oneOf(PACKAGE_FORMATS, 'file formats among'), { error: 'Choose the files the preset includes.' })
  .min(1, 'Include at least one file format.')
  .transform((values) => [...new Set(values)]);

// Listing versions and the seller's rights: every listing and every new version carries the
// seller's tick (rights.ts); the package ships the growth surface only when asked, and the field
// file, which holds the whole surface, only with it.
const rightsConfirmed = z.literal(true, { error: RIGHTS_REFUSED });
const shipsSurface = z.boolean({ error: 'Say whether the package ships your growth surface.' });

/** Whether `formats` may go without the surface; a field message on `formats` otherwise. */
export function surfaceRule(value: { formats?: readonly string[]; shipsSurface?: boolean }, context: z.RefinementCtx) {
  if (value.formats?.includes(SURFACE_CARRYING_FORMAT) && value.shipsSurface === false) {
    context.addIssue({ code: 'custom', path: ['formats'], message: FIELD_NEEDS_SURFACE });
  }
}

export const listingDraftSchema = z
  .object({
    groomId: z.uuid('Choose one of your grooms.'),
    versionId: z.uuid('Choose a saved version of the groom.'),
    title,
    description,
    tags: tagsSchema,
    priceCents,
    currency,
    licenceSlug,
    formats,
    rightsConfirmed,
    shipsSurface: shipsSurface.default(false),
  })
  .superRefine(surfaceRule);
export type ListingDraftInput = z.infer<typeof listingDraftSchema>;

/** PATCH: any of the draft's fields except the version it freezes; a changed surface tick comes with the rights tick again. */
export const listingPatchSchema = z
  .object({ title, description, tags: tagsSchema, priceCents, currency, licenceSlug, formats, rightsConfirmed, shipsSurface })
  .partial()
  .strict()
  .refine((value) => value.shipsSurface === undefined || value.rightsConfirmed === true, { path: ['rightsConfirmed'], message: RIGHTS_REFUSED });
export type ListingPatchInput = z.infer<typeof listingPatchSchema>;

/** POST /api/market/listings/[id]/versions: a newer groom version, with its description and files, for the listing's owners. */
export const listingVersionSchema = z
  .object({
    groomId: z.uuid('Choose one of your grooms.'),
    versionId: z.uuid('Choose a saved version of the groom.'),
    description,
    formats,
    notes: z.string().trim().max(2000, 'Keep the notes under 2000 characters.').default(''),
    rightsConfirmed,
    shipsSurface: shipsSurface.default(false),
  })
  .superRefine(surfaceRule);
export type ListingVersionInput = z.infer<typeof listingVersionSchema>;

export const decisionSchema = z
  .object({
    approve: z.boolean({ error: 'Say whether the listing is approved.' }),
    reason: z.string().trim().max(2000, 'Keep the reason under 2000 characters.').optional(),
  })
  .refine((value) => value.approve || (value.reason?.length ?? 0) >= 5, {
    path: ['reason'],
    message: 'Tell the seller why, in at least 5 characters.',
  });

export const refundSchema = z.object({ reason: z.string().trim().max(500, 'Keep the reason under 500 characters.').optional() });

export const reviewSchema = z.object({
  rating: z.number({ error: 'Rate it from 1 to 5.' }).int('Rate it from 1 to 5.').min(1, 'Rate it from 1 to 5.').max(5, 'Rate it from 1 to 5.'),
  body: z.string().trim().max(4000, 'Keep the review under 4000 characters.').default(''),
});

const intFromQuery = (name: string, min: number, max: number) =>
  z.coerce.number({ error: `${name} must be a whole number.` }).int(`${name} must be a whole number.`).min(min).max(max);
/** A measure (density in guides per cm², length in cm) from 0 up to `max`. */
const numberFromQuery = (name: string, unit: string, max: number) =>
  z.coerce
    .number({ error: `${name} must be a number (${unit}).` })
    .min(0, `${name} must not be below 0 ${unit}.`)
    .max(max, `${name} must be at most ${max.toLocaleString('en-GB')} ${unit}.`);
const listFromQuery = <T extends readonly [string, ...string[]]>(values: T, what: string) =>
  z
    .union([z.string(), z.array(z.string())])
    .transform((value) => (Array.isArray(value) ? value : value.split(',')).map((v) => v.trim()).filter(Boolean))
    .pipe(z.array(oneOf(values, what)));

export const searchSchema = z
  .object({
    q: z.string().trim().max(200, 'Keep the search under 200 characters.').optional(),
    animal: listFromQuery(ANIMALS, 'the animal').optional(),
    coatLength: listFromQuery(COAT_LENGTHS, 'the coat length').optional(),
    style: listFromQuery(STYLES, 'the style').optional(),
    bodyRegion: listFromQuery(BODY_REGIONS, 'the body region').optional(),
    format: listFromQuery(PACKAGE_FORMATS, 'file formats among').optional(),
    currency: currency.optional(),
    minPrice: intFromQuery('minPrice', 0, MAX_PRICE_CENTS).optional(),
    maxPrice: intFromQuery('maxPrice', 0, MAX_PRICE_CENTS).optional(),
    minDensity: numberFromQuery('minDensity', 'guides per cm²', 10_000).optional(),
    maxDensity: numberFromQuery('maxDensity', 'guides per cm²', 10_000).optional(),
    minLength: numberFromQuery('minLength', 'cm', 1_000_000).optional(),
    maxLength: numberFromQuery('maxLength', 'cm', 1_000_000).optional(),
    sort: oneOf(SEARCH_SORTS, 'the order').optional(),
    page: intFromQuery('page', 1, 10_000).default(1),
    pageSize: intFromQuery('pageSize', 1, 60).default(24),
  })
  .refine((v) => v.minPrice === undefined || v.maxPrice === undefined || v.minPrice <= v.maxPrice, {
    path: ['maxPrice'],
    message: 'The highest price must not be below the lowest.',
  })
  .refine((v) => v.minDensity === undefined || v.maxDensity === undefined || v.minDensity <= v.maxDensity, {
    path: ['maxDensity'],
    message: 'The highest density must not be below the lowest.',
  })
  .refine((v) => v.minLength === undefined || v.maxLength === undefined || v.minLength <= v.maxLength, {
    path: ['maxLength'],
    message: 'The longest length must not be below the shortest.',
  });
export type SearchInput = z.infer<typeof searchSchema>;

const day = z.iso.date('Give dates as YYYY-MM-DD.');
export const salesQuerySchema = z
  .object({
    from: day.optional(),
    to: day.optional(),
    bucket: oneOf(SALES_BUCKETS, 'the period').default('day'),
  })
  .refine((v) => !v.from || !v.to || v.from <= v.to, { path: ['to'], message: 'The end must not be before the start.' });
export type SalesQuery = z.infer<typeof salesQuerySchema>;

export const payoutSchema = z.object({ currency: currency.optional() });

// A buyer's refund request, an admin's answer declining one, and the checkout's agreement (words branch).
export const refundRequestSchema = z.object({
  reason: z
    .string({ error: 'Say why you ask for a refund.' })
    .trim()
    .min(10, 'Say why you ask for a refund, in at least 10 characters: what did not work for you?')
    .max(2000, 'Keep the reason under 2000 characters.'),
});
export type RefundRequestInput = z.infer<typeof refundRequestSchema>;

export const refundDeclineSchema = z.object({
  answer: z
    .string({ error: 'Tell the buyer why the refund is declined.' })
    .trim()
    .min(10, 'Tell the buyer why, in at least 10 characters: they get it by e-mail.')
    .max(2000, 'Keep the answer under 2000 characters.'),
});

export const checkoutSchema = z.object({
  /** The buyer agrees, before paying, that where the law lets a right to cancel end once the download starts, it ends then. */
  waiveCancellation: z.boolean({ error: 'Say whether you agree (true or false).' }).default(false),
});
export type CheckoutInput = z.infer<typeof checkoutSchema>;
// A buyer's own use of a preset (lib/market/fitting): which of their surfaces, and the new groom's name.
export const presetTransferSchema = z.object({ surfaceId: z.uuid('Choose one of your growth surfaces.') });
export const acceptFitSchema = z.object({
  name: z.string().trim().min(1, 'Give the groom a name.').max(200, 'Use a name of at most 200 characters.').optional(),
});
