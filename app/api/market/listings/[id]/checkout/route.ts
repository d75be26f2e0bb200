// POST: a signed-in buyer (or groomer) opens the payment provider's hosted checkout for a
// published listing; the price comes from the database. 403 own-listing, 409 already-owned.
// Body: `{ waiveCancellation?: boolean }`, the buyer's agreement kept with the checkout.
import { handler, jsonData, pathId, readBody } from '@/lib/http/server';
import { notFound } from '@/lib/market/errors';
import { startCheckout } from '@/lib/market/payments/checkout';
import type { CheckoutResponse } from '@/lib/market/types';
import { checkoutSchema } from '@/lib/market/validation';

export function POST(request: Request, { params }: { params: Promise<{ id: string }> }) {
  return handler(['buyer', 'groomer'], async (actor) => {
    const id = await pathId(params, 'id', notFound('listing'));
    const { waiveCancellation } = await readBody(request, checkoutSchema);
    const { url, sessionId } = await startCheckout(actor, id, { waiveCancellation });
    return jsonData<CheckoutResponse>({ url, sessionId });
  });
}
