// POST: the seller publishes a new version of their listing on the market (a newer groom version,
// description, files; the rights tick again), which waits for the admins while the version on sale stays.
// GET: every version of the listing, newest first, to its seller and admins.
import { handler, jsonData, pathId, readBody } from '@/lib/http/server';
import { notFound } from '@/lib/market/errors';
import { createListingVersion, listListingVersions } from '@/lib/market/listings';
import type { ListingVersionResponse, ListingVersionsResponse } from '@/lib/market/types';
import { listingVersionSchema } from '@/lib/market/validation';

export function POST(request: Request, { params }: { params: Promise<{ id: string }> }) {
  return handler(['groomer'], async (actor) => {
    const id = await pathId(params, 'id', notFound('listing'));
    const input = await readBody(request, listingVersionSchema);
    return jsonData<ListingVersionResponse>({ version: await createListingVersion(actor, id, input) }, 201);
  });
}

export function GET(_request: Request, { params }: { params: Promise<{ id: string }> }) {
  return handler(['groomer', 'admin'], async (actor) =>
    jsonData<ListingVersionsResponse>({ versions: await listListingVersions(actor, await pathId(params, 'id', notFound('listing'))) }),
  );
}
