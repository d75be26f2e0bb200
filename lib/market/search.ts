// The market's search: full text (PostgreSQL tsvector with a GIN index, weighted title > tags >
// description), filters on tags, price, currency, formats, guides per cm² and typical guide length
// (listing-facts.ts), sorting and pages —
// one query for the page and one for the count, both on published listings only (partial indexes).
// Answers are kept in memory under the market's search generation (see its migration), which
// grows with every change a result could show: a kept answer is reused only while nothing changed.
import type { Knex } from 'knex';
import { LRUCache } from 'lru-cache';
import { db } from '../platform/db';
import { cardOf, type ListingRow } from './listings';
import type { SearchResponse } from './types';
import type { SearchInput } from './validation';

const CARD_COLUMNS = [
  'l.id',
  'l.title',
  'l.price_cents',
  'l.currency',
  'l.animal',
  'l.coat_length',
  'l.style',
  'l.body_region',
  'l.formats',
  'l.guide_count',
  'l.facts',
  'l.sales_count',
  'l.rating_average',
  'l.rating_count',
  'l.seller_id',
  'l.published_at',
  'l.assets_status',
  'u.display_name as seller_name',
  'c.slug as licence_slug',
  'c.title as licence_title',
];

function applyFilters(query: Knex.QueryBuilder, input: SearchInput, hasText: boolean) {
  query.where('l.state', 'published');
  if (hasText) query.whereRaw(`l.search @@ websearch_to_tsquery('english', ?)`, [input.q!]);
  if (input.animal?.length) query.whereIn('l.animal', input.animal);
  if (input.coatLength?.length) query.whereIn('l.coat_length', input.coatLength);
  if (input.style?.length) query.whereIn('l.style', input.style);
  if (input.bodyRegion?.length) query.whereIn('l.body_region', input.bodyRegion);
  // Every chosen format must be in the package.
  if (input.format?.length) query.whereRaw('l.formats @> ?::text[]', [input.format]);
  if (input.currency) query.where('l.currency', input.currency);
  if (input.minPrice !== undefined) query.where('l.price_cents', '>=', input.minPrice);
  if (input.maxPrice !== undefined) query.where('l.price_cents', '<=', input.maxPrice);
  // Measures that mean the same on the buyer's character: density and length, not the guide count.
  if (input.minDensity !== undefined) query.where('l.guides_per_cm2', '>=', input.minDensity);
  if (input.maxDensity !== undefined) query.where('l.guides_per_cm2', '<=', input.maxDensity);
  if (input.minLength !== undefined) query.where('l.typical_length_cm', '>=', input.minLength);
  if (input.maxLength !== undefined) query.where('l.typical_length_cm', '<=', input.maxLength);
  return query;
}

/** How many different searches a server process keeps (common practice, no source: a few MB). */
const KEPT_SEARCHES = 1000;

const kept = new LRUCache<string, SearchResponse, SearchInput>({
  max: KEPT_SEARCHES,
  // Identical searches arriving together share one read of the database.
  fetchMethod: (_key, _stale, { context }) => readSearch(context),
});

/** The same search written two ways (filter lists in another order) gets the same key. */
function searchKey(generation: string, input: SearchInput): string {
  const entries = Object.entries(input)
    .filter(([, value]) => value !== undefined && value !== '')
    .map(([name, value]) => [name, Array.isArray(value) ? [...value].sort() : value] as const)
    .sort(([a], [b]) => (a < b ? -1 : 1));
  return `${generation}:${JSON.stringify(entries)}`;
}

/**
 * One page of published listings matching the search, with the total count. Never older than the
 * last committed change to a listing, seller name or licence when the call started.
 */
export async function searchListings(input: SearchInput): Promise<SearchResponse> {
  const { rows } = await db().raw<{ rows: { value: string }[] }>('SELECT value FROM market_search_generation');
  const answer = await kept.fetch(searchKey(rows[0].value, input), { context: input });
  return answer!;
}

async function readSearch(input: SearchInput): Promise<SearchResponse> {
  const hasText = Boolean(input.q && input.q.trim() !== '');
  const sort = input.sort ?? (hasText ? 'relevance' : 'newest');
  const page = applyFilters(
    db()('listings as l').join('users as u', 'u.id', 'l.seller_id').join('licences as c', 'c.id', 'l.licence_id').select(CARD_COLUMNS),
    input,
    hasText,
  );
  switch (sort) {
    case 'relevance':
      if (hasText) page.orderByRaw(`ts_rank_cd(l.search, websearch_to_tsquery('english', ?)) DESC`, [input.q!]);
      page.orderBy([{ column: 'l.published_at', order: 'desc' }, { column: 'l.id', order: 'desc' }]);
      break;
    case 'newest':
      page.orderBy([{ column: 'l.published_at', order: 'desc' }, { column: 'l.id', order: 'desc' }]);
      break;
    case 'best-selling':
      page.orderBy([{ column: 'l.sales_count', order: 'desc' }, { column: 'l.published_at', order: 'desc' }, { column: 'l.id', order: 'desc' }]);
      break;
    case 'rating':
      page.orderByRaw('l.rating_average DESC NULLS LAST, l.rating_count DESC, l.id DESC');
      break;
    case 'price-asc':
      page.orderBy([{ column: 'l.price_cents', order: 'asc' }, { column: 'l.id', order: 'asc' }]);
      break;
    case 'price-desc':
      page.orderBy([{ column: 'l.price_cents', order: 'desc' }, { column: 'l.id', order: 'desc' }]);
      break;
  }
  page.limit(input.pageSize).offset((input.page - 1) * input.pageSize);
  const count = applyFilters(db()('listings as l'), input, hasText).count<{ count: string }[]>('* as count');
  const [rows, [{ count: total }]] = await Promise.all([page, count]);
  return {
    results: (rows as (ListingRow & { seller_name: string; licence_slug: string; licence_title: string })[]).map(cardOf),
    total: Number(total),
    page: input.page,
    pageSize: input.pageSize,
  };
}
