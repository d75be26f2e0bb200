// Checkout, the signed webhook and purchases against the payments fake: signatures, duplicate
// and shuffled deliveries, declined cards, reconciliation, own and repeated purchases.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { closeDb, db } from '@/lib/platform/db';
import { payments } from '@/lib/platform/payments';
import { startCheckout } from '@/lib/market/payments/checkout';
import { reconcilePayments } from '@/lib/market/payments/reconcile';
import { stopJobs } from '@/lib/platform/jobs';
import { HttpError } from '@/lib/http/errors';
import type { Actor } from '@/lib/accounts/actor';
import { mailTo } from './helpers';
import { deliver, eventsAbout, insertListing, makePerson, payOnHostedPage, serveWebhookRoute, shuffle, signedRequest, waitFor } from './market-helpers';
import { POST as webhookPost } from '@/app/api/payments/webhook/route';

afterAll(async () => {
  await stopJobs();
  await closeDb();
});

let seller: Actor;
beforeAll(async () => {
  seller = await makePerson('seller', ['groomer']);
});

const purchasesOf = (sessionId: string) => db()('purchases').where({ checkout_session_id: sessionId });

/** A buyer pays a listing with the success card; the webhook is not delivered (nobody listens). */
async function paidSession(buyer: Actor, listingId: string) {
  const checkout = await startCheckout(buyer, listingId);
  const paid = await payOnHostedPage(checkout.url, '4242 4242 4242 4242');
  expect(paid.status).toBe(303);
  const session = await payments().checkout.sessions.retrieve(checkout.sessionId);
  return { session, checkout, paid };
}

async function expectMarketError(promise: Promise<unknown>, status: number, code: string) {
  const error = await promise.then(
    () => null,
    (caught: unknown) => caught,
  );
  expect(error).toBeInstanceOf(HttpError);
  expect((error as HttpError).status).toBe(status);
  expect((error as HttpError).code).toBe(code);
}

describe('checkout', () => {
  it('opens a Checkout Session at the price in the database and redirects back after paying', async () => {
    const buyer = await makePerson('buyer', ['buyer']);
    const listingId = await insertListing(seller, { priceCents: 2450, currency: 'gbp' });
    const { session, paid } = await paidSession(buyer, listingId);
    expect(session).toMatchObject({ amount_total: 2450, currency: 'gbp', status: 'complete', payment_status: 'paid' });
    // The fee (MARKET_PLATFORM_FEE_PERCENT, 15 in tests) in whole cents, rounded half up: 24.50 × 15 % = 3.675 → 3.68.
    expect(session.metadata).toMatchObject({ listing_id: listingId, buyer_id: buyer.userId, platform_fee_cents: '368' });
    expect(paid.location).toBe(`${process.env.NEXTAUTH_URL}/library?checkout=success&session_id=${session.id}`);
  });

  it('quotes the market’s fee in whole cents, rounded half up (worked examples at 15 %)', async () => {
    const buyer = await makePerson('buyer', ['buyer']);
    // price → 15 % → fee: 10.01 → 1.5015 → 1.50; 12.90 → 1.935 → 1.94; 1.00 → 0.15 → 0.15; 99.99 → 14.9985 → 15.00.
    const examples = [
      [1001, '150'],
      [1290, '194'],
      [100, '15'],
      [9999, '1500'],
    ] as const;
    for (const [priceCents, fee] of examples) {
      const checkout = await startCheckout(buyer, await insertListing(seller, { priceCents }));
      const session = await payments().checkout.sessions.retrieve(checkout.sessionId);
      expect({ priceCents, fee: session.metadata?.platform_fee_cents }).toEqual({ priceCents, fee });
    }
  });

  it('gives the same open checkout to a second click', async () => {
    const buyer = await makePerson('buyer', ['buyer']);
    const listingId = await insertListing(seller);
    const first = await startCheckout(buyer, listingId);
    const second = await startCheckout(buyer, listingId);
    expect(second.sessionId).toBe(first.sessionId);
    expect(second.reused).toBe(true);
  });

  it('refuses the seller their own listing', async () => {
    const listingId = await insertListing(seller);
    await expectMarketError(startCheckout(seller, listingId), 403, 'own-listing');
  });

  it('refuses a listing that is not published, as if it did not exist', async () => {
    const buyer = await makePerson('buyer', ['buyer']);
    const listingId = await insertListing(seller, { state: 'submitted' });
    await expectMarketError(startCheckout(buyer, listingId), 404, 'not-found');
  });

  it('refuses a buyer who already owns the listing', async () => {
    const buyer = await makePerson('buyer', ['buyer']);
    const listingId = await insertListing(seller);
    const { session } = await paidSession(buyer, listingId);
    const [completed] = await eventsAbout({ id: session.id }, ['checkout.session.completed']);
    expect((await deliver(completed)).status).toBe(200);
    await expectMarketError(startCheckout(buyer, listingId), 409, 'already-owned');
  });

  it('keeps one paid purchase when two checkouts of the same buyer were both paid, refunding the second', async () => {
    const buyer = await makePerson('buyer', ['buyer']);
    const listingId = await insertListing(seller);
    const first = await paidSession(buyer, listingId);
    // A second checkout the market opened earlier (e.g. in an old tab, before the first one); the fake pays it too.
    const secondSession = await payments().checkout.sessions.create({
      mode: 'payment',
      line_items: [{ quantity: 1, price_data: { currency: 'eur', unit_amount: 1200, product_data: { name: 'again' } } }],
      metadata: { listing_id: listingId, buyer_id: buyer.userId, seller_id: seller.userId, platform_fee_cents: '180' },
      success_url: 'http://127.0.0.1/ok',
    });
    await db()('checkout_sessions').insert({
      session_id: secondSession.id,
      listing_id: listingId,
      buyer_id: buyer.userId,
      amount_cents: 1200,
      currency: 'eur',
      url: secondSession.url,
      expires_at: new Date(secondSession.expires_at * 1000),
    });
    await payOnHostedPage(secondSession.url!, '4242424242424242');
    const events = [
      ...(await eventsAbout({ id: first.session.id }, ['checkout.session.completed'])),
      ...(await eventsAbout({ id: secondSession.id }, ['checkout.session.completed'])),
    ];
    await Promise.all(events.map((event) => deliver(event)));
    const rows = await db()('purchases').where({ listing_id: listingId, buyer_id: buyer.userId }).orderBy('created_at');
    expect(rows.map((row) => row.status).sort()).toEqual(['paid', 'refunded']);
    const refunded = rows.find((row) => row.status === 'refunded');
    const charge = await payments().charges.retrieve((await payments().paymentIntents.retrieve(refunded.payment_intent_id)).latest_charge as string);
    expect(charge.refunded).toBe(true);
  });

  it('records nothing for a declined card', async () => {
    const buyer = await makePerson('buyer', ['buyer']);
    const listingId = await insertListing(seller);
    const checkout = await startCheckout(buyer, listingId);
    const declined = await payOnHostedPage(checkout.url, '4000 0000 0000 0002');
    expect(declined.status).toBe(402);
    expect(declined.page).toMatch(/Your card was declined/);
    const session = await payments().checkout.sessions.retrieve(checkout.sessionId);
    expect(session).toMatchObject({ status: 'open', payment_status: 'unpaid' });
    // Whatever the fake sent about it, delivered, records no purchase; reconciliation finds none.
    for (const event of await eventsAbout({ id: checkout.sessionId })) expect((await deliver(event)).status).toBe(200);
    await reconcilePayments();
    expect(await purchasesOf(checkout.sessionId)).toHaveLength(0);
  });
});

describe('the webhook', () => {
  it('accepts the fake’s own signed delivery over HTTP and records the purchase, with mails to both sides', async () => {
    const server = await serveWebhookRoute();
    try {
      const buyer = await makePerson('buyer', ['buyer']);
      const listingId = await insertListing(seller, { title: 'Delivered plush coat' });
      const { session } = await paidSession(buyer, listingId);
      const [purchase] = await waitFor('the purchase', async () => {
        const rows = await purchasesOf(session.id);
        return rows.length > 0 && rows;
      });
      expect(purchase).toMatchObject({ listing_id: listingId, buyer_id: buyer.userId, seller_id: seller.userId, amount_cents: 1200, currency: 'eur', platform_fee_cents: 180, status: 'paid' });
      expect(server.delivered()).toBeGreaterThan(0);
      const receipt = await waitFor('the receipt', async () => (await mailTo(buyer.email!)).find((mail) => mail.subject.startsWith('Receipt')));
      expect(receipt.text).toMatch(/12\.00 EUR/);
      expect(receipt.text).toMatch(/ask a tax adviser where you are/);
      const notice = await waitFor('the sale notice', async () => (await mailTo(seller.email!)).find((mail) => mail.subject.includes('Delivered plush coat')));
      expect(notice.text).toMatch(/Market fee: 1\.80 EUR\. Yours: 10\.20 EUR/);
      expect((await db()('listings').where({ id: listingId }).first('sales_count')).sales_count).toBe(1);
    } finally {
      await server.close();
    }
  });

  it('refuses a missing, wrong or stale signature with 400 and changes nothing', async () => {
    const buyer = await makePerson('buyer', ['buyer']);
    const listingId = await insertListing(seller);
    const { session } = await paidSession(buyer, listingId);
    const [completed] = await eventsAbout({ id: session.id }, ['checkout.session.completed']);
    const payload = JSON.stringify(completed);
    const attempts = [
      signedRequest(payload, { signature: null }),
      signedRequest(payload, { signature: 't=123,v1=deadbeef' }),
      signedRequest(payload, { secret: 'whsec_someone_else' }),
      signedRequest(payload, { timestamp: Math.floor(Date.now() / 1000) - 301 - 60 }),
      // A signature of another body.
      new Request('http://127.0.0.1/api/payments/webhook', {
        method: 'POST',
        headers: { 'stripe-signature': signedRequest('{"id":"evt_other"}').headers.get('stripe-signature')! },
        body: payload,
      }),
    ];
    for (const request of attempts) {
      const response = await webhookPost(request);
      expect(response.status).toBe(400);
      expect((await response.json()).error.code).toBe('bad-signature');
    }
    expect(await purchasesOf(session.id)).toHaveLength(0);
    expect(await db()('payment_events').where({ event_id: completed.id })).toHaveLength(0);
    // The same event, signed properly, is then accepted.
    expect((await deliver(completed)).status).toBe(200);
    expect(await purchasesOf(session.id)).toHaveLength(1);
  });

  it('leaves exactly one purchase per session after 100 duplicate, shuffled, concurrent deliveries', async () => {
    const listingId = await insertListing(seller);
    const sessions = [];
    for (let i = 0; i < 4; i++) sessions.push((await paidSession(await makePerson('buyer', ['buyer']), listingId)).session);
    const events = (await Promise.all(sessions.map((session) => eventsAbout({ id: session.id, paymentIntent: session.payment_intent as string })))).flat();
    expect(events.length).toBeGreaterThanOrEqual(8);
    const deliveries = shuffle(Array.from({ length: 100 }, (_, i) => events[i % events.length]), 11);
    const responses = await Promise.all(deliveries.map((event) => deliver(event)));
    expect(responses.map((response) => response.status)).toEqual(deliveries.map(() => 200));
    const outcomes = await Promise.all(responses.map(async (response) => (await response.json()).data.outcome));
    expect(outcomes.filter((outcome) => outcome !== 'duplicate')).toHaveLength(events.length);
    for (const session of sessions) expect(await purchasesOf(session.id)).toHaveLength(1);
    expect((await db()('listings').where({ id: listingId }).first('sales_count')).sales_count).toBe(4);
  });

  it('records the payment and then the refund when the refund’s event arrives first', async () => {
    const buyer = await makePerson('buyer', ['buyer']);
    const listingId = await insertListing(seller);
    const { session } = await paidSession(buyer, listingId);
    await payments().refunds.create({ payment_intent: session.payment_intent as string });
    const events = await eventsAbout({ id: session.id, paymentIntent: session.payment_intent as string }, ['checkout.session.completed', 'charge.refunded']);
    expect(events.map((event) => event.type)).toEqual(['checkout.session.completed', 'charge.refunded']);
    for (const event of [...events].reverse()) expect((await deliver(event)).status).toBe(200);
    for (const event of events) expect((await (await deliver(event)).json()).data.outcome).toBe('duplicate');
    const rows = await purchasesOf(session.id);
    expect(rows).toHaveLength(1);
    expect(rows[0].status).toBe('refunded');
    expect((await db()('listings').where({ id: listingId }).first('sales_count')).sales_count).toBe(0);
  });
});

describe('reconciliation', () => {
  it('records a paid session whose webhook never arrived, once', async () => {
    const buyer = await makePerson('buyer', ['buyer']);
    const listingId = await insertListing(seller);
    const { session } = await paidSession(buyer, listingId);
    expect(await purchasesOf(session.id)).toHaveLength(0);
    const first = await reconcilePayments();
    expect(first.recovered).toBeGreaterThanOrEqual(1);
    expect(await purchasesOf(session.id)).toHaveLength(1);
    const again = await reconcilePayments();
    expect(again.recovered).toBe(0);
    // The late webhook changes nothing.
    const [completed] = await eventsAbout({ id: session.id }, ['checkout.session.completed']);
    expect((await deliver(completed)).status).toBe(200);
    expect(await purchasesOf(session.id)).toHaveLength(1);
  });
});
