// The studio's field worker: one FieldEngine per page, answering the protocol of protocol.ts.
// Requests are answered one at a time, in order; the page (field-client.ts) makes sure that
// only the newest solve of a burst is sent, so a drag never queues up stale work here.
// First, before any schema is built in this worker: no code generation under the app's policy.
import '@/lib/http/no-eval';
import { FieldEngine } from './field-engine';
import { errorOf } from './field-reports';
import type { WorkerReply, WorkerRequest } from './protocol';

// The worker's global scope, typed by hand: the project compiles against the DOM's types, which
// cannot be mixed with the web worker library's.
const scope = self as unknown as {
  postMessage(message: WorkerReply, transfer: Transferable[]): void;
  onmessage: ((event: MessageEvent<WorkerRequest>) => void) | null;
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

let queue: Promise<void> = Promise.resolve();

scope.onmessage = (event) => {
  const request = event.data;
  queue = queue.then(async () => {
    current = request.id;
    try {
      const result = await answer(request);
      post({ id: request.id, type: 'done', result }, transferablesOf(result));
    } catch (error) {
      post({ id: request.id, type: 'failed', error: errorOf(error) });
    }
  });
};
