// POST { reason? }: an admin refunds a purchase through the payment provider. The purchase stops
// downloading at once; the provider's charge.refunded webhook marks it refunded.
import { handler, jsonData, pathId, readBody } from '@/lib/http/server';
import { notFound } from '@/lib/market/errors';
import { refundPurchase } from '@/lib/market/payments/refunds';
import type { RefundResponse } from '@/lib/market/types';
import { refundSchema } from '@/lib/market/validation';

export function POST(request: Request, { params }: { params: Promise<{ id: string }> }) {
  return handler(['admin'], async (actor) => {
    const id = await pathId(params, 'id', notFound('purchase'));
    const { reason } = await readBody(request, refundSchema);
    return jsonData<RefundResponse>({ purchase: await refundPurchase(actor, id, reason) });
  });
}
