import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { AsciiWriter } from '@/lib/groom/export/ascii';

describe('ASCII number writer', () => {
  it('writes numbers that read back within half a unit of the last decimal kept', () => {
    fc.assert(
      fc.property(fc.double({ min: -1e4, max: 1e4, noNaN: true }), fc.integer({ min: 0, max: 12 }), (x, decimals) => {
        const text = new AsciiWriter().precision(decimals).number(x).toString();
        expect(text).toMatch(/^-?\d+(\.\d*[1-9])?$/);
        expect(Math.abs(Number(text) - x)).toBeLessThanOrEqual(0.5 * 10 ** -decimals * (1 + 1e-9) + Math.abs(x) * 1e-15);
      }),
    );
  });

  it('keeps seven significant digits of the largest value and never writes -0', () => {
    const w = new AsciiWriter().precisionFor([123.456789, -2]);
    expect(w.number(123.456789).text(' ').number(-0.00000001).text(' ').number(-2).text(' ').whole(40).toString()).toBe('123.4568 0 -2 40');
  });
});
