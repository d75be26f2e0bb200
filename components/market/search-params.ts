// The market page's state lives in its URL: what was searched, the filters, the order and the
// page. One schema reads it, for the filter form (field messages as you type) and for the page
// (which reads the URL on the server and asks lib/market). Prices in the URL and the form are in
// the currency's main unit ("12.50"); lib/market's search takes cents.
import { z } from 'zod';
import type { SearchInput } from '@/lib/market/validation';
import {
  ANIMALS,
  BODY_REGIONS,
  COAT_LENGTHS,
  CURRENCIES,
  FORMAT_LABELS,
  PACKAGE_FORMATS,
  STYLES,
  type SearchSort,
} from '@/lib/market/vocabulary';

export const SORTS: readonly { value: SearchSort; label: string }[] = [
  { value: 'relevance', label: 'Best match' },
  { value: 'newest', label: 'Newest first' },
  { value: 'best-selling', label: 'Best-selling' },
  { value: 'rating', label: 'Best rated' },
  { value: 'price-asc', label: 'Price, low to high' },
  { value: 'price-desc', label: 'Price, high to low' },
];

export const TAG_KEYS = ['animal', 'coatLength', 'style', 'bodyRegion'] as const;
export type TagKey = (typeof TAG_KEYS)[number];
export const TAG_LABELS: Record<TagKey, string> = {
  animal: 'Animal',
  coatLength: 'Coat length',
  style: 'Style',
  bodyRegion: 'Body region',
};
export const TAG_VALUES = {
  animal: ANIMALS,
  coatLength: COAT_LENGTHS,
  style: STYLES,
  bodyRegion: BODY_REGIONS,
} as const;

/** A tag as people read it: "full-body" → "full body". */
export function tagLabel(value: string): string {
  return value.replace(/-/g, ' ');
}

export const FORMAT_CHOICES = PACKAGE_FORMATS.map((value) => ({ value, label: FORMAT_LABELS[value] }));
export const CURRENCY_CHOICES = CURRENCIES.map((value) => ({ value, label: value.toUpperCase() }));

const blankToUndefined = (value: unknown) => (typeof value === 'string' && value.trim() === '' ? undefined : value);

const optionalChoice = <T extends readonly [string, ...string[]]>(values: T, message: string) =>
  z.preprocess(blankToUndefined, z.enum(values, { error: message }).optional());

/** A price typed in the currency's main unit ("12", "12.5", "12.50") as whole cents. */
const optionalPrice = z.preprocess(
  blankToUndefined,
  z
    .string()
    .trim()
    .regex(/^\d{1,6}([.,]\d{1,2})?$/, 'Enter an amount such as 12 or 12.50.')
    .transform((value) => Math.round(Number(value.replace(',', '.')) * 100))
    .optional(),
);

/** A density (guides per cm²) or a length (cm) typed as "2", "2.5" or "2,5". */
const optionalMeasure = (example: string) =>
  z.preprocess(
    blankToUndefined,
    z
      .string()
      .trim()
      .regex(/^\d{1,6}([.,]\d{1,3})?$/, `Enter a number such as ${example}.`)
      .transform((value) => Number(value.replace(',', '.')))
      .optional(),
  );

export const marketQuerySchema = z
  .object({
    q: z.preprocess(blankToUndefined, z.string().trim().max(200, 'Search with at most 200 characters.').optional()),
    animal: optionalChoice(ANIMALS, 'Choose an animal from the list.'),
    coatLength: optionalChoice(COAT_LENGTHS, 'Choose a coat length from the list.'),
    style: optionalChoice(STYLES, 'Choose a style from the list.'),
    bodyRegion: optionalChoice(BODY_REGIONS, 'Choose a body region from the list.'),
    format: optionalChoice(PACKAGE_FORMATS, 'Choose a file format from the list.'),
    currency: optionalChoice(CURRENCIES, 'Choose a currency from the list.'),
    minPrice: optionalPrice,
    maxPrice: optionalPrice,
    minDensity: optionalMeasure('2 or 2.5'),
    maxDensity: optionalMeasure('2 or 2.5'),
    minLength: optionalMeasure('1 or 1.5'),
    maxLength: optionalMeasure('1 or 1.5'),
    sort: optionalChoice(SORTS.map((sort) => sort.value) as [SearchSort, ...SearchSort[]], 'Choose an order from the list.'),
  })
  .superRefine((query, context) => {
    if (query.minPrice !== undefined && query.maxPrice !== undefined && query.minPrice > query.maxPrice) {
      context.addIssue({ code: 'custom', path: ['maxPrice'], message: 'The highest price is below the lowest.' });
    }
    if (query.minDensity !== undefined && query.maxDensity !== undefined && query.minDensity > query.maxDensity) {
      context.addIssue({ code: 'custom', path: ['maxDensity'], message: 'The highest density is below the lowest.' });
    }
    if (query.minLength !== undefined && query.maxLength !== undefined && query.minLength > query.maxLength) {
      context.addIssue({ code: 'custom', path: ['maxLength'], message: 'The longest length is below the shortest.' });
    }
  });
export type MarketQuery = z.output<typeof marketQuerySchema> & { page: number };

export const PAGE_SIZE = 12;

type RawParams = Record<string, string | string[] | undefined>;

function first(value: string | string[] | undefined): string | undefined {
  return Array.isArray(value) ? value[0] : value;
}

/**
 * Reads the page's URL. A value that does not parse is left out (and named in `ignored`), so a
 * mistyped address still shows the market rather than an error.
 */
export function readMarketQuery(params: RawParams): { query: MarketQuery; ignored: string[] } {
  const raw: Record<string, string | undefined> = {};
  for (const key of Object.keys(marketQuerySchema.shape)) raw[key] = first(params[key]);
  const ignored: string[] = [];
  let result = marketQuerySchema.safeParse(raw);
  while (!result.success) {
    const key = String(result.error.issues[0]?.path[0] ?? '');
    if (!(key in raw) || raw[key] === undefined) break;
    ignored.push(key);
    raw[key] = undefined;
    result = marketQuerySchema.safeParse(raw);
  }
  const pageNumber = Number(first(params.page));
  const page = Number.isInteger(pageNumber) && pageNumber >= 1 && pageNumber <= 10_000 ? pageNumber : 1;
  return { query: { ...(result.success ? result.data : {}), page }, ignored };
}

/** The order used when none is chosen: best match for a search, newest otherwise. */
export function defaultSort(query: Pick<MarketQuery, 'q'>): SearchSort {
  return query.q ? 'relevance' : 'newest';
}

/** What lib/market's search is asked for this query. */
export function searchInputOf(query: MarketQuery): SearchInput {
  const one = <T>(value: T | undefined) => (value === undefined ? undefined : [value]);
  const sort = query.sort === 'relevance' && !query.q ? 'newest' : query.sort;
  return {
    q: query.q,
    animal: one(query.animal),
    coatLength: one(query.coatLength),
    style: one(query.style),
    bodyRegion: one(query.bodyRegion),
    format: one(query.format),
    currency: query.currency,
    minPrice: query.minPrice,
    maxPrice: query.maxPrice,
    minDensity: query.minDensity,
    maxDensity: query.maxDensity,
    minLength: query.minLength,
    maxLength: query.maxLength,
    sort: sort ?? defaultSort(query),
    page: query.page,
    pageSize: PAGE_SIZE,
  };
}

export function centsToText(cents: number): string {
  return cents % 100 === 0 ? String(cents / 100) : (cents / 100).toFixed(2);
}

/** The URL of the market for a query (defaults and empty values left out). */
export function marketHref(query: Partial<MarketQuery>): string {
  const params = new URLSearchParams();
  const set = (key: string, value: string | number | undefined) => {
    if (value !== undefined && value !== '') params.set(key, String(value));
  };
  set('q', query.q);
  for (const key of TAG_KEYS) set(key, query[key]);
  set('format', query.format);
  set('currency', query.currency);
  set('minPrice', query.minPrice === undefined ? undefined : centsToText(query.minPrice));
  set('maxPrice', query.maxPrice === undefined ? undefined : centsToText(query.maxPrice));
  set('minDensity', query.minDensity);
  set('maxDensity', query.maxDensity);
  set('minLength', query.minLength);
  set('maxLength', query.maxLength);
  if (query.sort && query.sort !== defaultSort(query)) set('sort', query.sort);
  if (query.page && query.page > 1) set('page', query.page);
  const text = params.toString();
  return text ? `/market?${text}` : '/market';
}
