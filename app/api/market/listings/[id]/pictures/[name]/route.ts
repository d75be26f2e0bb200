// GET: redirects to a short-lived URL of one picture of a listing (`front-256`, `side-1024`, …),
// for listings the caller may see. A stable address for <img> on cards and pages.
import { NextResponse } from 'next/server';
import { handler, pathId } from '@/lib/http/server';
import { notFound } from '@/lib/market/errors';
import { pictureUrl } from '@/lib/market/listings';

export function GET(_request: Request, { params }: { params: Promise<{ id: string; name: string }> }) {
  return handler('public', async (actor) => {
    const id = await pathId(params, 'id', notFound('listing'));
    const { name } = await params;
    const response = NextResponse.redirect(await pictureUrl(actor, id, name), 302);
    response.headers.set('cache-control', 'private, max-age=300');
    return response;
  });
}
