// The page's side of the field worker: requests with promises and progress, and "lanes" in which
// only the newest request counts. While a whorl is dragged the page asks for a solve at every
// pointer move; a lane posts each one at once, tagged with the lane, and the worker carries out
// only the newest of those waiting when its turn comes, answering the older ones as superseded
// (request-queue.ts) — so the worker starts on the latest position as soon as it is free, even
// while the page is still busy drawing the last answer. Lanes of lower priority (guide growth)
// wait on the page until the lanes above them are idle, so a long growth never starts in the
// middle of a drag.
import { EARLY_OPEN_ID, FIELD_WORKER_NAME, FIELD_WORKER_URL, hasEarlyField, openingKey, takeEarlyField } from './field-start';
import type { OpenedSurface, ProgressReport, ResultOf, WorkerError, WorkerMessage, WorkerReply, WorkerRequestBody } from './protocol';

export interface WorkerLike {
  postMessage(message: WorkerMessage, transfer?: Transferable[]): void;
  onmessage: ((event: MessageEvent<WorkerReply>) => void) | null;
  onerror: ((event: ErrorEvent) => void) | null;
  terminate(): void;
}

/** A request the worker could not carry out, with its reason in plain words. */
export class WorkerFailure extends Error {
  constructor(readonly error: WorkerError) {
    super(error.message);
    this.name = 'WorkerFailure';
  }
}

/** What a lane request resolves to when a newer request of the same lane replaced it before it was carried out. */
export const SUPERSEDED = Symbol('superseded');
export type Superseded = typeof SUPERSEDED;

type Kind = keyof ResultOf;
type BodyOf<K extends Kind> = Extract<WorkerRequestBody, { type: K }>;
type Listener = (progress: ProgressReport) => void;

interface Pending {
  resolve(value: unknown): void;
  reject(error: unknown): void;
  onProgress?: Listener;
}

interface Queued {
  body: WorkerRequestBody;
  pending: Pending;
}

interface Lane {
  readonly priority: number;
  /** Requests of the lane posted to the worker and not yet answered. */
  atWorker: number;
  /** A request held on the page until the lanes above are idle. */
  queued: Queued | null;
}

export class FieldClient {
  private nextId = 1;
  private readonly pending = new Map<number, Pending>();
  private readonly lanes = new Map<string, Lane>();
  private broken: WorkerError | null = null;

  /**
   * `early`: the opening the page's inline script already sent this worker (field-start.ts), with
   * the replies that came before this client; `open` takes it over when it asks for the same.
   */
  constructor(
    private readonly worker: WorkerLike,
    private early: { readonly key: string; readonly held: WorkerReply[] } | null = null,
  ) {
    worker.onmessage = (event) => this.receive(event.data);
    worker.onerror = (event) => {
      event.preventDefault?.();
      this.fail({ code: 'worker-crashed', message: `The field worker stopped (${event.message || 'no reason given'}). Reload the page to start it again; your saved work is safe.` });
    };
  }

  /** Sends a request now; resolves with the worker's result. */
  request<K extends Kind>(body: BodyOf<K>, onProgress?: Listener): Promise<ResultOf[K]> {
    return new Promise<ResultOf[K]>((resolve, reject) => {
      this.send(body, { resolve: resolve as (value: unknown) => void, reject, onProgress });
    });
  }

  /**
   * Opens a surface: takes over the opening the page's inline script started when it is of the same
   * surface and boundary (its progress so far is replayed to `onProgress`), otherwise sends it.
   */
  open(body: BodyOf<'open'>, onProgress?: Listener): Promise<OpenedSurface> {
    const early = this.early;
    this.early = null;
    if (!early || early.key !== openingKey(body.source, body.boundary) || this.broken) return this.request(body, onProgress);
    return new Promise<OpenedSurface>((resolve, reject) => {
      this.pending.set(EARLY_OPEN_ID, { resolve: resolve as (value: unknown) => void, reject, onProgress });
      for (const reply of early.held) this.receive(reply);
    });
  }

  /**
   * Sends a request in a lane. It is posted at once when every lane of higher priority is idle
   * (lower `priority` numbers go first), otherwise it waits on the page, replacing — and resolving
   * with SUPERSEDED — any request of the lane already waiting there. Guarantees: every request
   * resolves exactly once, with its result or SUPERSEDED (or rejects); the newest request of a lane
   * is always carried out; a lane's results come in the order its requests were made.
   */
  latest<K extends Kind>(lane: string, priority: number, body: BodyOf<K>, onProgress?: Listener): Promise<ResultOf[K] | Superseded> {
    const state = this.lanes.get(lane) ?? { priority, atWorker: 0, queued: null };
    this.lanes.set(lane, state);
    return new Promise((resolve, reject) => {
      const pending: Pending = { resolve: resolve as (value: unknown) => void, reject, onProgress };
      state.queued?.pending.resolve(SUPERSEDED);
      state.queued = { body, pending };
      this.pump();
    });
  }

  /** True while a lane has a request at the worker or waiting. */
  isBusy(lane: string): boolean {
    const state = this.lanes.get(lane);
    return !!state && (state.atWorker > 0 || state.queued !== null);
  }

  terminate(): void {
    this.fail({ code: 'closed', message: 'The editor was closed.' });
    this.worker.terminate();
  }

  /** Posts the lanes' waiting requests whose turn it is. */
  private pump(): void {
    const ordered = [...this.lanes].sort(([, a], [, b]) => a.priority - b.priority);
    for (const [laneName, lane] of ordered) {
      if (!lane.queued) continue;
      const higherActive = ordered.some(([, other]) => other.priority < lane.priority && (other.atWorker > 0 || other.queued));
      if (higherActive) continue;
      const { body, pending } = lane.queued;
      lane.queued = null;
      lane.atWorker++;
      const done = () => {
        lane.atWorker--;
        if (lane.atWorker === 0) this.pump();
      };
      this.send(
        body,
        {
          onProgress: pending.onProgress,
          resolve: (value) => {
            pending.resolve(value);
            done();
          },
          reject: (error) => {
            pending.reject(error);
            done();
          },
        },
        laneName,
      );
    }
  }

  private send(body: WorkerRequestBody, pending: Pending, lane?: string): void {
    if (this.broken) {
      pending.reject(new WorkerFailure(this.broken));
      return;
    }
    const id = this.nextId++;
    this.pending.set(id, pending);
    const message = (lane === undefined ? { ...body, id } : { ...body, id, lane }) as WorkerMessage;
    const transfer = message.type === 'open' && message.source.kind === 'bytes' ? [message.source.bytes] : [];
    this.worker.postMessage(message, transfer);
  }

  private receive(reply: WorkerReply): void {
    const pending = this.pending.get(reply.id);
    if (!pending) {
      // The inline script's opening, until `open` takes it over.
      if (reply.id === EARLY_OPEN_ID && this.early) this.early.held.push(reply);
      return;
    }
    if (reply.type === 'progress') {
      pending.onProgress?.(reply.progress);
      return;
    }
    this.pending.delete(reply.id);
    if (reply.type === 'done') pending.resolve(reply.result);
    else if (reply.type === 'superseded') pending.resolve(SUPERSEDED);
    else pending.reject(new WorkerFailure(reply.error));
  }

  private fail(error: WorkerError): void {
    this.broken = error;
    const all = [...this.pending.values()];
    this.pending.clear();
    for (const lane of this.lanes.values()) {
      if (lane.queued) all.push(lane.queued.pending);
      lane.queued = null;
    }
    for (const pending of all) pending.reject(new WorkerFailure(error));
  }
}

let prewarmed: Worker | null = null;

/** The bundled worker (field-start.ts): one static script, no chunks to load one by one. */
function newWorker(): Worker {
  return new Worker(FIELD_WORKER_URL, { name: FIELD_WORKER_NAME });
}

/**
 * Starts a field worker ahead of need, so that its code loads while the page is still being
 * hydrated; the next `startFieldWorker` takes it. Does nothing outside a browser, nor when the
 * page's inline script has started one already.
 */
export function prewarmFieldWorker(): void {
  if (typeof window === 'undefined' || typeof Worker === 'undefined' || hasEarlyField()) return;
  prewarmed ??= newWorker();
}

/**
 * The studio's field worker. With `adoptEarly` (the editor's own surface), the worker the page's
 * inline script started, with its opening; otherwise the prewarmed one or a new one.
 */
export function startFieldWorker(options: { adoptEarly?: boolean } = {}): FieldClient {
  const early = options.adoptEarly ? takeEarlyField() : null;
  if (early) {
    return new FieldClient(early.worker as unknown as WorkerLike, { key: early.key, held: early.held });
  }
  const worker = prewarmed ?? newWorker();
  prewarmed = null;
  return new FieldClient(worker as unknown as WorkerLike);
}
