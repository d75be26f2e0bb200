/**
 * Seeded random numbers for everything in a groom that is random (root candidates, per-guide
 * variation), so that the same seed gives the same guides on every machine: integer arithmetic
 * only (Math.imul), no platform generator.
 */

/** A 32-bit mix of two integers (a murmur3-style finaliser); equal inputs give equal outputs everywhere. */
export function hash32(a: number, b: number): number {
  let h = Math.imul(a ^ 0x9e3779b9, 0x85ebca6b) ^ Math.imul(b + 0x7f4a7c15, 0xc2b2ae35);
  h ^= h >>> 16;
  h = Math.imul(h, 0x85ebca6b);
  h ^= h >>> 13;
  h = Math.imul(h, 0xc2b2ae35);
  h ^= h >>> 16;
  return h >>> 0;
}

/**
 * A stream of numbers in [0, 1) from a seed (the mulberry32 recurrence).
 * Guarantees: the same seed gives the same sequence; 2³² steps before it repeats.
 */
export function randomStream(seed: number): () => number {
  let state = hash32(seed >>> 0, 0x5eed) | 0;
  return () => {
    state = (state + 0x6d2b79f5) | 0;
    let t = Math.imul(state ^ (state >>> 15), 1 | state);
    t = (t + Math.imul(t ^ (t >>> 7), 61 | t)) ^ t;
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

/** A number in [0, 1) for one guide and one purpose (`channel`), independent of every other guide's. */
export function guideRandom(seed: number, guide: number, channel: number): number {
  return hash32(hash32(seed >>> 0, guide), channel) / 4294967296;
}
