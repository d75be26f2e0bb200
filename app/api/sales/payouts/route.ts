// POST { currency? }: pays the seller's available balance (in one currency) to their account
// through the payment provider's transfers. GET: the payout history, newest first.
import { handler, jsonData, readBody } from '@/lib/http/server';
import { listPayouts, requestPayout } from '@/lib/market/payouts';
import type { PayoutResponse, PayoutsResponse } from '@/lib/market/types';
import { payoutSchema } from '@/lib/market/validation';

export function POST(request: Request) {
  return handler(['groomer'], async (actor) => {
    const { currency } = await readBody(request, payoutSchema);
    return jsonData<PayoutResponse>({ payout: await requestPayout(actor, currency) }, 201);
  });
}

export function GET() {
  return handler(['groomer'], async (actor) => jsonData<PayoutsResponse>({ payouts: await listPayouts(actor) }));
}
