// POST { answer }: an admin declines a waiting refund request; the buyer gets the answer by e-mail
// (502 mail-failed, and nothing changed, if it cannot be sent). 409 wrong-state if already answered.
// Refunding goes through POST /api/admin/purchases/[id]/refund, which closes the request.
import { HttpError } from '@/lib/http/errors';
import { handler, jsonData, pathId, readBody } from '@/lib/http/server';
import { declineRefundRequest } from '@/lib/market/payments/refund-requests';
import type { RefundDeclineResponse } from '@/lib/market/types';
import { refundDeclineSchema } from '@/lib/market/validation';

export function POST(request: Request, { params }: { params: Promise<{ id: string }> }) {
  return handler(['admin'], async (actor) => {
    const id = await pathId(params, 'id', new HttpError(404, 'not-found', 'There is no such refund request.'));
    const { answer } = await readBody(request, refundDeclineSchema);
    return jsonData<RefundDeclineResponse>({ request: await declineRefundRequest(actor, id, answer) });
  });
}
