// POST: a signed-in buyer (or groomer) opens the payment provider's hosted checkout for a
// published listing; the price comes from the database. 403 own-listing, 409 already-owned.
import { startCheckout } from '@/lib/market/checkout';
import { marketData, marketHandler, pathId } from '@/lib/market/http';

export type CheckoutResponse = { url: string; sessionId: string };

export function POST(_request: Request, { params }: { params: Promise<{ id: string }> }) {
  return marketHandler(['buyer', 'groomer'], async (actor) => {
    const { url, sessionId } = await startCheckout(actor, await pathId(params, 'id', 'listing'));
    return marketData<CheckoutResponse>({ url, sessionId });
  });
}
