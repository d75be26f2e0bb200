// POST: a groomer turns one of their saved groom versions into a draft listing.
// GET: the signed-in groomer's own listings, in every state.
import { marketData, marketHandler, readBody } from '@/lib/market/http';
import { createListing, listOwnListings } from '@/lib/market/listings';
import type { ListingSummary } from '@/lib/market/types';
import { listingDraftSchema } from '@/lib/market/validation';

export type CreateListingResponse = { listing: ListingSummary };
export type OwnListingsResponse = { listings: ListingSummary[] };

export function POST(request: Request) {
  return marketHandler(['groomer'], async (actor) => {
    const input = await readBody(request, listingDraftSchema);
    return marketData<CreateListingResponse>({ listing: await createListing(actor, input) }, 201);
  });
}

export function GET() {
  return marketHandler(['groomer'], async (actor) => marketData<OwnListingsResponse>({ listings: await listOwnListings(actor) }));
}
