// Refunds by an admin: asked of the payment provider; the provider's `charge.refunded` webhook
// then marks the purchase refunded (lib/market/payments/purchases.ts). From the request on, the purchase
// no longer downloads.
import { db } from '../../platform/db';
import { payments } from '../../platform/payments';
import { HttpError } from '../../http/errors';
import { notFound, providerFailed } from '../errors';
import { withdrawReview } from './purchases';
import type { Actor } from '../../accounts/actor';
import type { AdminPurchase } from '../types';

export async function adminPurchase(id: string): Promise<AdminPurchase> {
  const row = await db()('purchases as p')
    .join('listings as l', 'l.id', 'p.listing_id')
    .join('users as b', 'b.id', 'p.buyer_id')
    .where('p.id', id)
    .first('p.*', 'l.title', 'b.email as buyer_email', 'b.display_name as buyer_name', paidOutAt());
  if (!row) throw notFound('purchase');
  return adminPurchaseOf(row);
}

/** When the sale was paid out to the seller (a payout that did not fail; a pending one counts, with its start). */
const paidOutAt = () =>
  db().raw(
    `(SELECT coalesce(o.completed_at, o.created_at) FROM payout_items i JOIN payouts o ON o.id = i.payout_id
       WHERE i.purchase_id = p.id AND i.kind = 'sale' AND o.status <> 'failed' LIMIT 1) AS paid_out_at`,
  );

type AdminPurchaseRow = {
  id: string;
  listing_id: string;
  title: string;
  buyer_id: string;
  buyer_email: string;
  buyer_name: string;
  amount_cents: number;
  currency: AdminPurchase['currency'];
  status: AdminPurchase['status'];
  refund_id: string | null;
  created_at: Date;
  refunded_at: Date | null;
  platform_fee_cents: number;
  paid_out_at: Date | null;
};

function adminPurchaseOf(row: AdminPurchaseRow): AdminPurchase {
  return {
    id: row.id,
    listing: { id: row.listing_id, title: row.title },
    buyer: { id: row.buyer_id, email: row.buyer_email, displayName: row.buyer_name },
    amountCents: row.amount_cents,
    currency: row.currency,
    status: row.status,
    refundPending: row.status === 'paid' && row.refund_id !== null,
    createdAt: row.created_at.toISOString(),
    refundedAt: row.refunded_at?.toISOString() ?? null,
    sellerNetCents: row.amount_cents - row.platform_fee_cents,
    paidOutAt: row.paid_out_at?.toISOString() ?? null,
  };
}

/** The latest purchases, for the admin's refund page (optionally of one listing or buyer e-mail). */
export async function listPurchasesForAdmin(filter: { listingId?: string; email?: string } = {}): Promise<AdminPurchase[]> {
  const query = db()('purchases as p')
    .join('listings as l', 'l.id', 'p.listing_id')
    .join('users as b', 'b.id', 'p.buyer_id')
    .orderBy('p.created_at', 'desc')
    .limit(200)
    .select('p.*', 'l.title', 'b.email as buyer_email', 'b.display_name as buyer_name', paidOutAt());
  if (filter.listingId) query.where('p.listing_id', filter.listingId);
  if (filter.email) query.where('b.email', filter.email.toLowerCase());
  return (await query).map(adminPurchaseOf);
}

export async function refundPurchase(actor: Actor, purchaseId: string, reason?: string): Promise<AdminPurchase> {
  await db().transaction(async (trx) => {
    const purchase = await trx('purchases').where({ id: purchaseId }).forUpdate().first('id', 'status', 'refund_id', 'payment_intent_id', 'listing_id', 'buyer_id');
    if (!purchase) throw notFound('purchase');
    if (purchase.status === 'refunded') throw new HttpError(409, 'refunded', 'This purchase is already refunded.');
    if (purchase.refund_id) return; // asked before; the provider's webhook will complete it
    if (!purchase.payment_intent_id) throw new HttpError(409, 'wrong-state', 'This purchase has no payment to refund.');
    let refundId: string;
    try {
      const refund = await payments().refunds.create(
        {
          payment_intent: purchase.payment_intent_id,
          reason: 'requested_by_customer',
          metadata: { purchase_id: purchase.id, refunded_by: actor.userId, ...(reason && { note: reason.slice(0, 450) }) },
        },
        { idempotencyKey: `refund-${purchase.id}` },
      );
      refundId = refund.id;
    } catch (error) {
      throw providerFailed('refund the payment', error);
    }
    await trx('purchases')
      .where({ id: purchase.id })
      .update({ refund_id: refundId, refund_reason: reason ?? null, refund_requested_at: trx.fn.now() });
    // From now on the buyer does not own it: their review stops counting in the rating.
    await withdrawReview(trx, purchase.listing_id, purchase.buyer_id);
    // The buyer's request, if they asked (lib/market/payments/refund-requests.ts), is answered by this refund.
    await trx('refund_requests').where({ purchase_id: purchase.id }).whereNull('closed_at').update({ outcome: 'refunded', closed_by: actor.userId, closed_at: trx.fn.now() });
  });
  return adminPurchase(purchaseId);
}
