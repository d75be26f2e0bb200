// The field worker's queue of requests, in the order they arrived. A request may name a lane
// (field-client.ts posts every solve of a drag at once, tagged with its lane): when its turn comes
// and a newer request of the same lane is already waiting, it is answered as superseded without
// being carried out. So the worker always starts on the newest position it has been sent, however
// late the page is in taking its answers, and the page never has to hold a request back for the
// worker's sake. No DOM, no messages: field-worker.ts drives it, the unit tests call it directly.
import type { WorkerMessage } from './protocol';

/** What the worker does next: carry a request out, or answer it as superseded. */
export type NextStep = { readonly kind: 'run'; readonly request: WorkerMessage } | { readonly kind: 'superseded'; readonly request: WorkerMessage };

export class RequestQueue {
  private readonly waiting: WorkerMessage[] = [];

  get size(): number {
    return this.waiting.length;
  }

  add(request: WorkerMessage): void {
    this.waiting.push(request);
  }

  /**
   * The next step, or null when nothing waits. Guarantees: every request added comes out exactly
   * once, in the order added; one with a lane comes out as `superseded` exactly when a request of
   * the same lane was added after it and is still waiting, so the newest request of each lane is
   * always carried out.
   */
  take(): NextStep | null {
    const request = this.waiting.shift();
    if (!request) return null;
    const lane = request.lane;
    if (lane !== undefined && this.waiting.some((later) => later.lane === lane)) return { kind: 'superseded', request };
    return { kind: 'run', request };
  }
}
