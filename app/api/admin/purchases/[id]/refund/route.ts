// POST { reason? }: an admin refunds a purchase through the payment provider. The purchase stops
// downloading at once; the provider's charge.refunded webhook marks it refunded.
import { marketData, marketHandler, pathId, readBody } from '@/lib/market/http';
import { refundPurchase } from '@/lib/market/refunds';
import type { AdminPurchase } from '@/lib/market/types';
import { refundSchema } from '@/lib/market/validation';

export type RefundResponse = { purchase: AdminPurchase };

export function POST(request: Request, { params }: { params: Promise<{ id: string }> }) {
  return marketHandler(['admin'], async (actor) => {
    const id = await pathId(params, 'id', 'purchase');
    const { reason } = await readBody(request, refundSchema);
    return marketData<RefundResponse>({ purchase: await refundPurchase(actor, id, reason) });
  });
}
