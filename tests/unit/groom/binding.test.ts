import { describe, expect, it } from 'vitest';
import { faceAreas, readSurface, surfaceArea } from '@/lib/field';
import { GroomError } from '@/lib/groom/errors';
import { growGuides } from '@/lib/groom/grow/guides';
import { sampleRoots } from '@/lib/groom/grow/roots';
import { solveGroomField } from '@/lib/groom/place/request';
import { prepareGroomSurface } from '@/lib/groom/place/surface';
import { parseGroomSpec, type GroomSpecInput } from '@/lib/groom/spec/spec';
import { quadSphere, type QuadSphere } from '@/tests/fixtures/quad-sphere';
import { icosphere } from '@/tests/fixtures/shapes';
import { nearestNeighbourDistances } from './support';

const text = (s: string) => new TextEncoder().encode(s);
const SPEC: GroomSpecInput = {
  specVersion: 2,
  units: 'cm',
  field: { singularities: [{ point: [0, 1, 0], index: 1 }, { point: [0, -1, 0], index: 1 }] },
  guides: { count: 300, length: 0.3, pointsPerGuide: 6, seed: 9 },
};

function grow(sphere: QuadSphere, input: GroomSpecInput = SPEC, rootsFrom?: QuadSphere) {
  const spec = parseGroomSpec(input);
  const mesh = readSurface(text(sphere.obj), 'sphere.obj').mesh;
  const surface = prepareGroomSurface(mesh, { boundary: spec.field.boundary });
  const from = rootsFrom ? readSurface(text(rootsFrom.obj), 'first.obj').mesh : undefined;
  return growGuides(surface, solveGroomField(spec, surface), spec, from ? { rootsFrom: from } : {}).guides;
}

describe('roots in one fixed order', () => {
  const mesh = icosphere(4, 1);
  const request = { positions: mesh.positions, triangles: mesh.triangles, faceArea: faceAreas(mesh), seed: 3 };

  it('makes a sparser set the first roots of a denser one, exactly', () => {
    const dense = sampleRoots({ ...request, count: 2100 });
    for (const count of [1, 64, 65, 700, 1500]) {
      const sparse = sampleRoots({ ...request, count });
      expect(sparse.count).toBe(count);
      expect(Array.from(sparse.face)).toEqual(Array.from(dense.face.subarray(0, count)));
      expect(Array.from(sparse.position)).toEqual(Array.from(dense.position.subarray(0, 3 * count)));
    }
  });

  it('spreads every prefix like a Poisson-disk set (between levels as well as at them)', () => {
    // The measure of Lagae & Dutré (Computer Graphics Forum 27(1), 2008), as in roots.test.ts:
    // distances in units of 2 r_max = 2 √(A / (2√3 N)); independent uniform points have a mean
    // nearest-neighbour distance of 0.47 and a smallest one near 0 (Clark & Evans, 1954).
    for (const count of [512, 600, 800, 1000, 1024]) {
      const roots = sampleRoots({ ...request, count });
      const twoRMax = 2 * Math.sqrt(surfaceArea(mesh) / (2 * Math.sqrt(3) * count));
      const nn = nearestNeighbourDistances(roots.position, count);
      expect(Math.min(...nn) / twoRMax, `smallest distance at ${count}`).toBeGreaterThan(0.3);
      expect(nn.reduce((a, b) => a + b, 0) / nn.length / twoRMax, `mean distance at ${count}`).toBeGreaterThan(0.6);
    }
  });
});

describe('guides know where they grow', () => {
  const sphere = quadSphere(10, 16);
  const guides = grow(sphere);

  it('binds every root to its OBJ polygon: the polygon corners’ file positions and the weights give the curve’s first point', () => {
    const { polygon, corners, weights } = guides.binding;
    const n = guides.pointsPerGuide;
    expect(guides.count).toBe(300);
    for (let g = 0; g < guides.count; g++) {
      const face = sphere.polygons[polygon[g]];
      let sum = 0;
      const root = [0, 0, 0];
      for (let i = 0; i < 3; i++) {
        const c = corners[3 * g + i];
        expect(c).toBeLessThan(face.vertices.length);
        if (i > 0) expect(c).toBeGreaterThan(corners[3 * g + i - 1]);
        const w = weights[3 * g + i];
        expect(w).toBeGreaterThanOrEqual(-1e-12);
        sum += w;
        // Positions as written in the file (before welding), by the file's own numbering.
        const position = sphere.positions[face.vertices[c]];
        for (let a = 0; a < 3; a++) root[a] += w * position[a];
      }
      expect(sum).toBeCloseTo(1, 12);
      for (let a = 0; a < 3; a++) expect(Math.abs(root[a] - guides.points[3 * n * g + a])).toBeLessThan(1e-9);
    }
  });

  it('gives each root the UV interpolated from its polygon corners’ vt', () => {
    const { polygon, corners, weights, uv } = guides.binding;
    expect(uv).toBeDefined();
    for (let g = 0; g < guides.count; g++) {
      const face = sphere.polygons[polygon[g]];
      for (let a = 0; a < 2; a++) {
        let expected = 0;
        for (let i = 0; i < 3; i++) expected += weights[3 * g + i] * Math.fround(sphere.uvs[face.uvs[corners[3 * g + i]]][a]);
        expect(Math.abs(uv![2 * g + a] - expected)).toBeLessThan(1e-12);
      }
    }
  });

  it('says which triangle of its polygon each root is in: 0 for a triangle, 0 or 1 for a quad', () => {
    for (let g = 0; g < guides.count; g++) {
      expect(guides.binding.triangle[g]).toBeLessThanOrEqual(sphere.polygons[guides.binding.polygon[g]].vertices.length - 3);
    }
    expect(new Set(guides.binding.triangle)).toEqual(new Set([0, 1]));
  });

  it('keeps ids when the count changes: the first guides of a larger set are the smaller set’s, point for point', () => {
    const more = grow(sphere, { ...SPEC, guides: { ...SPEC.guides, count: 700 } });
    expect(Array.from(more.guideId.subarray(0, 300))).toEqual(Array.from(guides.guideId));
    expect(Array.from(more.binding.polygon.subarray(0, 300))).toEqual(Array.from(guides.binding.polygon));
    expect(Array.from(more.binding.weights.subarray(0, 900))).toEqual(Array.from(guides.binding.weights));
    // Per-guide variation is keyed by id, so the guides themselves are the same curves.
    expect(Array.from(more.points.subarray(0, guides.points.length))).toEqual(Array.from(guides.points));
  });

  it('keeps ids, polygons and weights through a sculpt pass, with the roots on the sculpted skin', () => {
    const sculpted = quadSphere(10, 16, { sculpt: (_v, [x, y, z]) => [x * (1 + 0.15 * Math.sin(3 * y)), 1.2 * y, z + 0.1 * x * x] });
    const after = grow(sculpted, SPEC, sphere);
    expect(Array.from(after.guideId)).toEqual(Array.from(guides.guideId));
    expect(Array.from(after.binding.polygon)).toEqual(Array.from(guides.binding.polygon));
    expect(Array.from(after.binding.corners)).toEqual(Array.from(guides.binding.corners));
    expect(Array.from(after.binding.weights)).toEqual(Array.from(guides.binding.weights));
    const n = after.pointsPerGuide;
    for (let g = 0; g < after.count; g++) {
      const face = sculpted.polygons[after.binding.polygon[g]];
      for (let a = 0; a < 3; a++) {
        let root = 0;
        for (let i = 0; i < 3; i++) root += after.binding.weights[3 * g + i] * sculpted.positions[face.vertices[after.binding.corners[3 * g + i]]][a];
        expect(Math.abs(root - after.points[3 * n * g + a])).toBeLessThan(1e-9);
      }
    }
  });

  it('refuses to keep roots across surfaces of different topology', () => {
    let caught: unknown;
    try {
      grow(quadSphere(10, 16), SPEC, quadSphere(10, 18));
    } catch (error) {
      caught = error;
    }
    expect(caught).toBeInstanceOf(GroomError);
    expect((caught as GroomError).code).toBe('roots-surface-mismatch');
  });
});
