/**
 * Benchmark of the market's search (GET /api/market/search) against the built app on loopback,
 * with 10,000 published listings.
 *
 *   npm run bench:market -- [--listings 10000] [--rate 200] [--seconds 20] [--connections 20] [--rare 0.25] [--no-build] [--hold]
 *
 * It starts a throwaway stack of its own (PostgreSQL, S3 stand-in, SMTP sink, payments fake) on
 * the BENCH ports below, migrates and seeds it, inserts the listings (varied titles, descriptions,
 * tags, prices, formats, guide counts, sales and ratings), builds the app into .next-bench (skip
 * with --no-build to reuse an earlier build), serves it with `next start`, then runs autocannon
 * twice over a mix of searches: popular ones (the front page, every sort, common filters, text,
 * deep pages), which the server keeps answers for, and a quarter of rare ones drawn at random,
 * which it almost never has kept (so the database answers them):
 *   1. saturation: as many requests as the connections can make, for the highest req/s;
 *   2. steady rate (--rate, default 200 req/s, arriving evenly over each second): the latency
 *      distribution, p50/p95/p99, against the target p95 ≤ 50 ms;
 * each counting the answers of --seconds after 3 s of warming up (connections opening, the load
 * generator's start-up, which stalls its own clock); and, before both, each popular search alone
 * (one request at a time), answered by the database and then kept, to show what each costs.
 * Everything it started is stopped at the end (Ctrl-C too) and its data is deleted; with --hold the
 * app and the database stay up after the runs, for a look with psql or curl, until Ctrl-C.
 * Ports: BENCH_APP_PORT (3900), BENCH_PG_PORT (54390), BENCH_S3_PORT, BENCH_SMTP_SINK_PORT,
 * BENCH_MAIL_SINK_PORT, BENCH_PAYMENTS_PORT (54391 … 54394). Run it on a quiet machine: the
 * numbers mean little while a build or another test run shares the two cores.
 */
import { cpus, loadavg } from 'node:os';
import { join } from 'node:path';
import knex, { type Knex } from 'knex';
import { migrateAndSeed, projectRoot, stackEnvironment, startStack, testProfile, type StackProfile } from '../scripts/lib/stack';
import { CommandFailed, log, runCommand, shutdown, startProcess, stopEverythingOnSignals, waitForHttp } from '../scripts/lib/processes';
import { migrationConfig } from '../db/migration-config';
import { ANIMALS, BODY_REGIONS, COAT_LENGTHS, PACKAGE_FORMATS, STYLES } from '../lib/market/vocabulary';
import { load, numberOption, percentile, steadyLoad, tallyOver, useBenchStack, type Tally } from './load';

const LISTINGS = numberOption('listings', 10_000);
const RATE = numberOption('rate', 200);
const SECONDS = numberOption('seconds', 20);
const CONNECTIONS = numberOption('connections', 20);
const BUILD = !process.argv.includes('--no-build');
const HOLD = process.argv.includes('--hold');
const DIST_DIR = '.next-bench';
const TARGET_P95_MS = 50;

useBenchStack();

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

/** xorshift32 from a seed, 31 bits a draw: every bit of it is usable (a plain LCG's low bits repeat with a short period). */
function xorshift(seed: number): () => number {
  let state = seed;
  return () => {
    state ^= state << 13;
    state ^= state >>> 17;
    state ^= state << 5;
    return (state >>> 0) & 0x7fffffff;
  };
}

async function seedListings(connection: Knex, count: number) {
  const seller = await connection('users').where({ email: 'wren@thistledown.example' }).first('id');
  const licences: string[] = await connection('licences').orderBy('position').pluck('id');
  if (!seller || licences.length === 0) throw new CommandFailed('the demo seed did not create the groomer or the licences');
  const spec = JSON.stringify({ specVersion: 2, units: 'cm', field: { singularities: [] } });
  const next = xorshift(12345);
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
      guides_per_cm2: 0.2 + (next() % 500) / 100,
      typical_length_cm: 0.3 + (next() % 300) / 10,
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

/** The searches most visitors make: the market's front page, each sort, the common filters. */
const POPULAR_SEARCHES = [
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
  '/api/market/search?format=usda,glb&minDensity=1&maxDensity=3.5',
  '/api/market/search?q=coat&page=20&pageSize=24',
  '/api/market/search?animal=wolf,bear&sort=rating&page=3',
  '/api/market/search?q=tawny&format=obj',
];

const SORTS = ['newest', 'best-selling', 'rating', 'price-asc', 'price-desc'];

/**
 * A search few others make: a word or two, a filter or two, a sort and a page drawn at random
 * (about 10^7 combinations), so that it is almost never answered from what the server kept.
 */
function rareSearch(next: () => number): string {
  const random = () => next() / 2 ** 31;
  const params = new URLSearchParams();
  if (random() < 0.6) params.set('q', random() < 0.5 ? pick(WORDS.adjective, next()) : `${pick(WORDS.adjective, next())} ${pick(WORDS.noun, next())}`);
  if (random() < 0.5) params.set('animal', pick(ANIMALS, next()));
  if (random() < 0.3) params.set('coatLength', pick(COAT_LENGTHS, next()));
  if (random() < 0.3) params.set('style', pick(STYLES, next()));
  if (random() < 0.3) {
    const low = Math.floor(random() * 150) * 100;
    params.set('minPrice', String(low));
    params.set('maxPrice', String(low + 500 + Math.floor(random() * 50) * 100));
  }
  if (random() < 0.2) params.set('format', pick(PACKAGE_FORMATS, next()));
  params.set('sort', pick(SORTS, next()));
  params.set('page', String(1 + Math.floor(random() * (random() < 0.8 ? 3 : 30))));
  return `/api/market/search?${params}`;
}

/** The share of requests that are rare searches (--rare; 0.25 is a guess at a long tail, no source). */
const RARE_SHARE = numberOption('rare', 0.25, true);

/** Each call the next request's path: popular searches in turn, a rare one a quarter of the time. */
function searchMix(): () => string {
  const next = xorshift(2024);
  let turn = 0;
  return () => (next() / 2 ** 31 < RARE_SHARE ? rareSearch(next) : POPULAR_SEARCHES[turn++ % POPULAR_SEARCHES.length]);
}

/**
 * Each popular search on its own, one request at a time: first just after the search generation
 * was bumped (nothing kept: the database answers), then again (the kept answer).
 */
async function latencyAlone(url: string, connection: Knex, repeats = 15) {
  const rows: { path: string; total: number; fresh: number; kept: number }[] = [];
  const timed = async (path: string) => {
    const started = performance.now();
    const response = await fetch(url + path);
    const body = (await response.json()) as { data?: { total: number } };
    if (!response.ok || !body.data) throw new CommandFailed(`${path} answered ${response.status}`);
    return { ms: performance.now() - started, total: body.data.total };
  };
  for (const path of POPULAR_SEARCHES) {
    const fresh: number[] = [];
    const kept: number[] = [];
    let total = 0;
    for (let i = 0; i < repeats; i++) {
      await connection.raw('UPDATE market_search_generation SET value = value + 1');
      const first = await timed(path);
      fresh.push(first.ms);
      total = first.total;
      kept.push((await timed(path)).ms);
    }
    fresh.sort((a, b) => a - b);
    kept.sort((a, b) => a - b);
    rows.push({ path: path.replace('/api/market/search', '') || '(no filters)', total, fresh: percentile(fresh, 50), kept: percentile(kept, 50) });
  }
  return rows;
}

function summary(tally: Tally) {
  const sorted = tally.latencies.sort((a, b) => a - b);
  const total = sorted.length;
  return { total, non2xx: tally.non2xx, errors: tally.errors, reqPerSec: total / SECONDS, p50: percentile(sorted, 50), p95: percentile(sorted, 95), p99: percentile(sorted, 99) };
}

/** Seconds of load before answers are counted: connections opening, the load generator starting. */
const WARM_UP_SECONDS = 3;

/** As many requests as CONNECTIONS connections can make, each sending its next on the last's answer. */
async function saturate(url: string) {
  const tally = tallyOver(performance.now() + WARM_UP_SECONDS * 1000, SECONDS);
  await load(url, tally, searchMix(), WARM_UP_SECONDS + SECONDS, { connections: CONNECTIONS });
  return summary(tally);
}

/** `rate` requests per second arriving evenly (see `steadyLoad`). */
async function steady(url: string, rate: number) {
  const tally = tallyOver(performance.now() + (WARM_UP_SECONDS + 1) * 1000, SECONDS);
  await steadyLoad(url, tally, searchMix(), rate, WARM_UP_SECONDS + SECONDS + 1);
  return summary(tally);
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
  log(`inserting ${LISTINGS.toLocaleString('en-GB')} listings (about 90 % published)`);
  await seedListings(connection, LISTINGS);
  const nextCli = join(projectRoot, 'node_modules', 'next', 'dist', 'bin', 'next');
  if (BUILD) {
    log(`building the app (next build → ${DIST_DIR})`);
    await runCommand(process.execPath, [nextCli, 'build'], { cwd: projectRoot, env: environment });
  }
  const url = `http://127.0.0.1:${profile.ports.app}`;
  const server = startProcess(process.execPath, [nextCli, 'start', '--hostname', '127.0.0.1', '--port', String(profile.ports.app)], { cwd: projectRoot, env: environment });
  await waitForHttp(`${url}/api/health`, server, 'next start');
  // Warm-up: every search once, a few times.
  for (let i = 0; i < 3; i++) for (const path of POPULAR_SEARCHES) await (await fetch(url + path)).arrayBuffer();
  const alone = await latencyAlone(url, connection);
  await connection.destroy();

  log(`saturation: ${CONNECTIONS} connections for ${SECONDS} s`);
  const max = await saturate(url);
  log(`steady rate: ${RATE} req/s for ${SECONDS} s`);
  const steadyRun = await steady(url, RATE);

  const verdict = steadyRun.p95 <= TARGET_P95_MS && steadyRun.non2xx === 0 && steadyRun.errors === 0;
  console.log(`
Market search bench — ${LISTINGS.toLocaleString('en-GB')} listings, ${POPULAR_SEARCHES.length} popular searches and ${RARE_SHARE * 100} % rare ones, ${CONNECTIONS} connections, loopback
machine: ${cpus().length} × ${cpus()[0]?.model ?? 'cpu'}, load average ${loadavg().map((l) => l.toFixed(2)).join(' ')}

| run | requests | req/s | p50 ms | p95 ms | p99 ms | non-2xx | errors |
| --- | ---: | ---: | ---: | ---: | ---: | ---: | ---: |
| saturation | ${max.total} | ${max.reqPerSec.toFixed(0)} | ${max.p50.toFixed(1)} | ${max.p95.toFixed(1)} | ${max.p99.toFixed(1)} | ${max.non2xx} | ${max.errors} |
| ${RATE} req/s | ${steadyRun.total} | ${steadyRun.reqPerSec.toFixed(0)} | ${steadyRun.p50.toFixed(1)} | ${steadyRun.p95.toFixed(1)} | ${steadyRun.p99.toFixed(1)} | ${steadyRun.non2xx} | ${steadyRun.errors} |

target: p95 ≤ ${TARGET_P95_MS} ms at ${RATE} req/s — ${verdict ? 'met' : 'NOT met'}

Each popular search alone (one request at a time, before the runs above; medians of 15):

| search | found | from the database ms | kept ms |
| --- | ---: | ---: | ---: |
${alone.map((r) => `| \`${r.path}\` | ${r.total} | ${r.fresh.toFixed(1)} | ${r.kept.toFixed(1)} |`).join('\n')}`);
  if (!verdict) exitCode = 1;
  if (HOLD) {
    log(`holding: the app at ${url}, PostgreSQL at ${stackEnvironment(profile).DATABASE_URL}; Ctrl-C stops both`);
    await new Promise(() => {});
  }
} catch (failure) {
  console.error(`bench/market: ${(failure as Error).message}`);
  exitCode = 1;
}
await shutdown();
process.exit(exitCode);
