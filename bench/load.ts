// What the server benchmarks (bench/market.ts, bench/reliability.ts) share: their stack's ports,
// their number options, and load from autocannon counted in a window of time.
import { createRequire } from 'node:module';
import { join } from 'node:path';
import { projectRoot } from '../scripts/lib/stack';
import { CommandFailed } from '../scripts/lib/processes';

type AutocannonClient = { on(event: 'response', listener: (status: number, bytes: number, ms: number) => void): void };
type AutocannonResult = { errors: number; timeouts: number };
// autocannon ships no type declarations.
const autocannon = createRequire(import.meta.url)('autocannon') as (options: Record<string, unknown>) => Promise<AutocannonResult>;

/**
 * The bench stack reuses the test profile's machinery on ports and a folder of its own:
 * BENCH_APP_PORT (3900), BENCH_PG_PORT (54390), BENCH_S3_PORT … BENCH_PAYMENTS_PORT (54391 … 54394),
 * .data/bench. Call before the profile is read.
 */
export function useBenchStack() {
  const benchPorts: Record<string, string> = { APP: '3900', PG: '54390', S3: '54391', SMTP_SINK: '54392', MAIL_SINK: '54393', PAYMENTS: '54394' };
  for (const [name, port] of Object.entries(benchPorts)) process.env[`TEST_${name}_PORT`] = process.env[`BENCH_${name}_PORT`] ?? port;
  process.env.TEST_DATA_DIR = join(projectRoot, '.data', 'bench');
}

/** `--name N` from the command line, or `fallback`; positive (or also 0 when `zeroAllowed`). */
export function numberOption(name: string, fallback: number, zeroAllowed = false): number {
  const at = process.argv.indexOf(`--${name}`);
  if (at < 0) return fallback;
  const value = Number(process.argv[at + 1]);
  if (!Number.isFinite(value) || value < 0 || (value === 0 && !zeroAllowed)) throw new CommandFailed(`--${name} needs a ${zeroAllowed ? 'non-negative' : 'positive'} number`);
  return value;
}

/** Answers counted in a window of time (performance.now() ms): the start-up of the load is left out. */
export type Tally = { from: number; to: number; latencies: number[]; non2xx: number; errors: number };

export function tallyOver(from: number, seconds: number): Tally {
  return { from, to: from + seconds * 1000, latencies: [], non2xx: 0, errors: 0 };
}

export function percentile(sorted: number[], p: number): number {
  if (sorted.length === 0) return NaN;
  return sorted[Math.min(sorted.length - 1, Math.ceil((p / 100) * sorted.length) - 1)];
}

/** One autocannon run, `seconds` long, each request to `nextPath()`; its answers in the window go into the tally. */
export async function load(url: string, tally: Tally, nextPath: () => string, seconds: number, options: Record<string, unknown>) {
  const result = await autocannon({
    url,
    duration: seconds,
    requests: [{ method: 'GET', setupRequest: (request: Record<string, unknown>) => ({ ...request, path: nextPath() }) }],
    setupClient: (client: AutocannonClient) =>
      client.on('response', (status, _bytes, ms) => {
        const now = performance.now();
        if (now < tally.from || now >= tally.to) return;
        tally.latencies.push(ms);
        if (status < 200 || status >= 300) tally.non2xx++;
      }),
    ...options,
  });
  tally.errors += result.errors + result.timeouts;
}

/**
 * `rate` requests per second arriving evenly for `seconds`. autocannon's own rate limit lets each
 * connection send its quota for the second back to back at the start of the second (a burst of all
 * connections at once), so the steady rate is made of `rate` connections of one request per second
 * each, in runs started 1000 / runs ms apart: two requests every 10 ms at 200 req/s.
 */
export async function steadyLoad(url: string, tally: Tally, nextPath: () => string, rate: number, seconds: number) {
  const runs = Math.min(100, rate);
  const started: Promise<void>[] = [];
  for (let i = 0; i < runs; i++) {
    const connections = Math.floor(rate / runs) + (i < rate % runs ? 1 : 0);
    const run = () => load(url, tally, nextPath, seconds, { connections, connectionRate: 1 });
    started.push(new Promise((resolve) => setTimeout(resolve, (i * 1000) / runs)).then(run));
  }
  await Promise.all(started);
}
