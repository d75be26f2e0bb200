// How a job-worker process is started: the one command the task scripts (scripts/lib/job-workers.ts)
// and the integration tests use, so that tests run jobs the way `npm test`, the demo and
// production do. No imports of the app here: the scripts load this before any configuration.
import { spawn, type ChildProcess } from 'node:child_process';
import { fileURLToPath } from 'node:url';
import { JOBS_WORKER_READY } from './jobs/ready';

export const JOBS_WORKER_ENTRY = fileURLToPath(new URL('./jobs-worker.ts', import.meta.url));
/** node's arguments for a job-worker process. */
export const JOBS_WORKER_ARGS = ['--import', 'tsx', JOBS_WORKER_ENTRY];

export type JobsWorkerProcess = {
  child: ChildProcess;
  /** Everything the worker (and its job children) printed so far. */
  output: () => string;
  exited: Promise<number | null>;
  /** SIGTERM (the worker drains), then its exit code. */
  stop: () => Promise<number | null>;
};

/** Starts a worker with this process's environment and waits until it takes jobs (tests). */
export function startJobsWorkerProcess(environment: NodeJS.ProcessEnv = process.env): Promise<JobsWorkerProcess> {
  const child = spawn(process.execPath, JOBS_WORKER_ARGS, { env: environment, stdio: ['ignore', 'pipe', 'pipe'] });
  let output = '';
  const exited = new Promise<number | null>((resolve) => child.on('exit', (code) => resolve(code)));
  const worker: JobsWorkerProcess = {
    child,
    output: () => output,
    exited,
    stop: async () => {
      if (child.exitCode === null && child.signalCode === null) child.kill('SIGTERM');
      return exited;
    },
  };
  return new Promise((resolve, reject) => {
    const onData = (chunk: Buffer) => {
      output += chunk.toString('utf8');
      if (output.includes(`[jobs-worker] ${JOBS_WORKER_READY}:`)) resolve(worker);
    };
    child.stdout.on('data', onData);
    child.stderr.on('data', onData);
    void exited.then((code) => reject(new Error(`the job worker exited (code ${code}) before it was ready:\n${output}`)));
  });
}
