import { describe, expect, it, afterAll } from 'vitest';
import fc from 'fast-check';
import { CholeskyDecomposition, inverse, Matrix, solve as denseSolve } from 'ml-matrix';
import { multiplySymmetric, symmetricFromTriplets, type SymmetricSparse } from '@/lib/field/linalg/sparse';
import {
  analyzeCholesky,
  computeOrdering,
  factorCholesky,
  factorNumeric,
  NotPositiveDefiniteError,
  type CholeskyOptions,
} from '@/lib/field/linalg/cholesky';
import { graphOfSymmetric } from '@/lib/field/linalg/ordering/graph';
import { minimumDegreeOrder } from '@/lib/field/linalg/ordering/minimum-degree';
import { nestedDissectionOrder } from '@/lib/field/linalg/ordering/nested-dissection';

type Ordering = NonNullable<CholeskyOptions['ordering']>;
const ORDERINGS: Ordering[] = ['auto', 'nested-dissection', 'minimum-degree', 'natural'];

/** Deterministic generator so failures reproduce. */
function rng(seed: number): () => number {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

interface Triplets {
  n: number;
  rows: number[];
  cols: number[];
  values: number[];
}

/** A = BᵀB + εI for a random sparse m×n matrix B with about `perRow` entries per row. */
function randomSpd(n: number, perRow: number, epsilon: number, seed: number): Triplets {
  const random = rng(seed);
  const m = n + 3;
  const acc = new Map<number, number>();
  for (let r = 0; r < m; r++) {
    const entries = new Map<number, number>();
    for (let t = 0; t < perRow; t++) entries.set(Math.floor(random() * n), random() * 2 - 1);
    const list = [...entries];
    for (const [i, bi] of list) {
      for (const [j, bj] of list) {
        if (i < j) continue;
        const key = i * n + j;
        acc.set(key, (acc.get(key) ?? 0) + bi * bj);
      }
    }
  }
  const out: Triplets = { n, rows: [], cols: [], values: [] };
  for (let i = 0; i < n; i++) {
    out.rows.push(i);
    out.cols.push(i);
    out.values.push(epsilon);
  }
  for (const [key, value] of acc) {
    // mix triangles on purpose: the builder must mirror (i, j) with i < j
    const i = Math.floor(key / n);
    const j = key % n;
    const upper = (i + j) % 2 === 0;
    out.rows.push(upper ? j : i);
    out.cols.push(upper ? i : j);
    out.values.push(value);
  }
  return out;
}

/**
 * Graph Laplacian of a side×side vertex grid whose quads are split into two triangles
 * (six neighbours per interior vertex), with the listed Dirichlet vertices removed.
 * Cotangent-like weights vary per edge so the test is not tied to unit weights.
 */
function gridLaplacian(side: number, dirichlet: number[], seed: number): SymmetricSparse {
  const random = rng(seed);
  const count = side * side;
  const removed = new Set(dirichlet);
  const index = new Int32Array(count).fill(-1);
  let n = 0;
  for (let v = 0; v < count; v++) if (!removed.has(v)) index[v] = n++;
  const rows: number[] = [];
  const cols: number[] = [];
  const values: number[] = [];
  const diagonal = new Float64Array(count);
  const edge = (a: number, b: number) => {
    const w = 0.5 + random();
    diagonal[a] += w;
    diagonal[b] += w;
    if (index[a] >= 0 && index[b] >= 0) {
      rows.push(index[a]);
      cols.push(index[b]);
      values.push(-w);
    }
  };
  for (let i = 0; i < side; i++) {
    for (let j = 0; j < side; j++) {
      const v = i * side + j;
      if (j + 1 < side) edge(v, v + 1);
      if (i + 1 < side) edge(v, v + side);
      if (i + 1 < side && j + 1 < side) edge(v, v + side + 1);
    }
  }
  for (let v = 0; v < count; v++) {
    if (index[v] < 0) continue;
    rows.push(index[v]);
    cols.push(index[v]);
    values.push(diagonal[v]);
  }
  return symmetricFromTriplets(n, rows, cols, values);
}

/**
 * Graph Laplacian of a subdivided icosahedron (a closed surface: no boundary, so every
 * BFS level is a closed loop) with the listed Dirichlet vertices removed.
 */
function icosphereLaplacian(subdivisions: number, dirichlet: number[]): SymmetricSparse {
  let faces = [
    0, 11, 5, 0, 5, 1, 0, 1, 7, 0, 7, 10, 0, 10, 11, 1, 5, 9, 5, 11, 4, 11, 10, 2, 10, 7, 6, 7, 1, 8, 3, 9, 4, 3, 4, 2,
    3, 2, 6, 3, 6, 8, 3, 8, 9, 4, 9, 5, 2, 4, 11, 6, 2, 10, 8, 6, 7, 9, 8, 1,
  ];
  let count = 12;
  for (let level = 0; level < subdivisions; level++) {
    const midpoint = new Map<string, number>();
    const mid = (a: number, b: number) => {
      const key = a < b ? `${a},${b}` : `${b},${a}`;
      let v = midpoint.get(key);
      if (v === undefined) midpoint.set(key, (v = count++));
      return v;
    };
    const next: number[] = [];
    for (let f = 0; f < faces.length; f += 3) {
      const [a, b, c] = [faces[f], faces[f + 1], faces[f + 2]];
      const ab = mid(a, b);
      const bc = mid(b, c);
      const ca = mid(c, a);
      next.push(a, ab, ca, b, bc, ab, c, ca, bc, ab, bc, ca);
    }
    faces = next;
  }
  const removed = new Set(dirichlet);
  const index = new Int32Array(count).fill(-1);
  let n = 0;
  for (let v = 0; v < count; v++) if (!removed.has(v)) index[v] = n++;
  const seen = new Set<string>();
  const degree = new Float64Array(count);
  const rows: number[] = [];
  const cols: number[] = [];
  const values: number[] = [];
  for (let f = 0; f < faces.length; f += 3) {
    for (let e = 0; e < 3; e++) {
      const a = faces[f + e];
      const b = faces[f + ((e + 1) % 3)];
      const key = a < b ? `${a},${b}` : `${b},${a}`;
      if (seen.has(key)) continue;
      seen.add(key);
      degree[a]++;
      degree[b]++;
      if (index[a] >= 0 && index[b] >= 0) {
        rows.push(index[a]);
        cols.push(index[b]);
        values.push(-1);
      }
    }
  }
  for (let v = 0; v < count; v++) {
    if (index[v] < 0) continue;
    rows.push(index[v]);
    cols.push(index[v]);
    values.push(degree[v]);
  }
  return symmetricFromTriplets(n, rows, cols, values);
}

function toDense(A: SymmetricSparse): Matrix {
  const D = Matrix.zeros(A.n, A.n);
  for (let j = 0; j < A.n; j++) {
    for (let p = A.colPtr[j]; p < A.colPtr[j + 1]; p++) {
      const i = A.rowIdx[p];
      D.set(i, j, A.values[p]);
      D.set(j, i, A.values[p]);
    }
  }
  return D;
}

function norm(v: ArrayLike<number>): number {
  let s = 0;
  for (let i = 0; i < v.length; i++) s += v[i] * v[i];
  return Math.sqrt(s);
}

function relativeDifference(x: ArrayLike<number>, y: ArrayLike<number>): number {
  const d = new Float64Array(x.length);
  for (let i = 0; i < x.length; i++) d[i] = x[i] - y[i];
  return norm(d) / Math.max(norm(y), Number.MIN_VALUE);
}

function relativeResidual(A: SymmetricSparse, x: Float64Array, b: Float64Array): number {
  const r = multiplySymmetric(A, x);
  for (let i = 0; i < r.length; i++) r[i] -= b[i];
  return norm(r) / norm(b);
}

function randomVector(n: number, seed: number): Float64Array {
  const random = rng(seed);
  const b = new Float64Array(n);
  for (let i = 0; i < n; i++) b[i] = random() * 2 - 1;
  return b;
}

const report: { case: string; ordering: string; n: number; nnzL: number; relErrorVsDense: string; residual: string }[] = [];
afterAll(() => {
  console.table(report);
});

/** reference: ml-matrix CholeskyDecomposition (npm) solve on the dense copy */
function denseReference(A: SymmetricSparse, b: Float64Array): Float64Array {
  const decomposition = new CholeskyDecomposition(toDense(A));
  expect(decomposition.isPositiveDefinite()).toBe(true);
  return Float64Array.from(decomposition.solve(Matrix.columnVector(Array.from(b))).getColumn(0));
}

function checkAgainstDense(label: string, A: SymmetricSparse, seed: number): void {
  const b = randomVector(A.n, seed);
  const reference = denseReference(A, b);
  for (const ordering of ORDERINGS) {
    const factor = factorCholesky(A, { ordering });
    const bCopy = b.slice();
    const x = factor.solve(b);
    expect(b).toEqual(bCopy); // solve must not touch b
    const error = relativeDifference(x, reference);
    const residual = relativeResidual(A, x, b);
    report.push({
      case: label,
      ordering,
      n: A.n,
      nnzL: factor.nonZerosInFactor,
      relErrorVsDense: error.toExponential(2),
      residual: residual.toExponential(2),
    });
    expect(error).toBeLessThan(1e-9);
    expect(residual).toBeLessThan(1e-12);
  }
}

describe('factorCholesky on random sparse SPD matrices', () => {
  for (const [n, perRow, seed] of [
    [1, 1, 1],
    [2, 2, 2],
    [7, 2, 3],
    [30, 3, 4],
    [120, 3, 5],
    [300, 4, 6],
    [400, 2, 7],
  ] as const) {
    it(`matches the dense Cholesky solve for n=${n} (BᵀB + εI, ~${perRow} entries per row of B)`, () => {
      const t = randomSpd(n, perRow, 0.3, seed);
      const A = symmetricFromTriplets(t.n, t.rows, t.cols, t.values);
      checkAgainstDense(`random BᵀB+εI #${seed}`, A, seed + 100);
    });
  }
});

describe('factorCholesky on triangulated-grid Laplacians with Dirichlet vertices removed', () => {
  for (const [side, dirichlet] of [
    [4, [0]],
    [12, [0, 77]],
    [20, [5, 210, 399]],
    [22, [0, 483, 250, 251]],
  ] as const) {
    it(`matches the dense Cholesky solve on a ${side}×${side} grid minus ${dirichlet.length} vertices`, () => {
      const A = gridLaplacian(side, [...dirichlet], side);
      checkAgainstDense(`grid ${side}×${side}`, A, side + 7);
    });
  }

  it('matches the dense Cholesky solve on a closed surface (icosphere, 642 vertices, one Dirichlet vertex)', () => {
    checkAgainstDense('icosphere 642', icosphereLaplacian(3, [0]), 11);
  });

  it('has small residuals on larger grids, where a dense reference is too slow', () => {
    // reference: the residual through multiplySymmetric, itself checked against
    // ml-matrix Matrix.mmul (npm) in sparse.test.ts
    for (const side of [60, 120]) {
      const A = gridLaplacian(side, [0, side * side - 1], side);
      const b = randomVector(A.n, side);
      for (const ordering of ['auto', 'nested-dissection', 'minimum-degree'] as const) {
        const factor = factorCholesky(A, { ordering });
        const x = factor.solve(b);
        const residual = relativeResidual(A, x, b);
        report.push({
          case: `grid ${side}×${side}`,
          ordering,
          n: A.n,
          nnzL: factor.nonZerosInFactor,
          relErrorVsDense: '—',
          residual: residual.toExponential(2),
        });
        expect(residual).toBeLessThan(1e-11);
      }
    }
  });

  it('agrees with ml-matrix solve (LU) on a grid with two components, one Dirichlet vertex each', () => {
    // two disjoint 8×8 grids side by side: block-diagonal matrix
    const a = gridLaplacian(8, [0], 1);
    const rows: number[] = [];
    const cols: number[] = [];
    const values: number[] = [];
    for (const shift of [0, a.n]) {
      for (let j = 0; j < a.n; j++) {
        for (let p = a.colPtr[j]; p < a.colPtr[j + 1]; p++) {
          rows.push(a.rowIdx[p] + shift);
          cols.push(j + shift);
          values.push(a.values[p] * (shift === 0 ? 1 : 2));
        }
      }
    }
    const A = symmetricFromTriplets(2 * a.n, rows, cols, values);
    const b = randomVector(A.n, 3);
    // reference: ml-matrix solve (npm), LU on the dense copy
    const reference = denseSolve(toDense(A), Matrix.columnVector(Array.from(b))).getColumn(0);
    for (const ordering of ORDERINGS) {
      expect(relativeDifference(factorCholesky(A, { ordering }).solve(b), reference)).toBeLessThan(1e-9);
    }
  });
});

describe('factorCholesky on other shapes', () => {
  it('matches the dense solve on a dense SPD matrix (one big supernode, no separator to find)', () => {
    const n = 100;
    const random = rng(99);
    const B = Matrix.zeros(n, n);
    for (let i = 0; i < n; i++) for (let j = 0; j < n; j++) B.set(i, j, random() - 0.5);
    const dense = B.transpose().mmul(B).add(Matrix.eye(n, n));
    const rows: number[] = [];
    const cols: number[] = [];
    const values: number[] = [];
    for (let i = 0; i < n; i++) {
      for (let j = 0; j <= i; j++) {
        rows.push(i);
        cols.push(j);
        values.push(dense.get(i, j));
      }
    }
    checkAgainstDense('dense BᵀB+I', symmetricFromTriplets(n, rows, cols, values), 5);
  });

  it('matches the dense solve on many separate small grids (a mesh of many shells)', () => {
    const piece = gridLaplacian(5, [12], 4);
    const copies = 12;
    const rows: number[] = [];
    const cols: number[] = [];
    const values: number[] = [];
    for (let c = 0; c < copies; c++) {
      for (let j = 0; j < piece.n; j++) {
        for (let p = piece.colPtr[j]; p < piece.colPtr[j + 1]; p++) {
          rows.push(piece.rowIdx[p] + c * piece.n);
          cols.push(j + c * piece.n);
          values.push(piece.values[p] * (1 + c / 10));
        }
      }
    }
    checkAgainstDense('12 grids 5×5', symmetricFromTriplets(copies * piece.n, rows, cols, values), 6);
  });

  it('matches the dense solve with wide supernodes and large update matrices (blocked kernels)', () => {
    // two dense blocks of 250 joined through a dense separator of 200: in natural order
    // the first block is one supernode of 250 columns with 200 rows below it, which
    // takes the sliced, column-blocked path of the update kernel
    const random = rng(123);
    const blockSize = 250;
    const separator = 200;
    const n = 2 * blockSize + separator;
    const rows: number[] = [];
    const cols: number[] = [];
    const values: number[] = [];
    const diagonal = new Float64Array(n);
    const couple = (i: number, j: number) => {
      const v = random() * 0.2 - 0.1;
      rows.push(i);
      cols.push(j);
      values.push(v);
      diagonal[i] += Math.abs(v);
      diagonal[j] += Math.abs(v);
    };
    for (const start of [0, blockSize]) {
      for (let i = 0; i < blockSize; i++) {
        for (let j = 0; j < i; j++) couple(start + i, start + j);
        // the block's first vertex sees the whole separator, so every column of the
        // block shares one pattern and the block is a single supernode
        if (i === 0) for (let t = 0; t < separator; t++) couple(2 * blockSize + t, start);
        else couple(2 * blockSize + ((i * 7 + 3) % separator), start + i);
      }
    }
    for (let i = 0; i < separator; i++) for (let j = 0; j < i; j++) couple(2 * blockSize + i, 2 * blockSize + j);
    for (let i = 0; i < n; i++) {
      rows.push(i);
      cols.push(i);
      values.push(diagonal[i] + 1);
    }
    checkAgainstDense('blocks 250+250+200', symmetricFromTriplets(n, rows, cols, values), 8);
  });

  it('factors and solves the empty matrix', () => {
    for (const ordering of ORDERINGS) {
      const factor = factorCholesky(symmetricFromTriplets(0, [], [], []), { ordering });
      expect(factor.nonZerosInFactor).toBe(0);
      expect(factor.solve(new Float64Array(0)).length).toBe(0);
    }
  });

  it('rejects right-hand sides of the wrong length', () => {
    const factor = factorCholesky(gridLaplacian(4, [0], 1));
    expect(() => factor.solve(new Float64Array(3))).toThrow(/length 3, expected 15/);
    expect(() => factor.solve(new Float64Array(15), new Float64Array(2))).toThrow(/out has length 2/);
  });

  it("'auto' keeps the smaller factor of nested dissection and minimum degree on small matrices", () => {
    for (const side of [10, 30]) {
      const A = gridLaplacian(side, [0], side);
      const auto = analyzeCholesky(A).nonZerosInFactor;
      const nd = analyzeCholesky(A, { ordering: 'nested-dissection' }).nonZerosInFactor;
      const md = analyzeCholesky(A, { ordering: 'minimum-degree' }).nonZerosInFactor;
      expect(auto).toBe(Math.min(nd, md));
    }
  });
});

describe('refactoring and reuse', () => {
  it('factors new values on the analysed pattern and solves repeatedly with an out buffer', () => {
    const A = gridLaplacian(15, [3], 11);
    const symbolic = analyzeCholesky(A);
    const scaled: SymmetricSparse = { ...A, values: A.values.map((v, q) => v * (1 + (q % 5) * 0.1)) };
    // keep it SPD: scaling entries unevenly can break diagonal dominance, so add to the diagonal
    for (let j = 0; j < A.n; j++) scaled.values[A.colPtr[j]] += 2;
    const factor = factorNumeric(symbolic, scaled);
    const out = new Float64Array(A.n);
    for (let trial = 0; trial < 3; trial++) {
      const b = randomVector(A.n, 40 + trial);
      const x = factor.solve(b, out);
      expect(x).toBe(out);
      // reference: ml-matrix inverse (npm) applied to b
      const reference = Float64Array.from(
        inverse(toDense(scaled)).mmul(Matrix.columnVector(Array.from(b)))
          .getColumn(0),
      );
      expect(relativeDifference(x, reference)).toBeLessThan(1e-9);
    }
  });

  it('refuses a matrix whose pattern differs from the analysed one', () => {
    const A = gridLaplacian(6, [0], 1);
    const B = gridLaplacian(6, [1], 1);
    const symbolic = analyzeCholesky(A);
    expect(() => factorNumeric(symbolic, B)).toThrow(/sparsity pattern/);
  });

  it('solves to the same answer with a caller-supplied permutation', () => {
    const A = gridLaplacian(10, [0], 2);
    const perm = computeOrdering(A, 'minimum-degree');
    const b = randomVector(A.n, 9);
    const x1 = factorNumeric(analyzeCholesky(A, { permutation: perm }), A).solve(b);
    // reference: the natural-order factorization, itself checked against ml-matrix above
    const x2 = factorCholesky(A, { ordering: 'natural' }).solve(b);
    expect(relativeDifference(x1, x2)).toBeLessThan(1e-12);
    expect(() => analyzeCholesky(A, { permutation: new Int32Array(A.n) })).toThrow(/not a permutation/);
  });

  it('reports the same nonzero count for L as a dense factorization shows', () => {
    const A = gridLaplacian(9, [40], 5);
    for (const ordering of ORDERINGS) {
      const symbolic = analyzeCholesky(A, { ordering });
      // reference: ml-matrix CholeskyDecomposition (npm) of the permuted dense matrix,
      // counting entries of L that are not exactly zero (no cancellation with these weights)
      const P = toDense(A);
      const permuted = Matrix.zeros(A.n, A.n);
      for (let i = 0; i < A.n; i++) for (let j = 0; j < A.n; j++) permuted.set(i, j, P.get(symbolic.perm[i], symbolic.perm[j]));
      const Ld = new CholeskyDecomposition(permuted).lowerTriangularMatrix;
      let count = 0;
      for (let i = 0; i < A.n; i++) for (let j = 0; j <= i; j++) if (Math.abs(Ld.get(i, j)) > 1e-300) count++;
      expect(symbolic.nonZerosInFactor).toBe(count);
    }
  });
});

describe('property: random SPD matrices solve like the dense reference', () => {
  it('matches ml-matrix CholeskyDecomposition for arbitrary sparse patterns and values', () => {
    // reference: ml-matrix CholeskyDecomposition (npm)
    const matrixArb = fc
      .integer({ min: 1, max: 40 })
      .chain((n) =>
        fc.record({
          n: fc.constant(n),
          entries: fc.array(
            fc.tuple(fc.integer({ min: 0, max: n - 1 }), fc.integer({ min: 0, max: n - 1 }), fc.double({ min: -1, max: 1, noNaN: true })),
            { maxLength: 4 * n },
          ),
          shift: fc.double({ min: 0.05, max: 2, noNaN: true }),
          ordering: fc.constantFrom<Ordering>(...ORDERINGS),
          rhs: fc.array(fc.double({ min: -10, max: 10, noNaN: true }), { minLength: n, maxLength: n }),
        }),
      );
    fc.assert(
      fc.property(matrixArb, ({ n, entries, shift, ordering, rhs }) => {
        // A = BᵀB + shift·I, with B's rows given by the generated entries
        const dense = Matrix.eye(n, n).mul(shift);
        const B = Matrix.zeros(entries.length, n);
        entries.forEach(([r, c, v], t) => B.set(t, c, B.get(t, c) + v * (r % 3 === 0 ? 2 : 1)));
        dense.add(B.transpose().mmul(B));
        const rows: number[] = [];
        const cols: number[] = [];
        const values: number[] = [];
        for (let i = 0; i < n; i++) {
          for (let j = 0; j <= i; j++) {
            if (i === j || dense.get(i, j) !== 0) {
              rows.push(i);
              cols.push(j);
              values.push(dense.get(i, j));
            }
          }
        }
        const A = symmetricFromTriplets(n, rows, cols, values);
        const b = Float64Array.from(rhs);
        if (norm(b) === 0) b[0] = 1;
        const x = factorCholesky(A, { ordering }).solve(b);
        const reference = new CholeskyDecomposition(dense).solve(Matrix.columnVector(Array.from(b))).getColumn(0);
        expect(relativeDifference(x, reference)).toBeLessThan(1e-9);
        expect(relativeResidual(A, x, b)).toBeLessThan(1e-12);
      }),
      { numRuns: 150, seed: 20240601 },
    );
  });
});

describe('failures are errors, never NaN', () => {
  it('throws NotPositiveDefiniteError naming the column of an indefinite matrix', () => {
    // diag(2, −1, 3) with a coupling: the second pivot is negative
    const A = symmetricFromTriplets(3, [0, 1, 2, 1], [0, 1, 2, 0], [2, -1, 3, 0.5]);
    for (const ordering of ORDERINGS) {
      let caught: unknown;
      try {
        factorCholesky(A, { ordering });
      } catch (error) {
        caught = error;
      }
      expect(caught).toBeInstanceOf(NotPositiveDefiniteError);
      // reference: ml-matrix CholeskyDecomposition (npm) agrees that it is not SPD
      expect(new CholeskyDecomposition(toDense(A)).isPositiveDefinite()).toBe(false);
      const column = (caught as NotPositiveDefiniteError).column;
      expect(column).toBeGreaterThanOrEqual(0);
      expect((caught as Error).message).toContain(`column ${column}`);
    }
  });

  it('throws for a Laplacian with no Dirichlet vertex (singular), in every ordering', () => {
    const A = gridLaplacian(12, [], 3);
    for (const ordering of ORDERINGS) {
      expect(() => factorCholesky(A, { ordering })).toThrow(NotPositiveDefiniteError);
    }
  });

  it('throws for a zero or missing diagonal and for NaN values in a hand-built matrix', () => {
    const zeroDiagonal = symmetricFromTriplets(2, [0, 1], [0, 1], [1, 0]);
    expect(() => factorCholesky(zeroDiagonal)).toThrow(NotPositiveDefiniteError);
    const missing = symmetricFromTriplets(2, [0], [0], [1]);
    expect(() => factorCholesky(missing)).toThrow(/column 1/);
    const withNaN: SymmetricSparse = {
      n: 2,
      colPtr: Int32Array.from([0, 1, 2]),
      rowIdx: Int32Array.from([0, 1]),
      values: Float64Array.from([1, NaN]),
    };
    expect(() => factorCholesky(withNaN)).toThrow(NotPositiveDefiniteError);
  });

  it('rejects malformed hand-built matrices with a clear message', () => {
    const upper: SymmetricSparse = {
      n: 2,
      colPtr: Int32Array.from([0, 1, 3]),
      rowIdx: Int32Array.from([0, 0, 1]),
      values: Float64Array.from([1, 0.1, 1]),
    };
    expect(() => factorCholesky(upper)).toThrow(/lower triangle/);
  });
});

describe('orderings are permutations', () => {
  it('minimum degree and nested dissection return permutations on random graphs, connected or not', () => {
    fc.assert(
      fc.property(
        fc.integer({ min: 0, max: 300 }).chain((n) =>
          fc.record({
            n: fc.constant(n),
            edges: fc.array(fc.tuple(fc.nat(Math.max(0, n - 1)), fc.nat(Math.max(0, n - 1))), { maxLength: 3 * n }),
            leafSize: fc.integer({ min: 2, max: 40 }),
          }),
        ),
        ({ n, edges, leafSize }) => {
          const rows = edges.map((e) => e[0]).concat([...Array(n).keys()]);
          const cols = edges.map((e) => e[1]).concat([...Array(n).keys()]);
          const A = symmetricFromTriplets(n, rows, cols, rows.map(() => 1));
          const graph = graphOfSymmetric(A);
          for (const perm of [minimumDegreeOrder(graph), nestedDissectionOrder(graph, { leafSize })]) {
            expect(perm.length).toBe(n);
            expect([...perm].sort((a, b) => a - b)).toEqual([...Array(n).keys()]);
          }
        },
      ),
      { numRuns: 100, seed: 7 },
    );
  });

  it('nested dissection beats the natural order on a grid by a wide margin', () => {
    const A = gridLaplacian(50, [0], 1);
    const natural = analyzeCholesky(A, { ordering: 'natural' }).nonZerosInFactor;
    const nd = analyzeCholesky(A, { ordering: 'nested-dissection' }).nonZerosInFactor;
    const md = analyzeCholesky(A, { ordering: 'minimum-degree' }).nonZerosInFactor;
    expect(nd).toBeLessThan(natural * 0.6);
    expect(md).toBeLessThan(natural * 0.6);
  });
});
