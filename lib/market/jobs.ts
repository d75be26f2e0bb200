// The market's background work on the process's job queue (lib/platform/jobs.ts): pictures and packages of listings,
// and the periodic reconciliation of payments. Workers run inside the server process and start
// on first use of the market (startMarketWorkers), so any number of app servers share the queue.
import type PgBoss from 'pg-boss';
import { db } from '../platform/db';
import { jobQueue, startWorkers } from '../platform/jobs';
import { buildListingAssets } from './assets';
import { reconcilePayments } from './reconcile';

export const LISTING_ASSETS_QUEUE = 'market-listing-assets';
export const RECONCILE_QUEUE = 'market-reconcile';
/** How often payments are reconciled with the provider. */
export const RECONCILE_CRON = '*/10 * * * *';

const MARKET_QUEUES: PgBoss.Queue[] = [LISTING_ASSETS_QUEUE, RECONCILE_QUEUE].map((name) => ({ name, retryLimit: 3, retryDelay: 30, retryBackoff: true }));

/** The job queue of this process, with the market's queues made. */
export function marketBoss(): Promise<PgBoss> {
  return jobQueue('market', MARKET_QUEUES);
}

/** Starts this process's workers for the market's queues and the reconciliation schedule (once). */
export function startMarketWorkers(): Promise<void> {
  return startWorkers('market', async () => {
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
  });
}

/** Queues the pictures and package of a listing; one queued job per listing at a time. */
export async function enqueueListingAssets(listingId: string): Promise<void> {
  const boss = await marketBoss();
  await boss.send(LISTING_ASSETS_QUEUE, { listingId }, { singletonKey: listingId });
  // Make sure some worker picks it up, also in a server that has not started them yet.
  startMarketWorkers().catch((error) => console.error(`[market] workers did not start: ${(error as Error).message}`));
}
