// `npm run dev`: the demo's services and data, with `next dev` (hot reload) instead of a build.
import { demoProfile, migrateAndSeed, startStack } from './lib/stack';
import { startDevServer } from './lib/next-app';
import { log, shutdown, stopEverythingOnSignals } from './lib/processes';

stopEverythingOnSignals();
const profile = demoProfile();
try {
  await startStack(profile);
  await migrateAndSeed(profile);
  const app = await startDevServer(profile);
  log(`next dev is running at http://127.0.0.1:${profile.ports.app} — Ctrl-C stops it and the services.`);
  await app.exited;
  await shutdown();
  process.exit(0);
} catch (error) {
  console.error(`[whorlwind] the dev server could not start: ${(error as Error).message}`);
  await shutdown();
  process.exit(1);
}
