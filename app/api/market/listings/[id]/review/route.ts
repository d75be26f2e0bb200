// PUT: a buyer who owns the preset rates and reviews it (once; a second PUT edits the review).
import { marketData, marketHandler, pathId, readBody } from '@/lib/market/http';
import { saveReview } from '@/lib/market/reviews';
import type { Review } from '@/lib/market/types';
import { reviewSchema } from '@/lib/market/validation';

export type ReviewResponse = { review: Review };

export function PUT(request: Request, { params }: { params: Promise<{ id: string }> }) {
  return marketHandler(['buyer', 'groomer'], async (actor) => {
    const id = await pathId(params, 'id', 'listing');
    const input = await readBody(request, reviewSchema);
    return marketData<ReviewResponse>({ review: await saveReview(actor, id, input) });
  });
}
