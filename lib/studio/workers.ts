// Workers for the studio's queues: each job is handed to its plain function in lib/studio, one
// job at a time per queue and process (exports and thumbnails are CPU-bound), and the schedule
// of the upload sweep.
import type { ExportJobData, ThumbnailJobData } from './jobs';
import { startWorkers } from '../platform/jobs';
import { EXPORT_QUEUE, studioBoss, THUMBNAIL_QUEUE, UPLOAD_SWEEP_CRON, UPLOAD_SWEEP_QUEUE } from './jobs';
import { runExport } from './exports';
import { sweepAbandonedUploads } from './surfaces';
import { renderGroomThumbnail } from './thumbnails';

/** Seconds between looks at an empty queue. */
const POLLING_SECONDS = 1;

/** Starts this process's workers (once; later calls wait for the first). */
export function startStudioWorkers(): Promise<void> {
  return startWorkers('studio', async () => {
    const boss = await studioBoss();
    await boss.work<ExportJobData>(EXPORT_QUEUE, { batchSize: 1, pollingIntervalSeconds: POLLING_SECONDS }, async ([job]) => {
      await runExport(job.data);
    });
    await boss.work<ThumbnailJobData>(THUMBNAIL_QUEUE, { batchSize: 1, pollingIntervalSeconds: POLLING_SECONDS }, async ([job]) => {
      await renderGroomThumbnail(job.data);
    });
    await boss.work(UPLOAD_SWEEP_QUEUE, { batchSize: 1, pollingIntervalSeconds: 60 }, async () => {
      const swept = await sweepAbandonedUploads();
      if (swept > 0) console.log(`[studio] removed ${swept} upload(s) that were never registered`);
    });
    // One schedule for all processes: pg-boss keeps it by queue name and sends each slot once.
    await boss.schedule(UPLOAD_SWEEP_QUEUE, UPLOAD_SWEEP_CRON);
  });
}
