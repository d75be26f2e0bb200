// The drag bench's figures from the page's marks (lib/studio/client/drag-timing.ts): how many
// field updates were drawn a second, and how long each pointer position waited for a frame that
// shows a field solved for it or for a newer one. Pure, so that a unit test can check it.

/** A pointer move that moved the marker: its number and the time of its event (ms, page clock). */
export interface DragAsk {
  readonly ask: number;
  readonly at: number;
}

/** A frame that first showed a newly solved field: when, the ask it answers, and whether the solve was quick. */
export interface DrawnField {
  readonly at: number;
  readonly ask: number | null;
  readonly quick: boolean;
}

export interface DragFigures {
  readonly seconds: number;
  readonly asks: number;
  /** Quick fields drawn during the drag that answer an ask. */
  readonly updates: number;
  readonly updatesPerSecond: number;
  /** Pointer-to-field latency over the asks of the drag, nearest-rank percentiles (ms). */
  readonly latencyP50: number;
  readonly latencyP95: number;
  readonly latencyMax: number;
  /** Asks no quick field answered (the last ones, when the drag ended before their field came). */
  readonly unanswered: number;
}

/** The p-th percentile by nearest rank (p in 0–100) of ascending values; NaN for none. */
export function nearestRank(sorted: readonly number[], p: number): number {
  if (sorted.length === 0) return NaN;
  return sorted[Math.min(sorted.length, Math.max(1, Math.ceil((p / 100) * sorted.length))) - 1];
}

/**
 * The figures of one drag from `from` to `to` (ms, page clock). A frame answers an ask when its
 * field was solved for that ask or a later one (only the newest position is solved, so a
 * skipped position is caught up by the next field drawn); an ask's latency runs from its pointer
 * event to the first such frame. Frames of full solves (the release) do not count.
 */
export function dragFigures(asks: readonly DragAsk[], drawn: readonly DrawnField[], from: number, to: number): DragFigures {
  const seconds = (to - from) / 1000;
  const frames = drawn.filter((d) => d.quick && d.ask !== null).sort((a, b) => a.at - b.at);
  const inDrag = asks.filter((a) => a.at >= from && a.at <= to);
  const latencies: number[] = [];
  let unanswered = 0;
  for (const a of inDrag) {
    const frame = frames.find((d) => d.at >= a.at && d.ask! >= a.ask);
    if (frame) latencies.push(frame.at - a.at);
    else unanswered++;
  }
  latencies.sort((x, y) => x - y);
  const updates = frames.filter((d) => d.at >= from && d.at <= to).length;
  return {
    seconds,
    asks: inDrag.length,
    updates,
    updatesPerSecond: seconds > 0 ? updates / seconds : NaN,
    latencyP50: nearestRank(latencies, 50),
    latencyP95: nearestRank(latencies, 95),
    latencyMax: latencies.length > 0 ? latencies[latencies.length - 1] : NaN,
    unanswered,
  };
}
