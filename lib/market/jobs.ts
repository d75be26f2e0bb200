// The market's background work on pg-boss (same PostgreSQL): pictures and packages of listings,
// and the periodic reconciliation of payments. Workers run inside the server process and start
// on first use of the market (startMarketWorkers), so any number of app servers share the queue.
import PgBoss from 'pg-boss';
import { db } from '../db';
import { env } from '../env';
import { buildListingAssets } from './assets';
import { reconcilePayments } from './reconcile';

export const LISTING_ASSETS_QUEUE = 'market-listing-assets';
export const RECONCILE_QUEUE = 'market-reconcile';
/** How often payments are reconciled with the provider. */
export const RECONCILE_CRON = '*/10 * * * *';

type Holder = typeof globalThis & { whorlwindMarketBoss?: Promise<PgBoss>; whorlwindMarketWorkers?: Promise<void> };
const holder = globalThis as Holder;

async function startBoss(): Promise<PgBoss> {
  const boss = new PgBoss({ connectionString: env().DATABASE_URL, schema: 'pgboss', max: 4 });
  boss.on('error', (error) => console.error(`[market] job queue: ${error.message}`));
  await boss.start();
  for (const name of [LISTING_ASSETS_QUEUE, RECONCILE_QUEUE]) {
    if (!(await boss.getQueue(name))) await boss.createQueue(name, { name, retryLimit: 3, retryDelay: 30, retryBackoff: true });
  }
  return boss;
}

/** The queue of this process (started once). */
export function marketBoss(): Promise<PgBoss> {
  holder.whorlwindMarketBoss ??= startBoss().catch((error) => {
    holder.whorlwindMarketBoss = undefined;
    throw error;
  });
  return holder.whorlwindMarketBoss;
}

/** Starts this process's workers for the market's queues and the reconciliation schedule (once). */
export function startMarketWorkers(): Promise<void> {
  holder.whorlwindMarketWorkers ??= (async () => {
    const boss = await marketBoss();
    await boss.work<{ listingId: string }>(LISTING_ASSETS_QUEUE, { batchSize: 1, pollingIntervalSeconds: 1 }, async ([job]) => {
      await buildListingAssets(job.data.listingId);
    });
    await boss.work(RECONCILE_QUEUE, { batchSize: 1, pollingIntervalSeconds: 5 }, async () => {
      const result = await reconcilePayments();
      if (result.recovered > 0) console.log(`[market] reconciliation recorded ${result.recovered} purchase(s) whose webhook had not arrived`);
    });
    await boss.schedule(RECONCILE_QUEUE, RECONCILE_CRON, {}, { singletonKey: 'market-reconcile' });
    // Listings whose pictures were never queued (made by the seed, or a queue that was down).
    const pending = await db()('listings').where({ assets_status: 'pending' }).orderBy('created_at').limit(500).pluck('id');
    for (const listingId of pending) await boss.send(LISTING_ASSETS_QUEUE, { listingId }, { singletonKey: listingId });
  })().catch((error) => {
    holder.whorlwindMarketWorkers = undefined;
    throw error;
  });
  return holder.whorlwindMarketWorkers;
}

/** Queues the pictures and package of a listing; one queued job per listing at a time. */
export async function enqueueListingAssets(listingId: string): Promise<void> {
  const boss = await marketBoss();
  await boss.send(LISTING_ASSETS_QUEUE, { listingId }, { singletonKey: listingId });
  // Make sure some worker picks it up, also in a server that has not started them yet.
  startMarketWorkers().catch((error) => console.error(`[market] workers did not start: ${(error as Error).message}`));
}

/** Stops the queue of this process (scripts and tests that end). */
export async function stopMarketJobs(): Promise<void> {
  // Let a start under way finish first, so its workers are stopped too.
  await holder.whorlwindMarketWorkers?.catch(() => undefined);
  const boss = holder.whorlwindMarketBoss;
  holder.whorlwindMarketBoss = undefined;
  holder.whorlwindMarketWorkers = undefined;
  if (boss) await (await boss).stop({ graceful: true, wait: true, timeout: 10_000 });
}
