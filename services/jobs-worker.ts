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

type Worker = {
  boss: PgBoss;
  queues: string[];
  /** One loop per queue; each ends when the worker drains. */
  loops: Promise<void>[];
  running: Set<Promise<void>>;
  /** Aborted when the worker drains: loops stop taking jobs. */
  draining: AbortController;
  /** Aborted when the drain's grace is over: running heavy jobs are stopped. */
  stopNow: AbortController;
};

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

/** Waits `ms`, or less when the signal aborts. */
function pause(ms: number, signal: AbortSignal): Promise<void> {
  return new Promise((resolve) => {
    const timer = setTimeout(done, ms);
    function done() {
      clearTimeout(timer);
      signal.removeEventListener('abort', done);
      resolve();
    }
    signal.addEventListener('abort', done, { once: true });
  });
}

/**
 * Takes a queue's jobs one at a time, the next as soon as one ends, and looks again after
 * `pollingSeconds` only when the queue is empty. (pg-boss's own `work` waits its polling interval
 * after every job, which caps a queue at one job a second per worker.) Each job is completed or
 * failed here, awaited, so a drain never leaves a finished job active.
 */
async function workQueue(worker: Worker, kind: JobKind): Promise<void> {
  const { boss, draining } = worker;
  while (!draining.signal.aborted) {
    let job: PgBoss.Job<unknown> | undefined;
    try {
      [job] = await boss.fetch<unknown>(kind.queue, { batchSize: 1 });
    } catch (error) {
      console.error(`[jobs-worker] ${kind.queue}: could not fetch a job: ${(error as Error).message}`);
    }
    if (!job) {
      await pause(kind.pollingSeconds * 1000, draining.signal);
      continue;
    }
    const run = handle(worker, kind, job);
    worker.running.add(run);
    try {
      await run;
      await boss.complete(kind.queue, job.id);
    } catch (error) {
      console.error(`[jobs-worker] ${kind.queue} job ${job.id} failed:`, error);
      await boss.fail(kind.queue, job.id, { message: (error as Error).message }).catch(() => {});
    } finally {
      worker.running.delete(run);
    }
  }
}

/** Starts working on every queue; resolves once the worker takes jobs. */
export async function startWorker(): Promise<Worker> {
  const worker: Worker = {
    boss: undefined as unknown as PgBoss,
    queues: [],
    loops: [],
    running: new Set(),
    draining: new AbortController(),
    stopNow: new AbortController(),
  };
  for (const area of AREAS) {
    const boss = await area.boss();
    worker.boss = boss;
    await area.onStart?.(boss);
  }
  for (const area of AREAS) for (const kind of area.kinds) worker.queues.push(kind.queue);
  for (const area of AREAS) for (const kind of area.kinds) worker.loops.push(workQueue(worker, kind));
  return worker;
}

/** Stops taking jobs, gives the running ones `graceSeconds`, stops what is left (marked failed), and stops the queue. */
export async function drainWorker(worker: Worker, graceSeconds: number): Promise<void> {
  worker.draining.abort();
  const grace = setTimeout(() => worker.stopNow.abort(), graceSeconds * 1000);
  await Promise.allSettled(worker.loops);
  clearTimeout(grace);
  await releaseChildren();
  await stopJobs(5_000);
}

if (process.argv[1] && import.meta.url === pathToFileURL(process.argv[1]).href) {
  const drainSeconds = Number(process.env.WHORLWIND_DRAIN_SECONDS ?? DEFAULT_DRAIN_SECONDS);
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
