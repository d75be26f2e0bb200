import { describe, expect, it } from 'vitest';
import { eulerCharacteristic, buildTopology, readSurface } from '@/lib/field';
import { DEMO_GROOMS, DEMO_STUDIO } from '@/lib/groom/demo/grooms';
import { surfaceToObj } from '@/lib/groom/demo/obj';
import { solveGroomField } from '@/lib/groom/place/request';
import { parseGroomSpec } from '@/lib/groom/spec/spec';
import { prepareGroomSurface } from '@/lib/groom/place/surface';
import { groomOn } from './support';

describe(`demo grooms of ${DEMO_STUDIO}`, () => {
  for (const demo of DEMO_GROOMS) {
    it(`${demo.character}: the spec solves with exactly its singularities and grows density × area guides`, () => {
      const mesh = demo.surface();
      const spec = parseGroomSpec(demo.spec);
      const placed = spec.field.singularities.reduce((s, x) => s + x.index, 0) + spec.field.partings.length + spec.field.crests.length;
      // Poincaré–Hopf: the indices (and open curves, +1 each) sum to the Euler characteristic.
      expect(placed).toBe(eulerCharacteristic(buildTopology(mesh)));
      const result = groomOn(mesh, demo.spec);
      const requested = result.solved.connection.requestedIndex;
      result.solved.measuredIndex.forEach((x, v) => {
        if (result.solved.connection.constrainedVertex[v]) expect(Math.abs(x - requested[v])).toBeLessThan(1e-6);
      });
      expect(result.guides.count).toBe(Math.round(spec.guides.density! * result.areaSquareCm));
      expect(result.guides.count).toBeGreaterThan(500);
    });
  }

  it('writes each surface as OBJ that the surface reader reads back with its groups, and the spec still solves on it', () => {
    for (const demo of DEMO_GROOMS) {
      const mesh = demo.surface();
      const text = surfaceToObj(mesh, `${DEMO_STUDIO} — ${demo.character}`);
      const read = readSurface(new TextEncoder().encode(text), `${demo.id}.obj`);
      expect(read.mesh.triangles.length).toBe(mesh.triangles.length);
      expect([...read.mesh.groups!.names].sort()).toEqual([...mesh.groups!.names].sort());
      const spec = parseGroomSpec(demo.spec);
      expect(() => solveGroomField(spec, prepareGroomSurface(read.mesh))).not.toThrow();
    }
  });
});
