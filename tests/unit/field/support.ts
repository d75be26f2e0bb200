import type { TriangleMesh } from '@/lib/field/mesh/mesh';
import type { Topology } from '@/lib/field/mesh/topology';
import { nextAroundVertex, nextHalfedge } from '@/lib/field/mesh/topology';

/** `count` vertices spread over the surface by farthest-point sampling (Euclidean), starting at `first`. */
export function spreadVertices(mesh: TriangleMesh, count: number, first = 0): number[] {
  const p = mesh.positions;
  const n = p.length / 3;
  const distance = new Float64Array(n).fill(Infinity);
  const chosen: number[] = [];
  let next = first;
  for (let k = 0; k < count; k++) {
    chosen.push(next);
    let best = -1;
    for (let v = 0; v < n; v++) {
      const d = Math.hypot(p[3 * v] - p[3 * next], p[3 * v + 1] - p[3 * next + 1], p[3 * v + 2] - p[3 * next + 2]);
      if (d < distance[v]) distance[v] = d;
      if (best === -1 || distance[v] > distance[best]) best = v;
    }
    next = best;
  }
  return chosen;
}

/** Neighbours of a vertex in counter-clockwise order. */
export function neighbours(topology: Topology, v: number): number[] {
  const out: number[] = [];
  const start = topology.vertexHalfedge[v];
  let h = start;
  do {
    out.push(topology.triangles[nextHalfedge(h)]);
    h = nextAroundVertex(topology, h);
  } while (h !== -1 && h !== start);
  return out;
}

/**
 * A path of mesh vertices from `from` heading along `direction` for `steps` edges, each step to the
 * neighbour best aligned with the direction that keeps the path simple and away from earlier
 * vertices' neighbourhoods.
 */
export function edgePath(mesh: TriangleMesh, topology: Topology, from: number, direction: readonly number[], steps: number): number[] {
  const p = mesh.positions;
  const path = [from];
  const near = new Set<number>([from]);
  let v = from;
  for (let i = 0; i < steps; i++) {
    let best = -1;
    let bestDot = -Infinity;
    for (const w of neighbours(topology, v)) {
      if (near.has(w) || topology.isBoundaryVertex[w]) continue;
      const d = [p[3 * w] - p[3 * v], p[3 * w + 1] - p[3 * v + 1], p[3 * w + 2] - p[3 * v + 2]];
      const dot = (d[0] * direction[0] + d[1] * direction[1] + d[2] * direction[2]) / Math.hypot(d[0], d[1], d[2]);
      if (dot > bestDot) {
        bestDot = dot;
        best = w;
      }
    }
    if (best === -1) break;
    for (const w of neighbours(topology, v)) near.add(w);
    path.push(best);
    v = best;
  }
  return path;
}
