import { BufferAttribute, BufferGeometry, Vector3 } from 'three';
import { MeshBVH } from 'three-mesh-bvh';
import { describe, expect, it } from 'vitest';
import { buildTopology } from '@/lib/field';
import { genusTwoSurface, torus } from '@/tests/fixtures/shapes';
import { buildSkin, SKIN_QUERY_SIZE } from '@/lib/groom/place/skin';
import { randomStream } from '@/lib/groom/grow/random';

describe('skin index', () => {
  it('finds the same closest distance as three-mesh-bvh’s own closest-point query', () => {
    // lib/groom walks three-mesh-bvh's packed hierarchy itself; this guards that walk against the
    // library's own query (and against a change of its node layout).
    const mesh = genusTwoSurface({ resolution: 3 });
    const skin = buildSkin(mesh, buildTopology(mesh));
    const geometry = new BufferGeometry();
    geometry.setAttribute('position', new BufferAttribute(Float32Array.from(mesh.positions), 3));
    geometry.setIndex(new BufferAttribute(Uint32Array.from(mesh.triangles), 1));
    const reference = new MeshBVH(geometry);
    const random = randomStream(4);
    const out = new Float64Array(SKIN_QUERY_SIZE);
    for (let i = 0; i < 500; i++) {
      const q = new Vector3(6 * random() - 3, 4 * random() - 2, 2 * random() - 1);
      const expected = reference.closestPointToPoint(q)!;
      expect(skin.closest(q.x, q.y, q.z, 10, out)).toBe(true);
      // three-mesh-bvh works in float32, lib/groom in float64.
      expect(Math.abs(out[6])).toBeCloseTo(expected.distance, 5);
    }
  });

  it('tells inside from outside by the pseudo-normal, near faces, edges and corners alike', () => {
    const mesh = torus(2, 0.7, 24, 12);
    const skin = buildSkin(mesh, buildTopology(mesh));
    const out = new Float64Array(SKIN_QUERY_SIZE);
    const random = randomStream(9);
    for (let i = 0; i < 2000; i++) {
      const x = 6 * random() - 3, y = 6 * random() - 3, z = 2 * random() - 1;
      // Distance to the smooth torus's core circle; the mesh is inscribed, so keep a margin.
      const tube = Math.hypot(Math.hypot(x, y) - 2, z);
      if (Math.abs(tube - 0.7) < 0.08) continue;
      expect(skin.closest(x, y, z, 10, out)).toBe(true);
      expect(out[6] < 0).toBe(tube < 0.7);
    }
  });
});
