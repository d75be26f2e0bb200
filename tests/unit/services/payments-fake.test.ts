// The payments fake through the real `stripe` SDK, in this process on loopback: the answers the
// market relies on but its integration tests do not reach (idempotent replays, partial and
// excess refunds, transfers beyond the balance, expiring, paging, webhook retries).
import { createServer, type Server } from 'node:http';
import { type AddressInfo } from 'node:net';
import Stripe from 'stripe';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { startPaymentsFake } from '@/services/payments-fake/index';

const SECRET_KEY = 'sk_test_payments_fake_unit';
const WEBHOOK_SECRET = 'whsec_payments_fake_unit';

async function freePort(): Promise<number> {
  const probe = createServer();
  await new Promise<void>((resolve) => probe.listen(0, '127.0.0.1', () => resolve()));
  const { port } = probe.address() as AddressInfo;
  await new Promise<void>((resolve) => probe.close(() => resolve()));
  return port;
}

/** A webhook endpoint that refuses the first delivery of each event, then verifies and keeps it. */
function flakyEndpoint() {
  const attempts = new Map<string, number>();
  const received: Stripe.Event[] = [];
  const server = createServer((request, response) => {
    const chunks: Buffer[] = [];
    request.on('data', (chunk: Buffer) => chunks.push(chunk));
    request.on('end', () => {
      const payload = Buffer.concat(chunks).toString('utf8');
      const event = stripe.webhooks.constructEvent(payload, String(request.headers['stripe-signature']), WEBHOOK_SECRET);
      const attempt = (attempts.get(event.id) ?? 0) + 1;
      attempts.set(event.id, attempt);
      if (attempt === 1) {
        response.writeHead(500).end();
        return;
      }
      received.push(event);
      response.writeHead(200).end();
    });
  });
  return { server, attempts, received };
}

let stripe: Stripe;
let fake: { url: string; close: () => Promise<void> };
const endpoint = flakyEndpoint();

beforeAll(async () => {
  const port = await freePort();
  await new Promise<void>((resolve) => endpoint.server.listen(0, '127.0.0.1', () => resolve()));
  const webhookUrl = `http://127.0.0.1:${(endpoint.server.address() as AddressInfo).port}/`;
  fake = await startPaymentsFake({ port, secretKey: SECRET_KEY, webhookUrl, webhookSecret: WEBHOOK_SECRET, retryDelaysMs: [0, 20] });
  stripe = new Stripe(SECRET_KEY, { telemetry: false, maxNetworkRetries: 0, host: '127.0.0.1', port, protocol: 'http' });
});

afterAll(async () => {
  await fake?.close();
  await new Promise<void>((resolve) => (endpoint.server as Server).close(() => resolve()));
});

function openSession(unitAmount: number, currency = 'eur') {
  return stripe.checkout.sessions.create({
    mode: 'payment',
    success_url: 'http://127.0.0.1/paid?session={CHECKOUT_SESSION_ID}',
    line_items: [{ quantity: 1, price_data: { currency, unit_amount: unitAmount, product_data: { name: 'Short coat preset' } } }],
  });
}

/** Pays a session on the hosted page with a test card; the page's answer. */
function payOnPage(session: Stripe.Checkout.Session, card: string) {
  return fetch(session.url!, { method: 'POST', body: new URLSearchParams({ card, expiry: '12/34', cvc: '123' }), redirect: 'manual' });
}

async function paidIntent(unitAmount: number, currency = 'eur'): Promise<string> {
  const session = await openSession(unitAmount, currency);
  const page = await payOnPage(session, '4242 4242 4242 4242');
  expect(page.status).toBe(303);
  expect(page.headers.get('location')).toBe(`http://127.0.0.1/paid?session=${session.id}`);
  return (await stripe.checkout.sessions.retrieve(session.id)).payment_intent as string;
}

async function refusal(promise: Promise<unknown>): Promise<Stripe.errors.StripeError> {
  const error = await promise.then(
    () => undefined,
    (e: unknown) => e,
  );
  expect(error).toBeInstanceOf(Stripe.errors.StripeError);
  return error as Stripe.errors.StripeError;
}

describe('the payments fake', () => {
  it('replays the first answer to a repeated Idempotency-Key, errors included', async () => {
    const first = await stripe.accounts.create({ type: 'express' }, { idempotencyKey: 'seller-1' });
    const again = await stripe.accounts.create({ type: 'express' }, { idempotencyKey: 'seller-1' });
    expect(again.id).toBe(first.id);
    expect(again.lastResponse.headers['idempotent-replayed']).toBe('true');
    const params = { amount: 10_000, currency: 'usd', destination: first.id };
    const refused = await refusal(stripe.transfers.create(params, { idempotencyKey: 'payout-1' }));
    expect(refused.code).toBe('balance_insufficient');
    expect((await refusal(stripe.transfers.create(params, { idempotencyKey: 'payout-1' }))).message).toBe(refused.message);
  });

  it('refunds in parts and refuses more than is left, then anything once all is refunded', async () => {
    const intent = await paidIntent(1500);
    const part = await stripe.refunds.create({ payment_intent: intent, amount: 500 });
    expect(part).toMatchObject({ amount: 500, currency: 'eur', status: 'succeeded' });
    const tooMuch = await refusal(stripe.refunds.create({ payment_intent: intent, amount: 1001 }));
    expect(tooMuch).toMatchObject({ statusCode: 400, code: 'amount_too_large', param: 'amount' });
    expect(tooMuch.message).toBe('Refund amount (1001) is greater than unrefunded amount on charge (1000).');
    expect((await stripe.refunds.create({ payment_intent: intent })).amount).toBe(1000);
    const charge = await stripe.charges.retrieve(part.charge as string);
    expect(charge).toMatchObject({ amount_refunded: 1500, refunded: true });
    expect((await refusal(stripe.refunds.create({ charge: charge.id }))).code).toBe('charge_already_refunded');
  });

  it('transfers only what the balance holds, and takes it from the balance', async () => {
    await paidIntent(2000, 'gbp');
    const account = await stripe.accounts.create({ type: 'express', email: 'seller@example.test' });
    const beyond = await refusal(stripe.transfers.create({ amount: 2001, currency: 'gbp', destination: account.id }));
    expect(beyond.code).toBe('balance_insufficient');
    expect(beyond.message).toBe('You have insufficient available funds in your account (20.00 GBP) for this transfer.');
    await stripe.transfers.create({ amount: 1200, currency: 'gbp', destination: account.id });
    const balance = await stripe.balance.retrieve();
    expect(balance.available.find((a) => a.currency === 'gbp')?.amount).toBe(800);
    expect((await stripe.transfers.list({ destination: account.id })).data.map((t) => t.amount)).toEqual([1200]);
  });

  it('expires an open session once, and its page then says so', async () => {
    const session = await openSession(900);
    expect((await stripe.checkout.sessions.expire(session.id)).status).toBe('expired');
    const again = await refusal(stripe.checkout.sessions.expire(session.id));
    expect(again).toMatchObject({ statusCode: 400, param: 'session' });
    const page = await payOnPage(session, '4242424242424242');
    expect(page.status).toBe(409);
    expect(await page.text()).toContain('no longer open (it expired)');
  });

  it('answers a declined card with 402, leaving the session open', async () => {
    const session = await openSession(700);
    const page = await payOnPage(session, '4000 0000 0000 0002');
    expect(page.status).toBe(402);
    expect(await page.text()).toContain('Your card was declined.');
    expect((await stripe.checkout.sessions.retrieve(session.id)).status).toBe('open');
  });

  it('pages lists newest first with starting_after', async () => {
    const intent = await paidIntent(600);
    for (let i = 0; i < 3; i++) await stripe.refunds.create({ payment_intent: intent, amount: 100 });
    const first = await stripe.refunds.list({ limit: 2 });
    expect(first.has_more).toBe(true);
    const rest = await stripe.refunds.list({ limit: 2, starting_after: first.data[1].id });
    const all = await stripe.refunds.list({ limit: 100 });
    expect([...first.data, ...rest.data].map((r) => r.id)).toEqual(all.data.slice(0, first.data.length + rest.data.length).map((r) => r.id));
    const unknown = await refusal(stripe.refunds.list({ starting_after: 're_unknown' }));
    expect(unknown).toMatchObject({ statusCode: 404, code: 'resource_missing', param: 'starting_after' });
  });

  it('says which id is missing, and which URL it does not know', async () => {
    expect(await refusal(stripe.charges.retrieve('ch_nothing'))).toMatchObject({ statusCode: 404, code: 'resource_missing', message: "No such charge: 'ch_nothing'" });
    const unknown = await refusal(stripe.payouts.list());
    expect(unknown).toMatchObject({ statusCode: 404, message: 'Unrecognized request URL (GET: /v1/payouts).' });
  });

  it('delivers signed events again after a refused delivery', async () => {
    const intent = await paidIntent(800);
    await expect.poll(() => endpoint.received.filter((e) => e.type === 'checkout.session.completed' && (e.data.object as Stripe.Checkout.Session).payment_intent === intent).length).toBe(1);
    const completed = endpoint.received.find((e) => (e.data.object as Stripe.Checkout.Session).payment_intent === intent)!;
    expect(endpoint.attempts.get(completed.id)).toBe(2);
    expect((await stripe.events.retrieve(completed.id)).pending_webhooks).toBe(0);
  });
});

describe('the payments fake with a data folder', () => {
  it('remembers sessions, charges, accounts, transfers, the balance and idempotent answers across a restart', async () => {
    const { mkdtemp, readdir, rm } = await import('node:fs/promises');
    const { tmpdir } = await import('node:os');
    const { join } = await import('node:path');
    const dataDir = await mkdtemp(join(tmpdir(), 'payments-fake-'));
    const port = await freePort();
    const client = new Stripe(SECRET_KEY, { telemetry: false, maxNetworkRetries: 0, host: '127.0.0.1', port, protocol: 'http' });
    try {
      let running = await startPaymentsFake({ port, secretKey: SECRET_KEY, dataDir });
      const session = await client.checkout.sessions.create({
        mode: 'payment',
        success_url: 'http://127.0.0.1/paid',
        line_items: [{ quantity: 1, price_data: { currency: 'eur', unit_amount: 3000, product_data: { name: 'Kept coat' } } }],
      });
      expect((await fetch(session.url!, { method: 'POST', body: new URLSearchParams({ card: '4242424242424242', expiry: '12/34', cvc: '123' }), redirect: 'manual' })).status).toBe(303);
      const account = await client.accounts.create({ type: 'express' });
      const transfer = await client.transfers.create({ amount: 1000, currency: 'eur', destination: account.id }, { idempotencyKey: 'kept-payout' });
      const before = await client.balance.retrieve();
      await running.close();

      running = await startPaymentsFake({ port, secretKey: SECRET_KEY, dataDir });
      try {
        expect(await client.checkout.sessions.retrieve(session.id)).toMatchObject({ status: 'complete', payment_status: 'paid', amount_total: 3000 });
        expect((await client.balance.retrieve()).available).toEqual(before.available);
        expect((await client.transfers.list({ destination: account.id })).data.map((t) => t.id)).toEqual([transfer.id]);
        // The same payout asked again after the restart gets the same transfer, not a second one.
        const again = await client.transfers.create({ amount: 1000, currency: 'eur', destination: account.id }, { idempotencyKey: 'kept-payout' });
        expect(again.id).toBe(transfer.id);
        // And new work goes on from there: the rest of the balance can be paid.
        expect((await client.transfers.create({ amount: 2000, currency: 'eur', destination: account.id })).amount).toBe(2000);
        expect((await client.balance.retrieve()).available).toEqual([{ amount: 0, currency: 'eur', source_types: { card: 0 } }]);
      } finally {
        await running.close();
      }
      // Written whole and renamed into place: no temporary file is left behind.
      expect(await readdir(dataDir)).toEqual(['state.json']);
    } finally {
      await rm(dataDir, { recursive: true, force: true });
    }
  });
});
