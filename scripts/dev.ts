// `npm run dev`: the demo's services and data, with `next dev` (hot reload) instead of a build.
import { demoProfile, migrateAndSeed, startStack } from './lib/stack';
import { startDevServer } from './lib/next-app';
import { log } from './lib/processes';
import { serveUntilStopped } from './lib/serve-task';

await serveUntilStopped('the dev server', async () => {
  const profile = demoProfile();
  await startStack(profile);
  await migrateAndSeed(profile);
  const app = await startDevServer(profile);
  log(`next dev is running at http://127.0.0.1:${profile.ports.app} — Ctrl-C stops it and the services.`);
  return app;
});
