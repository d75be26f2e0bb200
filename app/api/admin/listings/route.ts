// GET ?state=submitted (default): the admins' moderation queue, oldest submission first.
import { z } from 'zod';
import { handler, jsonData, parseInput, queryOf } from '@/lib/http/server';
import { listListingsForAdmin } from '@/lib/market/listings';
import type { AdminListingsResponse } from '@/lib/market/types';
import { LISTING_STATES } from '@/lib/market/vocabulary';

const querySchema = z.object({ state: z.enum(LISTING_STATES, { error: `Choose a state: ${LISTING_STATES.join(', ')}.` }).default('submitted') });

export function GET(request: Request) {
  return handler(['admin'], async () => {
    const { state } = parseInput(querySchema, queryOf(request));
    return jsonData<AdminListingsResponse>({ listings: await listListingsForAdmin(state) });
  });
}
