// POST: a groomer turns one of their saved groom versions into a draft listing.
// GET: the signed-in groomer's own listings, in every state.
import { handler, jsonData, readBody } from '@/lib/http/server';
import { createListing, listOwnListings } from '@/lib/market/listings';
import type { CreateListingResponse, OwnListingsResponse } from '@/lib/market/types';
import { listingDraftSchema } from '@/lib/market/validation';

export function POST(request: Request) {
  return handler(['groomer'], async (actor) => {
    const input = await readBody(request, listingDraftSchema);
    return jsonData<CreateListingResponse>({ listing: await createListing(actor, input) }, 201);
  });
}

export function GET() {
  return handler(['groomer'], async (actor) => jsonData<OwnListingsResponse>({ listings: await listOwnListings(actor) }));
}
