// POST: The seller sends a draft (or a rejected or unlisted listing) to the admins for approval.
import { handler, jsonData, pathId } from '@/lib/http/server';
import { notFound } from '@/lib/market/errors';
import { submitListing } from '@/lib/market/listings';
import type { UpdateListingResponse } from '@/lib/market/types';

export function POST(_request: Request, { params }: { params: Promise<{ id: string }> }) {
  return handler(['groomer'], async (actor) =>
    jsonData<UpdateListingResponse>({ listing: await submitListing(actor, await pathId(params, 'id', notFound('listing'))) }),
  );
}
