// POST: The seller takes a published (or submitted) listing off the market; buyers keep what they bought.
import { marketData, marketHandler, pathId } from '@/lib/market/http';
import { unlistListing } from '@/lib/market/listings';
import type { ListingSummary } from '@/lib/market/types';

export function POST(_request: Request, { params }: { params: Promise<{ id: string }> }) {
  return marketHandler(['groomer'], async (actor) =>
    marketData<{ listing: ListingSummary }>({ listing: await unlistListing(actor, await pathId(params, 'id', 'listing')) }),
  );
}
