import { BufferAttribute, BufferGeometry, DoubleSide, Ray, Vector3 } from 'three';
import { MeshBVH } from 'three-mesh-bvh';
import { faceNormals, type TriangleMesh } from '../../field';

/**
 * Finding the surface along a normal: from a point laid over from another surface, look both ways
 * along its old normal for the nearest face that faces the same way, no farther than a bound. The
 * side check is what keeps a place from jumping across a thin gap (lips, an ear's two sheets):
 * the sheet on the far side of the gap faces the other way.
 */
export interface NormalProbe {
  /**
   * The nearest hit within `maxDistance` of `point` along ±`normal` on a face whose normal points
   * within 90° of `normal`, else null. `normal` need not be unit length.
   */
  along(point: readonly number[], normal: readonly number[], maxDistance: number): { face: number; point: [number, number, number]; distance: number } | null;
}

/** Builds the probe's hierarchy (three-mesh-bvh, indirect, so the mesh's arrays are untouched). */
export function buildNormalProbe(mesh: TriangleMesh): NormalProbe {
  const geometry = new BufferGeometry();
  geometry.setAttribute('position', new BufferAttribute(Float32Array.from(mesh.positions), 3));
  geometry.setIndex(new BufferAttribute(Uint32Array.from(mesh.triangles), 1));
  const bvh = new MeshBVH(geometry, { indirect: true });
  const normals = faceNormals(mesh);
  const ray = new Ray();
  return {
    along(point, normal, maxDistance) {
      const length = Math.hypot(normal[0], normal[1], normal[2]);
      if (!(length > 0) || !(maxDistance > 0)) return null;
      const n = [normal[0] / length, normal[1] / length, normal[2] / length];
      let best: { face: number; point: [number, number, number]; distance: number } | null = null;
      for (const sign of [1, -1]) {
        ray.origin.set(point[0], point[1], point[2]);
        ray.direction.set(sign * n[0], sign * n[1], sign * n[2]);
        for (const hit of bvh.raycast(ray, DoubleSide, 0, maxDistance)) {
          const f = hit.faceIndex ?? -1;
          if (f < 0) continue;
          const facing = normals[3 * f] * n[0] + normals[3 * f + 1] * n[1] + normals[3 * f + 2] * n[2];
          if (facing <= 0) continue;
          if (!best || hit.distance < best.distance) best = { face: f, point: toTuple(hit.point), distance: hit.distance };
        }
      }
      return best;
    },
  };
}

function toTuple(v: Vector3): [number, number, number] {
  return [v.x, v.y, v.z];
}
