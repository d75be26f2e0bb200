// The shape of `npm run demo` and `npm run dev`: start everything, keep serving until Ctrl-C
// (the signal handler then stops everything and ends the process), or stop everything and
// fail if the app server or a job worker ends by itself or something cannot start.
import { isShuttingDown, log, shutdown, stopEverythingOnSignals, type LongRunning } from './processes';

export type Served = { label: string; process: LongRunning };

export async function serveUntilStopped(taskName: string, start: () => Promise<Served[]>) {
  stopEverythingOnSignals();
  try {
    const served = await start();
    const first = await Promise.race(served.map(({ label, process }) => process.exited.then((code) => ({ label, code }))));
    if (isShuttingDown()) return;
    log(`${first.label} exited by itself (code ${first.code}); stopping everything`);
  } catch (error) {
    if (isShuttingDown()) return;
    console.error(`[whorlwind] ${taskName} could not start: ${(error as Error).message}`);
  }
  await shutdown();
  process.exit(1);
}
