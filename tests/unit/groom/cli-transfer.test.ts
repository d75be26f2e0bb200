// The command line's transfer (lib/groom/README.md, "Command line"): --from OLD carries the spec
// onto --surface NEW, prints the report, writes it with --report; refusals write nothing.
import { spawnSync } from 'node:child_process';
import { existsSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { readSurface } from '@/lib/field';
import { identityOfMesh, parseGroomSpecJson, pointOfPosition, type TransferReport } from '@/lib/groom';
import { multiply3, onUnitSphere as at, transferSphere, rotationAbout } from '@/tests/fixtures/transfer-sphere';

const launcher = join(process.cwd(), 'bin', 'whorlwind-groom.mjs');
let folder: string;
const MOVED = { split: 'bc' as const, asTriangles: true, shift: 5, scale: 2.54, rotation: multiply3(rotationAbout('z', 35), rotationAbout('x', 50)), translation: [3, -1, 2] as [number, number, number] };
const moved = transferSphere(12, 16, MOVED);


function run(...args: string[]) {
  const result = spawnSync(process.execPath, [launcher, ...args], { cwd: folder, encoding: 'utf8', timeout: 60_000 });
  return { code: result.status, stdout: result.stdout, stderr: result.stderr.split('\n').filter((l) => l.startsWith('whorlwind-groom')) };
}

beforeAll(() => {
  folder = mkdtempSync(join(tmpdir(), 'whorlwind-transfer-'));
  writeFileSync(join(folder, 'old.obj'), transferSphere(12, 16).obj);
  writeFileSync(join(folder, 'new.obj'), moved.obj);
  writeFileSync(join(folder, 'coat.json'), JSON.stringify({ specVersion: 2, units: 'cm', upAxis: 'z', field: { singularities: [{ point: at(40, 30), index: 1 }, { point: at(130, 200), index: 1 }] }, guides: { count: 50, length: 0.3 } }));
  const pairs = [at(10, 0), at(90, 0), at(90, 90), at(170, 200)].map((p) => ({ from: p, to: moved.place(p) }));
  writeFileSync(join(folder, 'landmarks.json'), JSON.stringify(pairs));
  writeFileSync(join(folder, 'line.json'), JSON.stringify([0, 1, 2].map((k) => ({ from: [k, 0, 0], to: [0, k, 0] }))));
});
afterAll(() => rmSync(folder, { recursive: true, force: true }));

describe('whorlwind-groom --from', () => {
  it('carries the spec onto the new surface by landmarks, prints and writes the report, and grows there', () => {
    // Both files have UVs (read since the reader keeps them), so alignment is asked for by name.
    const r = run('--surface', 'new.obj', '--spec', 'coat.json', '--from', 'old.obj', '--method', 'alignment', '--landmarks', 'landmarks.json', '--report', 'report.json', '--out', 'carried.json', '--out', 'g.usda');
    expect(r.stderr).toEqual([]);
    expect(r.code).toBe(0);
    expect(r.stdout).toMatch(/transfer\s+by alignment along the normal; alignment by landmarks/);
    expect(r.stdout).toMatch(/features\s+2 of 2 carried/);
    expect(r.stdout).toMatch(/field\s+solves with exactly the carried singularities/);
    const report = JSON.parse(readFileSync(join(folder, 'report.json'), 'utf8')) as TransferReport;
    expect(report.features.map((f) => f.path)).toEqual(['field.singularities[0]', 'field.singularities[1]']);
    expect(report.alignment.scale).toBeCloseTo(2.54, 6);
    const carried = parseGroomSpecJson(readFileSync(join(folder, 'carried.json'), 'utf8'));
    const expected = moved.place(at(40, 30));
    // Within one edge of the new sphere (radius 2.54, 16 segments: an edge is about 1 unit).
    expect(Math.hypot(...carried.field.singularities[0].point!.map((x, i) => x - expected[i]))).toBeLessThan(1);
    expect(existsSync(join(folder, 'g.usda'))).toBe(true);
    // Left to choose, it carries by UV, which both files have.
    const auto = run('--surface', 'new.obj', '--spec', 'coat.json', '--from', 'old.obj', '--out', 'auto.json');
    expect(auto.code).toBe(0);
    expect(auto.stdout).toMatch(/transfer\s+by UV/);
  });

  it('a sculpt pass (same polygons, moved vertices): every guide keeps its id, polygon and weights', () => {
    // The old sphere with every vertex pushed out or in a little, as a sculpt pass would.
    let k = 0;
    const sculpt = transferSphere(12, 16).obj.replace(/^v (\S+) (\S+) (\S+)$/gm, (_, x, y, z) => {
      const f = 1 + 0.03 * Math.sin(1.7 * k++);
      return `v ${Number(x) * f} ${Number(y) * f} ${Number(z) * f}`;
    });
    writeFileSync(join(folder, 'sculpt.obj'), sculpt);
    expect(run('--surface', 'old.obj', '--spec', 'coat.json', '--out', 'before.usda').code).toBe(0);
    const after = run('--surface', 'sculpt.obj', '--spec', 'coat.json', '--from', 'old.obj', '--out', 'after.usda');
    expect(after.stderr).toEqual([]);
    expect(after.stdout).toMatch(/transfer\s+by polygon/);
    const primvar = (file: string, name: string) => readFileSync(join(folder, file), 'utf8').match(new RegExp(`primvars:whorlwind:${name} = (\\[[^\\]]*\\])`))![1];
    for (const name of ['guideId', 'rootFace', 'rootBarycentric']) expect(primvar('after.usda', name), name).toBe(primvar('before.usda', name));
  });

  it('writes a spec whose places carry where they sit in the file: polygon, barycentric and UV', () => {
    expect(run('--surface', 'old.obj', '--spec', 'coat.json', '--out', 'placed.json').code).toBe(0);
    const placed = parseGroomSpecJson(readFileSync(join(folder, 'placed.json'), 'utf8'));
    const { mesh } = readSurface(readFileSync(join(folder, 'old.obj')), 'old.obj');
    const identity = identityOfMesh(mesh);
    const size = Math.hypot(2, 2, 2);
    for (const s of placed.field.singularities) {
      expect(s.surface?.uv).toHaveLength(2);
      // The position names the vertex the singularity is placed on (within rounding of the written numbers).
      const back = pointOfPosition(identity, mesh, s.surface!)!;
      const p = mesh.positions;
      const nearest = Math.min(...Array.from({ length: p.length / 3 }, (_, v) => Math.hypot(p[3 * v] - back[0], p[3 * v + 1] - back[1], p[3 * v + 2] - back[2])));
      expect(nearest / size).toBeLessThan(1e-5);
    }
  });

  it('refuses collinear landmarks in one line and writes nothing', () => {
    const r = run('--surface', 'new.obj', '--spec', 'coat.json', '--from', 'old.obj', '--landmarks', 'line.json', '--report', 'refused.json', '--out', 'refused.usda');
    expect(r.code).toBe(1);
    expect(r.stderr).toEqual([expect.stringMatching(/^whorlwind-groom: landmarks: the 3 old surface points lie on one line/)]);
    expect(existsSync(join(folder, 'refused.json'))).toBe(false);
    expect(existsSync(join(folder, 'refused.usda'))).toBe(false);
  });

  it('says a transfer option needs --from (exit code 2)', () => {
    const r = run('--surface', 'new.obj', '--spec', 'coat.json', '--report', 'r.json');
    expect(r.code).toBe(2);
    expect(r.stderr).toEqual(['whorlwind-groom: --report needs --from (the surface the spec was made on)']);
  });
});
