// The studio's background work on pg-boss, in the same PostgreSQL: exports, thumbnails, and the
// hourly sweep of abandoned uploads.
// Any process may queue; workers (lib/studio/workers.ts) run inside the Next.js server
// (instrumentation.ts) or in a worker process of their own (services/jobs-worker.ts), and any
// number of them share the queues.
import PgBoss from 'pg-boss';
import { env } from '../env';

export const EXPORT_QUEUE = 'studio-export';
export const THUMBNAIL_QUEUE = 'studio-thumbnail';
export const UPLOAD_SWEEP_QUEUE = 'studio-upload-sweep';
/** When abandoned uploads are swept: hourly. */
export const UPLOAD_SWEEP_CRON = '23 * * * *';

export type ExportJobData = { exportId: string };
/** Without `versionId`, the groom's saved spec is rendered; with it, that version's spec. */
export type ThumbnailJobData = { groomId: string; versionId?: string };

type Holder = typeof globalThis & { whorlwindStudioBoss?: Promise<PgBoss> };
const holder = globalThis as Holder;

async function startBoss(): Promise<PgBoss> {
  const boss = new PgBoss({ connectionString: env().DATABASE_URL, schema: 'pgboss', max: 4 });
  boss.on('error', (error) => console.error(`[studio] job queue: ${error.message}`));
  await boss.start();
  // A job is only tried again when its worker vanished (the job expired): the handlers record
  // every failure they meet on the export itself and end the job.
  await boss.createQueue(EXPORT_QUEUE, { name: EXPORT_QUEUE, retryLimit: 1, retryDelay: 5, expireInSeconds: 30 * 60 });
  await boss.createQueue(THUMBNAIL_QUEUE, { name: THUMBNAIL_QUEUE, retryLimit: 1, retryDelay: 5, expireInSeconds: 10 * 60 });
  await boss.createQueue(UPLOAD_SWEEP_QUEUE, { name: UPLOAD_SWEEP_QUEUE, retryLimit: 0, expireInSeconds: 10 * 60 });
  return boss;
}

/** The job queue of this process, started on first use. */
export function studioBoss(): Promise<PgBoss> {
  holder.whorlwindStudioBoss ??= startBoss().catch((error) => {
    holder.whorlwindStudioBoss = undefined;
    throw error;
  });
  return holder.whorlwindStudioBoss;
}

export async function enqueueExport(data: ExportJobData): Promise<void> {
  await (await studioBoss()).send(EXPORT_QUEUE, data);
}

/**
 * Queues a thumbnail. A thumbnail is a picture of work already saved, so a queue that cannot be
 * reached is logged rather than failing the save that asked for it.
 */
export async function enqueueThumbnail(data: ThumbnailJobData): Promise<void> {
  try {
    await (await studioBoss()).send(THUMBNAIL_QUEUE, data);
  } catch (error) {
    console.error(`[studio] thumbnail of groom ${data.groomId} not queued: ${(error as Error).message}`);
  }
}

/** Stops this process's queue and its workers, letting running jobs finish (scripts and tests that end). */
export async function stopStudioJobs(): Promise<void> {
  const boss = holder.whorlwindStudioBoss;
  holder.whorlwindStudioBoss = undefined;
  if (boss) await (await boss).stop({ graceful: true, wait: true, timeout: 30_000 });
}
