/** Growable typed arrays and a max-heap on them, for the sampling and path searches. */

/** A typed array of twice the length holding `a`'s values first. */
export function grow<T extends Int32Array | Float32Array | Float64Array>(a: T): T {
  const bigger = new (a.constructor as new (n: number) => T)(2 * a.length);
  bigger.set(a);
  return bigger;
}

/**
 * A binary max-heap of (item, key) entries on typed arrays. Equal keys pop the lower item first,
 * so the order never depends on insertion history. Keys are not updated in place: callers push
 * an item again (and skip stale entries), which keeps every operation a plain sift.
 */
export class MaxHeap {
  private items: Int32Array;
  private keys: Float64Array;
  private count = 0;
  constructor(capacity: number) {
    this.items = new Int32Array(Math.max(1, capacity));
    this.keys = new Float64Array(Math.max(1, capacity));
  }
  private above(ka: number, ia: number, kb: number, ib: number): boolean {
    return ka > kb || (ka === kb && ia < ib);
  }
  push(item: number, key: number): void {
    if (this.count === this.items.length) {
      this.items = grow(this.items);
      this.keys = grow(this.keys);
    }
    const { items, keys } = this;
    let at = this.count++;
    while (at > 0) {
      const parent = (at - 1) >> 1;
      if (!this.above(key, item, keys[parent], items[parent])) break;
      items[at] = items[parent];
      keys[at] = keys[parent];
      at = parent;
    }
    items[at] = item;
    keys[at] = key;
  }
  get size(): number {
    return this.count;
  }
  topKey(): number {
    return this.keys[0];
  }
  pop(): number {
    const { items, keys } = this;
    const top = items[0];
    const n = --this.count;
    const item = items[n], key = keys[n];
    let at = 0;
    for (;;) {
      let child = 2 * at + 1;
      if (child >= n) break;
      if (child + 1 < n && this.above(keys[child + 1], items[child + 1], keys[child], items[child])) child++;
      if (!this.above(keys[child], items[child], key, item)) break;
      items[at] = items[child];
      keys[at] = keys[child];
      at = child;
    }
    items[at] = item;
    keys[at] = key;
    return top;
  }
}
