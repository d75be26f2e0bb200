/**
 * Benchmark of lib/field's sparse Cholesky on triangulated-grid Laplacians, the shape of
 * system the field engine solves (vertex–vertex adjacency, six neighbours inside), with
 * one Dirichlet vertex removed per connected component so the matrix is SPD.
 *
 *   npx tsx bench/cholesky.ts                 all sizes (~10k, 50k, 200k, 800k vertices)
 *   npx tsx bench/cholesky.ts 50000 200000    chosen vertex counts
 *
 * Each size runs in its own child process so that its peak RSS is its own.
 */
import { spawnSync } from 'node:child_process';
import { fileURLToPath } from 'node:url';
import { multiplySymmetric, symmetricFromTriplets, type SymmetricSparse } from '../lib/field/sparse';
import { analyzeCholesky, computeOrdering, factorNumeric } from '../lib/field/cholesky';

const DEFAULT_SIZES = [10_000, 50_000, 200_000, 800_000];
const SOLVE_REPEATS = 9;

/** Laplacian of a side×side grid of vertices, each quad split along one diagonal. */
function triangulatedGridLaplacian(side: number): SymmetricSparse {
  const count = side * side;
  const edges = 3 * (side - 1) * (side - 1) + 2 * (side - 1);
  const a = new Int32Array(edges);
  const b = new Int32Array(edges);
  let e = 0;
  for (let i = 0; i < side; i++) {
    for (let j = 0; j < side; j++) {
      const v = i * side + j;
      if (j + 1 < side) (a[e] = v), (b[e++] = v + 1);
      if (i + 1 < side) (a[e] = v), (b[e++] = v + side);
      if (i + 1 < side && j + 1 < side) (a[e] = v), (b[e++] = v + side + 1);
    }
  }
  // one Dirichlet vertex per connected component: its row and column are removed
  const parent = new Int32Array(count);
  for (let v = 0; v < count; v++) parent[v] = v;
  const find = (v: number): number => {
    while (parent[v] !== v) v = parent[v] = parent[parent[v]];
    return v;
  };
  for (let t = 0; t < e; t++) {
    const ra = find(a[t]);
    const rb = find(b[t]);
    if (ra !== rb) parent[Math.max(ra, rb)] = Math.min(ra, rb);
  }
  const index = new Int32Array(count);
  let n = 0;
  for (let v = 0; v < count; v++) index[v] = find(v) === v ? -1 : n++;

  const degree = new Float64Array(count);
  for (let t = 0; t < e; t++) {
    degree[a[t]]++;
    degree[b[t]]++;
  }
  const rows = new Int32Array(e + n);
  const cols = new Int32Array(e + n);
  const values = new Float64Array(e + n);
  let k = 0;
  for (let t = 0; t < e; t++) {
    if (index[a[t]] < 0 || index[b[t]] < 0) continue;
    rows[k] = index[b[t]];
    cols[k] = index[a[t]];
    values[k++] = -1;
  }
  for (let v = 0; v < count; v++) {
    if (index[v] < 0) continue;
    rows[k] = cols[k] = index[v];
    values[k++] = degree[v];
  }
  return symmetricFromTriplets(n, rows.subarray(0, k), cols.subarray(0, k), values.subarray(0, k));
}

interface Row {
  vertices: number;
  faces: number;
  n: number;
  nnzA: number;
  nnzL: number;
  gflop: number;
  orderingS: number;
  symbolicS: number;
  numericS: number;
  totalS: number;
  solveMs: number;
  residual: number;
  peakRssMB: number;
}

function runOne(vertices: number): Row {
  let peak = 0;
  const sample = () => {
    peak = Math.max(peak, process.memoryUsage().rss);
  };
  const side = Math.round(Math.sqrt(vertices));
  const A = triangulatedGridLaplacian(side);
  sample();
  const t0 = performance.now();
  const perm = computeOrdering(A, 'auto');
  const t1 = performance.now();
  sample();
  const symbolic = analyzeCholesky(A, { permutation: perm });
  const t2 = performance.now();
  sample();
  const factor = factorNumeric(symbolic, A);
  const t3 = performance.now();
  sample();

  const b = new Float64Array(A.n);
  for (let i = 0; i < A.n; i++) b[i] = Math.sin(0.37 * i) + 0.5;
  const x = new Float64Array(A.n);
  const times: number[] = [];
  for (let r = 0; r < SOLVE_REPEATS; r++) {
    const s0 = performance.now();
    factor.solve(b, x);
    times.push(performance.now() - s0);
  }
  sample();
  times.sort((p, q) => p - q);
  const Ax = multiplySymmetric(A, x);
  let rr = 0;
  let bb = 0;
  for (let i = 0; i < A.n; i++) {
    rr += (Ax[i] - b[i]) ** 2;
    bb += b[i] ** 2;
  }
  // maxRSS (kB) covers moments between samples, e.g. inside the numeric factorization
  peak = Math.max(peak, process.resourceUsage().maxRSS * 1024);
  return {
    vertices: side * side,
    faces: 2 * (side - 1) * (side - 1),
    n: A.n,
    nnzA: A.colPtr[A.n],
    nnzL: factor.nonZerosInFactor,
    gflop: symbolic.flops / 1e9,
    orderingS: (t1 - t0) / 1000,
    symbolicS: (t2 - t1) / 1000,
    numericS: (t3 - t2) / 1000,
    totalS: (t3 - t0) / 1000,
    solveMs: times[times.length >> 1],
    residual: Math.sqrt(rr / bb),
    peakRssMB: peak / 2 ** 20,
  };
}

function main(): void {
  const args = process.argv.slice(2);
  if (args[0] === '--one') {
    process.stdout.write(JSON.stringify(runOne(Number(args[1]))));
    return;
  }
  const sizes = args.length > 0 ? args.map(Number) : DEFAULT_SIZES;
  const script = fileURLToPath(import.meta.url);
  const table: Record<string, string | number>[] = [];
  for (const vertices of sizes) {
    const child = spawnSync(process.execPath, [...process.execArgv, script, '--one', String(vertices)], {
      encoding: 'utf8',
      maxBuffer: 1 << 20,
    });
    if (child.status !== 0) {
      console.error(child.stderr);
      throw new Error(`benchmark for ${vertices} vertices failed (exit ${child.status})`);
    }
    const row = JSON.parse(child.stdout) as Row;
    table.push({
      vertices: row.vertices,
      faces: row.faces,
      n: row.n,
      'nnz(L)': row.nnzL,
      'GFlop': +row.gflop.toFixed(2),
      'ordering s': +row.orderingS.toFixed(3),
      'symbolic s': +row.symbolicS.toFixed(3),
      'numeric s': +row.numericS.toFixed(3),
      'total s': +row.totalS.toFixed(3),
      'solve ms (median)': +row.solveMs.toFixed(2),
      '‖Ax−b‖/‖b‖': row.residual.toExponential(1),
      'peak RSS MB': Math.round(row.peakRssMB),
    });
    console.error(`done: ${row.vertices} vertices in ${row.totalS.toFixed(2)} s`);
  }
  console.table(table);
}

main();
