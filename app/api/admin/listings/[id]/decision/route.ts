// POST { approve, reason? }: an admin publishes or rejects (with a reason) a submitted listing;
// the seller is e-mailed. If the mail cannot be sent, nothing changes (502 mail-failed).
import { handler, jsonData, pathId, readBody } from '@/lib/http/server';
import { notFound } from '@/lib/market/errors';
import { decideListing } from '@/lib/market/listings';
import type { DecisionResponse } from '@/lib/market/types';
import { decisionSchema } from '@/lib/market/validation';

export function POST(request: Request, { params }: { params: Promise<{ id: string }> }) {
  return handler(['admin'], async (actor) => {
    const id = await pathId(params, 'id', notFound('listing'));
    const decision = await readBody(request, decisionSchema);
    return jsonData<DecisionResponse>({ listing: await decideListing(actor, id, decision) });
  });
}
