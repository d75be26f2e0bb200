// Makes the queues named on its command line through lib/platform/jobs, as a job worker does when
// it starts, then exits: 0 when they were made, 1 with the error otherwise. Started several at a
// time by jobs-queue-setup.test.ts.
import { closeDb } from '@/lib/platform/db';
import { jobQueue, stopJobs } from '@/lib/platform/jobs';

const [area, ...names] = process.argv.slice(2);
let code = 0;
try {
  await jobQueue(area, names.map((name) => ({ name })));
} catch (failure) {
  console.error(`queue set-up failed: ${(failure as Error).message}`);
  code = 1;
}
await stopJobs();
await closeDb();
process.exit(code);
