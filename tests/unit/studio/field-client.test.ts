import { describe, expect, it } from 'vitest';
import { FieldClient, SUPERSEDED, WorkerFailure, type WorkerLike } from '@/lib/studio/client/field-client';
import type { WorkerMessage, WorkerReply } from '@/lib/studio/client/protocol';

/** A worker that holds every request until the test answers it. */
class FakeWorker implements WorkerLike {
  readonly received: WorkerMessage[] = [];
  onmessage: ((event: MessageEvent<WorkerReply>) => void) | null = null;
  onerror: ((event: ErrorEvent) => void) | null = null;
  terminated = false;
  postMessage(message: WorkerMessage) {
    this.received.push(message);
  }
  reply(reply: WorkerReply) {
    this.onmessage?.({ data: reply } as MessageEvent<WorkerReply>);
  }
  terminate() {
    this.terminated = true;
  }
}

const spec = {} as never;
const display = { drawing: 'strokes', density: 100 } as const;
const solve = (quick: boolean) => ({ type: 'solve', spec, display, quick }) as const;

describe('the field client', () => {
  it('passes progress on and resolves with the result', async () => {
    const worker = new FakeWorker();
    const client = new FieldClient(worker);
    const seen: string[] = [];
    const result = client.request({ type: 'curve-path', points: [], closed: false }, (p) => seen.push(p.stage));
    const id = worker.received[0].id;
    worker.reply({ id, type: 'progress', progress: { stage: 'joining', fraction: 0.5 } });
    worker.reply({ id, type: 'done', result: { points: new Float32Array(3) } });
    await expect(result).resolves.toEqual({ points: new Float32Array(3) });
    expect(seen).toEqual(['joining']);
  });

  it('in a lane, every request is posted at once with its lane; the worker\'s "superseded" resolves it as SUPERSEDED', async () => {
    const worker = new FakeWorker();
    const client = new FieldClient(worker);
    const first = client.latest('field', 0, solve(true));
    const second = client.latest('field', 0, solve(true));
    const third = client.latest('field', 0, solve(false));
    expect(worker.received.map((r) => [r.type, (r as { lane?: string }).lane])).toEqual([['solve', 'field'], ['solve', 'field'], ['solve', 'field']]);
    worker.reply({ id: worker.received[0].id, type: 'done', result: 'one' });
    worker.reply({ id: worker.received[1].id, type: 'superseded' });
    await expect(first).resolves.toBe('one');
    await expect(second).resolves.toBe(SUPERSEDED);
    expect(client.isBusy('field')).toBe(true);
    expect(worker.received[2]).toMatchObject({ type: 'solve', quick: false });
    worker.reply({ id: worker.received[2].id, type: 'done', result: 'three' });
    await expect(third).resolves.toBe('three');
    expect(client.isBusy('field')).toBe(false);
  });

  it('a request outside a lane carries no lane (the worker never supersedes it)', () => {
    const worker = new FakeWorker();
    const client = new FieldClient(worker);
    void client.request({ type: 'find-mirror' });
    expect(worker.received[0]).not.toHaveProperty('lane');
  });

  it('a lower-priority lane waits until the field lane is idle', async () => {
    const worker = new FakeWorker();
    const client = new FieldClient(worker);
    const field = client.latest('field', 0, solve(true));
    const guides = client.latest('guides', 1, { type: 'grow', spec });
    const laterField = client.latest('field', 0, solve(false));
    expect(worker.received.map((r) => r.type)).toEqual(['solve', 'solve']);
    worker.reply({ id: worker.received[0].id, type: 'superseded' });
    await expect(field).resolves.toBe(SUPERSEDED);
    // Still one of the field lane's requests at the worker: the guides keep waiting.
    expect(worker.received.map((r) => r.type)).toEqual(['solve', 'solve']);
    worker.reply({ id: worker.received[1].id, type: 'done', result: 'field' });
    await laterField;
    expect(worker.received.map((r) => r.type)).toEqual(['solve', 'solve', 'grow']);
    worker.reply({ id: worker.received[2].id, type: 'done', result: 'guides' });
    await expect(guides).resolves.toBe('guides');
  });

  it('a failure comes back with its reason; a crashed worker fails everything after it in plain words', async () => {
    const worker = new FakeWorker();
    const client = new FieldClient(worker);
    const failing = client.request({ type: 'grow', spec });
    worker.reply({ id: worker.received[0].id, type: 'failed', error: { code: 'unknown-region', message: 'no group "tail"' } });
    await expect(failing).rejects.toBeInstanceOf(WorkerFailure);
    const waiting = client.request({ type: 'grow', spec });
    worker.onerror?.({ message: 'out of memory', preventDefault() {} } as ErrorEvent);
    await expect(waiting).rejects.toThrow(/field worker stopped \(out of memory\)/);
    await expect(client.request({ type: 'grow', spec })).rejects.toThrow(/Reload the page/);
  });
});
