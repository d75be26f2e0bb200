// A seller's balance and payouts. The balance is shown as it is, per currency: what the market
// owes the seller (or, after a refund of a sale already paid out, what the seller owes), split
// into what can be paid out now, what is held, what waits for an asked refund, and what is owed.
//
// Which sales are paid out (payout_items says which purchases each payout paid, once):
//   - a sale only after the holding period (MARKET_PAYOUT_HOLD_DAYS, 14 days by default: a
//     common practice of marketplaces so that most refunds and disputes come before the money
//     leaves; no single source sets the number) and only while no refund is asked for it;
//   - a refunded sale that was already paid out is owed: it is taken back (a clawback item) from
//     the next payout, which is made only when the cleared sales exceed what is owed.
//
// A payout is written before the money moves: the row (pending, with its items and a
// deterministic idempotency key made of the seller and the purchases it pays) commits first,
// then the provider's transfer is created with that key, then the row is completed. A failure
// between the two leaves the row pending; the next request resumes it with the same key, so the
// provider answers with the transfer it already made instead of paying again.
import { createHash, randomUUID } from 'node:crypto';
import type { Knex } from 'knex';
import { db, lockUntilCommit } from '../platform/db';
import { env } from '../platform/env';
import { payments } from '../platform/payments';
import { HttpError } from '../http/errors';
import { providerFailed } from './errors';
import type { Actor } from '../accounts/actor';
import type { Balance, Payout } from './types';
import { formatPrice, type Currency } from './vocabulary';

type Db = Knex | Knex.Transaction;
type Item = { purchaseId: string; kind: 'sale' | 'clawback'; amountCents: number };
type Standing = Balance & { items: Item[] };

const isoOrNull = (value: Date | null) => (value ? value.toISOString() : null);

/** Every purchase of the seller that still matters for the balance, with where it stands. */
async function standings(trx: Db, sellerId: string): Promise<Map<Currency, Standing>> {
  const { rows } = await trx.raw<{
    rows: { id: string; currency: Currency; net: number; state: 'cleared' | 'held' | 'refund-pending' | 'owed'; clears_at: Date | null }[];
  }>(
    `SELECT p.id, p.currency, p.amount_cents - p.platform_fee_cents AS net, p.created_at + interval '1 day' * ? AS clears_at,
            CASE WHEN p.status = 'refunded' THEN 'owed'
                 WHEN p.refund_id IS NOT NULL THEN 'refund-pending'
                 WHEN p.created_at > now() - interval '1 day' * ? THEN 'held'
                 ELSE 'cleared' END AS state
       FROM purchases p
      WHERE p.seller_id = ?
        AND (p.status = 'paid' AND NOT EXISTS (SELECT 1 FROM payout_items i JOIN payouts o ON o.id = i.payout_id
                                                 WHERE i.purchase_id = p.id AND i.kind = 'sale' AND o.status <> 'failed')
          OR p.status = 'refunded' AND EXISTS (SELECT 1 FROM payout_items i JOIN payouts o ON o.id = i.payout_id
                                                 WHERE i.purchase_id = p.id AND i.kind = 'sale' AND o.status <> 'failed')
                                   AND NOT EXISTS (SELECT 1 FROM payout_items i JOIN payouts o ON o.id = i.payout_id
                                                     WHERE i.purchase_id = p.id AND i.kind = 'clawback' AND o.status <> 'failed'))
      ORDER BY p.created_at, p.id`,
    [payoutHoldDays(), payoutHoldDays(), sellerId],
  );
  // The ledger's own sum, as a safety net: a payout never exceeds what was earned minus what was paid.
  const { rows: ledger } = await trx.raw<{ rows: { currency: Currency; balance: string }[] }>(
    `SELECT currency, sum(amount) AS balance FROM (
       SELECT currency, amount_cents - platform_fee_cents AS amount FROM purchases WHERE seller_id = ? AND status = 'paid'
       UNION ALL
       SELECT currency, -amount_cents FROM payouts WHERE seller_id = ? AND status <> 'failed'
     ) t GROUP BY currency`,
    [sellerId, sellerId],
  );
  const out = new Map<Currency, Standing>();
  const of = (currency: Currency) => {
    if (!out.has(currency)) {
      out.set(currency, { currency, balanceCents: 0, payableCents: 0, clearedCents: 0, heldCents: 0, heldUntil: null, refundPendingCents: 0, owedCents: 0, items: [] });
    }
    return out.get(currency)!;
  };
  for (const row of ledger) of(row.currency).balanceCents = Number(row.balance);
  for (const row of rows) {
    const s = of(row.currency);
    const net = Number(row.net);
    if (row.state === 'cleared') {
      s.clearedCents += net;
      s.items.push({ purchaseId: row.id, kind: 'sale', amountCents: net });
    } else if (row.state === 'owed') {
      s.owedCents += net;
      s.items.push({ purchaseId: row.id, kind: 'clawback', amountCents: -net });
    } else if (row.state === 'held') {
      s.heldCents += net;
      const clears = isoOrNull(row.clears_at);
      if (clears && (!s.heldUntil || clears < s.heldUntil)) s.heldUntil = clears;
    } else s.refundPendingCents += net;
  }
  for (const s of out.values()) s.payableCents = Math.max(0, Math.min(s.clearedCents - s.owedCents, s.balanceCents));
  return out;
}

/** Days a sale is held before it can be paid out. */
export function payoutHoldDays(): number {
  return env().MARKET_PAYOUT_HOLD_DAYS;
}

/** The seller's balance per currency, as it is (see the top of this file). */
export async function balances(sellerId: string, trx: Db = db()): Promise<Balance[]> {
  // Every currency the seller has kept sales or payouts in, even at 0.
  const all = [...(await standings(trx, sellerId)).values()];
  return all.sort((a, b) => a.currency.localeCompare(b.currency)).map(({ items: _items, ...balance }) => balance);
}

type PayoutRow = { id: string; amount_cents: number; currency: Currency; transfer_id: string | null; status: Payout['status']; idempotency_key: string; seller_id: string; created_at: Date };

function payoutOf(row: PayoutRow): Payout {
  return { id: row.id, amountCents: row.amount_cents, currency: row.currency, transferId: row.transfer_id, status: row.status, createdAt: row.created_at.toISOString() };
}

export async function listPayouts(actor: Actor): Promise<Payout[]> {
  const rows = await db()('payouts').where({ seller_id: actor.userId }).whereNot({ status: 'failed' }).orderBy('created_at', 'desc').limit(500);
  return rows.map(payoutOf);
}

/** Why nothing can be paid out, in the seller's words. */
function nothingToPayOut(currency: Currency | undefined, balance: Balance | undefined): HttpError {
  const reasons: string[] = [];
  if (balance) {
    const money = (cents: number) => formatPrice(cents, balance.currency);
    if (balance.owedCents > 0) {
      reasons.push(`${money(balance.owedCents)} of sales already paid out were refunded; it is kept back from your next sales (${money(balance.clearedCents)} so far)`);
    }
    if (balance.heldCents > 0) {
      const until = balance.heldUntil ? ` (the first on ${balance.heldUntil.slice(0, 10)})` : '';
      reasons.push(`${money(balance.heldCents)} of recent sales can be paid out ${payoutHoldDays()} days after each sale${until}`);
    }
    if (balance.refundPendingCents > 0) reasons.push(`${money(balance.refundPendingCents)} waits for refunds that were asked`);
  }
  const head = currency ? `There is nothing to pay out in ${currency.toUpperCase()} right now` : 'There is nothing to pay out right now';
  return new HttpError(409, 'nothing-to-pay-out', reasons.length > 0 ? `${head}: ${reasons.join('; ')}.` : `${head}.`);
}

/** The seller's connected account at the provider, opened at the first payout. */
async function payoutAccount(trx: Db, sellerId: string): Promise<string> {
  const known = await trx('seller_accounts').where({ user_id: sellerId }).first('account_id');
  if (known) return known.account_id;
  const user = await trx('users').where({ id: sellerId }).first('email');
  let accountId: string;
  try {
    const created = await payments().accounts.create(
      { type: 'express', email: user?.email, metadata: { user_id: sellerId } },
      { idempotencyKey: `seller-account-${sellerId}` },
    );
    accountId = created.id;
  } catch (error) {
    throw providerFailed('open your payout account', error);
  }
  await trx('seller_accounts').insert({ user_id: sellerId, account_id: accountId }).onConflict('user_id').ignore();
  return accountId;
}

/** The payout's key: the seller and the purchases it pays, and how many payouts of the same items failed before. */
function payoutKey(sellerId: string, items: Item[], failedBefore: number): string {
  const digest = createHash('sha256')
    .update([sellerId, ...items.map((item) => `${item.kind}:${item.purchaseId}`).sort()].join('\n'))
    .digest('hex')
    .slice(0, 40);
  return `payout-${digest}-${failedBefore}`;
}

/**
 * Pays what can be paid out now in one currency to the seller's connected account. One payout at
 * a time per seller (an advisory lock and one pending payout per currency); a payout whose
 * transfer or completion failed is resumed, with its key, by the next request.
 */
export async function requestPayout(actor: Actor, currency?: Currency): Promise<Payout> {
  const sellerId = actor.userId;
  const row = await db().transaction(async (trx): Promise<PayoutRow> => {
    await lockUntilCommit(trx, `payout:${sellerId}`);
    const inFlight = await trx('payouts')
      .where({ seller_id: sellerId, status: 'pending' })
      .modify((query) => (currency ? query.where({ currency }) : query))
      .orderBy('created_at')
      .first();
    if (inFlight) return inFlight;
    const all = await standings(trx, sellerId);
    const payable = [...all.values()].filter((s) => s.payableCents > 0);
    if (!currency && payable.length > 1) {
      throw new HttpError(400, 'choose-currency', `You have money to pay out in ${payable.map((b) => b.currency.toUpperCase()).join(' and ')}: choose one.`, {
        details: { currencies: payable.map((b) => b.currency) },
      });
    }
    const chosen = currency ? payable.find((s) => s.currency === currency) : payable[0];
    if (!chosen) throw nothingToPayOut(currency, currency ? all.get(currency) : [...all.values()][0]);
    await payoutAccount(trx, sellerId);
    const base = payoutKey(sellerId, chosen.items, 0).replace(/-0$/, '');
    const failedBefore = Number((await trx('payouts').where({ seller_id: sellerId, status: 'failed' }).whereLike('idempotency_key', `${base}-%`).count({ n: '*' }))[0].n);
    const [payout] = await trx('payouts')
      .insert({ id: randomUUID(), seller_id: sellerId, amount_cents: chosen.payableCents, currency: chosen.currency, status: 'pending', idempotency_key: `${base}-${failedBefore}` })
      .returning('*');
    await trx('payout_items').insert(chosen.items.map((item) => ({ payout_id: payout.id, purchase_id: item.purchaseId, kind: item.kind, amount_cents: item.amountCents })));
    return payout;
  });
  return completePayout(row);
}

/** A refusal the provider gave for good (a 4xx other than a conflict or a rate limit): nothing was transferred. */
function refusedForGood(error: unknown): boolean {
  const status = (error as { statusCode?: number }).statusCode;
  return status !== undefined && status >= 400 && status < 500 && status !== 409 && status !== 429;
}

/** Creates (or, with the same key, finds again) the payout's transfer and completes the row. */
async function completePayout(row: PayoutRow): Promise<Payout> {
  const account = await db()('seller_accounts').where({ user_id: row.seller_id }).first('account_id');
  let transferId: string;
  try {
    const transfer = await payments().transfers.create(
      {
        amount: row.amount_cents,
        currency: row.currency,
        destination: account.account_id,
        transfer_group: `payout-${row.id}`,
        metadata: { payout_id: row.id, seller_id: row.seller_id },
      },
      { idempotencyKey: row.idempotency_key },
    );
    transferId = transfer.id;
  } catch (error) {
    if (refusedForGood(error)) {
      // Nothing moved: the payout failed, and its sales can be paid out again.
      await db().transaction(async (trx) => {
        await trx('payouts').where({ id: row.id, status: 'pending' }).update({ status: 'failed', failure: (error as Error).message.slice(0, 500), completed_at: trx.fn.now() });
        await trx('payout_items').where({ payout_id: row.id }).delete();
      });
    }
    throw providerFailed('transfer the payout', error);
  }
  const [done] = await db()('payouts').where({ id: row.id }).update({ status: 'paid', transfer_id: transferId, completed_at: db().fn.now() }).returning('*');
  return payoutOf(done);
}

/**
 * Finishes payouts left pending (a crash or a failed recording after the row was written) that
 * nobody resumed for a while: the reconciliation job calls it, so a payout does not wait for the
 * seller to press the button again. Same key, so the provider answers with the transfer it made.
 */
export async function resumePendingPayouts(options: { olderThanSeconds?: number } = {}): Promise<{ resumed: number; failed: number }> {
  const rows: PayoutRow[] = await db()('payouts')
    .where({ status: 'pending' })
    .where('created_at', '<=', db().raw(`now() - interval '1 second' * ?`, [options.olderThanSeconds ?? 300]))
    .orderBy('created_at')
    .limit(100);
  let resumed = 0;
  let failed = 0;
  for (const row of rows) {
    try {
      await completePayout(row);
      resumed += 1;
    } catch {
      failed += 1; // logged by providerFailed; tried again at the next run
    }
  }
  return { resumed, failed };
}
