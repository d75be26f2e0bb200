import { describe, expect, it } from 'vitest';
import { icosphere } from '@/tests/fixtures/shapes';
import { growGuides } from '@/lib/groom/grow/guides';
import { encodeMap, encodeMask } from '@/lib/groom/place/maps';
import { solveGroomField } from '@/lib/groom/place/request';
import { prepareGroomSurface } from '@/lib/groom/place/surface';
import { parseGroomSpec, type GroomSpecInput } from '@/lib/groom/spec/spec';
import { expectedGuideCount } from '@/lib/studio/client/guide-estimate';

// The editor's "growing about N guides" (lib/studio/client/guide-estimate.ts) against what growing
// makes: with a density (and no density pins) the root sampler makes exactly round(density × the
// weighted area) roots (lib/groom/README.md, "roots"), so the estimate can be held to the count.

type Vec3 = [number, number, number];
const mesh = icosphere(3, 1);
const surface = prepareGroomSurface(mesh);
const nV = mesh.positions.length / 3;
const field = { singularities: [{ point: [0, 1, 0] as Vec3, index: 1 }, { point: [0, -1, 0] as Vec3, index: 1 }] };
// A closed parting round the equator: its north side is about half the sphere.
const ring = Array.from({ length: 12 }, (_x, i): Vec3 => [Math.cos((i * Math.PI) / 6), 0, Math.sin((i * Math.PI) / 6)]);
// A mask over the cap x > 0.5 (about a quarter of the sphere's area).
const shares = Float64Array.from({ length: nV }, (_x, v) => (mesh.positions[3 * v] > 0.5 ? 1 : 0));

function grownPerSet(input: GroomSpecInput) {
  const spec = parseGroomSpec(input);
  const guides = growGuides(surface, solveGroomField(spec, surface), spec).guides;
  return { spec, counts: guides.sets ? guides.sets.map((s) => s.count) : [guides.count] };
}

const wholeSurfaceCount = (density: number) => Math.round(density * surface.faceArea.reduce((s, a) => s + a, 0));

describe('the editor’s guide-count estimate', () => {
  it('counts a mask set on its mask’s faces and a parting-side set on its side, as growing does', () => {
    const { spec, counts } = grownPerSet({
      specVersion: 3,
      units: 'cm',
      field: { ...field, partings: [{ points: ring, closed: true }] },
      masks: [encodeMask('cheek', shares, mesh)],
      guideSets: [
        { name: 'cheek', region: { mask: 'cheek' }, guides: { density: 200 } },
        { name: 'crown', region: { partings: [0], from: { point: [0, 1, 0] } }, guides: { density: 100 } },
      ],
    });
    expect(counts.reduce((a, b) => a + b, 0)).toBe(expectedGuideCount(spec, surface));
    // Each set alone, so a set counted on the whole surface cannot hide behind the other.
    for (const keep of [0, 1]) {
      const one = { ...spec, guideSets: [spec.guideSets![keep]] };
      expect(expectedGuideCount(one, surface)).toBe(counts[keep]);
    }
    // What the estimate said before: each set over the whole sphere.
    expect(expectedGuideCount(spec, surface)).toBeLessThan(0.8 * (wholeSurfaceCount(200) + wholeSurfaceCount(100)));
  });

  it('weighs the area by the painted density map as the root sampler does', () => {
    const thrice = Float64Array.from({ length: nV }, (_x, v) => (mesh.positions[3 * v + 1] > 0 ? 3 : 1));
    const { spec, counts } = grownPerSet({ specVersion: 3, units: 'cm', field, maps: [encodeMap('density', thrice, mesh)], guides: { density: 80 } });
    expect(expectedGuideCount(spec, surface)).toBe(counts[0]);
    expect(counts[0]).toBeGreaterThan(1.5 * wholeSurfaceCount(80));
  });

  it('takes a count as it is, and counts nothing for a region growing would refuse', () => {
    const spec = parseGroomSpec({
      specVersion: 3,
      units: 'cm',
      field,
      masks: [encodeMask('bare', new Float64Array(nV), mesh)],
      guideSets: [
        { name: 'counted', region: { groups: [] }, guides: { count: 321 } },
        { name: 'unpainted', region: { mask: 'bare' }, guides: { density: 100 } },
      ],
    });
    expect(expectedGuideCount(spec, surface)).toBe(321);
  });
});
