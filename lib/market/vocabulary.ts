// The market's fixed words: tag vocabularies, currencies, file formats, states and sort orders.
// Plain data, shared by the route handlers, the search and the market's pages (safe in the browser).
import { EXPORT_FORMAT_FACTS, EXPORT_FORMATS, type ExportFormat } from '../groom/export/formats';

export const ANIMALS = ['fox', 'cat', 'dog', 'wolf', 'bear', 'horse', 'deer', 'rabbit', 'rodent', 'bird', 'human', 'creature', 'toy'] as const;
export const COAT_LENGTHS = ['short', 'medium', 'long'] as const;
export const STYLES = ['natural', 'stylised', 'groomed', 'wild', 'plush'] as const;
export const BODY_REGIONS = ['full-body', 'head', 'face', 'scalp', 'torso', 'limbs', 'tail'] as const;

export type Animal = (typeof ANIMALS)[number];
export type CoatLength = (typeof COAT_LENGTHS)[number];
export type Style = (typeof STYLES)[number];
export type BodyRegion = (typeof BODY_REGIONS)[number];

export type ListingTags = { animal: Animal; coatLength: CoatLength; style: Style; bodyRegion: BodyRegion };

/** Currencies a price may be in (ISO 4217, lower case as the payment API writes them). */
export const CURRENCIES = ['eur', 'usd', 'gbp'] as const;
export type Currency = (typeof CURRENCIES)[number];

/** Prices in cents: at least 1.00 and at most 100,000.00 of the currency. */
export const MIN_PRICE_CENTS = 100;
export const MAX_PRICE_CENTS = 10_000_000;

/**
 * Files a preset can include: the studio's export formats (lib/groom's table). The package
 * always holds the licence text and a README besides.
 */
export const PACKAGE_FORMATS = EXPORT_FORMATS;
export type PackageFormat = ExportFormat;

export const FORMAT_LABELS = Object.fromEntries(PACKAGE_FORMATS.map((format) => [format, EXPORT_FORMAT_FACTS[format].label])) as Record<PackageFormat, string>;

export const LISTING_STATES = ['draft', 'submitted', 'published', 'rejected', 'unlisted'] as const;
export type ListingState = (typeof LISTING_STATES)[number];

export const SEARCH_SORTS = ['relevance', 'newest', 'best-selling', 'rating', 'price-asc', 'price-desc'] as const;
export type SearchSort = (typeof SEARCH_SORTS)[number];

export const SALES_BUCKETS = ['day', 'week', 'month'] as const;
export type SalesBucket = (typeof SALES_BUCKETS)[number];

/** A price with its currency, e.g. "24.00 EUR". */
export function formatPrice(cents: number, currency: string): string {
  const sign = cents < 0 ? '−' : '';
  const abs = Math.abs(cents);
  return `${sign}${Math.floor(abs / 100).toLocaleString('en-GB')}.${String(abs % 100).padStart(2, '0')} ${currency.toUpperCase()}`;
}

/** Shown wherever money changes hands. */
export const TAX_NOTE =
  'Prices are what the buyer pays. Taxes and invoicing follow the local rules of the seller and of the buyer; ' +
  'Whorlwind does not give tax advice.';
