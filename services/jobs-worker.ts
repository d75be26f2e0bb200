// A job worker of its own for the studio's queues (exports, thumbnails), for running the work
// beside the app servers instead of inside them:
//   node --import tsx services/jobs-worker.ts        (DATABASE_URL and S3_* as for the app)
// The integration tests start the same workers in their own process with startJobsWorker().
import { pathToFileURL } from 'node:url';
import { closeDb } from '../lib/platform/db';
import { stopJobs } from '../lib/platform/jobs';
import { startStudioWorkers } from '../lib/studio/workers';

export type JobsWorker = { stop: () => Promise<void> };

export async function startJobsWorker(): Promise<JobsWorker> {
  await startStudioWorkers();
  return { stop: stopJobs };
}

if (process.argv[1] && import.meta.url === pathToFileURL(process.argv[1]).href) {
  const worker = await startJobsWorker();
  console.log('[jobs-worker] working on the studio queues; Ctrl-C stops after the running jobs');
  let stopping = false;
  const stop = async () => {
    if (stopping) return;
    stopping = true;
    await worker.stop();
    await closeDb();
    process.exit(0);
  };
  process.on('SIGINT', stop);
  process.on('SIGTERM', stop);
}
