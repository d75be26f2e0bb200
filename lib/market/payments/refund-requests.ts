// A buyer's request for a refund: asked from the library with a reason, it waits in the admins'
// refund queue until an admin refunds the purchase (refundPurchase in lib/market/payments/refunds.ts
// closes the request in its transaction) or declines it with an answer the buyer gets by e-mail. Whether
// the buyer has a right to cancel depends on the law where they live; the queue shows the admin
// what that law usually turns on: whether the buyer agreed at checkout that the right ends with the
// download, and whether they downloaded.
import { db } from '../../platform/db';
import { HttpError } from '../../http/errors';
import { notFound } from '../errors';
import { refundDeclinedMail, sendMailLogged } from '../mail';
import { adminPurchase } from './refunds';
import type { Actor } from '../../accounts/actor';
import type { AdminRefundRequest, RefundRequestState } from '../types';

type RequestRow = { id: string; reason: string; created_at: Date; outcome: 'refunded' | 'declined' | null; answer: string | null; closed_at: Date | null };

/** The request as its buyer and the admins see it. */
export function refundRequestOf(row: RequestRow): RefundRequestState {
  return {
    id: row.id,
    reason: row.reason,
    requestedAt: row.created_at.toISOString(),
    outcome: row.outcome,
    answer: row.answer,
    closedAt: row.closed_at?.toISOString() ?? null,
  };
}

/**
 * Puts the buyer's request in the admins' queue. Only the purchase's buyer may ask (anyone else
 * gets the same 404 as for a purchase that does not exist); a refunded purchase, one being
 * refunded, or one with a request still waiting answers 409 and adds nothing.
 */
export async function requestRefund(actor: Actor, purchaseId: string, reason: string): Promise<RefundRequestState> {
  return db().transaction(async (trx) => {
    const purchase = await trx('purchases').where({ id: purchaseId, buyer_id: actor.userId }).forUpdate().first('id', 'status', 'refund_id');
    if (!purchase) throw notFound('purchase');
    if (purchase.status === 'refunded') throw new HttpError(409, 'refunded', 'This purchase is already refunded.');
    if (purchase.refund_id) throw new HttpError(409, 'refund-pending', 'This purchase is already being refunded.');
    const open = await trx('refund_requests').where({ purchase_id: purchaseId }).whereNull('closed_at').first('created_at');
    if (open) {
      throw new HttpError(409, 'refund-pending', `You already asked for a refund of this purchase on ${open.created_at.toISOString().slice(0, 10)}; an admin answers by e-mail.`);
    }
    const [row] = await trx('refund_requests').insert({ purchase_id: purchaseId, buyer_id: actor.userId, reason }).returning('*');
    return refundRequestOf(row);
  });
}

/** The requests waiting for an admin, oldest first (the queue is worked from the front). */
export async function listRefundRequests(): Promise<AdminRefundRequest[]> {
  const rows = await db()('refund_requests as r')
    .join('purchases as p', 'p.id', 'r.purchase_id')
    .whereNull('r.closed_at')
    // A purchase refunded by other means (the provider's dashboard) leaves the queue too.
    .where('p.status', 'paid')
    .whereNull('p.refund_id')
    .orderBy('r.created_at', 'asc')
    .limit(200)
    .select('r.*', 'p.cancellation_waived_at', db().raw('(SELECT count(*) FROM downloads d WHERE d.purchase_id = p.id) AS downloads'));
  return Promise.all(
    rows.map(async (row) => ({
      id: row.id,
      reason: row.reason,
      requestedAt: row.created_at.toISOString(),
      purchase: await adminPurchase(row.purchase_id),
      downloads: Number(row.downloads),
      cancellationWaived: row.cancellation_waived_at !== null,
    })),
  );
}

/**
 * Declines an open request with the admin's answer and mails it to the buyer. If the mail cannot
 * be sent the request is opened again (502), so no buyer is left with a silent refusal.
 */
export async function declineRefundRequest(actor: Actor, requestId: string, answer: string): Promise<RefundRequestState> {
  const declined = await db().transaction(async (trx) => {
    const row = await trx('refund_requests as r')
      .join('purchases as p', 'p.id', 'r.purchase_id')
      .join('listings as l', 'l.id', 'p.listing_id')
      .join('users as b', 'b.id', 'r.buyer_id')
      .where('r.id', requestId)
      .forUpdate('r')
      .first('r.closed_at', 'l.title', 'b.email');
    if (!row) throw new HttpError(404, 'not-found', 'There is no such refund request.');
    if (row.closed_at) throw new HttpError(409, 'wrong-state', 'This refund request was already answered.');
    const [updated] = await trx('refund_requests')
      .where({ id: requestId })
      .update({ outcome: 'declined', answer, closed_by: actor.userId, closed_at: trx.fn.now() })
      .returning('*');
    return { request: updated as RequestRow, title: row.title as string, email: row.email as string };
  });
  if (!(await sendMailLogged(refundDeclinedMail(declined.email, { title: declined.title, answer })))) {
    await db()('refund_requests').where({ id: requestId }).update({ outcome: null, answer: null, closed_by: null, closed_at: null });
    throw new HttpError(502, 'mail-failed', 'Nothing was changed: the e-mail to the buyer could not be sent. Try again in a few minutes.');
  }
  return refundRequestOf(declined.request);
}

/** The latest request of each of the buyer's purchases, for the library. */
export async function latestRefundRequests(purchaseIds: readonly string[]): Promise<Map<string, RefundRequestState>> {
  if (purchaseIds.length === 0) return new Map();
  const rows = await db()('refund_requests')
    .distinctOn('purchase_id')
    .whereIn('purchase_id', purchaseIds)
    .orderBy([{ column: 'purchase_id' }, { column: 'created_at', order: 'desc' }])
    .select('*');
  return new Map(rows.map((row) => [row.purchase_id as string, refundRequestOf(row)]));
}
