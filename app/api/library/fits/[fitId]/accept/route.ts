// POST: accept a finished fit — a groom of the buyer's in the studio, marked as fitted from the
// purchase (never for sale). 201 with the groom; 409 while the fit is not done.
import { handler, jsonData, pathId, readBody } from '@/lib/http/server';
import { notFound } from '@/lib/market/errors';
import { acceptFit } from '@/lib/market/fitting';
import type { FitAcceptedResponse } from '@/lib/market/types';
import { acceptFitSchema } from '@/lib/market/validation';

export function POST(request: Request, { params }: { params: Promise<{ fitId: string }> }) {
  return handler(['buyer', 'groomer'], async (actor) => {
    const fitId = await pathId(params, 'fitId', notFound('fit'));
    const { name } = await readBody(request, acceptFitSchema);
    return jsonData<FitAcceptedResponse>({ groom: await acceptFit(actor, fitId, name) }, 201);
  });
}
