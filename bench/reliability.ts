/**
 * Reliability under heavy work: does the web server keep answering while job workers run the
 * heaviest exports the limits allow?
 *
 *   npm run bench:reliability -- [--seconds 20] [--health-rate 50] [--search-rate 200] [--no-build]
 *
 * It starts a throwaway stack of its own (the BENCH ports of bench/market.ts, .data/bench) in a
 * process of its own (bench/stack-host.ts: the object store stand-in must not share the thread that
 * times the answers), migrates and seeds it (the demo groomer's surfaces and the market's demo listings), builds the app into
 * .next-bench (skip with --no-build to reuse an earlier build), serves it with `next start` beside
 * two job-worker processes (services/jobs-worker.ts, as `WORKERS=2 npm run demo` would), makes a
 * groom at the budget (lib/groom/README.md, "Budgets": 250,000 guides × 16 points on the demo cat)
 * and then measures, with autocannon at a steady rate (requests arriving evenly over each second,
 * answers of the first 3 s left out, and during an export only until it ended):
 *   1. GET /api/health alone (nothing else running);
 *   2. GET /api/health while one USD export of that groom runs (target p95 ≤ 100 ms);
 *   3. the market search at --search-rate req/s and /api/health together while two such exports
 *      run at once, one in each worker (targets: search p95 ≤ 50 ms, health p95 ≤ 100 ms).
 * The search runs over the seeded listings only (bench/market.ts measures it over 10,000). Each
 * export's own time is printed too. Run it on a quiet machine: the two cores are the point.
 */
import { cpus, loadavg } from 'node:os';
import { join } from 'node:path';
import { migrateAndSeed, projectRoot, stackEnvironment, testProfile, type StackProfile } from '../scripts/lib/stack';
import { CommandFailed, log, runCommand, shutdown, startProcess, stopEverythingOnSignals, waitForHttp } from '../scripts/lib/processes';
import { JOBS_WORKER_ARGS } from '../services/jobs-worker-process';
import { DEMO_ACCOUNTS } from '../db/demo-scenario';
import { numberOption, percentile, steadyLoad, tallyOver, useBenchStack, type Tally } from './load';

const SECONDS = numberOption('seconds', 20);
const HEALTH_RATE = numberOption('health-rate', 50);
const SEARCH_RATE = numberOption('search-rate', 200);
const BUILD = !process.argv.includes('--no-build');
const DIST_DIR = '.next-bench';
const WARM_UP_SECONDS = 3;
const TARGETS = { health: 100, search: 50 };
const SEARCHES = ['/api/market/search', '/api/market/search?sort=best-selling', '/api/market/search?sort=rating', '/api/market/search?q=fox', '/api/market/search?animal=cat'];

useBenchStack();

/**
 * `rate` requests a second for WARM_UP + SECONDS s, arriving evenly (see `steadyLoad`), in turn to
 * each of `paths`; with `until`, answers count only until it resolves (the exports ended).
 */
async function steady(url: string, paths: readonly string[], rate: number, until?: Promise<unknown>): Promise<Tally> {
  const tally = tallyOver(performance.now() + WARM_UP_SECONDS * 1000, SECONDS);
  void until?.then(() => (tally.to = Math.min(tally.to, performance.now())));
  let turn = 0;
  await steadyLoad(url, tally, () => paths[turn++ % paths.length], rate, WARM_UP_SECONDS + SECONDS + 1);
  return tally;
}

function row(label: string, tally: Tally, target?: number): string {
  const sorted = tally.latencies.sort((a, b) => a - b);
  const seconds = Math.max(0, (tally.to - tally.from) / 1000);
  const p95 = percentile(sorted, 95);
  const verdict = target === undefined ? '' : p95 <= target && tally.non2xx === 0 && tally.errors === 0 ? `≤ ${target}: met` : `≤ ${target}: NOT met`;
  return `| ${label} | ${seconds.toFixed(1)} | ${sorted.length} | ${(sorted.length / seconds).toFixed(0)} | ${percentile(sorted, 50).toFixed(1)} | ${p95.toFixed(1)} | ${percentile(sorted, 99).toFixed(1)} | ${tally.non2xx} | ${tally.errors} | ${verdict} |`;
}

stopEverythingOnSignals();
const profile: StackProfile = testProfile();
let exitCode = 0;
try {
  // The services run in a process of their own (bench/stack-host.ts); the payments fake starts last.
  const services = startProcess(process.execPath, ['--import', 'tsx', join(projectRoot, 'bench', 'stack-host.ts')], { cwd: projectRoot });
  await waitForHttp(`http://127.0.0.1:${profile.ports.payments}/`, services, 'the bench\'s services');
  await migrateAndSeed(profile);
  const environment = { ...stackEnvironment(profile), NEXT_DIST_DIR: DIST_DIR };
  // This process queues the exports through lib/studio, with the stack's configuration.
  Object.assign(process.env, stackEnvironment(profile));
  const nextCli = join(projectRoot, 'node_modules', 'next', 'dist', 'bin', 'next');
  if (BUILD) {
    log(`building the app (next build → ${DIST_DIR})`);
    await runCommand(process.execPath, [nextCli, 'build'], { cwd: projectRoot, env: environment });
  }
  const url = `http://127.0.0.1:${profile.ports.app}`;
  for (let i = 0; i < 2; i++) startProcess(process.execPath, JOBS_WORKER_ARGS, { cwd: projectRoot, env: environment });
  const server = startProcess(process.execPath, [nextCli, 'start', '--hostname', '127.0.0.1', '--port', String(profile.ports.app)], { cwd: projectRoot, env: environment });
  await waitForHttp(`${url}/api/health`, server, 'next start');
  for (let i = 0; i < 20; i++) for (const path of ['/api/health', ...SEARCHES]) await (await fetch(url + path)).arrayBuffer();

  const { db } = await import('../lib/platform/db');
  const { createGroom, saveSpec } = await import('../lib/studio/grooms');
  const { requestExport } = await import('../lib/studio/exports');
  const { MAX_GUIDE_POINTS } = await import('../lib/groom');
  const { DEMO_GROOMS } = await import('../lib/groom/demo');
  const wren = DEMO_ACCOUNTS.find((account) => account.roles.includes('groomer'))!;
  const groomer = { userId: (await db()('users').where({ email: wren.email }).first('id')).id as string };
  const cat = DEMO_GROOMS[1];
  const surface = await db()('growth_surfaces').where({ owner_id: groomer.userId, state: 'ready' }).whereILike('name', `${cat.character}%`).first('id');
  if (!surface) throw new CommandFailed(`the seeded surface of ${cat.character} is missing`);
  const groom = await createGroom(groomer, { surfaceId: surface.id, name: 'Bench — the densest coat allowed' });
  const { density: _density, ...guides } = cat.spec.guides as Record<string, unknown>;
  await saveSpec(groomer, groom.id, { spec: { ...cat.spec, guides: { ...guides, count: MAX_GUIDE_POINTS / 16, pointsPerGuide: 16 } }, baseRevision: groom.revision });

  const exportTimes: string[] = [];
  /** Queues a USD export and resolves once it runs; `done` resolves when it ended. */
  const startExport = async () => {
    const job = await requestExport(groomer, groom.id, 'usda');
    const queued = performance.now();
    const state = async () => (await db()('groom_exports').where({ id: job.id }).first('status', 'error')) as { status: string; error: string | null };
    while ((await state()).status === 'queued') await new Promise((resolve) => setTimeout(resolve, 100));
    const done = (async () => {
      let last = await state();
      while (last.status === 'running') {
        await new Promise((resolve) => setTimeout(resolve, 250));
        last = await state();
      }
      exportTimes.push(`${last.status} in ${((performance.now() - queued) / 1000).toFixed(1)} s${last.error ? ` (${last.error})` : ''}`);
    })();
    return { done };
  };

  log(`/api/health alone: ${HEALTH_RATE} req/s for ${SECONDS} s`);
  const alone = await steady(url, ['/api/health'], HEALTH_RATE);
  log(`/api/health while one export runs`);
  const one = await startExport();
  const duringOne = await steady(url, ['/api/health'], HEALTH_RATE, one.done);
  await one.done;
  log(`the search at ${SEARCH_RATE} req/s and /api/health while two exports run`);
  const [a, b] = await Promise.all([startExport(), startExport()]);
  const bothDone = Promise.all([a.done, b.done]);
  const [searchDuringTwo, healthDuringTwo] = await Promise.all([steady(url, SEARCHES, SEARCH_RATE, bothDone), steady(url, ['/api/health'], HEALTH_RATE, bothDone)]);
  await Promise.all([a.done, b.done]);
  const { closeDb } = await import('../lib/platform/db');
  const { stopJobs } = await import('../lib/platform/jobs');
  await stopJobs();
  await closeDb();

  const table = [
    '| run | counted s | requests | req/s | p50 ms | p95 ms | p99 ms | non-2xx | errors | target p95 |',
    '| --- | ---: | ---: | ---: | ---: | ---: | ---: | ---: | ---: | --- |',
    row('/api/health, nothing else running', alone),
    row('/api/health, one export running', duringOne, TARGETS.health),
    row(`market search at ${SEARCH_RATE} req/s, two exports running`, searchDuringTwo, TARGETS.search),
    row('/api/health, two exports running', healthDuringTwo, TARGETS.health),
  ];
  console.log(`
Reliability bench — ${HEALTH_RATE} health req/s, ${SEARCH_RATE} search req/s, ${SECONDS} s counted per run, loopback; exports of 250,000 guides × 16 points as USD
machine: ${cpus().length} × ${cpus()[0]?.model ?? 'cpu'}, load average ${loadavg().map((l) => l.toFixed(2)).join(' ')}

${table.join('\n')}

exports (queued → ended): ${exportTimes.join('; ')}`);
  if (table.some((line) => line.includes('NOT met'))) exitCode = 1;
} catch (failure) {
  console.error(`bench/reliability: ${(failure as Error).message}`);
  exitCode = 1;
}
await shutdown();
process.exit(exitCode);
