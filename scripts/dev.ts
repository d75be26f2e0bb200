// `npm run dev`: the demo's services, data and job worker(s), with `next dev` (hot reload) instead of a build.
// A change to job code needs a restart of the task: the worker does not reload.
import { demoProfile, migrateAndSeed, startStack } from './lib/stack';
import { startDevServer } from './lib/next-app';
import { log } from './lib/processes';
import { serveUntilStopped } from './lib/serve-task';
import { startJobWorkers } from './lib/job-workers';

await serveUntilStopped('the dev server', async () => {
  const profile = demoProfile();
  await startStack(profile);
  await migrateAndSeed(profile);
  const workers = startJobWorkers(profile);
  const app = await startDevServer(profile);
  log(`next dev is running at http://127.0.0.1:${profile.ports.app} — Ctrl-C stops it and the services.`);
  return [{ label: 'the dev server', process: app }, ...workers.map((worker) => ({ label: 'a job worker', process: worker }))];
});
