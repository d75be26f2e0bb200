/**
 * `npm run bench:prepared` — what the prepared form's groundwork (format version 2:
 * the check's mark and the field's ring orderings) saves `prepareSurface`, on the UV spheres of the
 * editor's opening bench (50,240, 200,320 and 1,000,800 faces). Each size and variant runs in its
 * own process, as the editor's worker prepares on a fresh heap: three preparations of the surface
 * read back from its prepared form, without the groundwork (check and ordering worked out, as
 * before) or with it; the first run and the faster of the other two. Beside it: the check job's
 * extra work (the orderings), the prepared form's size with and without them, and — to decide
 * whether the symbolic analysis would be worth storing too — its time and its arrays' size.
 * Prints Markdown tables; the load average is printed before and after.
 */
import { execFileSync } from 'node:child_process';
import os from 'node:os';
import { fileURLToPath } from 'node:url';
import {
  analyzeCholesky,
  factorNumeric,
  prepareSurface,
  readPreparedSurface,
  readSurface,
  ringOrderings,
  symmetricFromTriplets,
  writePreparedSurface,
  type SurfaceReadResult,
  type TriangleMesh,
} from '@/lib/field';
import { surfaceToObj } from '@/lib/groom/demo/obj';
import { uvSphere } from '@/lib/groom/demo/primitives';

const SIZES: [number, number][] = [
  [158, 160],
  [314, 320],
  [696, 720],
];

/** The server's reading of the sphere, as the check job has it (from the OBJ text). */
function serverReading(rings: number, segments: number): SurfaceReadResult {
  const mesh = uvSphere(rings, segments, 10);
  return readSurface(new TextEncoder().encode(surfaceToObj(mesh, 'bench sphere')), 'sphere.obj');
}

const ms = (t0: number) => Math.round(performance.now() - t0);
const mb = (bytes: number) => (bytes / 2 ** 20).toFixed(1);

function runPrepare(rings: number, segments: number, variant: 'without' | 'with'): string {
  const read = serverReading(rings, segments);
  const prepared = readPreparedSurface(writePreparedSurface(read, { checked: true, ringOrderings: ringOrderings(read.mesh) }));
  const options = variant === 'with' ? { checked: true, ringOrderings: prepared.groundwork!.ringOrderings } : {};
  const runs: { total: number; check: number; ordering: number; factorization: number }[] = [];
  for (let i = 0; i < 3; i++) {
    const t0 = performance.now();
    const surface = prepareSurface(prepared.mesh, options);
    const total = ms(t0);
    if (variant === 'with' && !surface.reused.ordering) throw new Error('the stored ordering was not used');
    const s = surface.setupSeconds;
    runs.push({ total, check: Math.round(1000 * s.check), ordering: Math.round(1000 * s.ordering), factorization: Math.round(1000 * s.factorization) });
  }
  const warm = runs[1].total <= runs[2].total ? runs[1] : runs[2];
  return JSON.stringify({ first: runs[0], warm });
}

/** The ring matrix of a closed surface with one component: every vertex but the last (see ring-solver.ts). */
function closedRingMatrix(mesh: TriangleMesh) {
  const n = mesh.positions.length / 3 - 1;
  const rows: number[] = [], cols: number[] = [], vals: number[] = [];
  const t = mesh.triangles;
  for (let f = 0; f < t.length; f += 3) {
    for (let k = 0; k < 3; k++) {
      const a = t[f + k], b = t[f + ((k + 1) % 3)];
      // each interior edge once: from its lower-numbered end
      if (a > b) continue;
      for (const [i, j, v] of [[a, a, 1], [b, b, 1], [a, b, -1]] as const) {
        if (i >= n || j >= n) continue;
        rows.push(Math.max(i, j));
        cols.push(Math.min(i, j));
        vals.push(v);
      }
    }
  }
  return symmetricFromTriplets(n, rows, cols, vals);
}

function runFacts(rings: number, segments: number): string {
  const read = serverReading(rings, segments);
  let t0 = performance.now();
  const orderings = ringOrderings(read.mesh);
  const orderingsMs = ms(t0);
  const before = writePreparedSurface(read).length;
  const after = writePreparedSurface(read, { checked: true, ringOrderings: orderings }).length;
  const bytes = writePreparedSurface(read, { checked: true, ringOrderings: orderings });
  t0 = performance.now();
  readPreparedSurface(bytes);
  const readMs = ms(t0);
  const matrix = closedRingMatrix(read.mesh);
  t0 = performance.now();
  const symbolic = analyzeCholesky(matrix, { permutation: orderings.free! });
  const symbolicMs = ms(t0);
  t0 = performance.now();
  factorNumeric(symbolic, matrix);
  const numericMs = ms(t0);
  let layoutBytes = symbolic.perm.byteLength;
  for (const value of Object.values(symbolic.layout)) if (ArrayBuffer.isView(value)) layoutBytes += value.byteLength;
  return JSON.stringify({ faces: read.mesh.triangles.length / 3, orderingsMs, before, after, readMs, symbolicMs, numericMs, layoutBytes });
}

const [, , mode, ringsArg, segmentsArg] = process.argv;
if (mode === 'with' || mode === 'without') {
  console.log(runPrepare(Number(ringsArg), Number(segmentsArg), mode));
} else if (mode === 'facts') {
  console.log(runFacts(Number(ringsArg), Number(segmentsArg)));
} else {
  const load = () => os.loadavg().map((l) => l.toFixed(2)).join(' ');
  console.log(`Machine: ${os.cpus().length} × ${os.cpus()[0]?.model ?? 'unknown CPU'}, Node.js ${process.version}; load average at start ${load()}\n`);
  const self = fileURLToPath(import.meta.url);
  const child = (...args: string[]) => JSON.parse(execFileSync(process.execPath, ['--import', 'tsx', '--max-old-space-size=6000', self, ...args], { encoding: 'utf8' }).trim().split('\n').pop()!);
  const prepareRows: string[] = [];
  const factRows: string[] = [];
  for (const [rings, segments] of SIZES) {
    const facts = child('facts', String(rings), String(segments));
    const without = child('without', String(rings), String(segments));
    const withParts = child('with', String(rings), String(segments));
    const faces = facts.faces.toLocaleString('en');
    const cell = (r: { total: number; check: number; ordering: number; factorization: number }) => `${r.total} (${r.check} / ${r.ordering} / ${r.factorization})`;
    prepareRows.push(`| ${faces} | ${cell(without.first)} | ${cell(withParts.first)} | ${without.first.total - withParts.first.total} | ${cell(without.warm)} | ${cell(withParts.warm)} | ${without.warm.total - withParts.warm.total} |`);
    factRows.push(`| ${faces} | ${facts.orderingsMs} | ${mb(facts.before)} → ${mb(facts.after)} | ${facts.readMs} | ${facts.symbolicMs} / ${facts.numericMs} | ${mb(facts.layoutBytes)} |`);
    console.error(`${faces} done; load average ${load()}`);
  }
  console.log('`prepareSurface` ms, total (check / ordering / factorization with the ordering); first run on a fresh heap, then the faster of two more:\n');
  console.log('| faces | without, first | with, first | saved ms | without, warm | with, warm | saved ms |');
  console.log('| ---: | --- | --- | ---: | --- | --- | ---: |');
  for (const row of prepareRows) console.log(row);
  console.log('\nThe check job and the prepared form:\n');
  console.log('| faces | orderings worked out by the check ms | prepared form MB, version 1 → 2 | read back ms | symbolic analysis / numeric factorization ms | symbolic arrays MB |');
  console.log('| ---: | ---: | --- | ---: | --- | ---: |');
  for (const row of factRows) console.log(row);
  console.log(`\nLoad average at the end ${load()}`);
}
