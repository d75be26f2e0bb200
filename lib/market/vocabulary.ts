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

/**
 * Shown wherever money changes hands. It defers to the law and to a tax adviser where each person is,
 * and does not claim the market never collects tax: in some places the law puts that on a market.
 */
export const TAX_NOTE =
  'Prices are what the buyer pays. Where the law makes the market or its payment provider collect sales tax or VAT on a sale, ' +
  'it does; everything else — what you declare and how you invoice — follows the rules where you are and where the buyer is. ' +
  'Whorlwind does not give tax advice: ask a tax adviser where you are.';

/** Sign-up and checkout: who may pay and accept a licence depends on the law where the buyer lives. */
export const AGE_NOTE =
  'To pay and to accept a licence you must be old enough to do so where you live; if you are not, a parent or guardian must buy for you.';

/**
 * Checkout and the library: a right to cancel a digital purchase, and when it ends, is set by the law
 * where the buyer lives; in some places it ends once the download starts, and only if the buyer agreed
 * to that before paying.
 */
export const CANCELLATION_NOTE =
  'Whether you may cancel a purchase of digital files, and for how long, depends on the law where you live. In some places that right ends once you start the download, but only if you agreed to it before paying. You can ask for a refund from your library at any time, with your reason.';

/** What the checkout's agreement means, said beside its check box. */
export const WAIVER_AGREEMENT =
  'I want the files at once: where the law where I live lets my right to cancel end once the download starts, I agree that it ends then.';
export const WITHOUT_WAIVER =
  'Without this agreement, where the law gives you a right to cancel, you keep it for its full period even after you download.';
