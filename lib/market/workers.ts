// The market's jobs as a job-worker process (services/jobs-worker.ts) runs them: the pictures and
// package of a listing are heavy (a child process with a time and memory budget), the
// reconciliation schedule is light. Any number of worker processes share the queues.
import { db } from '../platform/db';
import type { AreaJobs, JobKind } from '../platform/jobs';
import { buildListingAssets } from './assets';
import { buildListingVersionAssets } from './version-assets';
import { LISTING_ASSETS_BUDGET, LISTING_ASSETS_QUEUE, marketBoss, PRESET_TRANSFER_BUDGET, PRESET_TRANSFER_QUEUE, RECONCILE_CRON, RECONCILE_QUEUE, TRIAL_SWEEP_CRON, TRIAL_SWEEP_QUEUE, type ListingAssetsJobData, type PresetTransferJobData } from './jobs';
import { failPresetTransfer, runPresetTransfer, sweepOldTrials } from './fitting/transfers';
import { reconcilePayments } from './payments/reconcile';
import { resumePendingPayouts } from './payouts';

const listingAssetsKind: JobKind<ListingAssetsJobData> = {
  queue: LISTING_ASSETS_QUEUE,
  what: 'Making the pictures and package',
  lighter: 'Fewer guides or fewer points per guide make it lighter.',
  pollingSeconds: 1,
  budget: LISTING_ASSETS_BUDGET,
  run: ({ listingId, versionId }) => (versionId ? buildListingVersionAssets(versionId) : buildListingAssets(listingId)),
  fail: async ({ listingId, versionId }, message) => {
    if (versionId) {
      await db()('listing_versions').where({ id: versionId }).whereNot({ assets_status: 'ready' }).update({ assets_status: 'failed', assets_error: message });
      return;
    }
    await db()('listings').where({ id: listingId }).whereNot({ assets_status: 'ready' }).update({ assets_status: 'failed', assets_error: message, updated_at: db().fn.now() });
  },
};

const presetTransferKind: JobKind<PresetTransferJobData> = {
  queue: PRESET_TRANSFER_QUEUE,
  what: 'Fitting the preset to your surface',
  lighter: 'A surface with fewer faces (decimated) is lighter to fit a preset to.',
  pollingSeconds: 1,
  budget: PRESET_TRANSFER_BUDGET,
  run: runPresetTransfer,
  fail: failPresetTransfer,
};

const trialSweepKind: JobKind<unknown> = {
  queue: TRIAL_SWEEP_QUEUE,
  what: 'The sweep of old trials',
  pollingSeconds: 60,
  run: async () => {
    const swept = await sweepOldTrials();
    if (swept > 0) console.log(`[market] removed ${swept} trial(s) older than their keeping time`);
  },
};

const reconcileKind: JobKind<unknown> = {
  queue: RECONCILE_QUEUE,
  what: 'The reconciliation of payments',
  pollingSeconds: 5,
  run: async () => {
    const result = await reconcilePayments();
    if (result.recovered > 0) console.log(`[market] reconciliation recorded ${result.recovered} purchase(s) whose webhook had not arrived`);
    if (result.refundsRecovered > 0) console.log(`[market] reconciliation recorded ${result.refundsRecovered} refund(s) whose webhook had not arrived`);
    const payouts = await resumePendingPayouts();
    if (payouts.resumed > 0) console.log(`[market] finished ${payouts.resumed} payout(s) left pending`);
  },
};

export const MARKET_JOBS: AreaJobs = {
  area: 'market',
  boss: marketBoss,
  kinds: [listingAssetsKind, presetTransferKind, trialSweepKind, reconcileKind],
  onStart: async (boss) => {
    await boss.schedule(RECONCILE_QUEUE, RECONCILE_CRON, {}, { singletonKey: 'market-reconcile' });
    await boss.schedule(TRIAL_SWEEP_QUEUE, TRIAL_SWEEP_CRON);
    // Listings whose pictures were never queued (made by the seed, or a queue that was down), and
    // ready ones built before the reduced public preview (20261208200000_listing_preview), whose
    // preview held every guide, or before their facts (20261208200001_listing_facts): rebuilt
    // once, the package kept as it is.
    const pending = await db()('listings')
      .where({ assets_status: 'pending' })
      .orWhere((ready) => ready.where({ assets_status: 'ready' }).where((old) => old.whereNull('preview_key').orWhereNull('facts')))
      .orderBy('created_at')
      .pluck('id');
    for (const listingId of pending) await boss.send(LISTING_ASSETS_QUEUE, { listingId } satisfies ListingAssetsJobData, { singletonKey: listingId });
    const updates = await db()('listing_versions').where({ assets_status: 'pending', review: 'submitted' }).orderBy('created_at').limit(500).select('id', 'listing_id');
    for (const update of updates) {
      await boss.send(LISTING_ASSETS_QUEUE, { listingId: update.listing_id, versionId: update.id } satisfies ListingAssetsJobData, { singletonKey: `version-${update.id}` });
    }
  },
};
