// Money that is never lost or doubled: the webhook's amount check, payouts (holding period,
// pending refunds, the payout row before the transfer), refunds of paid-out sales, and the
// reconciliation of refunds whose webhook never arrived. Against PostgreSQL and the payments fake.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { closeDb, db } from '@/lib/platform/db';
import { payments } from '@/lib/platform/payments';
import { stopJobs } from '@/lib/platform/jobs';
import { startCheckout } from '@/lib/market/payments/checkout';
import { balances, requestPayout, resumePendingPayouts } from '@/lib/market/payouts';
import type { Actor } from '@/lib/accounts/actor';
import { reconcilePayments } from '@/lib/market/payments/reconcile';
import { refundPurchase } from '@/lib/market/payments/refunds';
import { HttpError } from '@/lib/http/errors';
import { mailTo } from './helpers';
import { deliver, eventsAbout, insertListing, makePerson, payOnHostedPage, waitFor } from './market-helpers';

afterAll(async () => {
  await stopJobs();
  await closeDb();
});

let seller: Actor;
beforeAll(async () => {
  seller = await makePerson('money-seller', ['groomer']);
});

/** A purchase of a new listing of `by`, paid on the hosted page and delivered; its row. */
async function sale(by: Actor, options: { priceCents?: number; daysAgo?: number } = {}) {
  const buyer = await makePerson('money-buyer', ['buyer']);
  const listingId = await insertListing(by, { priceCents: options.priceCents ?? 1200 });
  const checkout = await startCheckout(buyer, listingId);
  expect((await payOnHostedPage(checkout.url, '4242424242424242')).status).toBe(303);
  const [completed] = await eventsAbout({ id: checkout.sessionId }, ['checkout.session.completed']);
  expect((await deliver(completed)).status).toBe(200);
  const purchase = await db()('purchases').where({ checkout_session_id: checkout.sessionId }).first();
  // Time moves through the rows: the sale happened `daysAgo` days ago (past the holding period).
  if (options.daysAgo) await db()('purchases').where({ id: purchase.id }).update({ created_at: db().raw(`now() - interval '${options.daysAgo} days'`) });
  return { ...purchase, buyer, listingId } as { id: string; payment_intent_id: string; amount_cents: number; platform_fee_cents: number; buyer: Actor; listingId: string };
}

async function transfersTo(sellerId: string) {
  const account = await db()('seller_accounts').where({ user_id: sellerId }).first('account_id');
  if (!account) return [];
  return (await payments().transfers.list({ destination: account.account_id, limit: 100 })).data;
}

describe('the webhook’s amount check (probe: the free purchase)', () => {
  it('refuses a signed completed checkout whose amount or currency differs from the checkout the market opened', async () => {
    const buyer = await makePerson('money-buyer', ['buyer']);
    const listingId = await insertListing(seller, { priceCents: 1200 });
    const checkout = await startCheckout(buyer, listingId);
    const session = await payments().checkout.sessions.retrieve(checkout.sessionId);
    // The provider's event, correctly signed, but for 0 cents (or another currency).
    const forged = (id: string, changes: object) => ({
      id,
      object: 'event',
      type: 'checkout.session.completed',
      created: Math.floor(Date.now() / 1000),
      data: { object: { ...session, status: 'complete', payment_status: 'paid', payment_intent: `pi_forged_${id}`, ...changes } },
    });
    for (const [id, changes] of [
      [`evt_zero_${checkout.sessionId}`, { amount_total: 0 }],
      [`evt_currency_${checkout.sessionId}`, { currency: 'usd' }],
    ] as const) {
      const response = await deliver(forged(id, changes));
      expect(response.status).toBe(200); // answered, so the provider does not retry it into a purchase
      expect((await response.json()).data.outcome).toBe('refused');
    }
    expect(await db()('purchases').where({ checkout_session_id: checkout.sessionId })).toHaveLength(0);
  });
});

describe('payouts', () => {
  it('never pays twice when recording the transfer fails and the seller tries again (probe: the double payout)', async () => {
    await doublePayoutProbe('seller');
  });

  it('finishes a payout left pending by the reconciliation job, with the same transfer', async () => {
    await doublePayoutProbe('job');
  });
});

/** A seller's payout whose recording fails once; then the seller or the job finishes it. Exactly one transfer. */
async function doublePayoutProbe(finisher: 'seller' | 'job') {
  const payee = await makePerson('money-payee', ['groomer']);
  // Other sellers' money on the platform's balance, so a second transfer would go through.
  await sale(seller, { priceCents: 5000 });
  const bought = await sale(payee, { priceCents: 2000, daysAgo: 30 });
  // A fault in the database: the first write that records a transfer for this seller fails
  // (a sequence, because it does not roll back with the failing transaction).
  const tag = payee.userId.replace(/-/g, '');
  await db().raw(`CREATE SEQUENCE fault_${tag}`);
  await db().raw(`
    CREATE FUNCTION fault_${tag}() RETURNS trigger LANGUAGE plpgsql AS $$
    BEGIN
      IF NEW.seller_id = '${payee.userId}' AND NEW.transfer_id IS NOT NULL AND nextval('fault_${tag}') = 1 THEN
        RAISE EXCEPTION 'injected fault: the payout could not be recorded';
      END IF;
      RETURN NEW;
    END $$`);
  await db().raw(`CREATE TRIGGER fault_${tag} BEFORE INSERT OR UPDATE ON payouts FOR EACH ROW EXECUTE FUNCTION fault_${tag}()`);
  try {
    await expect(requestPayout(payee)).rejects.toThrow();
    if (finisher === 'seller') {
      expect(await requestPayout(payee)).toMatchObject({ amountCents: 1700, currency: 'eur', status: 'paid' });
    } else {
      expect((await resumePendingPayouts({ olderThanSeconds: 0 })).resumed).toBeGreaterThanOrEqual(1);
      expect(await db()('payouts').where({ seller_id: payee.userId }).select('status', 'amount_cents')).toEqual([{ status: 'paid', amount_cents: 1700 }]);
    }
  } finally {
    await db().raw(`DROP TRIGGER fault_${tag} ON payouts`);
    await db().raw(`DROP FUNCTION fault_${tag}()`);
    await db().raw(`DROP SEQUENCE fault_${tag}`);
  }
  const transfers = await transfersTo(payee.userId);
  expect(transfers.map((t) => t.amount)).toEqual([bought.amount_cents - bought.platform_fee_cents]);
}

describe('what a payout pays', () => {
  it('pays only sales past the holding period and without an asked refund, and says what waits', async () => {
    const payee = await makePerson('money-payee', ['groomer']);
    const admin = await makePerson('money-admin', ['admin']);
    const old = await sale(payee, { priceCents: 1000, daysAgo: 15 }); // 10.00 → 8.50 to the seller
    const fresh = await sale(payee, { priceCents: 2000, daysAgo: 3 }); // held: 17.00
    const disputed = await sale(payee, { priceCents: 4000, daysAgo: 30 }); // refund asked: 34.00
    await refundPurchase(admin, disputed.id, 'Asked by the buyer.');
    expect(await balances(payee.userId)).toEqual([
      { currency: 'eur', balanceCents: 850 + 1700 + 3400, payableCents: 850, clearedCents: 850, heldCents: 1700, heldUntil: expect.any(String), refundPendingCents: 3400, owedCents: 0 },
    ]);
    const payout = await requestPayout(payee);
    expect(payout).toMatchObject({ amountCents: 850, status: 'paid' });
    expect(await db()('payout_items').where({ payout_id: payout.id }).pluck('purchase_id')).toEqual([old.id]);
    const nothing = await requestPayout(payee).catch((error: unknown) => error as HttpError);
    expect(nothing).toMatchObject({ status: 409, code: 'nothing-to-pay-out' });
    expect((nothing as HttpError).message).toMatch(/17\.00 EUR of recent sales can be paid out 14 days after each sale/);
    expect((nothing as HttpError).message).toMatch(/34\.00 EUR waits for refunds that were asked/);
    expect(fresh.id).toBeDefined();
  });

  it('makes one payout of two clicks at once', async () => {
    const payee = await makePerson('money-payee', ['groomer']);
    await sale(payee, { priceCents: 3000, daysAgo: 20 });
    const results = await Promise.allSettled([requestPayout(payee), requestPayout(payee)]);
    const paid = results.filter((r) => r.status === 'fulfilled').map((r) => (r as PromiseFulfilledResult<{ id: string }>).value.id);
    // Either the second click finds the first payout in flight (and finishes the same one) or nothing left to pay.
    expect(new Set(paid).size).toBe(1);
    expect((await transfersTo(payee.userId)).map((t) => t.amount)).toEqual([2550]);
  });
});

describe('reconciliation of refunds', () => {
  it('records a refund whose webhook never arrived, and tells buyer and seller', async () => {
    const payee = await makePerson('money-payee', ['groomer']);
    const bought = await sale(payee, { priceCents: 1500 });
    // Refunded at the provider; its charge.refunded is never delivered.
    await payments().refunds.create({ payment_intent: bought.payment_intent_id });
    expect((await db()('purchases').where({ id: bought.id }).first('status')).status).toBe('paid');
    const result = await reconcilePayments();
    expect(result.refundsRecovered).toBeGreaterThanOrEqual(1);
    expect(await db()('purchases').where({ id: bought.id }).first('status', 'refunded_at')).toMatchObject({ status: 'refunded', refunded_at: expect.any(Date) });
    expect((await db()('listings').where({ id: bought.listingId }).first('sales_count')).sales_count).toBe(0);
    await waitFor('the buyer’s refund mail', async () => (await mailTo(bought.buyer.email!)).find((mail) => mail.subject.startsWith('Refund')));
    const notice = await waitFor('the seller’s refund mail', async () => (await mailTo(payee.email!)).find((mail) => mail.subject.includes('was refunded')));
    expect(notice.text).toMatch(/had not been paid out yet/);
    // Again: nothing more to do, and the late webhook is a no-op.
    expect((await reconcilePayments()).refundsRecovered).toBe(0);
    const [late] = await eventsAbout({ id: '', paymentIntent: bought.payment_intent_id }, ['charge.refunded']);
    expect((await deliver(late)).status).toBe(200);
    expect(await mailTo(payee.email!)).toHaveLength(2); // the sale notice and one refund notice
  });
});

describe('the provider’s refusals in plain words', () => {
  it('tells the admin the payment was already refunded, without the provider’s own text', async () => {
    const bought = await sale(await makePerson('money-payee', ['groomer']));
    await payments().refunds.create({ payment_intent: bought.payment_intent_id });
    const error = (await refundPurchase(await makePerson('money-admin', ['admin']), bought.id).catch((caught: unknown) => caught)) as HttpError;
    expect(error).toBeInstanceOf(HttpError);
    expect(error).toMatchObject({ status: 502, code: 'payment-provider', message: 'The payment provider could not refund the payment: the payment was already refunded.' });
    expect(error.extra.details).toEqual({ providerCode: 'charge_already_refunded' });
    // Nothing half-written: the purchase is not marked as a refund asked by the market.
    expect((await db()('purchases').where({ id: bought.id }).first('refund_id')).refund_id).toBeNull();
  });
});
