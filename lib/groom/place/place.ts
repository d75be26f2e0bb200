import { nextAroundVertex, nextHalfedge, prevHalfedge, type Topology } from '../../field';
import { GroomError } from '../errors';
import { MaxHeap } from './heap';
import { SKIN_QUERY_SIZE } from './skin';
import type { PlaceSpec } from '../spec/spec';
import type { GroomSurface } from './surface';

/**
 * Where the spec's places land on the surface: points snapped to vertices or to the surface,
 * file vertex numbers mapped through the reader's welding, curves joined along mesh edges.
 */

/** Points farther than this fraction of the bounding box diagonal from the surface are taken for a mistake (wrong units, wrong surface). */
const OFF_SURFACE_FRACTION = 0.1;

function checkNearSurface(surface: GroomSurface, point: readonly number[], path: string): Float64Array {
  const out = new Float64Array(SKIN_QUERY_SIZE);
  const limit = OFF_SURFACE_FRACTION * surface.diagonal;
  for (const c of point) if (!Number.isFinite(c)) throw new GroomError('point-off-surface', `${path}: the point is not finite.`, path);
  if (!surface.skin.closest(point[0], point[1], point[2], limit, out)) {
    throw new GroomError(
      'point-off-surface',
      `${path}: the point (${point.join(', ')}) is more than ${round(limit)} units from the surface; check the units and that the spec belongs to this surface.`,
      path,
    );
  }
  return out;
}

function round(x: number): number {
  return Math.round(x * 1000) / 1000;
}

/**
 * The welded vertex a spec place names: `vertex` as numbered in the surface file (through
 * `fileVertexToVertex` when the surface came from a file), or `point` snapped to the nearest vertex.
 *
 * Guarantees: a vertex some face uses, or a GroomError naming `path`.
 */
export function vertexOfPlace(surface: GroomSurface, place: PlaceSpec, path: string): number {
  const topology = surface.field.topology;
  let v: number;
  if (place.vertex !== undefined) {
    const map = surface.mesh.fileVertexToVertex;
    const count = map ? map.length : topology.vertexCount;
    if (place.vertex >= count) throw new GroomError('vertex-out-of-range', `${path}.vertex: the surface file has vertices 0 to ${count - 1}, not ${place.vertex}.`, `${path}.vertex`);
    v = map ? map[place.vertex] : place.vertex;
  } else {
    const point = place.point!;
    checkNearSurface(surface, point, `${path}.point`);
    v = surface.nearestVertex().find(point[0], point[1], point[2]).vertex;
  }
  if (topology.vertexHalfedge[v] === -1) throw new GroomError('unused-vertex', `${path}: vertex ${v} belongs to no face of the surface.`, path);
  return v;
}

/** The surface point nearest `point`, with its face. Guarantees: a GroomError naming `path` for a point far off the surface. */
export function surfacePointOf(surface: GroomSurface, point: readonly number[], path: string): { face: number; position: [number, number, number] } {
  const out = checkNearSurface(surface, point, path);
  return { face: out[7], position: [out[0], out[1], out[2]] };
}

/** Neighbours of a vertex (both ends of the fan at a boundary vertex). */
function forEachNeighbour(topology: Topology, v: number, visit: (w: number) => void): void {
  const start = topology.vertexHalfedge[v];
  if (start === -1) return;
  let h = start;
  let last = h;
  do {
    visit(topology.triangles[nextHalfedge(h)]);
    last = h;
    h = nextAroundVertex(topology, h);
  } while (h !== -1 && h !== start);
  if (h === -1) visit(topology.triangles[prevHalfedge(last)]);
}

/**
 * The shortest chain of mesh edges from `from` to `to` (Dijkstra on edge lengths) that keeps off
 * the boundary between its ends, as the vertices it passes, both ends included.
 *
 * Guarantees: consecutive vertices share an edge; a GroomError naming `path` when no such chain exists.
 */
export function edgePath(surface: GroomSurface, from: number, to: number, path: string): number[] {
  if (from === to) return [from];
  const topology = surface.field.topology;
  const p = surface.mesh.positions;
  const n = topology.vertexCount;
  const distance = new Float64Array(n).fill(Infinity);
  const previous = new Int32Array(n).fill(-1);
  // Nearest first: the max-heap is keyed by negated distance.
  const heap = new MaxHeap(64);
  distance[from] = 0;
  heap.push(from, 0);
  while (heap.size > 0) {
    const v = heap.pop();
    if (v === to) break;
    const dv = distance[v];
    forEachNeighbour(topology, v, (w) => {
      if (w !== to && topology.isBoundaryVertex[w]) return;
      const d = dv + Math.hypot(p[3 * w] - p[3 * v], p[3 * w + 1] - p[3 * v + 1], p[3 * w + 2] - p[3 * v + 2]);
      if (d < distance[w]) {
        distance[w] = d;
        previous[w] = v;
        heap.push(w, -d);
      }
    });
  }
  if (previous[to] === -1) throw new GroomError('curve-unreachable', `${path}: vertices ${from} and ${to} are not joined by any path on the surface.`, path);
  const chain = [to];
  while (chain[chain.length - 1] !== from) chain.push(previous[chain[chain.length - 1]]);
  return chain.reverse();
}
