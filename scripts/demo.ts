// `npm run demo`: starts PostgreSQL and the stand-ins, migrates and seeds the demo scenario,
// builds the app and serves it on http://127.0.0.1:3000 (APP_PORT) with a job worker beside it
// (WORKERS=n for more) until Ctrl-C, which stops
// everything this run started. The demo's data stays in .data/demo between runs.
import { DEMO_ACCOUNTS } from '../db/demo-scenario';
import { ROLE_LABELS } from '../lib/accounts/roles';
import { demoProfile, migrateAndSeed, startStack } from './lib/stack';
import { buildApp, startApp } from './lib/next-app';
import { log } from './lib/processes';
import { serveUntilStopped } from './lib/serve-task';
import { startJobWorkers } from './lib/job-workers';

await serveUntilStopped('the demo', async () => {
  const profile = demoProfile();
  await startStack(profile);
  await migrateAndSeed(profile);
  await buildApp(profile);
  const workers = startJobWorkers(profile);
  const app = await startApp(profile);
  const url = `http://127.0.0.1:${profile.ports.app}`;
  log(`Whorlwind is running at ${url} — Ctrl-C stops it and everything it started.`);
  log(`sent e-mail can be read at ${url}/admin/mail (as the admin). Demo accounts:`);
  for (const account of DEMO_ACCOUNTS) {
    const roles = account.roles.map((role) => ROLE_LABELS[role]).join(', ');
    log(`  ${roles.padEnd(8)} ${account.email}  password: ${account.password}`);
  }
  return [{ label: 'the app server', process: app }, ...workers.map((worker) => ({ label: 'a job worker', process: worker }))];
});
