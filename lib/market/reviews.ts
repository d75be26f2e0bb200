// Reviews: a buyer who owns a preset (a paid purchase, not refunded) rates it 1–5 with some words,
// once, and may edit it. The listing's average and count change in the same transaction. A refund
// withdraws the buyer's review from the rating (payments/purchases.ts); it counts again if they
// buy and review again.
import type { Knex } from 'knex';
import { db } from '../platform/db';
import { HttpError } from '../http/errors';
import { notFound } from './errors';
import type { Actor } from '../accounts/actor';
import type { Review } from './types';

export async function saveReview(actor: Actor, listingId: string, input: { rating: number; body: string }): Promise<Review> {
  const id = await db().transaction(async (trx) => {
    const listing = await trx('listings').where({ id: listingId }).forUpdate().first('id', 'seller_id');
    if (!listing) throw notFound('listing');
    const owns = await trx('purchases').where({ listing_id: listingId, buyer_id: actor.userId, status: 'paid' }).whereNull('refund_id').first('id');
    if (!owns) throw new HttpError(403, 'not-owned', 'Only buyers who own this preset can review it.');
    const [review] = await trx('reviews')
      .insert({ listing_id: listingId, buyer_id: actor.userId, rating: input.rating, body: input.body })
      .onConflict(['listing_id', 'buyer_id'])
      .merge({ rating: input.rating, body: input.body, updated_at: trx.fn.now(), withdrawn_at: null })
      .returning('id');
    await refreshRating(trx, listingId);
    return review.id as string;
  });
  const row = await db()('reviews as r').join('users as u', 'u.id', 'r.buyer_id').where('r.id', id).first('r.*', 'u.display_name');
  return {
    id: row.id,
    rating: row.rating,
    body: row.body,
    buyer: { displayName: row.display_name },
    createdAt: row.created_at.toISOString(),
    updatedAt: row.updated_at.toISOString(),
    mine: true,
  };
}

/** The listing's average and count from the reviews that stand (not withdrawn by a refund). */
export async function refreshRating(trx: Knex.Transaction, listingId: string): Promise<void> {
  const [{ count, average }] = await trx('reviews')
    .where({ listing_id: listingId })
    .whereNull('withdrawn_at')
    .select(trx.raw('count(*)::int AS count'), trx.raw('round(avg(rating), 2) AS average'));
  await trx('listings').where({ id: listingId }).update({ rating_count: count, rating_average: average });
}
