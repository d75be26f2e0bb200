// POST { approve, reason? }: an admin puts a listing's update on sale (its owners get it free, with
// a notice and an e-mail) or sends it back with a reason. If the seller's mail cannot be sent, nothing changes (502).
import { handler, jsonData, pathId, readBody } from '@/lib/http/server';
import { notFound } from '@/lib/market/errors';
import { decideListingVersion } from '@/lib/market/listings';
import type { ListingVersionResponse } from '@/lib/market/types';
import { decisionSchema } from '@/lib/market/validation';

export function POST(request: Request, { params }: { params: Promise<{ id: string }> }) {
  return handler(['admin'], async (actor) => {
    const id = await pathId(params, 'id', notFound('listing version'));
    const decision = await readBody(request, decisionSchema);
    return jsonData<ListingVersionResponse>({ version: await decideListingVersion(actor, id, decision) });
  });
}
