import { describe, expect, it } from 'vitest';
import { DEMO_GROOMS } from '@/lib/groom/demo/grooms';
import { parseGroomSpec, type GroomSpec } from '@/lib/groom/spec/spec';
import type { ApiOutcome as Outcome } from '@/lib/http/client';
import { Autosaver, type SaveStatus } from '@/lib/studio/client/autosave';

type Answer = Outcome<{ revision: number; savedAt: string }>;

/** A server that answers each save when the test says so, and timers the test runs by hand. */
function harness(startRevision = 3) {
  const saves: { spec: GroomSpec; base: number; answer: (a: Answer) => void }[] = [];
  const timers: (() => void)[] = [];
  const statuses: SaveStatus[] = [];
  const saver = new Autosaver(parseGroomSpec(DEMO_GROOMS[0].spec), startRevision, {
    save: (spec, base) => new Promise<Answer>((resolve) => saves.push({ spec, base, answer: resolve })),
    onStatus: (status) => statuses.push(status),
    setTimer: (run) => timers.push(run),
    clearTimer: () => timers.splice(0),
  });
  const runTimers = () => timers.splice(0).forEach((run) => run());
  const tick = () => new Promise((resolve) => setTimeout(resolve, 0));
  return { saver, saves, statuses, runTimers, tick };
}

const renamed = (name: string): GroomSpec => ({ ...parseGroomSpec(DEMO_GROOMS[0].spec), name });
const ok = (revision: number): Answer => ({ ok: true, data: { revision, savedAt: '2026-01-01T00:00:00Z' } });

describe('autosave', () => {
  it('waits for the delay, saves with the revision it last saw, and takes the new revision', async () => {
    const { saver, saves, statuses, runTimers, tick } = harness();
    saver.update(renamed('a'));
    saver.update(renamed('b'));
    expect(saver.current.state).toBe('waiting');
    expect(saves).toHaveLength(0);
    runTimers();
    expect(saves).toHaveLength(1);
    expect(saves[0]).toMatchObject({ base: 3, spec: { name: 'b' } });
    saves[0].answer(ok(4));
    await tick();
    expect(saver.current).toEqual({ state: 'saved', revision: 4, savedAt: '2026-01-01T00:00:00Z' });
    expect(statuses.map((s) => s.state)).toEqual(['waiting', 'waiting', 'saving', 'saved']);
  });

  it('an edit during a save is saved after it, on the new revision', async () => {
    const { saver, saves, runTimers, tick } = harness();
    saver.update(renamed('a'));
    runTimers();
    saver.update(renamed('b'));
    saves[0].answer(ok(4));
    await tick();
    expect(saver.current.state).toBe('waiting');
    runTimers();
    expect(saves[1]).toMatchObject({ base: 4, spec: { name: 'b' } });
    saves[1].answer(ok(5));
    await tick();
    expect(saver.dirty).toBe(false);
  });

  it('flush saves at once and says whether everything is saved', async () => {
    const { saver, saves, tick } = harness();
    saver.update(renamed('a'));
    const flushed = saver.flush();
    await tick();
    saves[0].answer(ok(9));
    await expect(flushed).resolves.toBe(true);
    await expect(saver.flush()).resolves.toBe(true);
    expect(saves).toHaveLength(1);
  });

  it('a refused save keeps its message and field messages, and can be tried again', async () => {
    const { saver, saves, runTimers, tick } = harness();
    saver.update(renamed('a'));
    runTimers();
    saves[0].answer({ ok: false, error: { code: 'invalid-spec', message: 'The spec has problems.', fields: { 'guides.density': 'must be positive' }, status: 400 } });
    await tick();
    expect(saver.current).toMatchObject({ state: 'failed', message: 'Not saved: The spec has problems.', fields: { 'guides.density': 'must be positive' } });
    const retried = saver.retry();
    await tick();
    saves[1].answer(ok(4));
    await expect(retried).resolves.toBe(true);
  });

  it('a stale revision is a conflict: nothing more is saved until the groomer decides', async () => {
    const { saver, saves, runTimers, tick } = harness();
    saver.update(renamed('a'));
    runTimers();
    saves[0].answer({ ok: false, error: { code: 'stale-revision', message: 'stale', details: { revision: 7 }, status: 409 } });
    await tick();
    expect(saver.current).toMatchObject({ state: 'conflict', serverRevision: 7 });
    saver.update(renamed('b'));
    runTimers();
    expect(saves).toHaveLength(1);
    const kept = saver.keepMine();
    await tick();
    expect(saves[1]).toMatchObject({ base: 7, spec: { name: 'b' } });
    saves[1].answer(ok(8));
    await expect(kept).resolves.toBe(true);
    saver.adopt(renamed('server'), 12);
    expect(saver.current).toEqual({ state: 'saved', revision: 12, savedAt: null });
    expect(saver.dirty).toBe(false);
  });
});
