// What runs the market's jobs (lib/market/jobs.ts): the pictures and package of a listing, and the
// reconciliation schedule. Started once per server process by instrumentation.ts; any number of
// app servers share the queues.
import { db } from '../platform/db';
import { startWorkers } from '../platform/jobs';
import { buildListingAssets } from './assets';
import { LISTING_ASSETS_QUEUE, marketBoss, RECONCILE_CRON, RECONCILE_QUEUE, type ListingAssetsJobData } from './jobs';
import { reconcilePayments } from './payments/reconcile';
import { resumePendingPayouts } from './payouts';

/** Starts this process's workers for the market's queues and the reconciliation schedule (once). */
export function startMarketWorkers(): Promise<void> {
  return startWorkers('market', async () => {
    const boss = await marketBoss();
    await boss.work<ListingAssetsJobData>(LISTING_ASSETS_QUEUE, { batchSize: 1, pollingIntervalSeconds: 1 }, async ([job]) => {
      await buildListingAssets(job.data.listingId);
    });
    await boss.work(RECONCILE_QUEUE, { batchSize: 1, pollingIntervalSeconds: 5 }, async () => {
      const result = await reconcilePayments();
      if (result.recovered > 0) console.log(`[market] reconciliation recorded ${result.recovered} purchase(s) whose webhook had not arrived`);
      if (result.refundsRecovered > 0) console.log(`[market] reconciliation recorded ${result.refundsRecovered} refund(s) whose webhook had not arrived`);
      const payouts = await resumePendingPayouts();
      if (payouts.resumed > 0) console.log(`[market] finished ${payouts.resumed} payout(s) left pending`);
    });
    await boss.schedule(RECONCILE_QUEUE, RECONCILE_CRON, {}, { singletonKey: 'market-reconcile' });
    // Listings whose pictures were never queued (made by the seed, or a queue that was down).
    const pending = await db()('listings').where({ assets_status: 'pending' }).orderBy('created_at').limit(500).pluck('id');
    for (const listingId of pending) await boss.send(LISTING_ASSETS_QUEUE, { listingId } satisfies ListingAssetsJobData, { singletonKey: listingId });
  });
}
