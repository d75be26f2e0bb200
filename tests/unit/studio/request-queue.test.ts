// The drag's lane, end to end without a browser: the page's FieldClient posting every lane request
// at once, and the worker's RequestQueue (the same module field-worker.ts drives) choosing what to
// carry out. What must hold, whatever the timing: the newest request of a lane is carried out and
// answered with its own result; an older one is answered SUPERSEDED without being carried out once
// a newer one waits; no request is left without an answer; a lane's results come in the order its
// requests were made; a request outside a lane is never superseded.
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { FieldClient, SUPERSEDED, type WorkerLike } from '@/lib/studio/client/field-client';
import type { WorkerMessage, WorkerReply } from '@/lib/studio/client/protocol';
import { RequestQueue } from '@/lib/studio/client/request-queue';
import type { Vec3 } from '@/lib/studio/client/features';

const at = (id: number, lane?: string): WorkerMessage => ({ id, type: 'find-mirror', ...(lane ? { lane } : {}) });

describe('the worker\'s request queue', () => {
  it('carries out the newest of a lane\'s waiting requests and answers the older ones as superseded, in arrival order', () => {
    const queue = new RequestQueue();
    for (const request of [at(1, 'field'), at(2, 'field'), at(3), at(4, 'guides'), at(5, 'field')]) queue.add(request);
    const steps: string[] = [];
    for (let next = queue.take(); next; next = queue.take()) steps.push(`${next.request.id} ${next.kind}`);
    expect(steps).toEqual(['1 superseded', '2 superseded', '3 run', '4 run', '5 run']);
    expect(queue.size).toBe(0);
  });

  it('a request that arrives after an older one of its lane was started does not stop it', () => {
    const queue = new RequestQueue();
    queue.add(at(1, 'field'));
    expect(queue.take()).toEqual({ kind: 'run', request: at(1, 'field') });
    queue.add(at(2, 'field'));
    expect(queue.take()).toEqual({ kind: 'run', request: at(2, 'field') });
    expect(queue.take()).toBeNull();
  });
});

/** A worker that holds what the page posts in a RequestQueue and takes one step when the test says so. */
class QueueWorker implements WorkerLike {
  readonly queue = new RequestQueue();
  /** Request numbers (the test's, carried in the points) the worker carried out, in order. */
  readonly carriedOut: number[] = [];
  onmessage: ((event: MessageEvent<WorkerReply>) => void) | null = null;
  onerror: ((event: ErrorEvent) => void) | null = null;
  private readonly waitingLanes: (string | undefined)[] = [];
  postMessage(message: WorkerMessage) {
    this.queue.add(message);
    this.waitingLanes.push(message.lane);
  }
  /** One turn of the worker: false when nothing waited. */
  step(): boolean {
    const next = this.queue.take();
    if (!next) return false;
    const { request } = next;
    this.waitingLanes.shift();
    const n = request.type === 'curve-path' ? request.points[0][0] : -1;
    if (next.kind === 'superseded') {
      this.reply({ id: request.id, type: 'superseded' });
    } else {
      // Carried out only when no newer request of its lane waits (checked here, independently of the queue).
      if (request.lane !== undefined) expect(this.waitingLanes).not.toContain(request.lane);
      this.carriedOut.push(n);
      this.reply({ id: request.id, type: 'done', result: { n } });
    }
    return true;
  }
  private reply(reply: WorkerReply) {
    this.onmessage?.({ data: reply } as MessageEvent<WorkerReply>);
  }
  terminate() {}
}

const LANES = [
  { lane: 'field', priority: 0 },
  { lane: 'draft', priority: 0 },
  { lane: 'guides', priority: 1 },
  { lane: null, priority: 0 },
] as const;

const flush = () => new Promise<void>((resolve) => setTimeout(resolve, 0));

describe('a lane through the page and the worker', () => {
  it('newest wins, superseded ones are answered, no answer is lost, each lane keeps its order (random interleavings, fast-check seed 1512)', async () => {
    // Each action: the page makes a request in one of the lanes (or outside them), or the worker takes a turn.
    const action = fc.oneof(fc.record({ make: fc.integer({ min: 0, max: LANES.length - 1 }) }), fc.constant({ make: null }));
    await fc.assert(
      fc.asyncProperty(fc.array(action, { minLength: 1, maxLength: 60 }), async (actions) => {
        const worker = new QueueWorker();
        const client = new FieldClient(worker);
        const made: { n: number; lane: string | null; outcome: 'waiting' | 'superseded' | 'result' }[] = [];
        const resultOrder: number[] = [];
        for (const { make } of actions) {
          if (make === null) {
            worker.step();
            await flush();
            continue;
          }
          const n = made.length;
          const { lane, priority } = LANES[make];
          const body = { type: 'curve-path' as const, points: [[n, 0, 0] as Vec3], closed: false };
          const record = { n, lane, outcome: 'waiting' as 'waiting' | 'superseded' | 'result' };
          made.push(record);
          const answer = lane === null ? client.request(body) : client.latest(lane, priority, body);
          void answer.then((value) => {
            if (value === SUPERSEDED) {
              record.outcome = 'superseded';
            } else {
              // Each answer is the request's own.
              expect((value as unknown as { n: number }).n).toBe(n);
              record.outcome = 'result';
              resultOrder.push(n);
            }
          });
        }
        // The worker works through everything left (lower lanes are posted as the higher ones go idle).
        for (let turns = 0; turns < 1000 && (worker.step() || worker.queue.size > 0); turns++) await flush();
        await flush();
        // No answer lost.
        expect(made.filter((r) => r.outcome === 'waiting')).toEqual([]);
        for (const { lane } of LANES) {
          const ofLane = made.filter((r) => r.lane === lane);
          if (ofLane.length === 0) continue;
          if (lane === null) {
            // Outside a lane, nothing is superseded.
            expect(ofLane.every((r) => r.outcome === 'result')).toBe(true);
            continue;
          }
          // Newest wins: the last request of each lane is answered with its own result.
          expect(ofLane[ofLane.length - 1].outcome).toBe('result');
          // Order kept: the lane's results arrive in the order its requests were made.
          const results = resultOrder.filter((n) => made[n].lane === lane);
          expect(results).toEqual([...results].sort((a, b) => a - b));
        }
        // Only what came back with a result was carried out, once each.
        expect([...worker.carriedOut].sort((a, b) => a - b)).toEqual(made.filter((r) => r.outcome === 'result').map((r) => r.n));
      }),
      { seed: 1512, numRuns: 200 },
    );
  });

  it('a burst of a drag\'s solves made while the worker is busy costs one solve, the newest', async () => {
    const worker = new QueueWorker();
    const client = new FieldClient(worker);
    const ask = (n: number) => client.latest('field', 0, { type: 'curve-path', points: [[n, 0, 0]], closed: false });
    const first = ask(0);
    worker.step();
    const burst = [1, 2, 3, 4].map(ask);
    while (worker.step());
    expect(await first).toEqual({ n: 0 });
    expect(await Promise.all(burst)).toEqual([SUPERSEDED, SUPERSEDED, SUPERSEDED, { n: 4 }]);
    expect(worker.carriedOut).toEqual([0, 4]);
  });
});
