// Brisquette, the demo's long-bodied cat, looks like a cat and not a ball: a body much longer than
// it is high or wide, standing on four legs (the lowest points, in two pairs front and back, left
// and right), with a head and a tail at the ends. Proportions are rough ones of a domestic cat
// from common knowledge (body about 2–3 times as long as the shoulder height), not a standard.
import { describe, expect, it } from 'vitest';
import { checkSurface } from '@/lib/field';
import { DEMO_GROOMS } from '@/lib/groom/demo';

const cat = DEMO_GROOMS.find((demo) => demo.id === 'brisquette-long-cat')!;

describe('the demo cat', () => {
  const mesh = cat.surface();
  const p = mesh.positions;
  const n = p.length / 3;
  const axis = (k: number) => Array.from({ length: n }, (_, v) => p[3 * v + k]);
  const [xs, ys, zs] = [axis(0), axis(1), axis(2)];
  const extent = (values: number[]) => Math.max(...values) - Math.min(...values);

  it('is a clean closed surface of genus 0', () => {
    const report = checkSurface(mesh);
    expect(report.problems.filter((problem) => problem.severity === 'error')).toEqual([]);
    expect(report.facts!.genus).toBe(0);
  });

  it('is long: nose to tail well over twice its height and three times its width', () => {
    expect(extent(zs)).toBeGreaterThan(2 * extent(ys));
    expect(extent(zs)).toBeGreaterThan(3 * extent(xs));
  });

  it('stands on four legs: the lowest points sit in four separate feet, two in front and two behind', () => {
    const floor = Math.min(...ys);
    const belly = Math.min(...ys.filter((_, v) => Math.abs(xs[v]) < 0.5 && zs[v] > -5 && zs[v] < 5));
    // The feet reach well below the belly between the legs.
    expect(belly - floor).toBeGreaterThan(4);
    const feet = new Set<string>();
    for (let v = 0; v < n; v++) if (ys[v] < floor + 1) feet.add(`${zs[v] > 0 ? 'front' : 'hind'} ${xs[v] > 0 ? 'left' : 'right'}`);
    expect([...feet].sort()).toEqual(['front left', 'front right', 'hind left', 'hind right']);
  });

  it('has a tail behind: the rear tip lies far behind the hind feet and above them', () => {
    const tip = zs.indexOf(Math.min(...zs));
    const hindFeet = Math.min(...zs.filter((_, v) => ys[v] < Math.min(...ys) + 1));
    expect(hindFeet - zs[tip]).toBeGreaterThan(8);
    expect(ys[tip]).toBeGreaterThan(Math.min(...ys) + 8);
  });
});
