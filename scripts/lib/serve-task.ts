// The shape of `npm run demo` and `npm run dev`: start everything, keep serving until Ctrl-C
// (the signal handler then stops everything and ends the process), or stop everything and
// fail if the app server ends by itself or something cannot start.
import { isShuttingDown, log, shutdown, stopEverythingOnSignals, type LongRunning } from './processes';

export async function serveUntilStopped(taskName: string, start: () => Promise<LongRunning>) {
  stopEverythingOnSignals();
  try {
    const server = await start();
    const code = await server.exited;
    if (isShuttingDown()) return;
    log(`the app server exited by itself (code ${code}); stopping the services`);
  } catch (error) {
    if (isShuttingDown()) return;
    console.error(`[whorlwind] ${taskName} could not start: ${(error as Error).message}`);
  }
  await shutdown();
  process.exit(1);
}
