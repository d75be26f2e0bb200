// Workers for the studio's queues: each job is handed to its plain function in lib/studio, one
// job at a time per queue and process (exports and thumbnails are CPU-bound).
import type { ExportJobData, ThumbnailJobData } from './jobs';
import { EXPORT_QUEUE, stopStudioJobs, studioBoss, THUMBNAIL_QUEUE } from './jobs';
import { runExport } from './exports';
import { renderGroomThumbnail } from './thumbnails';

/** Seconds between looks at an empty queue. */
const POLLING_SECONDS = 1;

type Holder = typeof globalThis & { whorlwindStudioWorkers?: Promise<void> };
const holder = globalThis as Holder;

/** Starts this process's workers (once; later calls wait for the first). */
export function startStudioWorkers(): Promise<void> {
  holder.whorlwindStudioWorkers ??= (async () => {
    const boss = await studioBoss();
    await boss.work<ExportJobData>(EXPORT_QUEUE, { batchSize: 1, pollingIntervalSeconds: POLLING_SECONDS }, async ([job]) => {
      await runExport(job.data);
    });
    await boss.work<ThumbnailJobData>(THUMBNAIL_QUEUE, { batchSize: 1, pollingIntervalSeconds: POLLING_SECONDS }, async ([job]) => {
      await renderGroomThumbnail(job.data);
    });
  })().catch((error) => {
    holder.whorlwindStudioWorkers = undefined;
    throw error;
  });
  return holder.whorlwindStudioWorkers;
}

/** Stops the workers and the queue of this process, letting running jobs finish. */
export async function stopStudioWorkers(): Promise<void> {
  holder.whorlwindStudioWorkers = undefined;
  await stopStudioJobs();
}
