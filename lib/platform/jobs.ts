// The background work of this process: one pg-boss on the app's PostgreSQL (schema pgboss) for
// every area, the studio's queues and the market's alike. Any process may queue; jobs run only in
// job-worker processes (services/jobs-worker.ts), never in the web server, and any number of
// them, on any number of machines, share the queues.
import PgBoss from 'pg-boss';
import { db } from './db';
import { env } from './env';

type Jobs = { boss: Promise<PgBoss>; queues: Map<string, Promise<void>> };
type Holder = typeof globalThis & { whorlwindJobs?: Jobs };
const holder = globalThis as Holder;

async function startBoss(): Promise<PgBoss> {
  const boss = new PgBoss({ connectionString: env().DATABASE_URL, schema: 'pgboss', max: 4 });
  boss.on('error', (error) => console.error(`[jobs] job queue: ${error.message}`));
  await boss.start();
  return boss;
}

/** This process's jobs, started on first use; a start that failed is tried again next time. */
function jobs(): Jobs {
  if (!holder.whorlwindJobs) {
    const started: Jobs = { boss: startBoss(), queues: new Map() };
    started.boss.catch(() => {
      if (holder.whorlwindJobs === started) holder.whorlwindJobs = undefined;
    });
    holder.whorlwindJobs = started;
  }
  return holder.whorlwindJobs;
}

/** Memoised per area and process; a failure is forgotten so that the next call tries again. */
function once(map: Map<string, Promise<void>>, area: string, work: () => Promise<void>): Promise<void> {
  let done = map.get(area);
  if (!done) {
    done = work().catch((error) => {
      map.delete(area);
      throw error;
    });
    map.set(area, done);
  }
  return done;
}

/**
 * Held while a process makes or updates queues: two job workers starting at once on a new database
 * would both find a queue missing and create it together, and pg-boss's creation (a row and a
 * partition table) then deadlocks one of them (PostgreSQL error 40P01, seen with `WORKERS=2`).
 * The number is this project's own; any constant unique among its advisory locks would do.
 */
const QUEUE_SETUP_LOCK = 0x77_686f_726c;

/**
 * The job queue with an area's queues made (once per process; pg-boss keeps them in the database).
 * A queue that exists gets the options of this code (its time budget may have changed since).
 * Processes make queues one at a time (a transaction-level advisory lock, released at its end).
 */
export async function jobQueue(area: string, queues: readonly PgBoss.Queue[]): Promise<PgBoss> {
  const { boss, queues: made } = jobs();
  const started = await boss;
  await once(made, area, () =>
    db().transaction(async (lock) => {
      await lock.raw('SELECT pg_advisory_xact_lock(?)', [QUEUE_SETUP_LOCK]);
      for (const queue of queues) {
        if (!(await started.getQueue(queue.name))) await started.createQueue(queue.name, queue);
        else await started.updateQueue(queue.name, queue);
      }
    }),
  );
  return started;
}

/**
 * What a job-worker process needs to know about one queue. A job with a `budget` is heavy: the
 * worker runs it in a child process of its own, stops it past its time or memory budget, and then
 * calls `fail` so that the row the person watches says why (lib/groom's typed arrays live outside
 * the JavaScript heap, so the memory budget is checked on the child's resident size too).
 */
export type JobKind<Data = never> = {
  queue: string;
  /** The work in a person's words, as the subject of a sentence: "The export". */
  what: string;
  /** What makes the work lighter, said after a stop past its budget: "Fewer guides … make it lighter." */
  lighter?: string;
  pollingSeconds: number;
  run: (data: Data) => Promise<void>;
  budget?: JobBudget;
  /** Marks the job's row failed with a message for the person who asked for it. */
  fail?: (data: Data, message: string) => Promise<void>;
};

export type JobBudget = { seconds: number; memoryMb: number };

/** An area's jobs as a worker process starts them: its queue, its kinds, its schedules. */
export type AreaJobs = {
  area: string;
  boss: () => Promise<PgBoss>;
  // Each kind's Data is its own (JobKind<never> takes them all); the worker hands a job's data
  // only to the kind of its queue.
  kinds: JobKind[];
  /** Schedules and catch-up work a worker does once when it starts. */
  onStart?: (boss: PgBoss) => Promise<void>;
};

/** pg-boss gives a job up (and may try it again) a minute after its time budget: the worker stops it first. */
export function expiryOf(budget: JobBudget): number {
  return budget.seconds + 60;
}

/** Stops this process's queue, letting running jobs finish (scripts, tests and worker processes that end). */
export async function stopJobs(timeoutMs = 30_000): Promise<void> {
  const current = holder.whorlwindJobs;
  holder.whorlwindJobs = undefined;
  if (!current) return;
  const boss = await current.boss.catch(() => null);
  await boss?.stop({ graceful: true, wait: true, timeout: timeoutMs });
}
