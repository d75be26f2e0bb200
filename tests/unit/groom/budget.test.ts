// The groom's hard budget (lib/groom/README.md, "Budgets"): guides × points per guide, refused by
// the schema for a count and by the grower for a density; thumbnails grow a bounded sample.
import { describe, expect, it } from 'vitest';
import { GroomError, growGuides, MAX_GUIDE_POINTS, validateGroomSpec } from '@/lib/groom';
import { prepareGroomSurface } from '@/lib/groom/place/surface';
import { solveGroomField } from '@/lib/groom/place/request';
import { parseGroomSpec } from '@/lib/groom/spec/spec';
import { gridPlane } from '@/tests/fixtures/shapes';

const flat = { specVersion: 2, units: 'cm', upAxis: 'z', field: { referenceDirection: [1, 0, 0] } } as const;

describe('the guide-point budget', () => {
  it('takes exactly the budget and refuses one guide more, naming the field and what fits', () => {
    expect(validateGroomSpec({ ...flat, guides: { count: MAX_GUIDE_POINTS / 16, pointsPerGuide: 16 } }).problems).toBeUndefined();
    expect(validateGroomSpec({ ...flat, guides: { count: MAX_GUIDE_POINTS / 64, pointsPerGuide: 64 } }).problems).toBeUndefined();
    const { problems } = validateGroomSpec({ ...flat, guides: { count: MAX_GUIDE_POINTS / 16 + 1, pointsPerGuide: 16 } });
    expect(problems).toEqual([
      {
        path: 'guides.count',
        message:
          '250,001 guides × 16 points is 4,000,016 points; a groom may have at most 4,000,000 (at 16 points per guide, 250,000 guides). Lower the guide count or the points per guide.',
      },
    ]);
  });

  it('counts the default of 16 points per guide when the spec leaves it out', () => {
    expect(validateGroomSpec({ ...flat, guides: { count: 300_000 } }).problems?.[0].path).toBe('guides.count');
  });

  it('refuses a density that makes too many guides on this surface, before growing any', () => {
    // 20 × 20 cm = 400 cm²; 10,000 guides per cm² of 16 points is 64,000,000 points.
    const spec = parseGroomSpec({ ...flat, guides: { density: 10_000 } });
    const surface = prepareGroomSurface(gridPlane(4, 4, 20, 20));
    const solved = solveGroomField(spec, surface);
    let caught: unknown;
    try {
      growGuides(surface, solved, spec);
    } catch (error) {
      caught = error;
    }
    expect(caught).toBeInstanceOf(GroomError);
    expect((caught as GroomError).message).toBe(
      'guides.density: 10000 guides per cm² over 400 cm² makes 4,000,000 guides × 16 points is 64,000,000 points; a groom may have at most 4,000,000 (at 16 points per guide, 250,000 guides). Lower the guide count or the points per guide.',
    );
  });

  it('grows a bounded sample when asked (thumbnails), the full count otherwise', () => {
    const spec = parseGroomSpec({ ...flat, guides: { count: 400, pointsPerGuide: 4 } });
    const surface = prepareGroomSurface(gridPlane(4, 4, 20, 20));
    const solved = solveGroomField(spec, surface);
    expect(growGuides(surface, solved, spec).guides.count).toBe(400);
    expect(growGuides(surface, solved, spec, { sampleOf: 50 }).guides.count).toBe(50);
  });
});
