/**
 * Append-only typed arrays for readers that do not know their sizes in advance (OBJ, ASCII STL).
 * Capacity doubles, so appending n values costs O(n) in total.
 */
export class GrowableFloat64 {
  private data: Float64Array;
  length = 0;

  constructor(capacity = 1024) {
    this.data = new Float64Array(Math.max(4, capacity));
  }

  push(x: number): void {
    if (this.length === this.data.length) this.data = grow(this.data, new Float64Array(this.data.length * 2));
    this.data[this.length++] = x;
  }

  /** The values appended so far, in an array of exactly that length. */
  toArray(): Float64Array {
    return this.data.slice(0, this.length);
  }
}

export class GrowableUint32 {
  private data: Uint32Array;
  length = 0;

  constructor(capacity = 1024) {
    this.data = new Uint32Array(Math.max(4, capacity));
  }

  push(x: number): void {
    if (this.length === this.data.length) this.data = grow(this.data, new Uint32Array(this.data.length * 2));
    this.data[this.length++] = x;
  }

  get(i: number): number {
    return this.data[i];
  }

  /** The values appended so far, in an array of exactly that length. */
  toArray(): Uint32Array {
    return this.data.slice(0, this.length);
  }
}

function grow<T extends Float64Array | Uint32Array>(from: T, to: T): T {
  to.set(from);
  return to;
}
