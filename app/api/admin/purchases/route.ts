// GET ?listingId=&email=: the latest purchases (200), for refunds.
import { z } from 'zod';
import { marketData, marketHandler, parseInput, queryOf } from '@/lib/market/http';
import { listPurchasesForAdmin } from '@/lib/market/refunds';
import type { AdminPurchase } from '@/lib/market/types';

export type AdminPurchasesResponse = { purchases: AdminPurchase[] };

const querySchema = z.object({ listingId: z.uuid('Give a listing id.').optional(), email: z.string().trim().max(320).optional() });

export function GET(request: Request) {
  return marketHandler(['admin'], async () =>
    marketData<AdminPurchasesResponse>({ purchases: await listPurchasesForAdmin(parseInput(querySchema, queryOf(request))) }),
  );
}
