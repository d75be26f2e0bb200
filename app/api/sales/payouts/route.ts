// POST { currency? }: pays the seller's available balance (in one currency) to their account
// through the payment provider's transfers. GET: the payout history, newest first.
import { marketData, marketHandler, readBody } from '@/lib/market/http';
import { listPayouts, requestPayout } from '@/lib/market/sales';
import type { Payout } from '@/lib/market/types';
import { payoutSchema } from '@/lib/market/validation';

export type PayoutResponse = { payout: Payout };
export type PayoutsResponse = { payouts: Payout[] };

export function POST(request: Request) {
  return marketHandler(['groomer'], async (actor) => {
    const { currency } = await readBody(request, payoutSchema);
    return marketData<PayoutResponse>({ payout: await requestPayout(actor, currency) }, 201);
  });
}

export function GET() {
  return marketHandler(['groomer'], async (actor) => marketData<PayoutsResponse>({ payouts: await listPayouts(actor) }));
}
