// Job workers started together on a database that does not have their queues yet (the first
// `WORKERS=2 npm run demo`, a deploy that adds a queue) each make the queues they work on. Without
// an order between them, both saw a queue missing and created it at once, and PostgreSQL aborted
// one as a deadlock (error 40P01), which ended that worker.
import { fork } from 'node:child_process';
import { randomUUID } from 'node:crypto';
import { fileURLToPath } from 'node:url';
import { afterAll, describe, expect, it } from 'vitest';
import { closeDb, db } from '@/lib/platform/db';
import { jobQueue, stopJobs } from '@/lib/platform/jobs';

const SETUP_PROCESS = fileURLToPath(new URL('./queue-setup-process.ts', import.meta.url));
const PROJECT_ROOT = fileURLToPath(new URL('../..', import.meta.url));

afterAll(async () => {
  await stopJobs();
  await closeDb();
});

function setUpQueues(area: string, names: string[]): Promise<{ code: number | null; output: string }> {
  const child = fork(SETUP_PROCESS, [area, ...names], { cwd: PROJECT_ROOT, execArgv: ['--import', 'tsx'], stdio: ['ignore', 'pipe', 'pipe', 'ipc'] });
  let output = '';
  child.stdout!.on('data', (chunk) => (output += chunk));
  child.stderr!.on('data', (chunk) => (output += chunk));
  return new Promise((resolve) => child.on('exit', (code) => resolve({ code, output })));
}

describe('queues made by several workers at once', () => {
  it('four processes making the same eight new queues at the same time all succeed, and each queue exists once', async () => {
    const names = Array.from({ length: 8 }, (_, i) => `setup-race-${randomUUID().slice(0, 8)}-${i}`);
    const results = await Promise.all(Array.from({ length: 4 }, () => setUpQueues('setup-race', names)));
    expect(results.map((result) => (result.code === 0 ? 'ok' : result.output.trim()))).toEqual(['ok', 'ok', 'ok', 'ok']);
    const made = await db()('pgboss.queue').whereIn('name', names).pluck('name');
    expect(made.sort()).toEqual([...names].sort());
    const boss = await jobQueue('setup-race-cleanup', []);
    for (const name of names) await boss.deleteQueue(name);
  }, 120_000);
});
