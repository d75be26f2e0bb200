// The market's queues on the process's job queue (lib/platform/jobs.ts): pictures and packages of
// listings, and the periodic reconciliation of payments. Queueing only; what runs the jobs is in
// lib/market/workers.ts, run by the job-worker processes (services/jobs-worker.ts).
import type PgBoss from 'pg-boss';
import { expiryOf, jobQueue, type JobBudget } from '../platform/jobs';

export const LISTING_ASSETS_QUEUE = 'market-listing-assets';
export const RECONCILE_QUEUE = 'market-reconcile';
export const PRESET_TRANSFER_QUEUE = 'market-preset-transfer';
export const TRIAL_SWEEP_QUEUE = 'market-trial-sweep';
/** When old trials and their files are swept: hourly. */
export const TRIAL_SWEEP_CRON = '41 * * * *';
/** How often payments are reconciled with the provider. */
export const RECONCILE_CRON = '*/10 * * * *';

/** A listing's files, or with `versionId` those of one of its updates waiting for review. */
export type ListingAssetsJobData = { listingId: string; versionId?: string };
export type PresetTransferJobData = { transferId: string };

/** Growing the guides once, six pictures, a preview and a package of every format (see lib/studio/jobs.ts). */
export const LISTING_ASSETS_BUDGET: JobBudget = { seconds: 10 * 60, memoryMb: 1536 };

/**
 * A listing's spec carried onto a buyer's surface: two surfaces read and prepared (as the studio's
 * move, lib/studio/jobs.ts), and for a trial the guides grown there and three small pictures.
 */
export const PRESET_TRANSFER_BUDGET: JobBudget = { seconds: 6 * 60, memoryMb: 2048 };

const MARKET_QUEUES: PgBoss.Queue[] = [
  { name: LISTING_ASSETS_QUEUE, retryLimit: 3, retryDelay: 30, retryBackoff: true, expireInSeconds: expiryOf(LISTING_ASSETS_BUDGET) },
  { name: RECONCILE_QUEUE, retryLimit: 3, retryDelay: 30, retryBackoff: true },
  // Tried again only when its worker vanished: the job records its own failures on its row.
  { name: PRESET_TRANSFER_QUEUE, retryLimit: 1, retryDelay: 5, expireInSeconds: expiryOf(PRESET_TRANSFER_BUDGET) },
  { name: TRIAL_SWEEP_QUEUE, retryLimit: 0, expireInSeconds: 10 * 60 },
];

/** The job queue of this process, with the market's queues made. */
export function marketBoss(): Promise<PgBoss> {
  return jobQueue('market', MARKET_QUEUES);
}

/** Queues the pictures and package of a listing; one queued job per listing at a time. */
export async function enqueueListingAssets(listingId: string): Promise<void> {
  const boss = await marketBoss();
  await boss.send(LISTING_ASSETS_QUEUE, { listingId } satisfies ListingAssetsJobData, { singletonKey: listingId });
}

/** Queues the pictures and package of a listing's update (lib/market/version-assets.ts); one queued job per update. */
export async function enqueueListingVersionAssets(listingId: string, versionId: string): Promise<void> {
  const boss = await marketBoss();
  await boss.send(LISTING_ASSETS_QUEUE, { listingId, versionId } satisfies ListingAssetsJobData, { singletonKey: `version-${versionId}` });
}

/** Queues the carrying of a listing's spec onto a buyer's surface (a fit or a trial). */
export async function enqueuePresetTransfer(data: PresetTransferJobData): Promise<void> {
  await (await marketBoss()).send(PRESET_TRANSFER_QUEUE, data);
}
