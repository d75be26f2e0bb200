// The timing the library benchmarks share: the fastest of a few runs after a warm-up, since on a
// shared machine the slow runs measure the neighbours, not the code.

/** The fastest of `runs` runs after one warm-up, with that run's result. */
export function best<T>(work: () => T, runs = 3): { ms: number; result: T } {
  let result = work();
  let ms = Infinity;
  for (let i = 0; i < runs; i++) {
    const t0 = performance.now();
    const r = work();
    const elapsed = performance.now() - t0;
    if (elapsed < ms) [ms, result] = [elapsed, r];
  }
  return { ms, result };
}
