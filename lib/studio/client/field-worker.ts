// The studio's field worker: one FieldEngine per page, answering the protocol of protocol.ts.
// Requests are answered one at a time, in the order they came; of a lane's requests (a drag's
// solves, posted at once) only the newest waiting one is carried out, the older ones answered as
// superseded (request-queue.ts) — so the worker never waits on a busy page to hear the newest
// position, and a drag never queues up stale work here.
// First, before any schema is built in this worker: no code generation under the app's policy.
import '@/lib/http/no-eval';
import { FieldEngine } from './field-engine';
import { errorOf } from './field-reports';
import type { WorkerMessage, WorkerReply, WorkerRequest } from './protocol';
import { RequestQueue } from './request-queue';

// The worker's global scope, typed by hand: the project compiles against the DOM's types, which
// cannot be mixed with the web worker library's.
const scope = self as unknown as {
  postMessage(message: WorkerReply, transfer: Transferable[]): void;
  onmessage: ((event: MessageEvent<WorkerMessage>) => void) | null;
};

let current = 0;
// The opening's preview arrays are made for the page alone: moved, not copied.
const engine = new FieldEngine((report) => {
  const progress = { ...report, at: performance.timeOrigin + performance.now() };
  post({ id: current, type: 'progress', progress }, progress.preview ? transferablesOf(progress.preview) : []);
});

function post(reply: WorkerReply, transfer: Transferable[] = []) {
  scope.postMessage(reply, transfer);
}

/** Typed arrays made for the reply alone can move to the page instead of being copied. */
function transferablesOf(result: unknown): Transferable[] {
  const out: Transferable[] = [];
  if (result && typeof result === 'object') {
    for (const value of Object.values(result)) {
      if (ArrayBuffer.isView(value) && value.buffer instanceof ArrayBuffer && !out.includes(value.buffer)) out.push(value.buffer);
    }
  }
  return out;
}

async function answer(request: WorkerRequest): Promise<unknown> {
  switch (request.type) {
    case 'open':
      return engine.open(request.source, request.boundary);
    case 'inspect':
      return engine.inspect(request.source);
    case 'solve':
      return engine.solve(request.spec, request.display, request.quick);
    case 'grow':
      return engine.grow(request.spec, request.rootsFrom);
    case 'curve-path':
      return { points: engine.curvePath(request.points, request.closed) };
    case 'read-grain':
      return engine.readGrain(request.spec, request.follow);
    case 'find-mirror':
      return engine.findMirror();
    case 'twist-faces':
      return engine.twistFaces();
  }
}

const queue = new RequestQueue();
let running = false;
let scheduled = false;
// The next step runs as a task of its own, queued behind the messages that arrived while the last
// request ran (a MessagePort's messages and the worker's own share the posted-message task queue,
// in order), so the queue sees every request sent meanwhile before it picks the next one.
const turns = new MessageChannel();
turns.port1.onmessage = () => {
  scheduled = false;
  void step();
};

function schedule(): void {
  if (running || scheduled) return;
  scheduled = true;
  turns.port2.postMessage(null);
}

async function step(): Promise<void> {
  for (let next = queue.take(); next; next = queue.take()) {
    const { request } = next;
    if (next.kind === 'superseded') {
      post({ id: request.id, type: 'superseded' });
      continue;
    }
    running = true;
    current = request.id;
    try {
      const result = await answer(request);
      post({ id: request.id, type: 'done', result }, transferablesOf(result));
    } catch (error) {
      post({ id: request.id, type: 'failed', error: errorOf(error) });
    }
    running = false;
    schedule();
    return;
  }
}

scope.onmessage = (event) => {
  queue.add(event.data);
  schedule();
};
