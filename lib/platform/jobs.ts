// The background work of this process: one pg-boss on the app's PostgreSQL (schema pgboss) for
// every area, the studio's queues and the market's alike. Any process may queue; workers run
// inside the Next.js server (instrumentation.ts) or in a worker process of their own
// (services/jobs-worker.ts), and any number of them share the queues.
import PgBoss from 'pg-boss';
import { env } from './env';

type Jobs = { boss: Promise<PgBoss>; queues: Map<string, Promise<void>>; workers: Map<string, Promise<void>> };
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
    const started: Jobs = { boss: startBoss(), queues: new Map(), workers: new Map() };
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

/** The job queue with an area's queues made (once per process; pg-boss keeps them in the database). */
export async function jobQueue(area: string, queues: readonly PgBoss.Queue[]): Promise<PgBoss> {
  const { boss, queues: made } = jobs();
  const started = await boss;
  await once(made, area, async () => {
    for (const queue of queues) {
      if (!(await started.getQueue(queue.name))) await started.createQueue(queue.name, queue);
    }
  });
  return started;
}

/** Starts an area's workers once per process (later calls wait for the first start). */
export function startWorkers(area: string, start: () => Promise<void>): Promise<void> {
  return once(jobs().workers, area, start);
}

/** Stops this process's queue and its workers, letting running jobs finish (scripts and tests that end). */
export async function stopJobs(): Promise<void> {
  const current = holder.whorlwindJobs;
  holder.whorlwindJobs = undefined;
  if (!current) return;
  // A start under way finishes first, so that its workers are stopped too.
  await Promise.allSettled(current.workers.values());
  const boss = await current.boss.catch(() => null);
  await boss?.stop({ graceful: true, wait: true, timeout: 30_000 });
}
