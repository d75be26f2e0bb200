/**
 * Text exports written as ASCII bytes into one growing buffer: numbers are printed digit by digit
 * in fixed-point, which is several times faster than building strings for the millions of
 * coordinates a groom has.
 */
const POWERS_OF_TEN = Array.from({ length: 13 }, (_, i) => 10 ** i);

export class AsciiWriter {
  private bytes = new Uint8Array(1 << 16);
  private length = 0;
  private readonly digits = new Uint8Array(24);
  private scale = 1;
  private decimals = 0;

  /**
   * The decimals that keep seven significant digits relative to the largest magnitude in
   * `values` (finer than float32 resolution at the model's size), at most twelve.
   */
  static decimalsFor(values: ArrayLike<number>): number {
    let largest = 0;
    for (let i = 0; i < values.length; i++) largest = Math.max(largest, Math.abs(values[i]));
    return Math.min(12, Math.max(0, 7 - Math.ceil(Math.log10(largest || 1))));
  }

  /** Sets how many decimals `number` keeps. */
  precision(decimals: number): this {
    this.decimals = decimals;
    this.scale = POWERS_OF_TEN[decimals];
    return this;
  }

  /** Sets the decimals for numbers of the size of `values` (see `decimalsFor`). */
  precisionFor(values: ArrayLike<number>): this {
    return this.precision(AsciiWriter.decimalsFor(values));
  }

  private reserve(n: number): void {
    if (this.length + n <= this.bytes.length) return;
    let size = this.bytes.length * 2;
    while (size < this.length + n) size *= 2;
    const bigger = new Uint8Array(size);
    bigger.set(this.bytes.subarray(0, this.length));
    this.bytes = bigger;
  }

  /** Appends text. Guarantees: exact for ASCII text (every caller's text is ASCII). */
  text(s: string): this {
    this.reserve(s.length);
    for (let i = 0; i < s.length; i++) this.bytes[this.length++] = s.charCodeAt(i);
    return this;
  }

  /** Appends a whole number ≥ 0. */
  whole(n: number): this {
    let k = 0;
    do {
      this.digits[k++] = 48 + (n % 10);
      n = Math.floor(n / 10);
    } while (n > 0);
    this.reserve(k);
    while (k > 0) this.bytes[this.length++] = this.digits[--k];
    return this;
  }

  /** Appends x rounded to the chosen decimals, without trailing zeros ("-0" never appears). */
  number(x: number): this {
    const m = Math.round(Math.abs(x) * this.scale);
    if (m === 0) return this.text('0');
    if (x < 0) this.text('-');
    const whole = Math.floor(m / this.scale);
    let fraction = m - whole * this.scale;
    this.whole(whole);
    if (fraction === 0) return this;
    let places = this.decimals;
    while (fraction % 10 === 0) {
      fraction /= 10;
      places--;
    }
    this.reserve(places + 1);
    this.bytes[this.length++] = 46;
    for (let i = places - 1; i >= 0; i--) {
      this.bytes[this.length + i] = 48 + (fraction % 10);
      fraction = Math.floor(fraction / 10);
    }
    this.length += places;
    return this;
  }

  /** The bytes written so far. */
  toBytes(): Uint8Array {
    return this.bytes.slice(0, this.length);
  }

  /** The text written so far. */
  toString(): string {
    return new TextDecoder().decode(this.bytes.subarray(0, this.length));
  }
}
