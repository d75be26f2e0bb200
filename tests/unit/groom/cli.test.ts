import { spawnSync } from 'node:child_process';
import { existsSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { checkSurface, readSurface } from '@/lib/field';
import { frustum, icosphere, roundedCube } from '@/tests/fixtures/shapes';
import { surfaceToObj } from '@/lib/groom/demo/obj';

const launcher = join(process.cwd(), 'bin', 'whorlwind-groom.mjs');
let folder: string;

function run(...args: string[]) {
  const result = spawnSync(process.execPath, [launcher, ...args], { cwd: folder, encoding: 'utf8', timeout: 60_000 });
  return { code: result.status, stdout: result.stdout, stderr: result.stderr.split('\n').filter((l) => l.startsWith('whorlwind-groom')) };
}

beforeAll(() => {
  folder = mkdtempSync(join(tmpdir(), 'whorlwind-cli-'));
  writeFileSync(join(folder, 'ball.obj'), surfaceToObj(icosphere(3, 5), 'test ball'));
  writeFileSync(join(folder, 'box.obj'), surfaceToObj(roundedCube(10, 0.25), 'rounded box'));
  writeFileSync(
    join(folder, 'coat.json'),
    JSON.stringify({ specVersion: 2, units: 'cm', field: { singularities: [{ point: [0, 5, 0], index: 1 }, { point: [0, -5, 0], index: 1, twist: 180 }] }, guides: { density: 2, length: 1 } }),
  );
});
afterAll(() => rmSync(folder, { recursive: true, force: true }));

describe('whorlwind-groom command line', () => {
  it('writes every asked-for file, from any working folder, and prints stats', () => {
    const r = run('--surface', 'ball.obj', '--spec', 'coat.json', '--out', 'g.usda', '--out', 'g.glb', '--out', 'g.obj', '--out', 'resolved.json', '--field', 'flow.ply', '--thumbnail', 't.png', '--size', '128', '--stats');
    expect(r.stderr).toEqual([]);
    expect(r.code).toBe(0);
    for (const f of ['g.usda', 'g.glb', 'g.obj', 'resolved.json', 'flow.ply', 't.png']) expect(existsSync(join(folder, f))).toBe(true);
    expect(readFileSync(join(folder, 'g.usda'), 'utf8')).toContain('def BasisCurves "Guides"');
    expect(r.stdout).toMatch(/guides\s+\d+ × 16 points/);
    expect(r.stdout).toMatch(/measured = requested at (\d+) of \1 vertices/);
    expect(r.stdout).toMatch(/edges\s+\d+ crossed without a seam/);
    expect(r.stdout).toMatch(/solve field\s+[\d.]+ ms/);
  });

  it('grows a version-3 spec with tufts and waver, reports the tufts and writes their data', () => {
    writeFileSync(
      join(folder, 'tufted.json'),
      JSON.stringify({ specVersion: 3, units: 'cm', field: { singularities: [{ point: [0, 5, 0], index: 1 }, { point: [0, -5, 0], index: 1, twist: 180 }] }, guides: { density: 2, length: 1, tipWidth: 0.001, tufts: { density: 0.1, inner: { density: 0.4 }, loners: 0.1 }, waver: { amplitude: 0.05 } } }),
    );
    const r = run('--surface', 'ball.obj', '--spec', 'tufted.json', '--out', 't.usda', '--out', 't.obj', '--stats');
    expect(r.stderr).toEqual([]);
    expect(r.code).toBe(0);
    expect(r.stdout).toMatch(/tufts\s+\d+ tufts, \d+ inner tufts; \d+ guides in none/);
    expect(readFileSync(join(folder, 't.usda'), 'utf8')).toContain('int[] primvars:whorlwind:innerTuft');
    expect(readFileSync(join(folder, 't.obj'), 'utf8')).toMatch(/^#whorlwind-shape 0 -?\d+ -?\d+ /m);
  });

  it('grows guide sets on the two sides of a closed parting and reports each set', () => {
    const ring = Array.from({ length: 12 }, (_x, i) => [5 * Math.cos((i * Math.PI) / 6), 0, 5 * Math.sin((i * Math.PI) / 6)]);
    writeFileSync(
      join(folder, 'sides.json'),
      JSON.stringify({
        specVersion: 3,
        units: 'cm',
        field: { singularities: [{ point: [0, 5, 0], index: 1 }, { point: [0, -5, 0], index: 1, twist: 180 }], partings: [{ points: ring, closed: true }] },
        guideSets: [
          { name: 'north cap', region: { partings: [0], from: { point: [0, 5, 0] } }, guides: { density: 1, length: 0.5 } },
          { name: 'south cap', region: { partings: [0], from: { point: [0, -5, 0] } }, guides: { density: 2, length: 1.5 } },
        ],
      }),
    );
    const r = run('--surface', 'ball.obj', '--spec', 'sides.json', '--out', 'sides.usda', '--out', 'sides.obj', '--stats');
    expect(r.stderr).toEqual([]);
    expect(r.code).toBe(0);
    expect(r.stdout).toMatch(/set\s+"north cap": \d+ guides over [\d.]+ cm²/);
    expect(r.stdout).toMatch(/set\s+"south cap": \d+ guides over [\d.]+ cm²/);
    const usda = readFileSync(join(folder, 'sides.usda'), 'utf8');
    expect(usda).toContain('def BasisCurves "north_cap"');
    expect(usda).toContain('def BasisCurves "south_cap"');
    expect(readFileSync(join(folder, 'sides.obj'), 'utf8')).toMatch(/^g south_cap$/m);
  });

  it('writes the growth surface beside the guides with --with-surface, and the release in the provenance', () => {
    const r = run('--surface', 'ball.obj', '--spec', 'coat.json', '--out', 's.usda', '--out', 's.obj', '--with-surface');
    expect(r.stderr).toEqual([]);
    expect(r.code).toBe(0);
    const usda = readFileSync(join(folder, 's.usda'), 'utf8');
    expect(usda).toContain('def Mesh "Surface"');
    expect(usda).toContain(`string version = "${JSON.parse(readFileSync(join(process.cwd(), 'package.json'), 'utf8')).version}"`);
    expect(usda).toContain('primvars:whorlwind:rootBarycentric');
    expect(readFileSync(join(folder, 's.obj'), 'utf8')).toMatch(/^o surface$/m);
    run('--surface', 'ball.obj', '--spec', 'coat.json', '--out', 'plain.usda');
    expect(readFileSync(join(folder, 'plain.usda'), 'utf8')).not.toContain('def Mesh');
  });

  it('fails with exit code 1 and one line naming the problem on bad input', () => {
    writeFileSync(join(folder, 'bad.json'), JSON.stringify({ specVersion: 2, units: 'cm', field: {}, guides: { lift: 120 } }));
    const bad = run('--surface', 'ball.obj', '--spec', 'bad.json', '--out', 'x.usda');
    expect(bad.code).toBe(1);
    expect(bad.stderr).toEqual([expect.stringMatching(/^whorlwind-groom: guides\.lift: /)]);
    writeFileSync(join(folder, 'unbalanced.json'), JSON.stringify({ specVersion: 2, units: 'cm', field: { singularities: [{ point: [0, 5, 0], index: 1 }] } }));
    const unbalanced = run('--surface', 'ball.obj', '--spec', 'unbalanced.json');
    expect(unbalanced.code).toBe(1);
    expect(unbalanced.stderr).toEqual([expect.stringMatching(/sum to 1, but .* needs 2/)]);
    const missing = run('--surface', 'nowhere.obj', '--spec', 'coat.json');
    expect(missing.code).toBe(1);
    expect(missing.stderr).toEqual([expect.stringMatching(/cannot read the surface nowhere\.obj/)]);
  });

  it('refuses a broken surface with the words of the upload check, and grows on a tube open at both ends', () => {
    // The ball with a fin: a third face on one of its edges, so that edge is not manifold.
    const ball = icosphere(3, 5);
    const [a, b] = [ball.triangles[0], ball.triangles[1]];
    const tip = ball.positions.length / 3;
    const finned = { positions: Float64Array.from([...ball.positions, 0, 0, 9]), triangles: Uint32Array.from([...ball.triangles, b, a, tip]) };
    writeFileSync(join(folder, 'fin.obj'), surfaceToObj(finned, 'ball with a fin'));
    writeFileSync(join(folder, 'bare.json'), JSON.stringify({ specVersion: 2, units: 'cm', field: {}, guides: { density: 1, length: 1 } }));
    const refused = run('--surface', 'fin.obj', '--spec', 'bare.json', '--out', 'fin.usda');
    const expected = checkSurface(readSurface(readFileSync(join(folder, 'fin.obj')), 'fin.obj').mesh).problems.find((p) => p.severity === 'error')!;
    expect(refused.code).toBe(1);
    expect(refused.stderr).toEqual([`whorlwind-groom: ${expected.message}`]);
    expect(existsSync(join(folder, 'fin.usda'))).toBe(false);

    writeFileSync(join(folder, 'sleeve.obj'), surfaceToObj(frustum(5, 3, 8, 12, 32), 'sleeve'));
    const sleeve = run('--surface', 'sleeve.obj', '--spec', 'bare.json', '--out', 'sleeve.usda', '--stats');
    expect(sleeve.stderr).toEqual([]);
    expect(sleeve.code).toBe(0);
    expect(sleeve.stdout).toMatch(/edges\s+\d+ crossed without a seam \(largest turn \d+\.\d°\)/);
  });

  it('fails with exit code 2 on a bad command line', () => {
    const r = run('--surface', 'ball.obj', '--spec', 'coat.json', '--out', 'guides.fbx');
    expect(r.code).toBe(2);
    expect(r.stderr).toEqual([expect.stringMatching(/--out guides\.fbx: the extension must be one of/)]);
    expect(run('--spec', 'coat.json').code).toBe(2);
  });

  // Source: a smooth cross field on a cube has eight index +1/4 singularities, one at each corner
  // (the classic cross-field result; tests/unit/field/suggest.test.ts checks the engine itself).
  it('--suggest writes a spec with the suggested singularities, and --spec of it solves to exactly those', () => {
    const r = run('--surface', 'box.obj', '--suggest', '--order', '4', '--out', 'suggestion.json', '--stats');
    expect(r.stderr).toEqual([]);
    expect(r.code).toBe(0);
    expect(r.stdout).toMatch(/suggested\s+8 singularities \(8 × \+1\/4\), order 4/);
    const spec = JSON.parse(readFileSync(join(folder, 'suggestion.json'), 'utf8'));
    expect(spec.field.order).toBe(4);
    expect(spec.field.singularities.map((s: { index: number }) => s.index)).toEqual(Array(8).fill(0.25));
    const { mesh } = readSurface(readFileSync(join(folder, 'box.obj')), 'box.obj');
    const corner = 1 - 0.25 + 0.25 / Math.sqrt(3);
    const corners = new Set<string>();
    for (const s of spec.field.singularities as { vertex: number }[]) {
      const v = mesh.fileVertexToVertex![s.vertex];
      const p = [0, 1, 2].map((k) => mesh.positions[3 * v + k]);
      expect(Math.hypot(...p.map((x) => Math.abs(x) - corner))).toBeLessThan(0.25);
      corners.add(p.map(Math.sign).join());
    }
    expect(corners.size).toBe(8);
    const back = run('--surface', 'box.obj', '--spec', 'suggestion.json', '--stats');
    expect(back.code).toBe(0);
    expect(back.stdout).toMatch(/index\s+placed 2 of 2; measured = requested at (\d+) of \1 vertices/);
  });

  // Source: "down" projected onto a sphere is the gradient of minus the height, zero only at the
  // top and the bottom (the height's critical points), so a strong pull puts the whorls there.
  it('--suggest-down pulls the whorls of a ball to its top and bottom', () => {
    const r = run('--surface', 'ball.obj', '--suggest', '--suggest-down', '0,-1,0', '--suggest-weight', '10', '--out', 'falling.json');
    expect(r.stderr).toEqual([]);
    const spec = JSON.parse(readFileSync(join(folder, 'falling.json'), 'utf8'));
    const ys = (spec.field.singularities as { vertex: number; index: number }[]).map((s) => {
      expect(s.index).toBe(1);
      return icosphere(3, 5).positions[3 * s.vertex + 1];
    });
    expect(ys.sort((a, b) => a - b)).toEqual([expect.closeTo(-5, 0), expect.closeTo(5, 0)]);
  });

  it('refuses suggestion options it cannot use', () => {
    expect(run('--surface', 'ball.obj', '--suggest', '--suggest-weight', '2', '--out', 'x.json').code).toBe(2);
    expect(run('--surface', 'ball.obj', '--suggest', '--suggest-down', '0,0', '--out', 'x.json').code).toBe(2);
    expect(run('--surface', 'ball.obj', '--spec', 'coat.json', '--order', '4').code).toBe(2);
    const odd = run('--surface', 'ball.obj', '--suggest', '--suggest-follow-curvature', '--out', 'x.json');
    expect(odd.code).toBe(1);
    expect(odd.stderr).toEqual([expect.stringMatching(/a field of order 1 cannot follow them/)]);
  });
});
