// PUT: a buyer who owns the preset rates and reviews it (once; a second PUT edits the review).
import { handler, jsonData, pathId, readBody } from '@/lib/http/server';
import { notFound } from '@/lib/market/errors';
import { saveReview } from '@/lib/market/reviews';
import type { ReviewResponse } from '@/lib/market/types';
import { reviewSchema } from '@/lib/market/validation';

export function PUT(request: Request, { params }: { params: Promise<{ id: string }> }) {
  return handler(['buyer', 'groomer'], async (actor) => {
    const id = await pathId(params, 'id', notFound('listing'));
    const input = await readBody(request, reviewSchema);
    return jsonData<ReviewResponse>({ review: await saveReview(actor, id, input) });
  });
}
