// Payments chaos: 1,000 webhook deliveries (real signatures) for 200 paid checkouts, shuffled with
// a fixed seed, each event delivered 1–5 times, refunds interleaved, and the app process that
// answers them killed and restarted twice mid-stream; then reconciliation and payouts. Afterwards:
// exactly one purchase per paid checkout, every refund applied, payouts equal to the sum of the
// eligible purchases, nothing doubled, nothing lost.
//
// "The app" is a process of its own serving the real webhook route over HTTP
// (tests/integration/webhook-process.ts, its PostgreSQL connections named chaos-<n> through
// application_name). A kill is SIGKILL while deliveries are in flight: the operating system closes
// its sockets, PostgreSQL rolls back its open transactions, the provider gets no answer. The next
// 60 deliveries meet a closed port; then a new process starts. The provider does not retry what
// was lost: reconciliation must find it.
//
// Deterministic: the order and repetition of deliveries, the refunds and the kill points follow a
// fixed seed; only which in-flight deliveries a kill catches depends on timing, and the checks
// below hold whatever it catches.
import { fork, type ChildProcess } from 'node:child_process';
import { fileURLToPath } from 'node:url';
import type Stripe from 'stripe';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { closeDb, db } from '@/lib/platform/db';
import { payments } from '@/lib/platform/payments';
import { startCheckout } from '@/lib/market/payments/checkout';
import type { Actor } from '@/lib/accounts/actor';
import { insertListing, makePerson, payOnHostedPage, shuffle, signedRequest } from './market-helpers';

const CHECKOUTS = 200;
const DELIVERIES = 1000;
const SELLERS = 10;
const BUYERS = 20;
const REFUNDED = 40;
const CONCURRENCY = 8;
const DOWNTIME = 60;
const KILL_AT = [330, 660];
const SEED = 20261204;

/** A small seeded generator (mulberry32), so the same run makes the same choices. */
function random(seed: number) {
  let a = seed;
  return () => {
    a = (a + 0x6d2b79f5) | 0;
    let t = Math.imul(a ^ (a >>> 15), 1 | a);
    t = (t + Math.imul(t ^ (t >>> 7), 61 | t)) ^ t;
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

const WEBHOOK_PROCESS = fileURLToPath(new URL('./webhook-process.ts', import.meta.url));
const PROJECT_ROOT = fileURLToPath(new URL('../..', import.meta.url));

type App = { name: string; child: ChildProcess; url: string };

/** Starts the app: a process serving the webhook route, with connections named after it. */
async function boot(n: number): Promise<App> {
  const name = `chaos-${n}`;
  const databaseUrl = new URL(process.env.DATABASE_URL!);
  databaseUrl.searchParams.set('application_name', name);
  const child = fork(WEBHOOK_PROCESS, [], {
    cwd: PROJECT_ROOT,
    execArgv: ['--import', 'tsx'],
    env: { ...process.env, DATABASE_URL: databaseUrl.toString() },
    stdio: ['ignore', 'inherit', 'inherit', 'ipc'],
  });
  const port = await new Promise<number>((resolve, reject) => {
    child.once('message', (message) => resolve((message as { port: number }).port));
    child.once('exit', (code) => reject(new Error(`the webhook process ${name} exited (code ${code}) before it listened`)));
  });
  return { name, child, url: `http://127.0.0.1:${port}/api/payments/webhook` };
}

/** Kills the app process (SIGKILL); the number of its PostgreSQL connections open at that moment. */
async function kill(app: App): Promise<number> {
  const open = Number((await db()('pg_stat_activity').where({ application_name: app.name }).count({ n: '*' }))[0].n);
  const exited = new Promise((resolve) => app.child.once('exit', resolve));
  app.child.kill('SIGKILL');
  await exited;
  return open;
}

/** One delivery as the provider makes it: signed, POSTed; true when the app answered 200. */
async function post(url: string, event: Stripe.Event): Promise<boolean> {
  const payload = JSON.stringify(event);
  const response = await fetch(url, { method: 'POST', headers: signedRequest(payload).headers, body: payload });
  await response.arrayBuffer();
  return response.status === 200;
}

const baseHoldDays = process.env.MARKET_PAYOUT_HOLD_DAYS;
let reconcilePayments: typeof import('@/lib/market/payments/reconcile').reconcilePayments;
let requestPayout: typeof import('@/lib/market/payouts').requestPayout;
let live: App | undefined;
let sellers: Actor[];
let sessions: Stripe.Checkout.Session[];
let refundedIntents: Set<string>;
let events: Stripe.Event[];

beforeAll(async () => {
  // Sales are paid out at once in this run (the holding period is tested in market-money); set
  // before anything reads the settings.
  process.env.MARKET_PAYOUT_HOLD_DAYS = '0';
  ({ reconcilePayments } = await import('@/lib/market/payments/reconcile'));
  ({ requestPayout } = await import('@/lib/market/payouts'));
  sellers = [];
  for (let i = 0; i < SELLERS; i++) sellers.push(await makePerson(`chaos-seller-${i}`, ['groomer']));
  const buyers: Actor[] = [];
  for (let i = 0; i < BUYERS; i++) buyers.push(await makePerson(`chaos-buyer-${i}`, ['buyer']));
  // One listing per seller, prices chosen so that the fee rounds both ways.
  const listings = [];
  for (let i = 0; i < SELLERS; i++) listings.push(await insertListing(sellers[i], { priceCents: 1000 + 137 * i, title: `Chaos coat ${i}` }));
  // 200 checkouts: every buyer buys every listing once, paid on the hosted page.
  sessions = [];
  for (const buyer of buyers) {
    for (const listingId of listings) {
      const checkout = await startCheckout(buyer, listingId);
      expect((await payOnHostedPage(checkout.url, '4242424242424242')).status).toBe(303);
      sessions.push(await payments().checkout.sessions.retrieve(checkout.sessionId));
    }
  }
  // Refunds asked at the provider for 40 of them (their events go into the same stream).
  const pick = shuffle(sessions, SEED).slice(0, REFUNDED);
  refundedIntents = new Set(pick.map((s) => s.payment_intent as string));
  for (const session of pick) await payments().refunds.create({ payment_intent: session.payment_intent as string }, { idempotencyKey: `chaos-refund-${session.id}` });
  // Every event the provider made about these payments.
  const ours = new Set([...sessions.map((s) => s.id), ...sessions.map((s) => s.payment_intent as string)]);
  events = [];
  for await (const event of payments().events.list({ limit: 100 })) {
    const object = event.data.object as { id?: string; payment_intent?: string | null };
    if (ours.has(object.id ?? '') || ours.has(object.payment_intent ?? '')) events.push(event);
  }
}, 300_000);

afterAll(async () => {
  live?.child.kill('SIGKILL');
  await closeDb();
  // Other files in this process keep the stack's settings.
  if (baseHoldDays === undefined) delete process.env.MARKET_PAYOUT_HOLD_DAYS;
  else process.env.MARKET_PAYOUT_HOLD_DAYS = baseHoldDays;
});

describe('payments chaos', () => {
  it('ends with one purchase per paid checkout, every refund applied and payouts equal to what was earned, after two kills', async () => {
    expect(events.length).toBe(CHECKOUTS * 2 + REFUNDED * 2); // payment_intent.succeeded + checkout.session.completed; charge.refunded + refund.created
    // Each event once, plus 1,000 − events more, spread at random, at most 5 per event; then shuffled.
    const rand = random(SEED);
    const times = events.map(() => 1);
    for (let extra = DELIVERIES - events.length; extra > 0; ) {
      const i = Math.floor(rand() * events.length);
      if (times[i] < 5) {
        times[i] += 1;
        extra -= 1;
      }
    }
    const deliveries = shuffle(
      events.flatMap((event, i) => Array.from({ length: times[i] }, () => event)),
      SEED,
    );
    expect(deliveries).toHaveLength(DELIVERIES);

    const counts = { delivered: 0, acknowledged: 0, droppedByKill: 0, refusedWhileDown: 0, connectionsAtKill: 0 };
    const acknowledged = new Set<string>();
    let app = (live = await boot(1));
    let running = new Set<Promise<void>>();
    let generation = 0;
    for (let i = 0; i < deliveries.length; i++) {
      const kill_ = KILL_AT.indexOf(i);
      if (kill_ >= 0) {
        // Killed mid-stream: whatever is in flight gets no answer.
        counts.connectionsAtKill += await kill(app);
        generation += 1;
        await Promise.allSettled([...running]);
        running = new Set();
        // Down for a while: these deliveries meet a closed port.
        const end = Math.min(deliveries.length, i + DOWNTIME);
        for (; i < end; i++) {
          counts.delivered += 1;
          if (!(await post(app.url, deliveries[i]).catch(() => false))) counts.refusedWhileDown += 1;
        }
        app = live = await boot(kill_ + 2);
      }
      if (i >= deliveries.length) break;
      if (running.size >= CONCURRENCY) await Promise.race(running);
      const event = deliveries[i];
      const mine = generation;
      const url = app.url;
      counts.delivered += 1;
      const work: Promise<void> = (async () => {
        const ok = await post(url, event).catch(() => false);
        if (mine !== generation) {
          counts.droppedByKill += 1;
          return;
        }
        if (ok) {
          counts.acknowledged += 1;
          acknowledged.add(event.id);
        }
      })();
      running.add(work);
      void work.finally(() => running.delete(work));
    }
    await Promise.allSettled([...running]);
    expect(counts.refusedWhileDown).toBe(KILL_AT.length * DOWNTIME);

    const lostEvents = events.filter((event) => !acknowledged.has(event.id));
    const beforeReconcile = Number((await db()('purchases').whereIn('checkout_session_id', sessions.map((s) => s.id)).count({ n: '*' }))[0].n);
    const reconciled = await reconcilePayments();

    // The stream lost some events for good (all their deliveries met a dead or down app): reconciliation found them.
    expect(lostEvents.length).toBeGreaterThan(0);
    expect(reconciled.recovered + reconciled.refundsRecovered).toBeGreaterThan(0);
    // Every acknowledged event was kept (a 200 means committed); a rolled-back one left no row.
    const handled = new Set(await db()('payment_events').whereIn('event_id', events.map((e) => e.id)).pluck('event_id'));
    expect([...acknowledged].filter((id) => !handled.has(id))).toEqual([]);

    // Exactly one purchase per paid checkout; refunded ones refunded, the others paid.
    const rows = await db()('purchases').whereIn('checkout_session_id', sessions.map((s) => s.id)).select('checkout_session_id', 'payment_intent_id', 'status', 'amount_cents', 'platform_fee_cents', 'seller_id', 'listing_id');
    expect(rows).toHaveLength(CHECKOUTS);
    expect(new Set(rows.map((r) => r.checkout_session_id)).size).toBe(CHECKOUTS);
    for (const row of rows) expect({ intent: row.payment_intent_id, status: row.status }).toEqual({ intent: row.payment_intent_id, status: refundedIntents.has(row.payment_intent_id) ? 'refunded' : 'paid' });
    // Each listing's sales count is its paid purchases; each session's amount is the listing's price.
    for (const listingId of new Set(rows.map((r) => r.listing_id))) {
      const paid = rows.filter((r) => r.listing_id === listingId && r.status === 'paid').length;
      expect((await db()('listings').where({ id: listingId }).first('sales_count', 'price_cents')).sales_count).toBe(paid);
    }

    // Payouts: two clicks at once per seller, one payout each, equal to the seller's share of the kept sales.
    let paidOut = 0;
    let earned = 0;
    for (const seller of sellers) {
      const settled = await Promise.allSettled([requestPayout(seller), requestPayout(seller)]);
      const ids = new Set(settled.filter((s) => s.status === 'fulfilled').map((s) => (s as PromiseFulfilledResult<{ id: string }>).value.id));
      expect(ids.size).toBe(1);
      const mine = rows.filter((r) => r.seller_id === seller.userId && r.status === 'paid');
      const expected = mine.reduce((sum, r) => sum + r.amount_cents - r.platform_fee_cents, 0);
      const account = await db()('seller_accounts').where({ user_id: seller.userId }).first('account_id');
      const transfers = (await payments().transfers.list({ destination: account.account_id, limit: 100 })).data;
      expect(transfers.map((t) => t.amount)).toEqual([expected]);
      paidOut += transfers[0].amount;
      earned += expected;
    }
    expect(paidOut).toBe(earned);

    const refunded = rows.filter((r) => r.status === 'refunded').length;
    console.log(
      [
        `payments chaos: ${CHECKOUTS} checkouts, ${events.length} events, ${DELIVERIES} deliveries planned`,
        `  sent ${counts.delivered}, acknowledged ${counts.acknowledged}, in flight at the 2 kills (SIGKILL) ${counts.droppedByKill} (${counts.connectionsAtKill} database connections open), refused while down ${counts.refusedWhileDown}`,
        `  events never acknowledged ${lostEvents.length} (completed checkouts ${lostEvents.filter((e) => e.type === 'checkout.session.completed').length}, refunds ${lostEvents.filter((e) => e.type === 'charge.refunded').length})`,
        `  purchases before reconciliation ${beforeReconcile}; reconciliation recorded ${reconciled.recovered} purchases and ${reconciled.refundsRecovered} refunds`,
        `  purchases ${rows.length} (paid ${rows.length - refunded}, refunded ${refunded} of ${REFUNDED} asked); payouts ${sellers.length}, ${(paidOut / 100).toFixed(2)} in all = the sellers' share of the kept sales`,
      ].join('\n'),
    );
  }, 300_000);
});
