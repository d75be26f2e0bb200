// A job child: a process the job worker (services/jobs/sandbox.ts) forks per heavy queue to run
// that queue's jobs one after another, with V8's heap limited by the worker:
//   fork('services/jobs/child.ts', [queue], { execArgv: ['--import', 'tsx', '--max-old-space-size=<MB>'] })
// It answers each job message with whether the job's function returned (the function records its
// own failures on its row, in the person's words) or threw; the worker judges budgets and crashes.
// Staying alive between jobs keeps start-up (~1 s of tsx) and the prepared surfaces out of each job.
import { closeDb } from '../../lib/platform/db';
import { jobKind } from './areas';

export type JobMessage = { job: number; data: unknown };
export type JobReply = { job: number; ok: boolean };

// The worker decides when a job stops (its budget, or its drain on SIGTERM): a signal sent to the
// whole process group (a terminal's Ctrl-C, the task scripts' stop) must not end a job
// unrecorded before the worker has marked it.
process.on('SIGTERM', () => {});
process.on('SIGINT', () => {});

const queue = process.argv[2] ?? '';
const kind = jobKind(queue);
if (!kind) {
  console.error(`[jobs-worker] no job kind for queue "${queue}"`);
  process.exit(1);
}

process.on('message', async (message: JobMessage) => {
  let ok = true;
  try {
    await kind.run(message.data as never);
  } catch (error) {
    console.error(`[jobs-worker] ${queue} job failed:`, error);
    ok = false;
  }
  process.send?.({ job: message.job, ok } satisfies JobReply);
});

// The worker let go of this child (it drains, or recycles a child grown large): end quietly.
process.on('disconnect', () => {
  void closeDb()
    .catch(() => {})
    .finally(() => process.exit(0));
});
