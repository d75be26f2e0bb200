/**
 * `npm run bench:field` — the field engine's speed on generated tori of about 20k, 100k, 400k and
 * 1.6M faces: setup (topology, frames, generators, ordering and factorization), re-solve after
 * moving one singularity, field build, and peak memory. Each size runs in its own process so the
 * peak memory is that size's alone. Prints a Markdown table.
 */
import { execFileSync } from 'node:child_process';
import os from 'node:os';
import { fileURLToPath } from 'node:url';
import { buildDirectionField, prepareSurface, solveConnection } from '@/lib/field';
import { torus } from '@/tests/fixtures/shapes';

const sizes: [number, number][] = [
  [100, 100],
  [250, 200],
  [500, 400],
  [1000, 800],
];

function median(values: number[]): number {
  const s = [...values].sort((a, b) => a - b);
  return s[Math.floor(s.length / 2)];
}

function runOne(nu: number, nv: number): string {
  const mesh = torus(3, 1, nu, nv);
  const faces = mesh.triangles.length / 3;
  const t0 = performance.now();
  const surface = prepareSurface(mesh);
  const setupSeconds = (performance.now() - t0) / 1000;
  // A whorl–saddle pair on opposite sides of the tube; the whorl then walks around the torus.
  const saddle = Math.floor(nu / 2) * nv + Math.floor(nv / 2);
  const request = (whorl: number) => ({ singularities: [{ vertex: whorl, index: 1 }, { vertex: saddle, index: -1 }] });
  let connection = solveConnection(surface, request(0));
  const resolves: number[] = [];
  for (let step = 1; step <= 9; step++) {
    const t = performance.now();
    connection = solveConnection(surface, request(step * nv));
    resolves.push(performance.now() - t);
  }
  const fieldTimes: number[] = [];
  for (let i = 0; i < 3; i++) {
    const t = performance.now();
    buildDirectionField(surface, connection);
    fieldTimes.push(performance.now() - t);
  }
  const peakMiB = process.resourceUsage().maxRSS / 1024;
  const s = surface.setupSeconds;
  return `| ${faces.toLocaleString('en')} | ${setupSeconds.toFixed(2)} | ${s.geometry.toFixed(2)} / ${s.generators.toFixed(2)} / ${s.factorization.toFixed(2)} | ${median(resolves).toFixed(1)} | ${median(fieldTimes).toFixed(0)} | ${peakMiB.toFixed(0)} |`;
}

const [, , nuArg, nvArg] = process.argv;
if (nuArg) {
  console.log(runOne(Number(nuArg), Number(nvArg)));
} else {
  console.log(`Machine: ${os.cpus().length} × ${os.cpus()[0]?.model ?? 'unknown CPU'}, ${(os.totalmem() / 2 ** 30).toFixed(0)} GiB, Node.js ${process.version}\n`);
  console.log('| faces | setup s | topology+geometry / generators / factorization s | re-solve ms (median of 9 moves) | field build ms | peak MiB |');
  console.log('| ---: | ---: | ---: | ---: | ---: | ---: |');
  const self = fileURLToPath(import.meta.url);
  for (const [nu, nv] of sizes) {
    const row = execFileSync(process.execPath, ['--import', 'tsx', '--max-old-space-size=6000', self, String(nu), String(nv)], { encoding: 'utf8' });
    console.log(row.trim());
  }
}
