// GET: a listing's page data (published to anyone; any state to its seller and admins).
// PATCH: the seller changes a draft (or a rejected or unlisted listing, which becomes a draft).
import { marketData, marketHandler, pathId, publicMarketHandler, readBody } from '@/lib/market/http';
import { getListingDetail, updateListing } from '@/lib/market/listings';
import type { ListingDetail, ListingSummary } from '@/lib/market/types';
import { listingPatchSchema } from '@/lib/market/validation';

type Context = { params: Promise<{ id: string }> };
export type ListingResponse = { listing: ListingDetail };
export type UpdateListingResponse = { listing: ListingSummary };

export function GET(_request: Request, { params }: Context) {
  return publicMarketHandler(async (actor) => marketData<ListingResponse>({ listing: await getListingDetail(actor, await pathId(params, 'id', 'listing')) }));
}

export function PATCH(request: Request, { params }: Context) {
  return marketHandler(['groomer'], async (actor) => {
    const id = await pathId(params, 'id', 'listing');
    const patch = await readBody(request, listingPatchSchema);
    return marketData<UpdateListingResponse>({ listing: await updateListing(actor, id, patch) });
  });
}
