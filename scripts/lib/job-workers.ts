// Job-worker processes beside the app (services/jobs-worker.ts): the web server runs no jobs.
// One by default; WORKERS (demo, dev) or TEST_WORKERS (tests) start more, which share the queues
// as workers on other machines would.
import { JOBS_WORKER_ARGS } from '../../services/jobs-worker-process';
import { projectRoot, stackEnvironment, type StackProfile } from './stack';
import { CommandFailed, log, startProcess, type LongRunning } from './processes';

const MOST_WORKERS = 16;

export function workerCount(profile: StackProfile): number {
  const variable = profile.name === 'test' ? 'TEST_WORKERS' : 'WORKERS';
  const raw = process.env[variable];
  if (raw === undefined || raw === '') return 1;
  const count = Number(raw);
  if (!Number.isInteger(count) || count < 0 || count > MOST_WORKERS) {
    throw new CommandFailed(`${variable}=${raw} is not a number of job workers (0–${MOST_WORKERS}).`);
  }
  return count;
}

/** Starts the profile's job workers; each is stopped (and drains) at shutdown like every child. */
export function startJobWorkers(profile: StackProfile): LongRunning[] {
  const count = workerCount(profile);
  log(count === 1 ? 'starting a job worker' : `starting ${count} job workers`);
  return Array.from({ length: count }, () => startProcess(process.execPath, JOBS_WORKER_ARGS, { cwd: projectRoot, env: stackEnvironment(profile) }));
}
