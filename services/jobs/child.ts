// One heavy job in a process of its own, started by the job worker (services/jobs/sandbox.ts):
//   node --import tsx --max-old-space-size=<MB> services/jobs/child.ts <queue>   (the job's data as JSON on stdin)
// It exits 0 when the job's function returned (the function records its own failures on its
// row, in the person's words) and 1 when it threw; the worker judges budgets and crashes.
import { closeDb } from '../../lib/platform/db';
import { jobKind } from './areas';

async function readStdin(): Promise<string> {
  const chunks: Buffer[] = [];
  for await (const chunk of process.stdin) chunks.push(chunk as Buffer);
  return Buffer.concat(chunks).toString('utf8');
}

// The worker decides when a job stops (its budget, or its drain on SIGTERM): a signal sent to the
// whole process group (a terminal's Ctrl-C, the task scripts' stop) must not end the job
// unrecorded before the worker has marked it.
process.on('SIGTERM', () => {});
process.on('SIGINT', () => {});

const queue = process.argv[2] ?? '';
const kind = jobKind(queue);
let code = 0;
try {
  if (!kind) throw new Error(`no job kind for queue "${queue}"`);
  await kind.run(JSON.parse(await readStdin()) as never);
} catch (error) {
  console.error(`[jobs-worker] ${queue} job failed:`, error);
  code = 1;
}
await closeDb().catch(() => {});
process.exit(code);
