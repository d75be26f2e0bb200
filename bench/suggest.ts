/**
 * `node --import tsx bench/suggest.ts` — the cost of a suggested layout (lib/field/suggest) at about
 * 100k faces: a torus (order 1, no alignment: inverse iteration), a rounded cube (order 4, inverse
 * iteration; and pulled toward the directions of least bending: one solve). Times assembly, the one
 * factorization, the solves, the measurement, and peak memory; the surface's own preparation
 * (prepareSurface, shared with every field solve) is shown apart. Each shape runs in its own
 * process. One run per row: the figures are for orientation, not for fine comparisons.
 */
import { execFileSync } from 'node:child_process';
import os from 'node:os';
import { fileURLToPath } from 'node:url';
import { prepareSurface, suggestLayout, type SuggestOptions, type TriangleMesh } from '@/lib/field';
import { roundedCube, torus } from '@/tests/fixtures/shapes';

const cases: Record<string, { mesh: () => TriangleMesh; options: SuggestOptions; label: string }> = {
  torus: { mesh: () => torus(3, 1, 250, 200), options: { order: 1 }, label: 'torus, order 1' },
  cube: { mesh: () => roundedCube(91, 0.2), options: { order: 4 }, label: 'rounded cube, order 4' },
  'cube-curvature': { mesh: () => roundedCube(91, 0.2), options: { order: 4, align: { curvature: true, weight: 4 } }, label: 'rounded cube, order 4, curvature' },
};

function runOne(name: string): string {
  const c = cases[name];
  const mesh = c.mesh();
  const t0 = performance.now();
  const surface = prepareSurface(mesh);
  const prepare = (performance.now() - t0) / 1000;
  const t1 = performance.now();
  const layout = suggestLayout(surface, c.options);
  const total = (performance.now() - t1) / 1000;
  const t = layout.timings;
  const peakMiB = process.resourceUsage().maxRSS / 1024;
  const s = (ms: number) => (ms / 1000).toFixed(2);
  return `| ${c.label} | ${(mesh.triangles.length / 3).toLocaleString('en')} | ${prepare.toFixed(2)} | ${total.toFixed(2)} | ${s(t.assembleMilliseconds)} / ${s(t.factorMilliseconds)} / ${s(t.solveMilliseconds)} / ${s(t.measureMilliseconds)} | ${layout.iterations} | ${layout.singularities.length} | ${peakMiB.toFixed(0)} |`;
}

const [, , nameArg] = process.argv;
if (nameArg) {
  console.log(runOne(nameArg));
} else {
  console.log(`Machine: ${os.cpus().length} × ${os.cpus()[0]?.model ?? 'unknown CPU'}, ${(os.totalmem() / 2 ** 30).toFixed(0)} GiB, Node.js ${process.version}\n`);
  console.log('| surface | faces | prepareSurface s | suggestion s | assemble / factor / solve / measure s | inverse iterations | singularities | peak MiB |');
  console.log('| --- | ---: | ---: | ---: | ---: | ---: | ---: | ---: |');
  const self = fileURLToPath(import.meta.url);
  for (const name of Object.keys(cases)) {
    const row = execFileSync(process.execPath, ['--import', 'tsx', '--max-old-space-size=4000', self, name], { encoding: 'utf8' });
    console.log(row.trim());
  }
}
