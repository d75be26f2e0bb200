import { BufferAttribute, BufferGeometry } from 'three';
import { MeshBVH } from 'three-mesh-bvh';
import type { Topology, TriangleMesh } from '../../field';

/**
 * The skin as a spatial index: the closest skin point to any point in space, and which side of
 * the skin that point is on. Built on three-mesh-bvh's bounding volume hierarchy; the triangle
 * tests run on the mesh's own typed arrays.
 */
export interface Skin {
  /**
   * Finds the skin point closest to (x, y, z) within `maxDistance`, and writes into `out`:
   * [0..2] the closest point, [3..5] the outward pseudo-normal there, [6] the signed distance
   * (negative under the skin), [7] the face. Returns false (and leaves `out` alone) when no skin
   * lies within `maxDistance`.
   *
   * Guarantees: the sign is that of the angle-weighted pseudo-normal of the closest feature (face,
   * edge or vertex), which is exact for a closed, consistently oriented surface: negative exactly
   * for points inside it. For an open surface it says which side of the nearest sheet the point is on.
   * `hintFace`, a face likely to be near, only speeds the search up; the answer is the same.
   */
  closest(x: number, y: number, z: number, maxDistance: number, out: Float64Array, hintFace?: number): boolean;
  /**
   * The hierarchy as three-mesh-bvh serializes it (version 1, indirect), built on the mesh's
   * positions in single precision and its triangles: `MeshBVH.deserialize` gives it to a three
   * geometry of the same arrays (the editor's page picks with it instead of building its own).
   * Read only: the skin's queries walk these buffers.
   */
  readonly hierarchy: { readonly roots: readonly ArrayBuffer[]; readonly indirectBuffer: Uint32Array | Uint16Array };
}

/** out layout of `Skin.closest`. */
export const SKIN_QUERY_SIZE = 8;

/**
 * Builds the spatial index of a mesh.
 *
 * Guarantees: the mesh's arrays are not modified (the hierarchy is built in indirect mode).
 */
export function buildSkin(mesh: TriangleMesh, topology: Topology): Skin {
  const p = mesh.positions;
  const tri = mesh.triangles;
  const nF = tri.length / 3;
  const nV = p.length / 3;
  const geometry = new BufferGeometry();
  geometry.setAttribute('position', new BufferAttribute(Float32Array.from(p), 3));
  geometry.setIndex(new BufferAttribute(Uint32Array.from(tri), 1));
  const bvh = new MeshBVH(geometry, { indirect: true });

  const { faceNormal, edgeNormal, vertexNormal } = pseudoNormals(p, tri, topology.twin, nV, nF);

  let qx = 0, qy = 0, qz = 0;
  let bestSq = Infinity;
  let bestFace = -1;
  let bestFeature = 0;
  let cx = 0, cy = 0, cz = 0;

  // Ericson's closest point on a triangle (Real-Time Collision Detection §5.1.5), also naming the
  // feature it lies on: 0 face, 1..3 edge k−1 (from corner k−1 to corner k), 4..6 corner k−4.
  const testTriangle = (f: number) => {
    const ia = 3 * tri[3 * f], ib = 3 * tri[3 * f + 1], ic = 3 * tri[3 * f + 2];
    const ax = p[ia], ay = p[ia + 1], az = p[ia + 2];
    const abx = p[ib] - ax, aby = p[ib + 1] - ay, abz = p[ib + 2] - az;
    const acx = p[ic] - ax, acy = p[ic + 1] - ay, acz = p[ic + 2] - az;
    const apx = qx - ax, apy = qy - ay, apz = qz - az;
    const d1 = abx * apx + aby * apy + abz * apz;
    const d2 = acx * apx + acy * apy + acz * apz;
    let u = 0, v = 0, feature = 0;
    if (d1 <= 0 && d2 <= 0) feature = 4;
    else {
      const bpx = qx - p[ib], bpy = qy - p[ib + 1], bpz = qz - p[ib + 2];
      const d3 = abx * bpx + aby * bpy + abz * bpz;
      const d4 = acx * bpx + acy * bpy + acz * bpz;
      if (d3 >= 0 && d4 <= d3) { u = 1; feature = 5; }
      else {
        const vc = d1 * d4 - d3 * d2;
        if (vc <= 0 && d1 >= 0 && d3 <= 0) { u = d1 / (d1 - d3); feature = 1; }
        else {
          const cpx = qx - p[ic], cpy = qy - p[ic + 1], cpz = qz - p[ic + 2];
          const d5 = abx * cpx + aby * cpy + abz * cpz;
          const d6 = acx * cpx + acy * cpy + acz * cpz;
          if (d6 >= 0 && d5 <= d6) { v = 1; feature = 6; }
          else {
            const vb = d5 * d2 - d1 * d6;
            if (vb <= 0 && d2 >= 0 && d6 <= 0) { v = d2 / (d2 - d6); feature = 3; }
            else {
              const va = d3 * d6 - d5 * d4;
              if (va <= 0 && d4 - d3 >= 0 && d5 - d6 >= 0) {
                const w = (d4 - d3) / (d4 - d3 + (d5 - d6));
                u = 1 - w; v = w; feature = 2;
              } else {
                const denom = 1 / (va + vb + vc);
                u = vb * denom; v = vc * denom; feature = 0;
              }
            }
          }
        }
      }
    }
    const px = ax + u * abx + v * acx, py = ay + u * aby + v * acy, pz = az + u * abz + v * acz;
    const dSq = (qx - px) ** 2 + (qy - py) ** 2 + (qz - pz) ** 2;
    if (dSq < bestSq) {
      bestSq = dSq; bestFace = f; bestFeature = feature;
      cx = px; cy = py; cz = pz;
    }
  };

  // The hierarchy three-mesh-bvh built, walked directly on its packed node buffer (the layout of
  // its serialization version 1: per node six float32 bounds, then either a leaf's triangle range
  // or the right child's relative offset); a query then allocates nothing and makes no calls back.
  const serialized = MeshBVH.serialize(bvh, { cloneBuffers: false });
  const version = (serialized as { version?: number }).version;
  if (version !== 1 || serialized.roots.length !== 1 || !serialized.indirectBuffer) {
    throw new Error(`three-mesh-bvh changed its node layout (serialization version ${version}); lib/groom/place/skin.ts must follow it.`);
  }
  const nodes = serialized.roots[0];
  const bounds = new Float32Array(nodes);
  const words = new Uint32Array(nodes);
  const halves = new Uint16Array(nodes);
  const order = serialized.indirectBuffer;
  const stack = new Int32Array(256);
  const boxDistanceSq = (n: number) => {
    const dx = Math.max(bounds[n] - qx, 0, qx - bounds[n + 3]);
    const dy = Math.max(bounds[n + 1] - qy, 0, qy - bounds[n + 4]);
    const dz = Math.max(bounds[n + 2] - qz, 0, qz - bounds[n + 5]);
    return dx * dx + dy * dy + dz * dz;
  };
  const search = () => {
    let top = 0;
    stack[top++] = 0;
    while (top > 0) {
      const n = stack[--top];
      if (boxDistanceSq(n) >= bestSq) continue;
      if (halves[2 * n + 15] === 0xffff) {
        const offset = words[n + 6], end = offset + halves[2 * n + 14];
        for (let i = offset; i < end; i++) testTriangle(order[i]);
        continue;
      }
      const left = n + 8, right = n + 8 * words[n + 6];
      const dl = boxDistanceSq(left), dr = boxDistanceSq(right);
      // Nearer child on top of the stack, so it is searched first and shrinks the radius sooner.
      if (dl <= dr) {
        if (dr < bestSq) stack[top++] = right;
        if (dl < bestSq) stack[top++] = left;
      } else {
        if (dl < bestSq) stack[top++] = left;
        if (dr < bestSq) stack[top++] = right;
      }
    }
  };

  return {
    hierarchy: { roots: serialized.roots, indirectBuffer: order },
    closest(x, y, z, maxDistance, out, hintFace) {
      qx = x; qy = y; qz = z;
      bestSq = maxDistance * maxDistance;
      bestFace = -1;
      if (hintFace !== undefined && hintFace >= 0 && hintFace < nF) testTriangle(hintFace);
      search();
      if (bestFace < 0) return false;
      let nx: number, ny: number, nz: number;
      if (bestFeature === 0) {
        nx = faceNormal[3 * bestFace]; ny = faceNormal[3 * bestFace + 1]; nz = faceNormal[3 * bestFace + 2];
      } else if (bestFeature <= 3) {
        const h = 3 * bestFace + bestFeature - 1;
        nx = edgeNormal[3 * h]; ny = edgeNormal[3 * h + 1]; nz = edgeNormal[3 * h + 2];
      } else {
        const v = tri[3 * bestFace + bestFeature - 4];
        nx = vertexNormal[3 * v]; ny = vertexNormal[3 * v + 1]; nz = vertexNormal[3 * v + 2];
      }
      const side = (x - cx) * nx + (y - cy) * ny + (z - cz) * nz;
      out[0] = cx; out[1] = cy; out[2] = cz;
      out[3] = nx; out[4] = ny; out[5] = nz;
      out[6] = side < 0 ? -Math.sqrt(bestSq) : Math.sqrt(bestSq);
      out[7] = bestFace;
      return true;
    },
  };
}

/**
 * Angle-weighted pseudo-normals (Bærentzen & Aanæs, "Signed distance computation using the angle
 * weighted pseudonormal", IEEE TVCG 11(3), 2005): per face, per halfedge (the edge's two faces
 * summed; the face's own normal on a boundary edge) and per vertex (faces weighted by their
 * corner angle there). With them the sign of (q − closest) · normal tells inside from outside.
 */
function pseudoNormals(p: Float64Array, tri: Uint32Array, twin: Int32Array, nV: number, nF: number) {
  const faceNormal = new Float64Array(3 * nF);
  const vertexNormal = new Float64Array(3 * nV);
  for (let f = 0; f < nF; f++) {
    const c = [3 * tri[3 * f], 3 * tri[3 * f + 1], 3 * tri[3 * f + 2]];
    const ux = p[c[1]] - p[c[0]], uy = p[c[1] + 1] - p[c[0] + 1], uz = p[c[1] + 2] - p[c[0] + 2];
    const vx = p[c[2]] - p[c[0]], vy = p[c[2] + 1] - p[c[0] + 1], vz = p[c[2] + 2] - p[c[0] + 2];
    let nx = uy * vz - uz * vy, ny = uz * vx - ux * vz, nz = ux * vy - uy * vx;
    const l = Math.hypot(nx, ny, nz) || 1;
    nx /= l; ny /= l; nz /= l;
    faceNormal[3 * f] = nx; faceNormal[3 * f + 1] = ny; faceNormal[3 * f + 2] = nz;
    for (let k = 0; k < 3; k++) {
      const a = c[k], b = c[(k + 1) % 3], d = c[(k + 2) % 3];
      const e1x = p[b] - p[a], e1y = p[b + 1] - p[a + 1], e1z = p[b + 2] - p[a + 2];
      const e2x = p[d] - p[a], e2y = p[d + 1] - p[a + 1], e2z = p[d + 2] - p[a + 2];
      const cross = Math.hypot(e1y * e2z - e1z * e2y, e1z * e2x - e1x * e2z, e1x * e2y - e1y * e2x);
      const angle = Math.atan2(cross, e1x * e2x + e1y * e2y + e1z * e2z);
      vertexNormal[a] += angle * nx; vertexNormal[a + 1] += angle * ny; vertexNormal[a + 2] += angle * nz;
    }
  }
  const edgeNormal = new Float64Array(9 * nF);
  for (let h = 0; h < 3 * nF; h++) {
    const f = (h / 3) | 0;
    const g = twin[h] === -1 ? f : (twin[h] / 3) | 0;
    for (let i = 0; i < 3; i++) edgeNormal[3 * h + i] = faceNormal[3 * f + i] + faceNormal[3 * g + i];
  }
  return { faceNormal, edgeNormal, vertexNormal };
}
