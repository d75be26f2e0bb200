import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { Matrix } from 'ml-matrix';
import { multiplySymmetric, symmetricFromTriplets } from '@/lib/field/linalg/sparse';

describe('symmetricFromTriplets', () => {
  it('mirrors upper entries, sums duplicates and sorts rows within columns', () => {
    const A = symmetricFromTriplets(3, [2, 0, 1, 1, 0, 2], [0, 2, 1, 1, 0, 2], [1, 2, 3, 4, 5, 6]);
    expect(Array.from(A.colPtr)).toEqual([0, 2, 3, 4]);
    expect(Array.from(A.rowIdx)).toEqual([0, 2, 1, 2]);
    expect(Array.from(A.values)).toEqual([5, 3, 7, 6]);
  });

  it('handles the empty matrix', () => {
    const A = symmetricFromTriplets(0, [], [], []);
    expect(A.n).toBe(0);
    expect(Array.from(A.colPtr)).toEqual([0]);
    expect(multiplySymmetric(A, new Float64Array(0)).length).toBe(0);
  });

  it('throws clear errors for bad input', () => {
    expect(() => symmetricFromTriplets(2, [0, 1], [0], [1, 1])).toThrow(/same length/);
    expect(() => symmetricFromTriplets(2, [2], [0], [1])).toThrow(/triplet 0 has row 2, outside 0..1/);
    expect(() => symmetricFromTriplets(2, [0], [-1], [1])).toThrow(/triplet 0 has column -1/);
    expect(() => symmetricFromTriplets(2, [0.5], [0], [1])).toThrow(/row 0.5/);
    expect(() => symmetricFromTriplets(2, [0, 1], [0, 1], [1, NaN])).toThrow(/triplet 1 at \(1, 1\) has non-finite value NaN/);
    expect(() => symmetricFromTriplets(2, [0], [0], [Infinity])).toThrow(/non-finite/);
    expect(() => symmetricFromTriplets(-1, [], [], [])).toThrow(/non-negative integer/);
  });
});

describe('multiplySymmetric', () => {
  it('matches a dense product (reference: ml-matrix Matrix.mmul, npm)', () => {
    fc.assert(
      fc.property(
        fc.integer({ min: 1, max: 25 }).chain((n) =>
          fc.record({
            n: fc.constant(n),
            entries: fc.array(fc.tuple(fc.nat(n - 1), fc.nat(n - 1), fc.double({ min: -5, max: 5, noNaN: true })), {
              maxLength: 60,
            }),
            x: fc.array(fc.double({ min: -5, max: 5, noNaN: true }), { minLength: n, maxLength: n }),
          }),
        ),
        ({ n, entries, x }) => {
          const A = symmetricFromTriplets(
            n,
            entries.map((e) => e[0]),
            entries.map((e) => e[1]),
            entries.map((e) => e[2]),
          );
          const dense = Matrix.zeros(n, n);
          for (const [i, j, v] of entries) {
            dense.set(i, j, dense.get(i, j) + v);
            if (i !== j) dense.set(j, i, dense.get(j, i) + v);
          }
          const expected = dense.mmul(Matrix.columnVector(x)).getColumn(0);
          const out = new Float64Array(n).fill(99);
          const y = multiplySymmetric(A, Float64Array.from(x), out);
          expect(y).toBe(out);
          for (let i = 0; i < n; i++) expect(y[i]).toBeCloseTo(expected[i], 10);
        },
      ),
      { numRuns: 200, seed: 3 },
    );
  });

  it('rejects vectors of the wrong length', () => {
    const A = symmetricFromTriplets(2, [0, 1], [0, 1], [1, 1]);
    expect(() => multiplySymmetric(A, new Float64Array(3))).toThrow(/length 3, expected 2/);
  });
});
