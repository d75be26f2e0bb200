// GET: a listing's page data (published to anyone; any state to its seller and admins).
// PATCH: the seller changes a draft (or a rejected or unlisted listing, which becomes a draft).
import { handler, jsonData, pathId, readBody } from '@/lib/http/server';
import { notFound } from '@/lib/market/errors';
import { getListingDetail, updateListing } from '@/lib/market/listings';
import type { ListingResponse, UpdateListingResponse } from '@/lib/market/types';
import { listingPatchSchema } from '@/lib/market/validation';

type Context = { params: Promise<{ id: string }> };

export function GET(_request: Request, { params }: Context) {
  return handler('public', async (actor) => jsonData<ListingResponse>({ listing: await getListingDetail(actor, await pathId(params, 'id', notFound('listing'))) }));
}

export function PATCH(request: Request, { params }: Context) {
  return handler(['groomer'], async (actor) => {
    const id = await pathId(params, 'id', notFound('listing'));
    const patch = await readBody(request, listingPatchSchema);
    return jsonData<UpdateListingResponse>({ listing: await updateListing(actor, id, patch) });
  });
}
