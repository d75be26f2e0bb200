// Hostile files through the upload API (issue 11): 225 generated bad meshes (tests/fixtures/
// hostile-meshes.ts: truncated, lying headers, huge counts, NaN/Inf, non-manifold, zip-bomb-like
// glTF buffers, deep and cyclic node graphs, garbage) are uploaded and registered as a groomer
// would: each is refused with 422 and a reason in words, nothing of it is kept, and the memory of
// the process that checks them stays bounded.
import { callRoute, expectJson, signedInAccount, uploadFile, type TestAccount } from './studio-helpers';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { closeDb, db } from '@/lib/platform/db';
import * as surfacesRoute from '@/app/api/studio/surfaces/route';
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
      const ticket = await uploadFile(groomer, file.fileName, file.bytes);
      const response = await callRoute(surfacesRoute, 'POST', '/api/studio/surfaces', { cookie: groomer.cookie, body: { uploadId: ticket.uploadId, name: file.fileName, units: 'cm' } });
      if (response.status !== 422) {
        accepted.push(`${file.category}: ${file.fileName} answered ${response.status}`);
        continue;
      }
      const { error } = await expectJson(response, 422);
      expect(error.code, file.fileName).toBe('surface-rejected');
      const errors = (error.details.problems as { code: string; severity: string; message: string }[]).filter((problem) => problem.severity === 'error');
      expect(errors.length, file.fileName).toBeGreaterThan(0);
      for (const problem of errors) expect(problem.message.length, `${file.fileName}: ${problem.code}`).toBeGreaterThan(20);
      const byCode = reasons.get(file.category) ?? new Map<string, number>();
      byCode.set(errors[0].code, (byCode.get(errors[0].code) ?? 0) + 1);
      reasons.set(file.category, byCode);
      peak = Math.max(peak, process.memoryUsage().rss);
    }
    expect(accepted).toEqual([]);
    // Nothing of a refused file is kept: no surface, no upload record.
    expect(await db()('growth_surfaces').where({ owner_id: groomer.userId })).toHaveLength(0);
    expect(await db()('surface_uploads').where({ owner_id: groomer.userId })).toHaveLength(0);
    const grownMb = (peak - baseline) / 2 ** 20;
    console.log(`[hostile] ${files.length} files refused; resident size grew at most ${grownMb.toFixed(0)} MB`);
    for (const [category, byCode] of reasons) console.log(`[hostile]   ${category.padEnd(13)} ${[...byCode].map(([code, n]) => `${code} ×${n}`).join(', ')}`);
    expect(grownMb).toBeLessThan(MEMORY_HEADROOM_MB);
  });
});
