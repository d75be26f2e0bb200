// The reliability bench's services (PostgreSQL, the S3 stand-in, the SMTP sink, the payments fake)
// in a process of their own, started by bench/reliability.ts with its ports in the environment.
// In the bench's own process the object store stand-in would receive the exports' uploads on the
// thread that also sends the load and times the answers, so an upload would be timed as server
// latency; in production the object store is not on the web server's machine at all. For the same
// reason the process lowers its own priority once everything is up (nice 19, like the job
// children): the stand-ins then take the cores only when the server leaves them idle. PostgreSQL,
// which the search reads, was started before that and keeps the normal priority.
import { setPriority } from 'node:os';
import { startStack, testProfile } from '../scripts/lib/stack';
import { shutdown, stopEverythingOnSignals } from '../scripts/lib/processes';

stopEverythingOnSignals();
try {
  await startStack(testProfile());
  setPriority(19);
} catch (failure) {
  console.error(`bench/stack-host: ${(failure as Error).message}`);
  await shutdown();
  process.exit(1);
}
