/**
 * Distances along the surface from one vertex, by fast marching on the triangles (Kimmel and
 * Sethian 1998, "Computing geodesic paths on manifolds"): Dijkstra's order of acceptance, but each
 * vertex is reached across a triangle whose other two corners are known, as a straight front
 * unfolded into the triangle's plane, not only along edges. Edge paths alone overestimate a
 * straight distance by a factor set by how the edges are laid out (up to 8 % on a regular grid, and
 * no better as it is refined), which is what would tie a pin's reach to the mesh.
 */
import type { TriangleMesh } from '../../field';
import { MaxHeap } from './heap';

/** The faces at each vertex, packed: faces of vertex v are `faces[start[v] … start[v + 1])`. */
export interface VertexFaces {
  readonly start: Uint32Array;
  readonly faces: Uint32Array;
}

/** The faces around every vertex (any order). */
export function vertexFaces(mesh: TriangleMesh): VertexFaces {
  const nV = mesh.positions.length / 3;
  const tri = mesh.triangles;
  const start = new Uint32Array(nV + 1);
  for (let h = 0; h < tri.length; h++) start[tri[h] + 1]++;
  for (let v = 0; v < nV; v++) start[v + 1] += start[v];
  const fill = start.slice(0, nV);
  const faces = new Uint32Array(tri.length);
  for (let h = 0; h < tri.length; h++) faces[fill[tri[h]]++] = (h / 3) | 0;
  return { start, faces };
}

/**
 * The distance at c from a planar front that is at distance da at a and db at b, or Infinity when
 * the front's source does not see c through the edge ab (then the edges decide).
 */
export function acrossTriangle(p: Float64Array, a: number, b: number, c: number, da: number, db: number): number {
  const abx = p[3 * b] - p[3 * a], aby = p[3 * b + 1] - p[3 * a + 1], abz = p[3 * b + 2] - p[3 * a + 2];
  const acx = p[3 * c] - p[3 * a], acy = p[3 * c + 1] - p[3 * a + 1], acz = p[3 * c + 2] - p[3 * a + 2];
  const ab = Math.sqrt(abx * abx + aby * aby + abz * abz);
  if (ab === 0) return Infinity;
  // The triangle unfolded into a plane: a at the origin, b on the x axis, c above it.
  const cx = (acx * abx + acy * aby + acz * abz) / ab;
  const cy = Math.sqrt(Math.max(0, acx * acx + acy * acy + acz * acz - cx * cx));
  // The virtual source: at da from a and db from b, below the x axis (on the far side from c).
  const sx = (da * da - db * db + ab * ab) / (2 * ab);
  const sy2 = da * da - sx * sx;
  if (sy2 < 0 || cy === 0) return Infinity;
  const sy = -Math.sqrt(sy2);
  // The straight line from the source to c must cross the edge ab between its ends.
  const crossX = sx + ((cx - sx) * -sy) / (cy - sy);
  if (crossX < 0 || crossX > ab) return Infinity;
  return Math.hypot(cx - sx, cy - sy);
}

/**
 * Distance along the surface from `source` to every vertex.
 *
 * Guarantees: 0 at the source, Infinity on pieces of surface not joined to it, finite and
 * positive elsewhere; never more than the shortest edge path; on a flat mesh exact for every
 * vertex a straight line from the source reaches through acute triangles, and in general
 * converging to the geodesic distance as the mesh is refined (first order in the edge length).
 */
export function geodesicDistances(mesh: TriangleMesh, around: VertexFaces, source: number): Float64Array {
  const p = mesh.positions;
  const tri = mesh.triangles;
  const nV = p.length / 3;
  const dist = new Float64Array(nV).fill(Infinity);
  const done = new Uint8Array(nV);
  // A max-heap on negated distances pops the nearest first.
  const heap = new MaxHeap(64);
  dist[source] = 0;
  heap.push(source, -0);
  const edge = (u: number, v: number) => Math.hypot(p[3 * v] - p[3 * u], p[3 * v + 1] - p[3 * u + 1], p[3 * v + 2] - p[3 * u + 2]);
  while (heap.size > 0) {
    const key = -heap.topKey();
    const v = heap.pop();
    if (done[v] || key > dist[v]) continue;
    done[v] = 1;
    for (let i = around.start[v]; i < around.start[v + 1]; i++) {
      const f = around.faces[i];
      for (let k = 0; k < 3; k++) {
        const c = tri[3 * f + k];
        if (done[c]) continue;
        let d = dist[v] + edge(v, c);
        const other = tri[3 * f] + tri[3 * f + 1] + tri[3 * f + 2] - v - c;
        if (done[other]) d = Math.min(d, acrossTriangle(p, v, other, c, dist[v], dist[other]));
        if (d < dist[c]) {
          dist[c] = d;
          heap.push(c, -d);
        }
      }
    }
  }
  return dist;
}
