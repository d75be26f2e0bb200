// Starting the field worker as early as the page allows. The worker is one static script,
// public/field-worker.js (bundled by esbuild with the app: scripts/lib/field-worker-bundle.ts).
// The groom page starts it from a small inline script while the HTML is still being parsed, and
// asks it at once to open the groom's surface, so the download, the reading and the one-off
// preparation run while the page's own code loads and hydrates; the editor then adopts that worker
// and that opening (field-client.ts) instead of starting both again.
import type { BoundaryMode } from '@/lib/field';
import type { GroomDetail } from '@/lib/studio/types';
import type { SurfaceSource, WorkerReply, WorkerRequest } from './protocol';

/** Where the app serves the bundled worker. */
export const FIELD_WORKER_URL = '/field-worker.js';
/** The worker's name (shown by the browser's tools). */
export const FIELD_WORKER_NAME = 'whorlwind-field';
/** The request id of the opening the inline script sends; the page's own requests count from 1. */
export const EARLY_OPEN_ID = 0;

/** What the inline script leaves for the editor: the worker, its replies so far, and what it was asked to open. */
export interface EarlyField {
  readonly worker: Worker;
  readonly held: WorkerReply[];
  readonly key: string;
}

const GLOBAL = '__whorlwindEarlyField';

/** The same surface opened with the same boundary has the same key. */
export function openingKey(source: SurfaceSource, boundary: BoundaryMode): string {
  return JSON.stringify({ source, boundary });
}

/**
 * The surface source of a groom as the editor opens it: the prepared form when the check wrote one
 * (no parsing, no welding in the browser), with the file behind it. The page's inline script and
 * the editor both build it here, so their keys agree.
 */
export function groomSurfaceSource(groom: Pick<GroomDetail, 'surface'>): SurfaceSource {
  const file: SurfaceSource = { kind: 'url', url: groom.surface.fileUrl, fileName: groom.surface.fileName };
  return groom.surface.prepared ? { kind: 'url', url: groom.surface.prepared.url, fileName: groom.surface.prepared.fileName, fallback: file } : file;
}

/** JSON that is safe inside an HTML <script> element (no "</script>", no line separators JavaScript refuses). */
function scriptJson(value: unknown): string {
  return JSON.stringify(value).replace(/</g, '\\u003c').replace(/\u2028/g, '\\u2028').replace(/\u2029/g, '\\u2029');
}

/**
 * The text of the inline script that starts the worker and its opening. Guarantees: it only
 * starts a worker from FIELD_WORKER_URL and posts it one `open` request with id EARLY_OPEN_ID;
 * replies are kept until the editor adopts the worker; any failure (no Worker, a refused
 * script) leaves nothing behind, and the editor then starts its worker as it always did.
 */
export function earlyFieldScript(source: SurfaceSource, boundary: BoundaryMode): string {
  const request: WorkerRequest = { id: EARLY_OPEN_ID, type: 'open', source, boundary };
  return (
    `(function(){try{var w=new Worker(${scriptJson(FIELD_WORKER_URL)},{name:${scriptJson(FIELD_WORKER_NAME)}});var held=[];` +
    `w.onmessage=function(e){held.push(e.data)};w.postMessage(${scriptJson(request)});` +
    `window[${scriptJson(GLOBAL)}]={worker:w,held:held,key:${scriptJson(openingKey(source, boundary))}};` +
    `performance.mark('whorlwind:worker-starting')}catch(e){}})();`
  );
}

/** The worker the inline script started, taken once (null when there is none, or outside a browser). */
export function takeEarlyField(): EarlyField | null {
  if (typeof window === 'undefined') return null;
  const slot = window as unknown as Record<string, EarlyField | undefined>;
  const early = slot[GLOBAL] ?? null;
  delete slot[GLOBAL];
  return early;
}

/** True while an inline script's worker waits to be adopted. */
export function hasEarlyField(): boolean {
  return typeof window !== 'undefined' && GLOBAL in window;
}
