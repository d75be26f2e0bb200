/**
 * Benchmark of lib/field's sparse Cholesky on triangulated-grid Laplacians, the shape of
 * system the field engine solves (vertex–vertex adjacency, six neighbours inside), with
 * one Dirichlet vertex removed per connected component so the matrix is SPD.
 *
 *   npx tsx bench/cholesky.ts                 all sizes (~10k, 50k, 200k, 800k vertices)
 *   npx tsx bench/cholesky.ts 50000 200000    chosen vertex counts
 *
 * Each size runs in its own child process so that its peak RSS is its own; see runOne for
 * the cold and warm rows. "cpu s" far below "total s" means other work shared the cores.
 */
import { spawnSync } from 'node:child_process';
import { fileURLToPath } from 'node:url';
import { analyzeCholesky, computeOrdering, factorNumeric, multiplySymmetric, symmetricFromTriplets, type SymmetricSparse } from '../lib/field';

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

interface Timing {
  orderingS: number;
  symbolicS: number;
  numericS: number;
  totalS: number;
  /** user + system CPU seconds of ordering..numeric; far below totalS means the machine was busy */
  cpuS: number;
  solveMs: number;
  residual: number;
}

interface Row {
  vertices: number;
  faces: number;
  n: number;
  nnzL: number;
  gflop: number;
  cold: Timing;
  warm: Timing;
  peakRssMB: number;
}

function measure(A: SymmetricSparse): { timing: Timing; nnzL: number; flops: number } {
  const c0 = process.cpuUsage();
  const t0 = performance.now();
  const perm = computeOrdering(A, 'auto');
  const t1 = performance.now();
  const symbolic = analyzeCholesky(A, { permutation: perm });
  const t2 = performance.now();
  const factor = factorNumeric(symbolic, A);
  const t3 = performance.now();
  const cpu = process.cpuUsage(c0);

  const b = new Float64Array(A.n);
  for (let i = 0; i < A.n; i++) b[i] = Math.sin(0.37 * i) + 0.5;
  const x = new Float64Array(A.n);
  const times: number[] = [];
  for (let r = 0; r < SOLVE_REPEATS; r++) {
    const s0 = performance.now();
    factor.solve(b, x);
    times.push(performance.now() - s0);
  }
  times.sort((p, q) => p - q);
  const Ax = multiplySymmetric(A, x);
  let rr = 0;
  let bb = 0;
  for (let i = 0; i < A.n; i++) {
    rr += (Ax[i] - b[i]) ** 2;
    bb += b[i] ** 2;
  }
  return {
    timing: {
      orderingS: (t1 - t0) / 1000,
      symbolicS: (t2 - t1) / 1000,
      numericS: (t3 - t2) / 1000,
      totalS: (t3 - t0) / 1000,
      cpuS: (cpu.user + cpu.system) / 1e6,
      solveMs: times[times.length >> 1],
      residual: Math.sqrt(rr / bb),
    },
    nnzL: factor.nonZerosInFactor,
    flops: symbolic.flops,
  };
}

/**
 * One size, twice: "cold" in a fresh process (every function still unoptimized, all
 * memory new — what the first mesh of a session costs), then "warm" on the same matrix
 * (what a worker that has already factored once pays).
 */
function runOne(vertices: number): Row {
  const side = Math.round(Math.sqrt(vertices));
  const A = triangulatedGridLaplacian(side);
  const cold = measure(A);
  // maxRSS (kB) covers moments between samples, e.g. inside the numeric factorization
  const peakRssMB = Math.max(process.memoryUsage().rss, process.resourceUsage().maxRSS * 1024) / 2 ** 20;
  const warm = measure(A);
  return {
    vertices: side * side,
    faces: 2 * (side - 1) * (side - 1),
    n: A.n,
    nnzL: cold.nnzL,
    gflop: cold.flops / 1e9,
    cold: cold.timing,
    warm: warm.timing,
    peakRssMB,
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
    for (const run of ['cold', 'warm'] as const) {
      const t = row[run];
      table.push({
        vertices: row.vertices,
        faces: row.faces,
        n: row.n,
        'nnz(L)': row.nnzL,
        GFlop: +row.gflop.toFixed(2),
        run,
        'ordering s': +t.orderingS.toFixed(3),
        'symbolic s': +t.symbolicS.toFixed(3),
        'numeric s': +t.numericS.toFixed(3),
        'total s': +t.totalS.toFixed(3),
        'cpu s': +t.cpuS.toFixed(3),
        'solve ms (median)': +t.solveMs.toFixed(2),
        '‖Ax−b‖/‖b‖': t.residual.toExponential(1),
        'peak RSS MB': run === 'cold' ? Math.round(row.peakRssMB) : '',
      });
    }
    console.error(`done: ${row.vertices} vertices, cold ${row.cold.totalS.toFixed(2)} s, warm ${row.warm.totalS.toFixed(2)} s`);
  }
  console.table(table);
}

main();
