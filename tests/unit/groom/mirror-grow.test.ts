import { spawnSync } from 'node:child_process';
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { USDAParser } from 'three/examples/jsm/loaders/usd/USDAParser.js';
import { describe, expect, it } from 'vitest';
import type { TriangleMesh } from '@/lib/field';
import { mirrorSymmetricShape } from '@/tests/fixtures/shapes';
import { parseGroomSpec, type GroomSpecInput } from '@/lib/groom/spec/spec';
import { prepareGroomSurface, type GroomSurface } from '@/lib/groom/place/surface';
import { solveGroomField } from '@/lib/groom/place/request';
import { growGuides } from '@/lib/groom/grow/guides';
import { detectMirrorPlane } from '@/lib/groom/place/mirror-plane';
import { mirrorSpecFeatures } from '@/lib/groom/place/mirror-features';
import { mirrorPoint, type MirrorPlane } from '@/lib/groom/spec/symmetry';
import { worstMirrorGap } from './support';

// Issue 16's symmetry check with every per-guide variation on: growing itself mirrors when the
// spec's `symmetry` is on (no option to pass), so every path that grows a spec gets it.
const X_PLANE: MirrorPlane = { normal: [1, 0, 0], offset: 0 };

const half: GroomSpecInput = {
  specVersion: 3,
  units: 'cm',
  field: { singularities: [{ point: [0.7, 0.5, 0.5], index: 1, twist: 40, handedness: 'clockwise' }], strokes: [{ points: [[0.6, -0.9, 0.4], [0.7, -0.7, 0.5], [0.8, -0.5, 0.55]] }] },
  guides: {
    count: 400, length: 0.5, jitter: 0.6, lift: 30, droop: 0.4,
    curl: { amplitude: 0.04, wavelength: 0.2 },
    tufts: { density: 3, gather: { tip: 0.9 }, inner: { density: 10, gather: { tip: 0.7 } }, loners: 0.2 },
    waver: { amplitude: 0.05, waves: 3 },
  },
  pins: [{ point: [0.5, -0.2, 0.8], attribute: 'length', value: 2 }],
  symmetry: { axis: 'x' },
};

/** The spec with its features mirrored on `surface` (as the editor's twin sides make them). */
function mirroredSpec(surface: GroomSurface, input: GroomSpecInput = half) {
  return mirrorSpecFeatures(parseGroomSpec(input), surface, X_PLANE);
}

describe('growing with the spec’s symmetry on (jitter, curl, two tuft levels, loners, waver)', () => {
  const surface = prepareGroomSurface(mirrorSymmetricShape());
  const spec = mirroredSpec(surface);
  const solved = solveGroomField(spec, surface);
  const grown = growGuides(surface, solved, spec);
  const g = grown.guides;

  it('every guide on one side has a mirror guide on the other within 1e-6 of the surface’s size, all points', () => {
    const { gap, paired } = worstMirrorGap(g.points, g.count, g.pointsPerGuide, X_PLANE);
    expect(paired).toBeGreaterThan(300);
    expect(gap / surface.diagonal).toBeLessThan(1e-6);
    // Every variation was really on: guides are gathered in both levels, some are loners.
    expect(grown.tufts!.centres).toBeGreaterThan(4);
    expect(grown.tufts!.innerCentres).toBeGreaterThan(grown.tufts!.centres);
    expect([...g.tuft].filter((t) => t < 0).length).toBeGreaterThan(10);
    expect([...g.innerTuft].filter((t) => t >= 0).length).toBeGreaterThan(100);
  });

  it('numbers each pair as a root then its mirror, with the same loner choice and mirrored tufts', () => {
    // Ids are the stored order: a root of the positive side at id k, its mirror at k + 1.
    const n = g.pointsPerGuide, P = g.points;
    let pairs = 0;
    for (let k = 0; k + 1 < g.count; k++) {
      const a = [P[3 * n * k], P[3 * n * k + 1], P[3 * n * k + 2]];
      if (a[0] <= 1e-9) continue;
      const b = [P[3 * n * (k + 1)], P[3 * n * (k + 1) + 1], P[3 * n * (k + 1) + 2]];
      const m = mirrorPoint(X_PLANE, a);
      expect(Math.hypot(m[0] - b[0], m[1] - b[1], m[2] - b[2])).toBeLessThan(1e-9);
      expect(g.tuft[k] < 0).toBe(g.tuft[k + 1] < 0);
      expect(g.length[k]).toBeCloseTo(g.length[k + 1], 9);
      pairs++;
      k++;
    }
    expect(pairs).toBeGreaterThan(150);
  });

  it('symmetry off: the roots are the sampler’s own and the guides do not mirror (as before)', () => {
    const { symmetry: _off, ...rest } = spec;
    const plain = growGuides(surface, solved, rest);
    expect(worstMirrorGap(plain.guides.points, plain.guides.count, plain.guides.pointsPerGuide, X_PLANE).gap / surface.diagonal).toBeGreaterThan(1e-3);
    expect(plain.guides.count).toBe(400);
    expect(Array.from(plain.guides.guideId)).toEqual(Array.from({ length: 400 }, (_x, i) => i));
  });

  // The bound is measured, not derived: here the gap is 11.6× the mismatch (detectMirrorPlane's:
  // largest distance of a mirrored vertex to the surface, over the diagonal); 20× leaves room.
  it('on a slightly lopsided surface the mirror gap stays within 20× the surface’s own mismatch', () => {
    // One cheek pushed out by 0.05 % of its x: a mismatch of a few 1e-5 of the diagonal.
    const lopsided: TriangleMesh = mirrorSymmetricShape();
    const p = lopsided.positions;
    for (let v = 0; v < p.length / 3; v++) if (p[3 * v] > 0.3 && p[3 * v + 2] > 0) p[3 * v] *= 1.0005;
    const bent = prepareGroomSurface(lopsided);
    const mismatch = detectMirrorPlane(bent).mismatch;
    expect(mismatch).toBeGreaterThan(1e-6);
    const bentSpec = mirroredSpec(bent);
    const made = growGuides(bent, solveGroomField(bentSpec, bent), bentSpec).guides;
    const { gap } = worstMirrorGap(made.points, made.count, made.pointsPerGuide, X_PLANE);
    expect(gap / bent.diagonal).toBeLessThan(20 * mismatch);
  });
});

/**
 * OBJ text with every coordinate as JavaScript writes it (the shortest that reads back to the same
 * double, ECMA-262 Number::toString), so the command line reads the very surface the spec was
 * mirrored on. (The demo writer's 6 decimals give another surface, still exactly symmetric, on
 * which the guides mirror less closely: 2.6e-6 of the diagonal with this spec, 1.2e-6 without
 * its length pin, though the solved field mirrors within 1e-13 on both; not yet explained, see
 * lib/groom/README.md, "Mirror symmetry".)
 */
function exactObj(mesh: TriangleMesh): string {
  const p = mesh.positions, t = mesh.triangles, lines: string[] = ['# twin shape'];
  for (let v = 0; v < p.length / 3; v++) lines.push(`v ${p[3 * v]} ${p[3 * v + 1]} ${p[3 * v + 2]}`);
  for (let f = 0; f < t.length / 3; f++) lines.push(`f ${t[3 * f] + 1} ${t[3 * f + 1] + 1} ${t[3 * f + 2] + 1}`);
  return `${lines.join('\n')}\n`;
}

describe('the product path: the command line’s USD of a spec with symmetry', () => {
  it('writes guides that mirror each other within 1e-6 of the surface’s size (points read back by three.js’s USDAParser)', () => {
    const folder = mkdtempSync(join(tmpdir(), 'whorlwind-twin-'));
    try {
      const surface = prepareGroomSurface(mirrorSymmetricShape());
      writeFileSync(join(folder, 'shape.obj'), exactObj(mirrorSymmetricShape()));
      writeFileSync(join(folder, 'coat.json'), JSON.stringify(mirroredSpec(surface)));
      const launcher = join(process.cwd(), 'bin', 'whorlwind-groom.mjs');
      const r = spawnSync(process.execPath, [launcher, '--surface', 'shape.obj', '--spec', 'coat.json', '--out', 'g.usda'], { cwd: folder, encoding: 'utf8', timeout: 120_000 });
      expect(r.stderr.split('\n').filter((l) => l.startsWith('whorlwind-groom'))).toEqual([]);
      expect(r.status).toBe(0);
      // three/examples/jsm/loaders/usd/USDAParser.js (r187), an independent USDA reader.
      const { specsByPath } = new USDAParser().parseData(readFileSync(join(folder, 'g.usda'), 'utf8'));
      const curves = Object.keys(specsByPath).find((k) => specsByPath[k].fields.typeName === 'BasisCurves')!;
      const points = specsByPath[`${curves}.points`].fields.default as number[];
      const counts = specsByPath[`${curves}.curveVertexCounts`].fields.default as number[];
      const n = counts[0];
      const { gap, paired } = worstMirrorGap(points, counts.length, n, X_PLANE);
      expect(paired).toBeGreaterThan(300);
      // point3f: single precision, about 1e-7 of a coordinate near 1 (IEEE 754 binary32).
      expect(gap / surface.diagonal).toBeLessThan(1e-6);
    } finally {
      rmSync(folder, { recursive: true, force: true });
    }
  });
});
