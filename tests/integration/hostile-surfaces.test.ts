// Hostile files through the upload API (issue 11): 225 generated bad meshes (tests/fixtures/
// hostile-meshes.ts: truncated, lying headers, huge counts, NaN/Inf, non-manifold, zip-bomb-like
// glTF buffers, deep and cyclic node graphs, garbage) are uploaded and registered as a groomer
// would and checked by the check job's function: each surface ends refused with a reason in words,
// none of the files is kept, and the memory of the process that checks them stays bounded.
// (That a crashing or over-budget check is marked refused is studio-jobs-worker.test.ts's.)
import { callRoute, expectJson, registerAndCheck, signedInAccount, uploadFile, type TestAccount } from './studio-helpers';
import * as surfacesRoute from '@/app/api/studio/surfaces/route';
import { startJobsWorkerProcess } from '@/services/jobs-worker-process';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { closeDb, db } from '@/lib/platform/db';
import type { UncheckedSurface } from '@/lib/studio/types';
import { ListObjectsV2Command } from '@aws-sdk/client-s3';
import { env } from '@/lib/platform/env';
import { storageClient } from '@/lib/platform/storage';
import { hostileMeshes } from '@/tests/fixtures/hostile-meshes';

/** Growth of this process's resident size over the run that counts as bounded. */
const MEMORY_HEADROOM_MB = 300;

let groomer: TestAccount;

beforeAll(async () => {
  groomer = await signedInAccount('groomer', 'hostile');
});

afterAll(closeDb);

describe('hostile growth surfaces', () => {
  it('are each refused with a reason, and memory stays bounded', async () => {
    const files = hostileMeshes();
    expect(files.length).toBeGreaterThanOrEqual(200);
    const baseline = process.memoryUsage().rss;
    let peak = baseline;
    const reasons = new Map<string, Map<string, number>>();
    const accepted: string[] = [];
    for (const file of files) {
      const surface = await registerAndCheck(groomer, file.fileName, file.bytes, file.fileName);
      if (surface.state !== 'refused') {
        accepted.push(`${file.category}: ${file.fileName} ended ${surface.state}`);
        continue;
      }
      const errors = (surface as UncheckedSurface).problems.filter((problem) => problem.severity === 'error');
      expect(errors.length, file.fileName).toBeGreaterThan(0);
      for (const problem of errors) expect(problem.message.length, `${file.fileName}: ${problem.code}`).toBeGreaterThan(20);
      const byCode = reasons.get(file.category) ?? new Map<string, number>();
      byCode.set(errors[0].code, (byCode.get(errors[0].code) ?? 0) + 1);
      reasons.set(file.category, byCode);
      peak = Math.max(peak, process.memoryUsage().rss);
    }
    expect(accepted).toEqual([]);
    // Nothing of a refused file is kept: every surface refused, no upload record, no object.
    expect(await db()('growth_surfaces').where({ owner_id: groomer.userId }).whereNot({ state: 'refused' })).toHaveLength(0);
    expect(await db()('surface_uploads').where({ owner_id: groomer.userId })).toHaveLength(0);
    const listing = await storageClient().send(new ListObjectsV2Command({ Bucket: env().S3_BUCKET, Prefix: `surfaces/${groomer.userId}/` }));
    expect(listing.Contents ?? []).toEqual([]);
    const grownMb = (peak - baseline) / 2 ** 20;
    console.log(`[hostile] ${files.length} files refused; resident size grew at most ${grownMb.toFixed(0)} MB`);
    for (const [category, byCode] of reasons) console.log(`[hostile]   ${category.padEnd(13)} ${[...byCode].map(([code, n]) => `${code} ×${n}`).join(', ')}`);
    expect(grownMb).toBeLessThan(MEMORY_HEADROOM_MB);
  });

  it('are refused by a job-worker process too, one of each kind, and a check past its memory budget is refused in those words', async () => {
    const worker = await startJobsWorkerProcess({ ...process.env, WHORLWIND_JOB_MEMORY_MB: '400' });
    try {
      const firstOfEach = [...new Map(hostileMeshes().map((file) => [file.category, file])).values()];
      const ids: string[] = [];
      for (const file of firstOfEach) {
        const ticket = await uploadFile(groomer, file.fileName, file.bytes);
        const registered = await callRoute(surfacesRoute, 'POST', '/api/studio/surfaces', { cookie: groomer.cookie, body: { uploadId: ticket.uploadId, name: `worker ${file.fileName}`, units: 'cm' } });
        ids.push((await expectJson(registered, 202)).data.surface.id);
      }
      const deadline = Date.now() + 120_000;
      let rows: { state: string; problems: { severity: string; message: string }[] }[] = [];
      for (;;) {
        rows = await db()('growth_surfaces').whereIn('id', ids).select('state', 'problems');
        if (rows.every((row) => row.state !== 'checking') || Date.now() > deadline) break;
        await new Promise((resolve) => setTimeout(resolve, 200));
      }
      expect(rows.map((row) => row.state), worker.output()).toEqual(ids.map(() => 'refused'));
      for (const row of rows) expect(row.problems.some((problem) => problem.severity === 'error' && problem.message.length > 20)).toBe(true);
    } finally {
      expect(await worker.stop(), worker.output()).toBe(0);
    }
  });
});
