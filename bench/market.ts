/**
 * Benchmark of the market's search (GET /api/market/search) against the built app on loopback,
 * with 10,000 published listings.
 *
 *   npm run bench:market -- [--listings 10000] [--rate 200] [--seconds 20] [--connections 20] [--no-build]
 *
 * It starts a throwaway stack of its own (PostgreSQL, S3 stand-in, SMTP sink, payments fake) on
 * the BENCH ports below, migrates and seeds it, inserts the listings (varied titles, descriptions,
 * tags, prices, formats, guide counts, sales and ratings), builds the app into .next-bench (skip
 * with --no-build to reuse an earlier build), serves it with `next start`, then runs autocannon
 * twice over a mix of searches (text, filters, every sort, deep pages):
 *   1. saturation: as many requests as the connections can make, for the highest req/s;
 *   2. fixed rate (--rate, default 200 req/s): the latency distribution, p50/p95/p99, against the
 *      target p95 ≤ 50 ms;
 * and, before both, each search alone (one request at a time) to show which searches cost what.
 * Everything it started is stopped at the end (Ctrl-C too) and its data is deleted.
 * Ports: BENCH_APP_PORT (3900), BENCH_PG_PORT (54390), BENCH_S3_PORT, BENCH_SMTP_SINK_PORT,
 * BENCH_MAIL_SINK_PORT, BENCH_PAYMENTS_PORT (54391 … 54394). Run it on a quiet machine: the
 * numbers mean little while a build or another test run shares the two cores.
 */
import { createRequire } from 'node:module';
import { cpus, loadavg } from 'node:os';
import { join } from 'node:path';
import knex, { type Knex } from 'knex';
import { migrateAndSeed, projectRoot, stackEnvironment, startStack, testProfile, type StackProfile } from '../scripts/lib/stack';
import { CommandFailed, log, runCommand, shutdown, startProcess, stopEverythingOnSignals, waitForHttp } from '../scripts/lib/processes';
import { migrationConfig } from '../knexfile';
import { ANIMALS, BODY_REGIONS, COAT_LENGTHS, PACKAGE_FORMATS, STYLES } from '../lib/market/vocabulary';

type AutocannonClient = { on(event: 'response', listener: (status: number, bytes: number, ms: number) => void): void };
type AutocannonResult = { requests: { average: number; total: number }; non2xx: number; errors: number; timeouts: number; duration: number };
type Autocannon = (options: Record<string, unknown>) => Promise<AutocannonResult>;
// autocannon ships no type declarations.
const autocannon = createRequire(import.meta.url)('autocannon') as Autocannon;

function option(name: string, fallback: number): number {
  const at = process.argv.indexOf(`--${name}`);
  if (at < 0) return fallback;
  const value = Number(process.argv[at + 1]);
  if (!Number.isFinite(value) || value <= 0) throw new CommandFailed(`--${name} needs a positive number`);
  return value;
}

const LISTINGS = option('listings', 10_000);
const RATE = option('rate', 200);
const SECONDS = option('seconds', 20);
const CONNECTIONS = option('connections', 20);
const BUILD = !process.argv.includes('--no-build');
const DIST_DIR = '.next-bench';
const TARGET_P95_MS = 50;

// The bench stack reuses the test profile's machinery on ports and a folder of its own.
const benchPorts: Record<string, string> = { APP: '3900', PG: '54390', S3: '54391', SMTP_SINK: '54392', MAIL_SINK: '54393', PAYMENTS: '54394' };
for (const [name, port] of Object.entries(benchPorts)) process.env[`TEST_${name}_PORT`] = process.env[`BENCH_${name}_PORT`] ?? port;
process.env.TEST_DATA_DIR = join(projectRoot, '.data', 'bench');

// ---- data ------------------------------------------------------------------------------------

const WORDS = {
  adjective: ['russet', 'silver', 'tawny', 'brindle', 'sable', 'ashen', 'golden', 'dappled', 'smoky', 'frosted', 'umber', 'ivory', 'wild', 'sleek', 'shaggy', 'velvet'],
  noun: ['crown', 'pelt', 'ruff', 'mane', 'coat', 'nap', 'fleece', 'tuft', 'brush', 'cowl', 'plume', 'fringe'],
  feature: ['a spiral cowlick on the crown', 'a parting down the spine', 'a crest along the back', 'an inflow whorl at the nape', 'a saddle on the chest', 'flow strokes along the cheeks', 'long tufts on the ears', 'an outflow whorl at the nose'],
  use: ['a game character', 'a feature film creature', 'a stylised short', 'a plush toy', 'a real-time cinematic', 'a commercial mascot'],
};

function pick<T>(items: readonly T[], n: number): T {
  return items[n % items.length];
}

async function seedListings(connection: Knex, count: number) {
  const seller = await connection('users').where({ email: 'wren@thistledown.example' }).first('id');
  const licences: string[] = await connection('licences').orderBy('position').pluck('id');
  if (!seller || licences.length === 0) throw new CommandFailed('the demo seed did not create the groomer or the licences');
  const spec = JSON.stringify({ specVersion: 2, units: 'cm', field: { singularities: [] } });
  // xorshift32: every bit of it is usable (a plain LCG's low bits repeat with a short period).
  let rng = 12345;
  const next = () => {
    rng ^= rng << 13;
    rng ^= rng >>> 17;
    rng ^= rng << 5;
    return (rng >>> 0) & 0x7fffffff;
  };
  const rows = [];
  for (let i = 0; i < count; i++) {
    const animal = pick(ANIMALS, next());
    const title = `${pick(WORDS.adjective, next())} ${animal} ${pick(WORDS.noun, next())} ${i}`;
    const formats = PACKAGE_FORMATS.filter((_, f) => (next() >> (f + 3)) & 1);
    rows.push({
      seller_id: seller.id,
      groom_id: '00000000-0000-4000-8000-000000000000',
      groom_version_id: '00000000-0000-4000-8000-000000000000',
      groom_name: title,
      version_number: 1,
      version_name: 'bench',
      spec,
      surface_key: 'bench/none.obj',
      surface_file_name: 'none.obj',
      title,
      description: `A ${pick(COAT_LENGTHS, next())} coat with ${pick(WORDS.feature, next())} and ${pick(WORDS.feature, next())}, made for ${pick(WORDS.use, next())}.`,
      animal,
      coat_length: pick(COAT_LENGTHS, next()),
      style: pick(STYLES, next()),
      body_region: pick(BODY_REGIONS, next()),
      price_cents: 100 + (next() % 20_000),
      currency: pick(['eur', 'usd', 'gbp'], next()),
      licence_id: pick(licences, next()),
      formats: formats.length > 0 ? formats : ['usda'],
      state: next() % 10 === 0 ? 'draft' : 'published',
      assets_status: 'ready',
      guide_count: 200 + (next() % 50_000),
      sales_count: next() % 500,
      rating_count: next() % 40,
      rating_average: next() % 5 === 0 ? null : 1 + (next() % 400) / 100,
      published_at: new Date(Date.UTC(2026, 0, 1) + (next() % (300 * 86_400)) * 1000),
    });
  }
  for (let start = 0; start < rows.length; start += 1000) await connection('listings').insert(rows.slice(start, start + 1000));
  // As autovacuum would have it on a settled database: statistics and the visibility map (counts
  // of published listings then come from index-only scans).
  await connection.raw('VACUUM ANALYZE listings');
}

/** The mix of searches the clients cycle through. */
function searchPaths(): string[] {
  const paths = [
    '/api/market/search',
    '/api/market/search?sort=best-selling',
    '/api/market/search?sort=rating',
    '/api/market/search?sort=price-asc&page=40',
    '/api/market/search?sort=price-desc&currency=eur',
    '/api/market/search?q=fox',
    '/api/market/search?q=spiral%20cowlick',
    '/api/market/search?q=silver%20mane&sort=newest',
    '/api/market/search?q=parting%20spine&animal=cat,dog',
    '/api/market/search?animal=fox&coatLength=long',
    '/api/market/search?style=plush&bodyRegion=full-body&sort=price-asc',
    '/api/market/search?minPrice=1000&maxPrice=5000&sort=best-selling',
    '/api/market/search?format=usda,glb&minGuides=1000&maxGuides=20000',
    '/api/market/search?q=coat&page=20&pageSize=24',
    '/api/market/search?animal=wolf,bear&sort=rating&page=3',
    '/api/market/search?q=tawny&format=obj',
  ];
  return paths;
}

function percentile(sorted: number[], p: number): number {
  if (sorted.length === 0) return NaN;
  return sorted[Math.min(sorted.length - 1, Math.ceil((p / 100) * sorted.length) - 1)];
}

/** Each search on its own, one request at a time: which searches cost what before any load. */
async function latencyAlone(url: string, repeats = 15) {
  const rows: { path: string; median: number; worst: number; total: number }[] = [];
  for (const path of searchPaths()) {
    const times: number[] = [];
    let total = 0;
    for (let i = 0; i < repeats; i++) {
      const started = performance.now();
      const response = await fetch(url + path);
      const body = (await response.json()) as { data?: { total: number } };
      times.push(performance.now() - started);
      if (!response.ok || !body.data) throw new CommandFailed(`${path} answered ${response.status}`);
      total = body.data.total;
    }
    times.sort((a, b) => a - b);
    rows.push({ path: path.replace('/api/market/search', '') || '(no filters)', median: percentile(times, 50), worst: times[times.length - 1], total });
  }
  return rows;
}

async function run(url: string, rate: number | null) {
  const latencies: number[] = [];
  const statuses = new Map<number, number>();
  const result = await autocannon({
    url,
    connections: CONNECTIONS,
    duration: SECONDS,
    ...(rate && { overallRate: rate }),
    requests: searchPaths().map((path) => ({ method: 'GET', path })),
    setupClient: (client: AutocannonClient) =>
      client.on('response', (status, _bytes, ms) => {
        latencies.push(ms);
        statuses.set(status, (statuses.get(status) ?? 0) + 1);
      }),
  });
  latencies.sort((a, b) => a - b);
  return {
    reqPerSec: result.requests.total / result.duration,
    total: result.requests.total,
    non2xx: result.non2xx,
    errors: result.errors + result.timeouts,
    p50: percentile(latencies, 50),
    p95: percentile(latencies, 95),
    p99: percentile(latencies, 99),
  };
}

// ---- main ------------------------------------------------------------------------------------

stopEverythingOnSignals();
const profile: StackProfile = testProfile();
let exitCode = 0;
try {
  await startStack(profile);
  await migrateAndSeed(profile);
  const environment = { ...stackEnvironment(profile), NEXT_DIST_DIR: DIST_DIR };
  const connection = knex(migrationConfig(stackEnvironment(profile).DATABASE_URL!));
  try {
    log(`inserting ${LISTINGS.toLocaleString('en-GB')} listings (about 90 % published)`);
    await seedListings(connection, LISTINGS);
  } finally {
    await connection.destroy();
  }
  const nextCli = join(projectRoot, 'node_modules', 'next', 'dist', 'bin', 'next');
  if (BUILD) {
    log(`building the app (next build → ${DIST_DIR})`);
    await runCommand(process.execPath, [nextCli, 'build'], { cwd: projectRoot, env: environment });
  }
  const url = `http://127.0.0.1:${profile.ports.app}`;
  const server = startProcess(process.execPath, [nextCli, 'start', '--hostname', '127.0.0.1', '--port', String(profile.ports.app)], { cwd: projectRoot, env: environment });
  await waitForHttp(`${url}/api/health`, server, 'next start');
  // Warm-up: every search once, a few times.
  for (let i = 0; i < 3; i++) for (const path of searchPaths()) await (await fetch(url + path)).arrayBuffer();
  const alone = await latencyAlone(url);

  log(`saturation: ${CONNECTIONS} connections for ${SECONDS} s`);
  const max = await run(url, null);
  log(`fixed rate: ${RATE} req/s for ${SECONDS} s`);
  const fixed = await run(url, RATE);

  const verdict = fixed.p95 <= TARGET_P95_MS && fixed.non2xx === 0 && fixed.errors === 0;
  console.log(`
Market search bench — ${LISTINGS.toLocaleString('en-GB')} listings, ${searchPaths().length} different searches, ${CONNECTIONS} connections, loopback
machine: ${cpus().length} × ${cpus()[0]?.model ?? 'cpu'}, load average ${loadavg().map((l) => l.toFixed(2)).join(' ')}

| run | requests | req/s | p50 ms | p95 ms | p99 ms | non-2xx | errors |
| --- | ---: | ---: | ---: | ---: | ---: | ---: | ---: |
| saturation | ${max.total} | ${max.reqPerSec.toFixed(0)} | ${max.p50} | ${max.p95} | ${max.p99} | ${max.non2xx} | ${max.errors} |
| ${RATE} req/s | ${fixed.total} | ${fixed.reqPerSec.toFixed(0)} | ${fixed.p50} | ${fixed.p95} | ${fixed.p99} | ${fixed.non2xx} | ${fixed.errors} |

target: p95 ≤ ${TARGET_P95_MS} ms at ${RATE} req/s — ${verdict ? 'met' : 'NOT met'}

Each search alone (one request at a time, before the runs above):

| search | found | median ms | worst ms |
| --- | ---: | ---: | ---: |
${alone.map((r) => `| \`${r.path}\` | ${r.total} | ${r.median.toFixed(1)} | ${r.worst.toFixed(1)} |`).join('\n')}`);
  if (!verdict) exitCode = 1;
} catch (failure) {
  console.error(`bench/market: ${(failure as Error).message}`);
  exitCode = 1;
}
await shutdown();
process.exit(exitCode);
