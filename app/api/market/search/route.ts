// GET: the market's search — text, tag, price, format and guide-count filters, sort and pages.
// Anyone may search; only published listings are found.
import { ensureWorkers, marketData, parseInput, plainMarketHandler, queryOf } from '@/lib/market/http';
import { searchListings } from '@/lib/market/search';
import type { SearchResponse } from '@/lib/market/types';
import { searchSchema } from '@/lib/market/validation';

export type { SearchResponse };

export function GET(request: Request) {
  ensureWorkers();
  return plainMarketHandler(async () => marketData<SearchResponse>(await searchListings(parseInput(searchSchema, queryOf(request)))));
}
