import { describe, expect, it } from 'vitest';
import { faceAreas, surfaceArea } from '@/lib/field';
import { icosphere } from '@/tests/fixtures/shapes';
import { GroomError } from '@/lib/groom/errors';
import { HUMAN_SCALP_PRESET } from '@/lib/groom/spec/presets';
import { growthMask } from '@/lib/groom/place/regions';
import { sampleRoots } from '@/lib/groom/grow/roots';
import { nearestNeighbourDistances, withGroups } from './support';

describe('guide roots', () => {
  // Common practice: guide and hair densities are quoted per cm², whatever the scene units.
  it('gives density × area roots, with the area in cm² from the declared units', () => {
    const radiusMm = 50;
    const mesh = icosphere(4, radiusMm);
    const areaCm2 = surfaceArea(mesh) * 0.01; // mm² → cm²
    // Against the smooth sphere too: the mesh's area is within a few percent of 4πr².
    expect(areaCm2 / (4 * Math.PI * (radiusMm / 10) ** 2)).toBeGreaterThan(0.97);
    const density = 3;
    const count = Math.round(density * areaCm2);
    const roots = sampleRoots({ positions: mesh.positions, triangles: mesh.triangles, faceArea: faceAreas(mesh), count, seed: 7 });
    expect(roots.count).toBe(count);
    expect(Math.abs(roots.count - density * 4 * Math.PI * 25) / (density * 4 * Math.PI * 25)).toBeLessThan(0.03);
    for (let i = 0; i < roots.count; i++) {
      const r = Math.hypot(roots.position[3 * i], roots.position[3 * i + 1], roots.position[3 * i + 2]);
      expect(r).toBeLessThanOrEqual(radiusMm + 1e-9);
      expect(r).toBeGreaterThan(radiusMm * 0.99);
    }
  });

  it('spreads roots like a Poisson-disk set, far more evenly than independent random points', () => {
    // Measure from Lagae & Dutré, "A Comparison of Methods for Generating Poisson Disk
    // Distributions", Computer Graphics Forum 27(1), 2008: the relative radius
    // ρ = (smallest distance / 2) / r_max with r_max = √(A / (2√3 N)); independent uniform points
    // have a mean nearest-neighbour distance of ½√(A/N) (Clark & Evans, Ecology 35(4), 1954),
    // i.e. 0.47 in units of 2 r_max, and a smallest distance near 0.
    const mesh = icosphere(4, 1);
    const count = 1500;
    const roots = sampleRoots({ positions: mesh.positions, triangles: mesh.triangles, faceArea: faceAreas(mesh), count, seed: 11 });
    const twoRMax = 2 * Math.sqrt(surfaceArea(mesh) / (2 * Math.sqrt(3) * count));
    const nn = nearestNeighbourDistances(roots.position, count);
    const mean = nn.reduce((a, b) => a + b, 0) / nn.length;
    expect(Math.min(...nn) / twoRMax).toBeGreaterThan(0.4);
    expect(mean / twoRMax).toBeGreaterThan(0.65);
  });

  it('grows only on the chosen OBJ groups', () => {
    const mesh = withGroups(icosphere(4, 10), ['crown', 'belly'], (_x, y) => (y > 0 ? 0 : 1));
    const mask = growthMask(mesh, ['crown']);
    const areas = faceAreas(mesh);
    let crownArea = 0;
    for (let f = 0; f < areas.length; f++) if (mask[f]) crownArea += areas[f];
    const count = Math.round(2 * crownArea);
    const roots = sampleRoots({ positions: mesh.positions, triangles: mesh.triangles, faceArea: areas, allowedFace: mask, count, seed: 1 });
    expect(roots.count).toBe(count);
    for (const f of roots.face) expect(mesh.groups!.groupOfFace[f]).toBe(0);
    expect(() => growthMask(mesh, ['crown', 'tail'])).toThrow(GroomError);
    expect(() => growthMask(mesh, ['crown', 'tail'])).toThrow(/guides\.regions\[1\].*"tail".*"crown", "belly"/);
  });

  it('is deterministic for a seed and changes with it', () => {
    const mesh = icosphere(3, 1);
    const request = { positions: mesh.positions, triangles: mesh.triangles, faceArea: faceAreas(mesh), count: 400, seed: 5 };
    const a = sampleRoots(request);
    const b = sampleRoots(request);
    expect(Array.from(b.position)).toEqual(Array.from(a.position));
    expect(Array.from(b.face)).toEqual(Array.from(a.face));
    expect(Array.from(sampleRoots({ ...request, seed: 6 }).position)).not.toEqual(Array.from(a.position));
  });

  it('follows density pins: denser where the factor is higher', () => {
    const mesh = icosphere(4, 1);
    const nV = mesh.positions.length / 3;
    const density = new Float64Array(nV);
    for (let v = 0; v < nV; v++) density[v] = mesh.positions[3 * v + 1] > 0 ? 3 : 1;
    const roots = sampleRoots({ positions: mesh.positions, triangles: mesh.triangles, faceArea: faceAreas(mesh), count: 2000, vertexDensity: density, seed: 2 });
    let upper = 0;
    for (let i = 0; i < roots.count; i++) if (roots.position[3 * i + 1] > 0.1) upper++;
    let lower = 0;
    for (let i = 0; i < roots.count; i++) if (roots.position[3 * i + 1] < -0.1) lower++;
    expect(upper / lower).toBeGreaterThan(2.5);
    expect(upper / lower).toBeLessThan(3.5);
  });

  it('has a human-scalp preset whose hair density is in the published range', () => {
    // Barman, Astore & Pecoraro, "The normal trichogram of the adult", J. Invest. Dermatol.
    // 44:233, 1965: 175–300 hairs per cm² on the adult scalp. Each guide stands for
    // `hairsPerGuide` rendered hairs, so hairs per cm² = guides per cm² × hairsPerGuide.
    const hairsPerCm2 = HUMAN_SCALP_PRESET.guides.density * HUMAN_SCALP_PRESET.guides.hairsPerGuide;
    expect(hairsPerCm2).toBeGreaterThanOrEqual(175);
    expect(hairsPerCm2).toBeLessThanOrEqual(300);
    expect(HUMAN_SCALP_PRESET.units).toBe('cm');
  });
});
