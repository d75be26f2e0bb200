// GET ?state=submitted (default): the admins' moderation queue, oldest submission first.
import { z } from 'zod';
import { marketData, marketHandler, parseInput, queryOf } from '@/lib/market/http';
import { listListingsForAdmin } from '@/lib/market/listings';
import type { ListingSummary } from '@/lib/market/types';
import { LISTING_STATES } from '@/lib/market/vocabulary';

export type AdminListingsResponse = { listings: ListingSummary[] };

const querySchema = z.object({ state: z.enum(LISTING_STATES, { error: `Choose a state: ${LISTING_STATES.join(', ')}.` }).default('submitted') });

export function GET(request: Request) {
  return marketHandler(['admin'], async () => {
    const { state } = parseInput(querySchema, queryOf(request));
    return marketData<AdminListingsResponse>({ listings: await listListingsForAdmin(state) });
  });
}
