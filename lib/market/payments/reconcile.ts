// Reconciliation: asks the payment provider for the completed Checkout Sessions and the refunds of
// the last days and records what the market missed (a webhook lost, late or refused): the
// purchase of a paid session that has none, and the refund of a purchase still marked paid.
// Runs every few minutes as a job (lib/market/workers.ts) and on an admin's request. A session
// whose event was refused (its amount did not match the checkout) is left alone.
import type Stripe from 'stripe';
import { db } from '../../platform/db';
import { payments } from '../../platform/payments';
import { providerFailed } from '../errors';
import { recordPaidSession, recordRefundedCharge, sendNotices, type Notice } from './purchases';

export type ReconcileResult = { checked: number; recovered: number; refundsChecked: number; refundsRecovered: number };

const DEFAULT_WINDOW_SECONDS = 3 * 24 * 60 * 60;

export async function reconcilePayments(options: { sinceSeconds?: number } = {}): Promise<ReconcileResult> {
  const since = Math.floor(Date.now() / 1000) - (options.sinceSeconds ?? DEFAULT_WINDOW_SECONDS);
  const result: ReconcileResult = { checked: 0, recovered: 0, refundsChecked: 0, refundsRecovered: 0 };
  const notices: Notice[] = [];
  try {
    await replaySessions(since, result, notices);
    await replayRefunds(since, result, notices);
  } finally {
    await sendNotices(notices);
  }
  return result;
}

/** Every page of a provider list, with a plain message when the provider fails. */
async function eachPage<T extends { id: string }>(what: string, list: (startingAfter?: string) => Promise<Stripe.ApiList<T>>, onPage: (items: T[]) => Promise<void>) {
  let startingAfter: string | undefined;
  for (;;) {
    const page = await list(startingAfter).catch((error: unknown) => {
      throw providerFailed(what, error);
    });
    await onPage(page.data);
    if (!page.has_more || page.data.length === 0) break;
    startingAfter = page.data[page.data.length - 1].id;
  }
}

async function replaySessions(since: number, result: ReconcileResult, notices: Notice[]) {
  await eachPage(
    'list the completed checkouts',
    (startingAfter) => payments().checkout.sessions.list({ status: 'complete', created: { gte: since }, limit: 100, ...(startingAfter && { starting_after: startingAfter }) }),
    async (sessions) => {
      const paid = sessions.filter((session) => session.payment_status === 'paid' && session.metadata?.listing_id);
      result.checked += paid.length;
      if (paid.length === 0) return;
      // One query per page for the sessions already recorded or refused.
      const ids = paid.map((s) => s.id);
      const known = new Set<string>([
        ...(await db()('purchases').whereIn('checkout_session_id', ids).pluck('checkout_session_id')),
        ...(await db()('payment_events').whereIn('object_id', ids).where({ outcome: 'refused' }).pluck('object_id')),
      ]);
      for (const session of paid) {
        if (known.has(session.id)) continue;
        const recorded = await db().transaction((trx) => recordPaidSession(trx, session, notices));
        if (recorded && 'created' in recorded && recorded.created) result.recovered += 1;
      }
    },
  );
}

async function replayRefunds(since: number, result: ReconcileResult, notices: Notice[]) {
  await eachPage(
    'list the refunds',
    (startingAfter) => payments().refunds.list({ created: { gte: since }, limit: 100, ...(startingAfter && { starting_after: startingAfter }) }),
    async (refunds) => {
      const done = refunds.filter((refund) => refund.status === 'succeeded' && typeof refund.payment_intent === 'string');
      result.refundsChecked += done.length;
      if (done.length === 0) return;
      const intents = done.map((refund) => refund.payment_intent as string);
      const settled = new Set<string>(await db()('purchases').whereIn('payment_intent_id', intents).where({ status: 'refunded' }).pluck('payment_intent_id'));
      for (const refund of done) {
        if (settled.has(refund.payment_intent as string)) continue;
        // The charge as it is now: only a fully refunded charge ends a purchase.
        const charge = await payments()
          .charges.retrieve(typeof refund.charge === 'string' ? refund.charge : refund.charge!.id)
          .catch((error: unknown) => {
            throw providerFailed('read a refunded payment', error);
          });
        const changed = await db().transaction((trx) => recordRefundedCharge(trx, charge, notices));
        if (changed) result.refundsRecovered += 1;
        settled.add(refund.payment_intent as string);
      }
    },
  );
}
