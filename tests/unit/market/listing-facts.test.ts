// A listing's facts from a spec, its surface and its guides, with numbers worked by hand: a flat
// sheet of known area, a spec of known density or count, the units written out.
import { describe, expect, it } from 'vitest';
import { checkSurface, type TriangleMesh } from '@/lib/field';
import { coatFacts, type GroomSpecInput } from '@/lib/groom';
import { measureListing } from '@/lib/market/listing-facts';
import { amount, factRows, lengthRange } from '@/components/market/listing-facts';
import { gridPlane } from '@/tests/fixtures/shapes';
import { groomOn, withGroups } from '../groom/support';

const flat = (units: 'cm' | 'mm', guides: GroomSpecInput['guides']): GroomSpecInput => ({
  specVersion: 2,
  units,
  upAxis: 'z',
  field: { referenceDirection: [1, 0.3, 0] },
  guides,
});

function facts(mesh: TriangleMesh, spec: GroomSpecInput) {
  const made = groomOn(mesh, spec);
  const coat = coatFacts(made.surface, made.spec, made.guides);
  return { coat, made, ...measureListing(coat, checkSurface(mesh).facts!, { count: Math.floor(made.guides.count / 10), pointsPerGuide: 4 }) };
}

const row = (rows: { term: string; value: string }[], term: string) => rows.find((r) => r.term === term)?.value;

describe('a listing’s facts from its spec', () => {
  it('a density of 2.2 guides per cm² on a 10 cm × 10 cm sheet: 220 guides, 2.2 per cm², 220 hairs per cm² at 100 hairs per guide', () => {
    // 10 cm × 10 cm = 100 cm²; 2.2 × 100 = 220 guides (the human-scalp preset's density, lib/groom/spec/presets.ts).
    const { coat, facts: f, guidesPerCm2 } = facts(gridPlane(20, 20, 10, 10), flat('cm', { density: 2.2, hairsPerGuide: 100, length: 1.5 }));
    expect(coat.guideCount).toBe(220);
    expect(f.growthAreaCm2).toBeCloseTo(100, 9);
    expect(f.guidesPerCm2).toBeCloseTo(2.2, 9);
    expect(guidesPerCm2).toBeCloseTo(2.2, 9);
    expect(f.hairsPerCm2).toBeCloseTo(220, 7);
    const rows = factRows(f);
    expect(row(rows, 'Units')).toBe('centimetres (cm)');
    expect(row(rows, 'Up axis')).toBe('+Z up');
    expect(row(rows, 'Density')).toBe('2.2 guides per cm², 100 hairs per guide (220 hairs per cm²)');
  });

  it('a count of 500 on a 100 mm × 100 mm sheet declared in millimetres: 100 cm², 5 guides per cm², lengths in mm and the typical length in cm', () => {
    // 100 mm × 100 mm = 10 000 mm² = 100 cm² (1 mm² = 0.01 cm²); 500 / 100 = 5 guides per cm².
    const { coat, facts: f, typicalLengthCm } = facts(gridPlane(20, 20, 100, 100), flat('mm', { count: 500, hairsPerGuide: 40, length: 12, jitter: 0.4, pointsPerGuide: 8 }));
    expect(coat.guideCount).toBe(500);
    expect(f.growthAreaCm2).toBeCloseTo(100, 9);
    expect(f.guidesPerCm2).toBeCloseTo(5, 9);
    expect(f.hairsPerCm2).toBeCloseTo(200, 7);
    expect(f.units).toBe('mm');
    expect(f.pointsPerGuide).toBe(8);
    // Jitter 0.4 varies a length by up to ±10 % (±25 % at jitter 1, lib/groom/README.md), and a
    // polyline of 8 points cuts the corners of a bent guide a little: within ±20 % of 12 mm.
    expect(f.length.combed).toBe(12);
    expect(f.length.shortest).toBeGreaterThanOrEqual(12 * 0.8);
    expect(f.length.longest).toBeLessThanOrEqual(12 * 1.2);
    expect(f.length.shortest).toBeLessThan(f.length.median);
    expect(f.length.median).toBeLessThan(f.length.longest);
    // 1 mm = 0.1 cm.
    expect(typicalLengthCm).toBeCloseTo(f.length.median / 10, 12);
    const rows = factRows(f);
    expect(row(rows, 'Units')).toBe('millimetres (mm)');
    expect(row(rows, 'Density')).toBe('5 guides per cm², 40 hairs per guide (200 hairs per cm²)');
    expect(row(rows, 'Guide lengths')).toBe(`${amount(f.length.shortest)}–${amount(f.length.longest)} mm, typically ${amount(f.length.median)} mm (combed length 12 mm)`);
    expect(row(rows, 'Points per guide')).toBe('8');
  });

  it('counts the density over the regions the spec grows on, and names the surface’s regions', () => {
    // Left half of a 10 cm × 10 cm sheet: 50 cm²; 300 guides there are 6 per cm².
    const mesh = withGroups(gridPlane(20, 20, 10, 10), ['left', 'right'], (x) => (x < 0 ? 0 : 1));
    const { facts: f } = facts(mesh, flat('cm', { count: 300, length: 1 }));
    expect(f.growthAreaCm2).toBeCloseTo(100, 9);
    const { facts: left } = facts(mesh, flat('cm', { count: 300, length: 1, regions: ['left'] }));
    expect(left.growthAreaCm2).toBeCloseTo(50, 9);
    expect(left.guidesPerCm2).toBeCloseTo(6, 9);
    expect(left.regions).toEqual({ expected: ['left'], surface: ['left', 'right'] });
    expect(row(factRows(left), 'Grows on')).toBe('the regions “left” (the seller’s surface has “left”, “right”)');
    expect(row(factRows(f), 'Grows on')).toBe('the whole surface (the seller’s surface has “left”, “right”)');
  });

  it('states the seller’s surface and offers the transfer by UV only with UVs that do not overlap', () => {
    const sheet = gridPlane(20, 20, 10, 10);
    const { facts: bare } = facts(sheet, flat('cm', { count: 100 }));
    // A flat sheet: 2 · 20 · 20 = 800 triangles, genus 0, one boundary loop, one piece.
    expect(bare.surface).toEqual({ faces: 800, genus: 0, openings: 1, pieces: 1, uvs: false, uvOverlappingFaces: 0 });
    expect(bare.transfer).toEqual({ uv: false, alignment: true });
    expect(row(factRows(bare), 'Seller’s surface')).toBe('800 triangles · genus 0 · 1 opening · 1 piece · no UVs');
    expect(row(factRows(bare), 'Onto your character')).toBe('by alignment of the two surfaces (not by UV: the seller’s surface has no UVs)');

    // UVs = the sheet's own x, y scaled into [0, 1]: no triangle overlaps another.
    const uvs = new Float32Array(6 * (sheet.triangles.length / 3));
    sheet.triangles.forEach((v, corner) => {
      uvs[2 * corner] = sheet.positions[3 * v] / 10 + 0.5;
      uvs[2 * corner + 1] = sheet.positions[3 * v + 1] / 10 + 0.5;
    });
    const { facts: mapped } = facts({ ...sheet, cornerUvs: uvs }, flat('cm', { count: 100 }));
    expect(mapped.transfer).toEqual({ uv: true, alignment: true });
    expect(row(factRows(mapped), 'Onto your character')).toMatch(/^by UV .* or by alignment/);

    // Mirrored halves (u = |x|), as a symmetric character's UVs often are: the halves overlap.
    const mirrored = uvs.map((value, i) => (i % 2 === 0 ? Math.abs(value - 0.5) : value));
    const { facts: overlapping } = facts({ ...sheet, cornerUvs: mirrored }, flat('cm', { count: 100 }));
    expect(overlapping.surface.uvs).toBe(true);
    expect(overlapping.surface.uvOverlappingFaces).toBeGreaterThan(0);
    expect(overlapping.transfer.uv).toBe(false);
  });

  it('words numbers as a reader compares them', () => {
    expect([amount(2.2), amount(0.45678), amount(1234.5), amount(12)]).toEqual(['2.2', '0.457', '1,235', '12']);
    const { facts: f } = facts(gridPlane(20, 20, 10, 10), flat('cm', { count: 100, length: 2, jitter: 0 }));
    expect(lengthRange({ ...f, length: { ...f.length, shortest: 2, longest: 2 } })).toBe('2 cm');
    expect(row(factRows(f), '3D preview')).toBe('10 guides, 4 points each');
  });
});
