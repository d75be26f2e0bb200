// Purchases, recorded from the payment provider's word only: a verified webhook event or the
// provider's own list of completed sessions (reconciliation). Exactly one purchase per payment
// session, whatever the number and order of deliveries:
//   - each event id is handled once (payment_events, primary key, in the same transaction);
//   - each session makes at most one purchase (purchases.checkout_session_id UNIQUE);
//   - a buyer holds at most one paid purchase of a listing (partial unique index); a second,
//     separate payment for the same listing is recorded as refunded and refunded at once;
//   - a refund that arrives before its payment records the payment first, then the refund;
//   - a paid session is recorded only if its amount, currency, listing and buyer are those of the
//     checkout the market opened (checkout_sessions, priced from the database): a signed event
//     for 0 cents is refused, logged and kept as refused (so neither a redelivery nor the
//     reconciliation turns it into a purchase).
import type { Knex } from 'knex';
import type Stripe from 'stripe';
import { z } from 'zod';
import { db } from '../../platform/db';
import { payments } from '../../platform/payments';
import { platformFeeCents } from '../fees';
import { receiptMail, refundMail, saleNoticeMail, saleRefundedMail, sendMailLogged } from '../mail';
import { refreshRating } from '../reviews';

type Trx = Knex.Transaction;

/** What to tell people once the transaction that recorded it has committed. */
export type Notice =
  | { kind: 'sale'; purchaseId: string }
  | { kind: 'refund'; purchaseId: string };

const sessionMetadata = z.object({
  listing_id: z.uuid(),
  buyer_id: z.uuid(),
  platform_fee_cents: z.coerce.number().int().min(0).optional(),
});

/** The payment provider's id of an expandable field. */
const idOf = (value: string | { id: string } | null | undefined) => (typeof value === 'string' ? value : (value?.id ?? null));

export type RecordResult = { purchaseId: string; created: boolean } | { refused: string } | null;

/** Why a paid session does not match the checkout the market opened; null when it does. */
async function mismatch(trx: Trx, session: Stripe.Checkout.Session, meta: { listing_id: string; buyer_id: string }): Promise<string | null> {
  const opened = await trx('checkout_sessions').where({ session_id: session.id }).first('listing_id', 'buyer_id', 'amount_cents', 'currency');
  if (!opened) return 'the market opened no such checkout';
  if (opened.listing_id !== meta.listing_id || opened.buyer_id !== meta.buyer_id) return 'its listing or buyer is not the one of the checkout the market opened';
  const amount = session.amount_total;
  const currency = (session.currency ?? '').toLowerCase();
  if (amount !== opened.amount_cents || currency !== opened.currency) {
    return `it says ${amount} ${currency || '(no currency)'}, the checkout asked ${opened.amount_cents} ${opened.currency}`;
  }
  return null;
}

/**
 * Records the purchase a paid, complete Checkout Session stands for; null when the session is not
 * the market's or not paid. Must run inside the caller's transaction.
 */
export async function recordPaidSession(trx: Trx, session: Stripe.Checkout.Session, notices: Notice[]): Promise<RecordResult> {
  if (session.status !== 'complete' || session.payment_status !== 'paid') return null;
  const meta = sessionMetadata.safeParse(session.metadata ?? {});
  if (!meta.success) return null; // not a market checkout
  const listing = await trx('listings').where({ id: meta.data.listing_id }).first('id', 'seller_id', 'current_version');
  if (!listing) return null;
  const recorded = await trx('purchases').where({ checkout_session_id: session.id }).first('id');
  if (recorded) return { purchaseId: recorded.id, created: false };
  const problem = await mismatch(trx, session, meta.data);
  if (problem) {
    console.error(`[market] refused the paid checkout ${session.id} (listing ${meta.data.listing_id}): ${problem}`);
    return { refused: problem };
  }
  const amount = session.amount_total ?? 0;
  const currency = (session.currency ?? '').toLowerCase();
  const fee = meta.data.platform_fee_cents !== undefined && meta.data.platform_fee_cents <= amount ? meta.data.platform_fee_cents : platformFeeCents(amount);
  const row = {
    listing_id: listing.id,
    buyer_id: meta.data.buyer_id,
    seller_id: listing.seller_id,
    // The version on sale when the payment is recorded: the owner may download it and every later one.
    listing_version: listing.current_version,
    update_seen_version: listing.current_version,
    checkout_session_id: session.id,
    payment_intent_id: idOf(session.payment_intent),
    amount_cents: amount,
    currency,
    platform_fee_cents: fee,
    created_at: new Date(session.created * 1000),
  };
  // Any unique key may hold it back: the same session (already recorded) or the buyer's other paid purchase.
  const inserted = await trx('purchases').insert({ ...row, status: 'paid' }).onConflict().ignore().returning('id');
  if (inserted.length > 0) {
    await trx('listings').where({ id: listing.id }).increment('sales_count', 1);
    await trx('checkout_sessions').where({ session_id: session.id }).delete();
    notices.push({ kind: 'sale', purchaseId: inserted[0].id });
    return { purchaseId: inserted[0].id, created: true };
  }
  const existing = await trx('purchases').where({ checkout_session_id: session.id }).first('id');
  if (existing) return { purchaseId: existing.id, created: false };

  // A second payment by the same buyer for a listing they already own (two checkouts paid in
  // parallel). Keep the record, give the money back at once.
  const refund = await payments().refunds.create(
    { payment_intent: row.payment_intent_id ?? undefined, reason: 'duplicate', metadata: { checkout_session_id: session.id } },
    { idempotencyKey: `duplicate-payment-${session.id}` },
  );
  const [duplicate] = await trx('purchases')
    .insert({
      ...row,
      status: 'refunded',
      refund_id: refund.id,
      refund_reason: 'Paid twice for the same preset: the second payment was refunded at once.',
      refund_requested_at: trx.fn.now(),
      refunded_at: trx.fn.now(),
    })
    .onConflict('checkout_session_id')
    .ignore()
    .returning('id');
  await trx('checkout_sessions').where({ session_id: session.id }).delete();
  return duplicate ? { purchaseId: duplicate.id, created: true } : null;
}

/**
 * Marks the purchase of a fully refunded charge refunded (true when it changed); records the
 * payment first if it is not yet. Must run inside the caller's transaction.
 */
export async function recordRefundedCharge(trx: Trx, charge: Stripe.Charge, notices: Notice[]): Promise<boolean> {
  if (!charge.refunded) return false; // partial refunds are not the market's; only full ones end a purchase
  const paymentIntent = idOf(charge.payment_intent);
  if (!paymentIntent) return false;
  let purchase = await trx('purchases').where({ payment_intent_id: paymentIntent }).forUpdate().first('id', 'status', 'listing_id', 'buyer_id');
  if (!purchase) {
    // The refund came before the payment's own event: ask the provider for the session.
    const sessions = await payments().checkout.sessions.list({ payment_intent: paymentIntent, limit: 1 });
    const session = sessions.data[0];
    if (!session) return false;
    await recordPaidSession(trx, session, notices);
    purchase = await trx('purchases').where({ payment_intent_id: paymentIntent }).forUpdate().first('id', 'status', 'listing_id', 'buyer_id');
    if (!purchase) return false;
  }
  if (purchase.status === 'refunded') return false;
  await trx('purchases')
    .where({ id: purchase.id })
    .update({ status: 'refunded', refunded_at: trx.fn.now(), refund_requested_at: trx.raw('coalesce(refund_requested_at, now())') });
  await trx('listings').where({ id: purchase.listing_id }).decrement('sales_count', 1);
  await withdrawReview(trx, purchase.listing_id, purchase.buyer_id);
  // A sale and its refund in one go need no mails about either.
  const sale = notices.findIndex((notice) => notice.kind === 'sale' && notice.purchaseId === purchase.id);
  if (sale >= 0) notices.splice(sale, 1);
  else notices.push({ kind: 'refund', purchaseId: purchase.id });
  return true;
}

/**
 * A refunded buyer no longer owns the preset, so their review leaves the listing's rating (kept,
 * marked withdrawn; a later purchase and review brings it back).
 */
async function withdrawReview(trx: Trx, listingId: string, buyerId: string) {
  const stillOwns = await trx('purchases').where({ listing_id: listingId, buyer_id: buyerId, status: 'paid' }).first('id');
  if (stillOwns) return;
  const withdrawn = await trx('reviews').where({ listing_id: listingId, buyer_id: buyerId }).whereNull('withdrawn_at').update({ withdrawn_at: trx.fn.now() });
  if (withdrawn > 0) await refreshRating(trx, listingId);
}

export type EventOutcome = 'handled' | 'duplicate' | 'ignored' | 'refused';

/** Handles one verified event exactly once; mails go out after the commit. */
export async function handlePaymentEvent(event: Stripe.Event): Promise<EventOutcome> {
  const notices: Notice[] = [];
  const outcome = await db().transaction(async (trx): Promise<EventOutcome> => {
    const object = event.data.object as { id?: string };
    const fresh = await trx('payment_events')
      .insert({ event_id: event.id, type: event.type, object_id: object?.id ?? null })
      .onConflict('event_id')
      .ignore()
      .returning('event_id');
    if (fresh.length === 0) return 'duplicate';
    switch (event.type) {
      case 'checkout.session.completed':
      case 'checkout.session.async_payment_succeeded': {
        const result = await recordPaidSession(trx, event.data.object, notices);
        if (result && 'refused' in result) {
          // Kept as refused: its redeliveries are duplicates, and reconciliation leaves it alone.
          await trx('payment_events').where({ event_id: event.id }).update({ outcome: 'refused' });
          return 'refused';
        }
        return 'handled';
      }
      case 'charge.refunded':
        await recordRefundedCharge(trx, event.data.object, notices);
        return 'handled';
      default:
        return 'ignored';
    }
  });
  await sendNotices(notices);
  return outcome;
}

/** Receipts and sale notices, or refund notices, for purchases whose transaction committed. */
export async function sendNotices(notices: readonly Notice[]): Promise<void> {
  if (notices.length === 0) return;
  const rows = await db()('purchases as p')
    .join('listings as l', 'l.id', 'p.listing_id')
    .join('licences as c', 'c.id', 'l.licence_id')
    .join('users as b', 'b.id', 'p.buyer_id')
    .join('users as s', 's.id', 'p.seller_id')
    .whereIn(
      'p.id',
      notices.map((notice) => notice.purchaseId),
    )
    .select(
      'p.id',
      'p.listing_id',
      'p.amount_cents',
      'p.currency',
      'p.platform_fee_cents',
      'l.title',
      'c.title as licence_title',
      'b.email as buyer_email',
      's.email as seller_email',
      // Whether the seller was already paid for it (a sale item of a payout that did not fail).
      db().raw(`EXISTS (SELECT 1 FROM payout_items i JOIN payouts o ON o.id = i.payout_id WHERE i.purchase_id = p.id AND i.kind = 'sale' AND o.status <> 'failed') AS paid_out`),
    );
  const byId = new Map(rows.map((row) => [row.id, row]));
  for (const notice of notices) {
    const row = byId.get(notice.purchaseId);
    if (!row) continue;
    const sale = {
      listingId: row.listing_id,
      title: row.title,
      amountCents: row.amount_cents,
      currency: row.currency,
      feeCents: row.platform_fee_cents,
      licenceTitle: row.licence_title,
      purchaseId: row.id,
    };
    if (notice.kind === 'sale') {
      await sendMailLogged(receiptMail(row.buyer_email, sale));
      await sendMailLogged(saleNoticeMail(row.seller_email, sale));
    } else {
      await sendMailLogged(refundMail(row.buyer_email, sale));
      await sendMailLogged(saleRefundedMail(row.seller_email, { ...sale, paidOut: row.paid_out }));
    }
  }
}
