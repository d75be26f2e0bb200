import { spawnSync } from 'node:child_process';
import { existsSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { checkSurface, readSurface } from '@/lib/field';
import { frustum, icosphere } from '@/tests/fixtures/shapes';
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
});
