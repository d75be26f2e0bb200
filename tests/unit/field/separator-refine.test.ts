import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { CholeskyDecomposition, Matrix } from 'ml-matrix';
import { symmetricFromTriplets, type SymmetricSparse } from '@/lib/field/linalg/sparse';
import { analyzeCholesky, factorNumeric } from '@/lib/field/linalg/cholesky';
import { graphOfSymmetric, type AdjacencyGraph } from '@/lib/field/linalg/ordering/graph';
import { nestedDissectionOrder, type NestedDissectionOptions } from '@/lib/field/linalg/ordering/nested-dissection';
import { SEPARATOR, SeparatorRefiner, SIDE_A, SIDE_B } from '@/lib/field/linalg/ordering/separator-refine';
import { planeCut } from '@/lib/field/linalg/ordering/plane-cut';
import { icosphere, torus } from '@/tests/fixtures/shapes';

/** Edges of a side×side grid of vertices, each quad split along one diagonal (six neighbours inside). */
function gridEdges(side: number): [number, number][] {
  const edges: [number, number][] = [];
  for (let i = 0; i < side; i++) {
    for (let j = 0; j < side; j++) {
      const v = i * side + j;
      if (j + 1 < side) edges.push([v, v + 1]);
      if (i + 1 < side) edges.push([v, v + side]);
      if (i + 1 < side && j + 1 < side) edges.push([v, v + side + 1]);
    }
  }
  return edges;
}

/** Each side of each triangle (shared sides twice: the matrix builder sums, the graph does not care). */
function meshEdges(triangles: Uint32Array): [number, number][] {
  const edges: [number, number][] = [];
  for (let t = 0; t < triangles.length; t += 3) {
    for (let k = 0; k < 3; k++) edges.push([triangles[t + k], triangles[t + ((k + 1) % 3)]]);
  }
  return edges;
}

/** The graph Laplacian plus the identity on these edges: symmetric positive definite. */
function shiftedLaplacian(n: number, edges: [number, number][]): SymmetricSparse {
  const rows: number[] = [];
  const cols: number[] = [];
  const values: number[] = [];
  const degree = new Float64Array(n);
  for (const [a, b] of edges) {
    if (a === b) continue;
    rows.push(a);
    cols.push(b);
    values.push(-1);
    degree[a]++;
    degree[b]++;
  }
  for (let v = 0; v < n; v++) {
    rows.push(v);
    cols.push(v);
    values.push(degree[v] + 1);
  }
  return symmetricFromTriplets(n, rows, cols, values);
}

/** Levels of a breadth-first search from `root` (−1 where it does not reach). */
function levelsFrom(graph: AdjacencyGraph, root: number): Int32Array {
  const level = new Int32Array(graph.n).fill(-1);
  const queue = [root];
  level[root] = 0;
  for (let head = 0; head < queue.length; head++) {
    const v = queue[head];
    for (let q = graph.offsets[v]; q < graph.offsets[v + 1]; q++) {
      const u = graph.adjacency[q];
      if (level[u] < 0) {
        level[u] = level[v] + 1;
        queue.push(u);
      }
    }
  }
  return level;
}

/** A split of the whole graph (all of it one piece) by one search level, refined. */
function refineLevelSplit(graph: AdjacencyGraph, root: number, separatorLevel: number) {
  const level = levelsFrom(graph, root);
  const where = new Uint8Array(graph.n);
  const separator = new Int32Array(graph.n);
  let count = 0;
  const sides = new Int32Array(2);
  for (let v = 0; v < graph.n; v++) {
    if (level[v] === separatorLevel) {
      where[v] = SEPARATOR;
      separator[count++] = v;
    } else {
      where[v] = level[v] >= 0 && level[v] < separatorLevel ? SIDE_A : SIDE_B;
      sides[where[v]]++;
    }
  }
  const before = { separator: count, sides: [sides[0], sides[1]] };
  const owner = new Int32Array(graph.n).fill(1);
  const after = new SeparatorRefiner(graph).refine(owner, 1, where, separator, count, sides);
  return { where, separator: separator.slice(0, after), sides, before };
}

function expectValidSplit(graph: AdjacencyGraph, where: Uint8Array, separator: Int32Array, sides: Int32Array): void {
  for (let v = 0; v < graph.n; v++) {
    for (let q = graph.offsets[v]; q < graph.offsets[v + 1]; q++) {
      const u = graph.adjacency[q];
      // the defining property of a vertex separator: no edge from one side to the other
      expect(where[v] === SIDE_A && where[u] === SIDE_B).toBe(false);
    }
  }
  const listed = new Set(separator);
  expect(listed.size).toBe(separator.length);
  let a = 0;
  let b = 0;
  for (let v = 0; v < graph.n; v++) {
    expect(listed.has(v)).toBe(where[v] === SEPARATOR);
    if (where[v] === SIDE_A) a++;
    if (where[v] === SIDE_B) b++;
  }
  expect([sides[0], sides[1]]).toEqual([a, b]);
}

describe('separator refinement', () => {
  it('keeps a valid vertex separator and never ends worse, on random graphs and splits', () => {
    fc.assert(
      fc.property(
        fc.integer({ min: 2, max: 200 }).chain((n) =>
          fc.record({
            n: fc.constant(n),
            edges: fc.array(fc.tuple(fc.nat(n - 1), fc.nat(n - 1)), { minLength: n, maxLength: 4 * n }),
            root: fc.nat(n - 1),
            levelPick: fc.double({ min: 0, max: 1, noNaN: true }),
          }),
        ),
        ({ n, edges, root, levelPick }) => {
          // a path through all vertices keeps the graph connected, so levels cover it
          const all: [number, number][] = [...edges, ...Array.from({ length: n - 1 }, (_, v) => [v, v + 1] as [number, number])];
          const graph = graphOfSymmetric(shiftedLaplacian(n, all));
          const depth = Math.max(...levelsFrom(graph, root));
          const separatorLevel = Math.min(depth, Math.floor(levelPick * (depth + 1)));
          const { where, separator, sides, before } = refineLevelSplit(graph, root, separatorLevel);
          expectValidSplit(graph, where, separator, sides);
          const bound = Math.floor(0.6 * n);
          const excess = (s: number[]) => Math.max(0, Math.max(s[0], s[1]) - bound);
          const afterExcess = excess([sides[0], sides[1]]);
          expect(afterExcess).toBeLessThanOrEqual(excess(before.sides));
          if (afterExcess === excess(before.sides)) expect(separator.length).toBeLessThanOrEqual(before.separator);
        },
      ),
      { numRuns: 200, seed: 12 },
    );
  });

  it('brings a lopsided search level of a grid within the balance bound, still one separator', () => {
    // On a 30×30 grid with one diagonal per square, the search from a corner has levels
    // {max(i, j) = d} of 2d + 1 vertices; d = 25 leaves 676 of 900 vertices on one side.
    const side = 30;
    const graph = graphOfSymmetric(shiftedLaplacian(side * side, gridEdges(side)));
    const { where, separator, sides, before } = refineLevelSplit(graph, 0, 25);
    expect(before).toEqual({ separator: 51, sides: [625, 224] });
    expectValidSplit(graph, where, separator, sides);
    expect(Math.max(sides[0], sides[1])).toBeLessThanOrEqual(0.6 * side * side);
    expect(separator.length).toBeLessThan(51);
  });
});

describe('plane cuts', () => {
  it('split at the median across the longest extent, with a valid separator, for random points', () => {
    fc.assert(
      fc.property(
        fc.integer({ min: 2, max: 150 }).chain((n) =>
          fc.record({
            n: fc.constant(n),
            edges: fc.array(fc.tuple(fc.nat(n - 1), fc.nat(n - 1)), { maxLength: 4 * n }),
            coordinates: fc.array(fc.double({ min: -5, max: 5, noNaN: true }), { minLength: 3 * n, maxLength: 3 * n }),
          }),
        ),
        ({ n, edges, coordinates }) => {
          const graph = graphOfSymmetric(shiftedLaplacian(n, edges));
          const points = Float64Array.from(coordinates);
          const verts = Int32Array.from({ length: n }, (_, v) => v);
          const where = new Uint8Array(n);
          const separator = new Int32Array(n);
          const sides = new Int32Array(2);
          const count = planeCut(graph, points, verts, 0, n, new Int32Array(n).fill(3), 3, where, separator, sides);
          expectValidSplit(graph, where, separator.slice(0, count), sides);
          // the cut is at the median of the longest axis: fewer than half the points lie below it
          expect(sides[0]).toBeLessThanOrEqual(n >> 1);
          const extent = [0, 1, 2].map((k) => {
            const xs = Array.from({ length: n }, (_, v) => points[3 * v + k]);
            return Math.max(...xs) - Math.min(...xs);
          });
          const axis = extent.indexOf(Math.max(...extent));
          const sorted = Array.from({ length: n }, (_, v) => points[3 * v + axis]).sort((a, b) => a - b);
          for (let v = 0; v < n; v++) expect(where[v] === SIDE_A).toBe(points[3 * v + axis] < sorted[n >> 1]);
        },
      ),
      { numRuns: 200, seed: 5 },
    );
  });
});

describe('nested dissection with refined separators', () => {
  function checkFactor(A: SymmetricSparse, points?: Float64Array): void {
    const perm = nestedDissectionOrder(graphOfSymmetric(A), { refineSize: 100, leafSize: 16, points });
    expect([...perm].sort((a, b) => a - b)).toEqual([...Array(A.n).keys()]);
    const factor = factorNumeric(analyzeCholesky(A, { permutation: perm }), A);
    const b = Float64Array.from({ length: A.n }, (_, i) => Math.sin(0.7 * i) + 0.25);
    const x = factor.solve(b);
    // reference: ml-matrix's dense Cholesky of the same matrix
    const dense = new Matrix(A.n, A.n);
    for (let j = 0; j < A.n; j++) {
      for (let p = A.colPtr[j]; p < A.colPtr[j + 1]; p++) {
        dense.set(A.rowIdx[p], j, A.values[p]);
        dense.set(j, A.rowIdx[p], A.values[p]);
      }
    }
    const reference = new CholeskyDecomposition(dense).solve(Matrix.columnVector(Array.from(b))).getColumn(0);
    let difference = 0;
    let size = 0;
    for (let i = 0; i < A.n; i++) {
      difference = Math.max(difference, Math.abs(x[i] - reference[i]));
      size = Math.max(size, Math.abs(reference[i]));
    }
    expect(difference / size).toBeLessThan(1e-10);
  }

  it('orders a grid whose pieces are refined, and the factor solves like the dense reference', () => {
    checkFactor(shiftedLaplacian(30 * 30, gridEdges(30)));
  });

  it('orders a closed surface (icosphere, 642 vertices) the same way', () => {
    const mesh = icosphere(3);
    checkFactor(shiftedLaplacian(mesh.positions.length / 3, meshEdges(mesh.triangles)));
  });

  it('reduces the factorization work on a torus, and plane cuts reduce it further', () => {
    // 120 × 100 vertices wrapped both ways: a search level is a long loop round its start, while
    // the plane through the torus's axis cuts the tube in two rings of 100 (the shortest way)
    const mesh = torus(3, 1, 120, 100);
    const A = shiftedLaplacian(mesh.positions.length / 3, meshEdges(mesh.triangles));
    const graph = graphOfSymmetric(A);
    const work = (options: NestedDissectionOptions) => analyzeCholesky(A, { permutation: nestedDissectionOrder(graph, options) }).flops;
    const plain = work({ refineSize: Infinity });
    const refined = work({ refineSize: 1000 });
    const planes = work({ refineSize: 1000, points: mesh.positions });
    expect(refined).toBeLessThan(plain);
    expect(planes).toBeLessThan(refined);
  });

  it('refuses points that are not three numbers per vertex', () => {
    const graph = graphOfSymmetric(shiftedLaplacian(4, [[0, 1], [1, 2], [2, 3]]));
    expect(() => nestedDissectionOrder(graph, { points: new Float64Array(11) })).toThrow(RangeError);
  });

  it('solves like the dense reference with plane cuts on a small torus', () => {
    const mesh = torus(3, 1, 24, 16);
    const A = shiftedLaplacian(mesh.positions.length / 3, meshEdges(mesh.triangles));
    checkFactor(A, mesh.positions);
  });
});
