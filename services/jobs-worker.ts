// A job-worker process: runs every area's queues (the studio's exports, thumbnails and upload
// sweep; the market's listing pictures and packages and its reconciliation). The web server runs
// no jobs; `npm run demo`, `npm run dev` and `npm test` start one of these beside the app
// (WORKERS / TEST_WORKERS start more), and any number on any number of machines share the queues:
//   node --import tsx services/jobs-worker.ts        (DATABASE_URL and S3_* as for the app)
// Heavy jobs run in a child process per queue, each job within its time and memory budgets
// (services/jobs/sandbox.ts).
// SIGTERM or SIGINT drains: no new jobs are taken, a running job gets WHORLWIND_DRAIN_SECONDS
// (default 6, under the scripts' 10 s before they kill) to finish, is then stopped and marked
// failed with a message saying so, and the process exits 0.
import { pathToFileURL } from 'node:url';
import type PgBoss from 'pg-boss';
import { closeDb } from '../lib/platform/db';
import { stopJobs, type JobKind } from '../lib/platform/jobs';
import { AREAS } from './jobs/areas';
import { effectiveBudget, releaseChildren, runInChild } from './jobs/sandbox';
import { JOBS_WORKER_READY } from './jobs/ready';

const DEFAULT_DRAIN_SECONDS = 6;

function log(message: string) {
  console.log(`[jobs-worker] ${message}`);
}

type Worker = { boss: PgBoss; queues: string[]; running: Set<Promise<void>>; stopNow: AbortController };

async function handle(worker: Worker, kind: JobKind, job: PgBoss.Job<unknown>): Promise<void> {
  if (!kind.budget) {
    await kind.run(job.data as never);
    return;
  }
  const budget = effectiveBudget(kind.budget);
  const outcome = await runInChild(kind, job.data, budget, worker.stopNow.signal);
  if (outcome.ok) return;
  console.error(`[jobs-worker] ${kind.queue} job ${job.id} ${outcome.reason}: ${outcome.message}`);
  await kind.fail?.(job.data as never, outcome.message);
}

/** Starts working on every queue; resolves once the worker takes jobs. */
export async function startWorker(): Promise<Worker> {
  const worker: Worker = { boss: undefined as unknown as PgBoss, queues: [], running: new Set(), stopNow: new AbortController() };
  for (const area of AREAS) {
    const boss = await area.boss();
    worker.boss = boss;
    for (const kind of area.kinds) {
      await boss.work(kind.queue, { batchSize: 1, pollingIntervalSeconds: kind.pollingSeconds }, async ([job]) => {
        const run = handle(worker, kind, job);
        worker.running.add(run);
        try {
          await run;
        } finally {
          worker.running.delete(run);
        }
      });
      worker.queues.push(kind.queue);
    }
    await area.onStart?.(boss);
  }
  return worker;
}

/** Stops taking jobs, gives the running ones `graceSeconds`, stops what is left (marked failed), and stops the queue. */
export async function drainWorker(worker: Worker, graceSeconds: number): Promise<void> {
  for (const queue of worker.queues) await worker.boss.offWork(queue);
  const settled = Promise.allSettled([...worker.running]);
  const grace = setTimeout(() => worker.stopNow.abort(), graceSeconds * 1000);
  await settled;
  clearTimeout(grace);
  await releaseChildren();
  await stopJobs(5_000);
}

if (process.argv[1] && import.meta.url === pathToFileURL(process.argv[1]).href) {
  const drainSeconds = Number(process.env.WHORLWIND_DRAIN_SECONDS ?? DEFAULT_DRAIN_SECONDS);
  // pg-boss completes a job without waiting; a completion cut short by the stop is logged, not fatal.
  process.on('unhandledRejection', (error) => console.error('[jobs-worker] unhandled:', error));
  const worker = await startWorker();
  log(`${JOBS_WORKER_READY}: working on ${worker.queues.join(', ')} (pid ${process.pid}); SIGTERM drains and stops`);
  let stopping = false;
  const stop = async (signal: string) => {
    if (stopping) return;
    stopping = true;
    log(`${signal}: taking no new jobs; running ones get ${drainSeconds} s`);
    await drainWorker(worker, Number.isFinite(drainSeconds) && drainSeconds >= 0 ? drainSeconds : DEFAULT_DRAIN_SECONDS);
    await closeDb();
    log('stopped');
    process.exit(0);
  };
  process.on('SIGINT', () => void stop('SIGINT'));
  process.on('SIGTERM', () => void stop('SIGTERM'));
}
