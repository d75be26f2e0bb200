// Runs once when a Next.js server starts: the studio's and the market's job workers live in the server process,
// so `npm run demo` and `npm run dev` need nothing else running. More servers (or
// services/jobs-worker.ts) simply add workers on the same queues.
export async function register() {
  if (process.env.NEXT_RUNTIME !== 'nodejs') return;
  // Imported here, not at the top, so that the edge runtime's bundle never includes pg-boss or sharp.
  const { startStudioWorkers } = await import('./lib/studio/workers');
  const { startMarketWorkers } = await import('./lib/market/workers');
  for (const [area, start] of [['studio', startStudioWorkers], ['market', startMarketWorkers]] as const) {
    try {
      await start();
    } catch (error) {
      // The app still serves pages; work waits in the queue until a worker starts.
      console.error(`[${area}] job workers did not start: ${(error as Error).message}`);
    }
  }
}
