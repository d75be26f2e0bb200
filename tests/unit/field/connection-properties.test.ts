import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { prepareSurface, type BoundaryMode } from '@/lib/field/connection';
import { FieldError } from '@/lib/field/mesh/errors';
import type { TriangleMesh } from '@/lib/field/mesh/mesh';
import { disc, icosphere, torus } from '@/tests/fixtures/shapes';
import { solveField } from '@/lib/field/solve-field';

/** Moves every vertex by up to `amount` (relative to `scale`) in a seeded pseudo-random direction. */
function jitter(mesh: TriangleMesh, seed: number, amount: number, scale: number): TriangleMesh {
  let state = seed >>> 0 || 1;
  const random = () => {
    state ^= state << 13;
    state ^= state >>> 17;
    state ^= state << 5;
    return (state >>> 0) / 4294967296 - 0.5;
  };
  const positions = mesh.positions.map((x) => x + random() * amount * scale);
  return { positions, triangles: mesh.triangles };
}

const shapes: { name: string; make: (seed: number) => TriangleMesh; boundary: BoundaryMode }[] = [
  { name: 'sphere', make: (s) => jitter(icosphere(2), s, 0.2, 0.3), boundary: 'free' },
  { name: 'torus', make: (s) => jitter(torus(3, 1, 16, 8), s, 0.2, 0.8), boundary: 'free' },
  { name: 'disc', make: (s) => jitter(disc(4, 12), s, 0.2, 0.25), boundary: 'free' },
  { name: 'held disc', make: (s) => jitter(disc(4, 12), s, 0.2, 0.25), boundary: 'tangent' },
];

describe('property: on random surfaces and random singularities the guarantee holds or a clear error is thrown', () => {
  // Checked with fast-check (npm), a general-purpose property-based testing library.
  it('never returns NaN, and every returned field has exactly the requested indices', () => {
    fc.assert(
      fc.property(
        fc.integer({ min: 0, max: shapes.length - 1 }),
        fc.integer({ min: 1, max: 2 ** 31 - 1 }),
        fc.constantFrom(1, 2, 4),
        fc.array(fc.record({ at: fc.double({ min: 0, max: 1, noNaN: true }), steps: fc.integer({ min: -2, max: 2 }) }), { maxLength: 6 }),
        fc.option(fc.double({ min: 0, max: 1, noNaN: true }), { nil: undefined }),
        (shapeIndex, seed, order, picks, remainderPick) => {
          const shape = shapes[shapeIndex];
          const surface = prepareSurface(shape.make(seed), { boundary: shape.boundary });
          const nV = surface.topology.vertexCount;
          const seen = new Set<number>();
          const singularities = picks
            .map((p) => ({ vertex: Math.min(nV - 1, Math.floor(p.at * nV)), index: p.steps / order }))
            .filter((s) => s.index !== 0 && !seen.has(s.vertex) && (seen.add(s.vertex), true));
          const remainderAt = remainderPick === undefined ? undefined : Math.min(nV - 1, Math.floor(remainderPick * nV));
          try {
            const solved = solveField(surface, { order, singularities, remainderAt });
            for (let f = 0; f < surface.topology.faceCount; f++) {
              const d = solved.field.faceDirection;
              expect(Math.hypot(d[3 * f], d[3 * f + 1], d[3 * f + 2])).toBeCloseTo(1, 9);
            }
            for (let v = 0; v < nV; v++) {
              if (!solved.connection.constrainedVertex[v]) continue;
              expect(Math.abs(solved.measuredIndex[v] - solved.connection.requestedIndex[v])).toBeLessThan(1e-6);
            }
          } catch (error) {
            expect(error).toBeInstanceOf(FieldError);
            expect((error as FieldError).message).toMatch(/\w{4,}/);
          }
        },
      ),
      { numRuns: 60, seed: 20261202 },
    );
  });
});
