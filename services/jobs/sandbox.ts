// Runs heavy jobs in a child process per queue (services/jobs/child.ts) and stops a job past its
// budget: time by a timer, memory by V8's heap limit (--max-old-space-size) and by the child's
// resident size, read from /proc (lib/field and lib/groom keep their data in typed arrays, which
// live outside the heap the flag limits). A child stopped that way is replaced at the next job.
// The web server never runs this: only job-worker processes.
import { fork, type ChildProcess } from 'node:child_process';
import { readFile, writeFile } from 'node:fs/promises';
import { setPriority } from 'node:os';
import { fileURLToPath } from 'node:url';
import type { JobBudget, JobKind } from '../../lib/platform/jobs';
import type { JobMessage, JobReply } from './child';

const CHILD = fileURLToPath(new URL('./child.ts', import.meta.url));
/** How often the child's resident size is read while a job runs. */
const MEMORY_SAMPLE_MS = 100;
const PAGE_BYTES = 4096;
/**
 * The scheduling priority of job children (nice 19, the lowest): on a machine the web server shares,
 * a busy core gives the server's requests nearly all of its time (Linux's CFS weighs nice 0 against
 * nice 19 as 1024 to 15, sched(7)), so heavy jobs take longer instead of requests waiting. With
 * nice 10 (1024 to 110) two exports on two cores still held the search's p95 at 92 ms.
 *
 * A task's nice only counts against tasks of its own group, though: where the kernel groups tasks
 * by session (autogroup, sched(7): on by default on desktop and many server kernels, and so on this
 * machine), the CPU is first shared equally between sessions, and a job worker's session got as much
 * as the web server's whatever its children's nice. So each child starts a session of its own
 * (`detached`) and that session's group gets the same nice 19 (/proc/<pid>/autogroup). Detached
 * children still end with their worker: they exit when its channel closes (child.ts).
 */
const JOB_NICENESS = 19;
/** A child left larger than this share of its budget after a job is replaced, so the next job starts with the budget free. */
const RECYCLE_SHARE = 0.5;

export type FailureReason = 'time' | 'memory' | 'stopped' | 'crashed';
export type ChildOutcome = { ok: true } | { ok: false; reason: FailureReason; message: string };

/** Budgets from the code, or the same for every kind from WHORLWIND_JOB_SECONDS / WHORLWIND_JOB_MEMORY_MB (small machines, tests). */
export function effectiveBudget(budget: JobBudget, environment: NodeJS.ProcessEnv = process.env): JobBudget {
  const seconds = Number(environment.WHORLWIND_JOB_SECONDS);
  const memoryMb = Number(environment.WHORLWIND_JOB_MEMORY_MB);
  return {
    seconds: Number.isFinite(seconds) && seconds > 0 ? seconds : budget.seconds,
    memoryMb: Number.isFinite(memoryMb) && memoryMb > 0 ? memoryMb : budget.memoryMb,
  };
}


function describeDuration(seconds: number): string {
  return seconds >= 120 ? `${Math.round(seconds / 60)} minutes` : `${seconds} seconds`;
}

/** The messages a groomer or seller reads on the failed row. */
export function outcomeMessage(kind: Pick<JobKind, 'what' | 'lighter'>, reason: FailureReason, budget: JobBudget): string {
  const { what } = kind;
  const lighter = kind.lighter ? ` ${kind.lighter}` : '';
  switch (reason) {
    case 'time':
      return `${what} took longer than the ${describeDuration(budget.seconds)} a job may run, so it was stopped.${lighter}`;
    case 'memory':
      return `${what} needed more than the ${budget.memoryMb} MB of memory a job may use, so it was stopped.${lighter}`;
    case 'stopped':
      return `${what} was stopped because the server running it shut down. Ask for it again.`;
    case 'crashed':
      return `${what} stopped because of a problem on the server. Try again; if it keeps failing, tell us.`;
  }
}

async function residentBytes(pid: number): Promise<number | null> {
  try {
    const statm = await readFile(`/proc/${pid}/statm`, 'utf8');
    return Number(statm.split(' ')[1]) * PAGE_BYTES;
  } catch {
    return null; // no /proc (not Linux) or the child has ended: the heap limit still holds
  }
}

/** Nice 19 for the child and for its session's group; a kernel without autogroup has no such file. */
async function lowerPriority(pid: number, queue: string): Promise<void> {
  try {
    setPriority(pid, JOB_NICENESS);
  } catch (error) {
    console.error(`[jobs-worker] could not lower the priority of the ${queue} child: ${(error as Error).message}`);
  }
  await writeFile(`/proc/${pid}/autogroup`, String(JOB_NICENESS)).catch(() => {});
}

type Slot = { child: ChildProcess; stderrTail: string; exited: Promise<void> };
const slots = new Map<string, Slot>();
let nextJob = 1;

function childFor(kind: JobKind, budget: JobBudget): Slot {
  const existing = slots.get(kind.queue);
  if (existing && existing.child.exitCode === null && existing.child.signalCode === null && existing.child.connected) return existing;
  const child = fork(CHILD, [kind.queue], {
    execArgv: ['--import', 'tsx', `--max-old-space-size=${budget.memoryMb}`],
    env: process.env,
    stdio: ['ignore', 'inherit', 'pipe', 'ipc'],
    detached: true,
  });
  const slot: Slot = { child, stderrTail: '', exited: new Promise((resolve) => child.once('exit', () => resolve())) };
  if (child.pid !== undefined) void lowerPriority(child.pid, kind.queue);
  child.stderr?.on('data', (chunk: Buffer) => {
    process.stderr.write(chunk);
    slot.stderrTail = (slot.stderrTail + chunk.toString('utf8')).slice(-4000);
  });
  child.on('error', () => {}); // reported through 'exit'
  slots.set(kind.queue, slot);
  void slot.exited.then(() => {
    if (slots.get(kind.queue) === slot) slots.delete(kind.queue);
  });
  return slot;
}

/** Lets go of every idle child (the worker is stopping); each ends when it sees the channel close. */
export async function releaseChildren(): Promise<void> {
  const all = [...slots.values()];
  for (const { child } of all) if (child.connected) child.disconnect();
  await Promise.all(all.map((slot) => slot.exited));
}

/**
 * Runs one job in its queue's child and resolves when the job has ended. `stop` (the worker
 * draining) ends the child at once; the job is then reported 'stopped'.
 */
export function runInChild(kind: JobKind, data: unknown, budget: JobBudget, stop: AbortSignal): Promise<ChildOutcome> {
  const slot = childFor(kind, budget);
  const { child } = slot;
  const job = nextJob++;
  return new Promise((resolve) => {
    let killedFor: 'time' | 'memory' | 'stopped' | null = null;
    const kill = (reason: 'time' | 'memory' | 'stopped') => {
      if (killedFor || child.exitCode !== null) return;
      killedFor = reason;
      child.kill('SIGKILL');
    };
    const timer = setTimeout(() => kill('time'), budget.seconds * 1000);
    let sampling = false;
    const sampler = setInterval(async () => {
      if (sampling || child.pid === undefined) return;
      sampling = true;
      const bytes = await residentBytes(child.pid);
      sampling = false;
      if (bytes !== null && bytes > budget.memoryMb * 1024 * 1024) kill('memory');
    }, MEMORY_SAMPLE_MS);
    const onStop = () => kill('stopped');

    let settled = false;
    const finish = (outcome: ChildOutcome) => {
      if (settled) return;
      settled = true;
      clearTimeout(timer);
      clearInterval(sampler);
      stop.removeEventListener('abort', onStop);
      child.off('message', onReply);
      child.off('exit', onExit);
      resolve(outcome);
    };
    const onReply = async (reply: JobReply) => {
      if (reply.job !== job) return;
      const resident = child.pid === undefined ? null : await residentBytes(child.pid);
      if (resident !== null && resident > RECYCLE_SHARE * budget.memoryMb * 1024 * 1024 && child.connected) child.disconnect();
      finish(reply.ok ? { ok: true } : { ok: false, reason: 'crashed', message: outcomeMessage(kind, 'crashed', budget) });
    };
    const onExit = () => {
      // V8 aborts with this line when the heap limit is reached.
      const reason: FailureReason = killedFor ?? (/heap out of memory|Allocation failed/i.test(slot.stderrTail) ? 'memory' : 'crashed');
      finish({ ok: false, reason, message: outcomeMessage(kind, reason, budget) });
    };
    child.on('message', onReply);
    child.once('exit', onExit);
    if (stop.aborted) onStop();
    else stop.addEventListener('abort', onStop, { once: true });
    child.send({ job, data: data ?? null } satisfies JobMessage, (error) => {
      // The child died before taking the job: reported as a crash by its exit.
      if (!error) return;
      if (child.exitCode !== null || child.signalCode !== null) onExit();
      else child.kill('SIGKILL');
    });
  });
}
