// The line a job-worker process prints once it takes jobs ("[jobs-worker] ready: …"), which its
// launcher (services/jobs-worker-process.ts) waits for.
export const JOBS_WORKER_READY = 'ready';
