// How long the field takes to follow the pointer while a marker is dragged, as the page sees it.
// Every pointer move that moves a marker is an "ask", numbered in order and marked at the time of
// its pointer event (`whorlwind:drag-asked`); the spec it made carries that number to the worker
// and back, and the frame that first draws the field solved for it is marked `whorlwind:field-drawn`
// with the number. Since only the newest ask of a burst is solved, a drawn field answers every
// ask up to its number: the browser bench (tests/browser/bench/drag-bench.ts) reads the latency
// of each ask from the marks. No DOM beyond the User Timing API, no React.

const askOfSpec = new WeakMap<object, number>();
let asks = 0;

/** The marks a drag leaves, dropped when the next drag starts so that a long session does not pile them up. */
const DRAG_MARKS = ['whorlwind:drag-asked', 'whorlwind:field-drawn', 'whorlwind:solved'];

/** A marker was pressed: the marks of the drags before go (the first field's marks stay). */
export function startDragTiming(): void {
  for (const name of DRAG_MARKS) performance.clearMarks(name);
}

/**
 * Records that the pointer event at `eventTime` (the event's `timeStamp`, on the page's clock)
 * asked for the field of `spec`; returns the ask's number (1, 2, … in the order of the events).
 */
export function markAsked(spec: object, eventTime: number): number {
  const ask = ++asks;
  askOfSpec.set(spec, ask);
  // A time stamp from before the page's clock started (a synthetic event's may be 0) is the mark's own time.
  const startTime = eventTime > 0 && eventTime <= performance.now() ? eventTime : performance.now();
  performance.mark('whorlwind:drag-asked', { startTime, detail: { ask } });
  return ask;
}

/** The number of the ask that made this spec, or null when no dragged pointer made it. */
export function askOf(spec: object): number | null {
  return askOfSpec.get(spec) ?? null;
}

/** Marks the frame that first shows a field: with the ask it answers (null for a field no drag asked for) and whether it was a quick solve. */
export function markFieldDrawn(ask: number | null, quick: boolean): void {
  performance.mark('whorlwind:field-drawn', { detail: { ask, quick } });
}
