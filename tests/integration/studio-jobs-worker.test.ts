// services/jobs-worker.ts run as a process of its own, as it would run beside the app servers:
// it takes a queued thumbnail job, and stops cleanly on SIGTERM.
import { callRoute, createSurface, expectJson, signedInAccount } from './studio-helpers';
import { spawn } from 'node:child_process';
import { readFile } from 'node:fs/promises';
import { fileURLToPath } from 'node:url';
import { afterAll, describe, expect, it } from 'vitest';
import { closeDb, db } from '@/lib/platform/db';
import { stopJobs } from '@/lib/platform/jobs';
import * as groomsRoute from '@/app/api/studio/grooms/route';

afterAll(async () => {
  await stopJobs();
  await closeDb();
});

const projectRoot = fileURLToPath(new URL('../../', import.meta.url));

describe('the stand-alone job worker', () => {
  it('renders a queued thumbnail and exits 0 on SIGTERM', async () => {
    const groomer = await signedInAccount('groomer', 'worker-process');
    const cube = new Uint8Array(await readFile(new URL('../fixtures/surfaces/uv-split-cube.obj', import.meta.url)));
    const surface = await createSurface(groomer, 'cube.obj', cube, 'Cube');
    const created = await callRoute(groomsRoute, 'POST', '/api/studio/grooms', { cookie: groomer.cookie, body: { surfaceId: surface.id, name: 'Cube coat' } });
    const groom = (await expectJson(created, 201)).data.groom;

    const worker = spawn(process.execPath, ['--import', 'tsx', 'services/jobs-worker.ts'], { cwd: projectRoot, env: process.env, stdio: ['ignore', 'pipe', 'pipe'] });
    let output = '';
    worker.stdout.on('data', (chunk) => (output += chunk));
    worker.stderr.on('data', (chunk) => (output += chunk));
    const exited = new Promise<number | null>((resolve) => worker.on('exit', resolve));
    try {
      const deadline = Date.now() + 45_000;
      let key: string | null = null;
      while (!key && Date.now() < deadline) {
        await new Promise((resolve) => setTimeout(resolve, 250));
        key = (await db()('grooms').where({ id: groom.id }).first('thumbnail_key')).thumbnail_key;
      }
      expect(key, output).toMatch(new RegExp(`^grooms/${groom.id}/thumbnail-`));
    } finally {
      worker.kill('SIGTERM');
    }
    expect(await exited, output).toBe(0);
    expect(output).toContain('[jobs-worker] working on the studio queues');
  });
});
