// POST: The seller sends a draft (or a rejected or unlisted listing) to the admins for approval.
import { marketData, marketHandler, pathId } from '@/lib/market/http';
import { submitListing } from '@/lib/market/listings';
import type { ListingSummary } from '@/lib/market/types';

export function POST(_request: Request, { params }: { params: Promise<{ id: string }> }) {
  return marketHandler(['groomer'], async (actor) =>
    marketData<{ listing: ListingSummary }>({ listing: await submitListing(actor, await pathId(params, 'id', 'listing')) }),
  );
}
