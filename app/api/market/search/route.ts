// GET: the market's search — text, tag, price, format and guide-count filters, sort and pages.
// Anyone may search; only published listings are found.
import { handler, jsonData, parseInput, queryOf } from '@/lib/http/server';
import { searchListings } from '@/lib/market/search';
import type { SearchResponse } from '@/lib/market/types';
import { searchSchema } from '@/lib/market/validation';

export function GET(request: Request) {
  return handler('none', async () => jsonData<SearchResponse>(await searchListings(parseInput(searchSchema, queryOf(request)))));
}
