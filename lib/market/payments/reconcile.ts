// Reconciliation: asks the payment provider for the completed Checkout Sessions of the last days
// and records the purchase of any that has none (its webhook was lost, late or refused). Runs
// every few minutes as a job (lib/market/workers.ts) and on an admin's request.
import { db } from '../../platform/db';
import { payments } from '../../platform/payments';
import { providerFailed } from '../errors';
import { recordPaidSession, sendNotices, type Notice } from './purchases';

export type ReconcileResult = { checked: number; recovered: number };

export async function reconcilePayments(options: { sinceSeconds?: number } = {}): Promise<ReconcileResult> {
  const since = Math.floor(Date.now() / 1000) - (options.sinceSeconds ?? 3 * 24 * 60 * 60);
  let checked = 0;
  let recovered = 0;
  const notices: Notice[] = [];
  try {
    let startingAfter: string | undefined;
    for (;;) {
      const page = await payments()
        .checkout.sessions.list({ status: 'complete', created: { gte: since }, limit: 100, ...(startingAfter && { starting_after: startingAfter }) })
        .catch((error: unknown) => {
          throw providerFailed('list the completed checkouts', error);
        });
      const paid = page.data.filter((session) => session.payment_status === 'paid' && session.metadata?.listing_id);
      checked += paid.length;
      // One query per page for the sessions already recorded.
      const known = new Set<string>(
        paid.length === 0 ? [] : await db()('purchases').whereIn('checkout_session_id', paid.map((s) => s.id)).pluck('checkout_session_id'),
      );
      for (const session of paid) {
        if (known.has(session.id)) continue;
        const result = await db().transaction((trx) => recordPaidSession(trx, session, notices));
        if (result?.created) recovered += 1;
      }
      if (!page.has_more || page.data.length === 0) break;
      startingAfter = page.data[page.data.length - 1].id;
    }
  } finally {
    await sendNotices(notices);
  }
  return { checked, recovered };
}
