// POST: The seller takes a published (or submitted) listing off the market; buyers keep what they bought.
import { handler, jsonData, pathId } from '@/lib/http/server';
import { notFound } from '@/lib/market/errors';
import { unlistListing } from '@/lib/market/listings';
import type { UpdateListingResponse } from '@/lib/market/types';

export function POST(_request: Request, { params }: { params: Promise<{ id: string }> }) {
  return handler(['groomer'], async (actor) =>
    jsonData<UpdateListingResponse>({ listing: await unlistListing(actor, await pathId(params, 'id', notFound('listing'))) }),
  );
}
