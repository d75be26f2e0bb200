/**
 * Benchmark of lib/groom's transfer on a 50,000-face surface: a quad sphere with UVs (126 rings ×
 * 200 longitudes, quads split in two) and the same sphere re-triangulated along the other
 * diagonals, renumbered, ×2.54 and turned about two axes. A spec of 8 singularities, 4 strokes of
 * 10 points and 16 pins is carried by polygon (onto a sculpted copy), by UV, and by landmarks.
 *
 *   node --import tsx bench/transfer.ts      prints a Markdown table
 *
 * Each time is the best of three runs after a warm-up; "transfer" includes solving the field on
 * the new surface (the report says whether it solves), which the table also gives on its own.
 */
import { cpus, loadavg } from 'node:os';
import { multiply3, onUnitSphere as at, transferSphere, rotationAbout } from '../tests/fixtures/transfer-sphere';
import { parseGroomSpec, prepareGroomSurface, solveGroomField, transferSpec, withoutUv, type TransferOptions } from '../lib/groom';
import { best } from './best-of';

const spec = parseGroomSpec({
  specVersion: 2,
  units: 'cm',
  upAxis: 'z',
  field: {
    singularities: [
      ...[[30, 20], [60, 100], [90, 180], [120, 260], [150, 340]].map(([t, p]) => ({ point: at(t, p), index: 1 })),
      ...[[45, 200], [100, 40], [135, 120]].map(([t, p]) => ({ point: at(t, p), index: -1 })),
    ],
    strokes: [0, 90, 180, 270].map((phi) => ({ points: Array.from({ length: 10 }, (_, k) => at(70 + 2 * k, phi + 3 * k)) })),
  },
  pins: Array.from({ length: 16 }, (_, k) => ({ point: at(20 + 9 * k, 22 * k), attribute: 'length' as const, value: 1.5 })),
});

const RINGS = 126, SEGMENTS = 200;
const moved = { split: 'bc' as const, asTriangles: true, shift: 17, scale: 2.54, rotation: multiply3(rotationAbout('z', 35), rotationAbout('x', 50)), translation: [3, -1, 2] as [number, number, number] };
const a = transferSphere(RINGS, SEGMENTS);
const b = transferSphere(RINGS, SEGMENTS, moved);
const sculpted = transferSphere(RINGS, SEGMENTS, { sculpt: ([x, y, z]) => { const k = 1 + 0.05 * Math.sin(4 * x) * Math.cos(3 * y); return [k * x, k * y, k * z]; } });
const prepare = best(() => prepareGroomSurface(b.mesh));
const from = { surface: prepareGroomSurface(a.mesh), identity: a.identity };
const onB = prepare.result;
const onSculpted = prepareGroomSurface(sculpted.mesh);
const solve = best(() => solveGroomField(spec, from.surface));
const landmarks = [at(10, 0), at(90, 0), at(90, 90), at(170, 200), at(60, 300)].map((p) => ({ from: p, to: b.place(p) }));
const cases: [string, () => ReturnType<typeof transferSpec>][] = [
  ['by polygon (sculpt pass)', () => transferSpec(spec, from, { surface: onSculpted, identity: sculpted.identity })],
  ['by UV', () => transferSpec(spec, from, { surface: onB, identity: b.identity })],
  ['by landmarks and normal', () => transferSpec(spec, { ...from, identity: withoutUv(a.identity) }, { surface: onB, identity: withoutUv(b.identity) }, { landmarks } satisfies TransferOptions)],
];
const rows = [`| step | ms | result |`, `| --- | ---: | --- |`];
rows.push(`| prepare the new surface (factorization, skin) | ${prepare.ms.toFixed(0)} | ${b.mesh.triangles.length / 3} faces |`);
rows.push(`| solve the spec's field on the old surface (for comparison) | ${solve.ms.toFixed(0)} | |`);
for (const [name, work] of cases) {
  const { ms, result } = best(work);
  const r = result.report;
  rows.push(`| transfer ${name} | ${ms.toFixed(0)} | ${r.method}; ${r.features.filter((f) => f.to).length}/${r.features.length} carried; field ${r.field.solved ? 'solves' : 'does not solve'} |`);
}
process.stdout.write(`${rows.join('\n')}\n\nNode ${process.version}, ${cpus()[0]?.model ?? 'unknown CPU'}, load average ${loadavg().map((x) => x.toFixed(2)).join(' ')}\n`);
