// POST: a signed-in buyer (or groomer) opens the payment provider's hosted checkout for a
// published listing; the price comes from the database. 403 own-listing, 409 already-owned.
import { handler, jsonData, pathId } from '@/lib/http/server';
import { notFound } from '@/lib/market/errors';
import { startCheckout } from '@/lib/market/payments/checkout';
import type { CheckoutResponse } from '@/lib/market/types';

export function POST(_request: Request, { params }: { params: Promise<{ id: string }> }) {
  return handler(['buyer', 'groomer'], async (actor) => {
    const { url, sessionId } = await startCheckout(actor, await pathId(params, 'id', notFound('listing')));
    return jsonData<CheckoutResponse>({ url, sessionId });
  });
}
