// GET ?listingId=&email=: the latest purchases (200), for refunds.
import { z } from 'zod';
import { handler, jsonData, parseInput, queryOf } from '@/lib/http/server';
import { listPurchasesForAdmin } from '@/lib/market/payments/refunds';
import type { AdminPurchasesResponse } from '@/lib/market/types';

const querySchema = z.object({ listingId: z.uuid('Give a listing id.').optional(), email: z.string().trim().max(320).optional() });

export function GET(request: Request) {
  return handler(['admin'], async () =>
    jsonData<AdminPurchasesResponse>({ purchases: await listPurchasesForAdmin(parseInput(querySchema, queryOf(request))) }),
  );
}
