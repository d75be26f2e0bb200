// Runs one heavy job in a child process (services/jobs/child.ts) and stops it past its budget:
// time by a timer, memory by V8's heap limit (--max-old-space-size) and by the child's resident
// size, read from /proc (lib/field and lib/groom keep their data in typed arrays, which live
// outside the heap the flag limits). The web server never runs this: only job-worker processes.
import { spawn } from 'node:child_process';
import { readFile } from 'node:fs/promises';
import { fileURLToPath } from 'node:url';
import type { JobBudget, JobKind } from '../../lib/platform/jobs';

const CHILD = fileURLToPath(new URL('./child.ts', import.meta.url));
/** How often the child's resident size is read. */
const MEMORY_SAMPLE_MS = 100;
const PAGE_BYTES = 4096;

export type ChildOutcome =
  | { ok: true }
  | { ok: false; reason: 'time' | 'memory' | 'stopped' | 'crashed'; message: string };

/** Budgets from the code, or the same for every kind from WHORLWIND_JOB_SECONDS / WHORLWIND_JOB_MEMORY_MB (small machines, tests). */
export function effectiveBudget(budget: JobBudget, environment: NodeJS.ProcessEnv = process.env): JobBudget {
  const seconds = Number(environment.WHORLWIND_JOB_SECONDS);
  const memoryMb = Number(environment.WHORLWIND_JOB_MEMORY_MB);
  return {
    seconds: Number.isFinite(seconds) && seconds > 0 ? seconds : budget.seconds,
    memoryMb: Number.isFinite(memoryMb) && memoryMb > 0 ? memoryMb : budget.memoryMb,
  };
}

const LIGHTER = 'Fewer guides or fewer points per guide make it lighter.';

function describeMinutes(seconds: number): string {
  return seconds >= 120 ? `${Math.round(seconds / 60)} minutes` : `${seconds} seconds`;
}

/** The messages a groomer or seller reads on the failed row. */
export function outcomeMessage(what: string, reason: Exclude<ChildOutcome, { ok: true }>['reason'], budget: JobBudget): string {
  switch (reason) {
    case 'time':
      return `${what} took longer than the ${describeMinutes(budget.seconds)} a job may run, so it was stopped. ${LIGHTER}`;
    case 'memory':
      return `${what} needed more than the ${budget.memoryMb} MB of memory a job may use, so it was stopped. ${LIGHTER}`;
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

/**
 * Runs the job in a child and resolves when the child has ended. `stop` (the worker draining)
 * ends the child at once; the job is then reported 'stopped'.
 */
export function runInChild(kind: JobKind, data: unknown, budget: JobBudget, stop: AbortSignal): Promise<ChildOutcome> {
  return new Promise((resolve) => {
    const child = spawn(process.execPath, ['--import', 'tsx', `--max-old-space-size=${budget.memoryMb}`, CHILD, kind.queue], {
      env: process.env,
      stdio: ['pipe', 'inherit', 'pipe'],
    });
    let stderrTail = '';
    let ended: 'time' | 'memory' | 'stopped' | null = null;
    const kill = (reason: 'time' | 'memory' | 'stopped') => {
      if (ended || child.exitCode !== null) return;
      ended = reason;
      child.kill('SIGKILL');
    };
    child.stderr.on('data', (chunk: Buffer) => {
      process.stderr.write(chunk);
      stderrTail = (stderrTail + chunk.toString('utf8')).slice(-4000);
    });
    child.stdin.on('error', () => {}); // a child that dies before reading its data
    child.stdin.end(JSON.stringify(data ?? null));

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
    if (stop.aborted) onStop();
    else stop.addEventListener('abort', onStop, { once: true });

    const finish = (outcome: ChildOutcome) => {
      clearTimeout(timer);
      clearInterval(sampler);
      stop.removeEventListener('abort', onStop);
      resolve(outcome);
    };
    child.on('error', () => finish({ ok: false, reason: 'crashed', message: outcomeMessage(kind.what, 'crashed', budget) }));
    child.on('exit', (code) => {
      if (code === 0 && !ended) return finish({ ok: true });
      // V8 aborts with this line when the heap limit is reached.
      const reason = ended ?? (/heap out of memory|Allocation failed/i.test(stderrTail) ? 'memory' : 'crashed');
      finish({ ok: false, reason, message: outcomeMessage(kind.what, reason, budget) });
    });
  });
}
