// The load generator of bench/reliability.ts, in a worker thread of its own: the bench's main thread
// also runs the local stand-ins (the object store receives each export's hundreds of megabytes), and
// a load generator sharing that event loop would time its own stalls as the server's latency.
// Requests arrive at a steady rate, spread over each second (one-connection runs started in turn).
import { createRequire } from 'node:module';
import { parentPort, workerData } from 'node:worker_threads';

export type SteadyLoad = { url: string; paths: readonly string[]; rate: number; seconds: number };
/** One answer: when it arrived (ms since the epoch), its latency (ms) and its status. */
export type Sample = [at: number, ms: number, status: number];
export type SteadyResult = { samples: Sample[]; errors: number };

type AutocannonClient = { on(event: 'response', listener: (status: number, bytes: number, ms: number) => void): void };
type AutocannonResult = { errors: number; timeouts: number };
// autocannon ships no type declarations.
const autocannon = createRequire(import.meta.url)('autocannon') as (options: Record<string, unknown>) => Promise<AutocannonResult>;

const { url, paths, rate, seconds } = workerData as SteadyLoad;
const samples: Sample[] = [];
let errors = 0;
let turn = 0;
const runs = Math.min(100, rate);
const started: Promise<void>[] = [];
for (let i = 0; i < runs; i++) {
  const connections = Math.floor(rate / runs) + (i < rate % runs ? 1 : 0);
  const run = async () => {
    const result = await autocannon({
      url,
      duration: seconds,
      connections,
      connectionRate: 1,
      requests: [{ method: 'GET', setupRequest: (request: Record<string, unknown>) => ({ ...request, path: paths[turn++ % paths.length] }) }],
      setupClient: (client: AutocannonClient) => client.on('response', (status, _bytes, ms) => samples.push([performance.timeOrigin + performance.now(), ms, status])),
    });
    errors += result.errors + result.timeouts;
  };
  started.push(new Promise((resolve) => setTimeout(resolve, (i * 1000) / runs)).then(run));
}
await Promise.all(started);
parentPort!.postMessage({ samples, errors } satisfies SteadyResult);
