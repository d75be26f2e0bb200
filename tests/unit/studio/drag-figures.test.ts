import { describe, expect, it } from 'vitest';
import { askOf, markAsked, markFieldDrawn, startDragTiming } from '@/lib/studio/client/drag-timing';
import { dragFigures, nearestRank } from '@/tests/browser/bench/drag-figures';

describe('the drag bench figures', () => {
  it('nearest-rank percentiles (NIST/Wikipedia "nearest-rank method": the ⌈p·n/100⌉-th smallest value)', () => {
    // The worked example of the nearest-rank method: 15, 20, 35, 40, 50 → p30 = 20, p40 = 20, p50 = 35, p100 = 50.
    const values = [15, 20, 35, 40, 50];
    expect(nearestRank(values, 30)).toBe(20);
    expect(nearestRank(values, 40)).toBe(20);
    expect(nearestRank(values, 50)).toBe(35);
    expect(nearestRank(values, 100)).toBe(50);
    expect(nearestRank([], 50)).toBeNaN();
  });

  it('a skipped position is answered by the next field drawn for a newer one; full solves and fields before the ask do not count', () => {
    // Worked by hand: asks every 10 ms; the worker answers ask 1 at 30 ms, then (asks 2 and 3
    // superseded by 4) ask 4 at 70 ms; ask 5 comes at 50 ms and is answered by the field of ask 6 at 100 ms.
    const asks = [1, 2, 3, 4, 5, 6].map((ask) => ({ ask, at: 10 * ask }));
    const drawn = [
      { at: 5, ask: null, quick: false }, // the field before the drag
      { at: 30, ask: 1, quick: true },
      { at: 70, ask: 4, quick: true },
      { at: 100, ask: 6, quick: true },
      { at: 140, ask: 6, quick: false }, // the release's full solve
    ];
    const figures = dragFigures(asks, drawn, 0, 100);
    // latencies: 1 → 20, 2 → 50, 3 → 40, 4 → 30, 5 → 50, 6 → 40
    expect(figures).toMatchObject({ asks: 6, updates: 3, unanswered: 0, latencyP50: 40, latencyP95: 50, latencyMax: 50 });
    expect(figures.updatesPerSecond).toBeCloseTo(30, 9);
  });

  it('an ask no quick field answered is counted, not timed', () => {
    const figures = dragFigures([{ ask: 1, at: 10 }, { ask: 2, at: 20 }], [{ at: 15, ask: 1, quick: true }, { at: 40, ask: 2, quick: false }], 0, 50);
    expect(figures).toMatchObject({ asks: 2, updates: 1, unanswered: 1, latencyP50: 5, latencyP95: 5 });
  });
});

describe('the drag marks of the page', () => {
  it('an ask is marked at its pointer event’s time and tags its spec; a new drag drops the marks of the drags before', () => {
    const spec = {};
    const at = performance.now();
    const ask = markAsked(spec, at);
    expect(askOf(spec)).toBe(ask);
    expect(askOf({})).toBeNull();
    markFieldDrawn(ask, true);
    const asked = performance.getEntriesByName('whorlwind:drag-asked') as PerformanceMark[];
    expect(asked.at(-1)).toMatchObject({ startTime: at, detail: { ask } });
    expect((performance.getEntriesByName('whorlwind:field-drawn').at(-1) as PerformanceMark).detail).toEqual({ ask, quick: true });
    // A synthetic event's time stamp of 0 is taken as the mark's own time.
    markAsked({}, 0);
    expect((performance.getEntriesByName('whorlwind:drag-asked').at(-1) as PerformanceMark).startTime).toBeGreaterThan(0);
    startDragTiming();
    expect(performance.getEntriesByName('whorlwind:drag-asked')).toHaveLength(0);
    expect(performance.getEntriesByName('whorlwind:field-drawn')).toHaveLength(0);
  });
});
