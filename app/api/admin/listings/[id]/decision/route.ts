// POST { approve, reason? }: an admin publishes or rejects (with a reason) a submitted listing;
// the seller is e-mailed. If the mail cannot be sent, nothing changes (502 mail-failed).
import { marketData, marketHandler, pathId, readBody } from '@/lib/market/http';
import { decideListing } from '@/lib/market/listings';
import type { ListingSummary } from '@/lib/market/types';
import { decisionSchema } from '@/lib/market/validation';

export function POST(request: Request, { params }: { params: Promise<{ id: string }> }) {
  return marketHandler(['admin'], async (actor) => {
    const id = await pathId(params, 'id', 'listing');
    const decision = await readBody(request, decisionSchema);
    return marketData<{ listing: ListingSummary }>({ listing: await decideListing(actor, id, decision) });
  });
}
