// POST { reason }: the purchase's buyer asks for a refund; the request waits in the admins' refund
// queue (201). 404 for anyone else's purchase; 409 refunded, or refund-pending when a refund or an
// earlier request is still under way.
import { handler, jsonData, pathId, readBody } from '@/lib/http/server';
import { notFound } from '@/lib/market/errors';
import { requestRefund } from '@/lib/market/payments/refund-requests';
import type { RefundRequestResponse } from '@/lib/market/types';
import { refundRequestSchema } from '@/lib/market/validation';

export function POST(request: Request, { params }: { params: Promise<{ purchaseId: string }> }) {
  return handler(['buyer', 'groomer'], async (actor) => {
    const purchaseId = await pathId(params, 'purchaseId', notFound('purchase'));
    const { reason } = await readBody(request, refundRequestSchema);
    return jsonData<RefundRequestResponse>({ request: await requestRefund(actor, purchaseId, reason) }, 201);
  });
}
