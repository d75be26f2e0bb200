/**
 * Cutting a piece of a graph whose vertices have places in space by the plane through its median
 * across its longest extent: the candidate separator nested dissection sets beside a level of a
 * breadth-first search, because on a surface with a handle the plane finds the short way round
 * (two rings across a torus's tube) where every search level is a long loop round its start.
 */
import type { AdjacencyGraph } from './graph';
import { SEPARATOR, SIDE_A, SIDE_B } from './separator-refine';

/**
 * Splits the piece verts[lo .. lo+size) (its vertices have owner[v] === id) by the plane
 * x_axis = median, the axis being the one of the longest extent of the piece's bounding box:
 * `where` gets SIDE_A below the median, SIDE_B at or above it, except that SIDE_B vertices with a
 * neighbour on side A become SEPARATOR and are listed in `separator`; `sides` gets the two
 * sides' sizes. Returns the separator's size.
 *
 * Guarantees: no edge within the piece joins side A to side B; deterministic. Side A is empty
 * when more than half the points coincide on the axis (or are not finite): callers check.
 */
export function planeCut(
  graph: AdjacencyGraph,
  points: Float64Array,
  verts: Int32Array,
  lo: number,
  size: number,
  owner: Int32Array,
  id: number,
  where: Uint8Array,
  separator: Int32Array,
  sides: Int32Array,
): number {
  const { offsets, adjacency } = graph;
  const p = points;
  const low = [Infinity, Infinity, Infinity];
  const high = [-Infinity, -Infinity, -Infinity];
  for (let t = lo; t < lo + size; t++) {
    const v = verts[t];
    for (let k = 0; k < 3; k++) {
      const x = p[3 * v + k];
      if (x < low[k]) low[k] = x;
      if (x > high[k]) high[k] = x;
    }
  }
  let axis = 0;
  for (let k = 1; k < 3; k++) if (high[k] - low[k] > high[axis] - low[axis]) axis = k;
  const keys = new Float64Array(size);
  for (let t = 0; t < size; t++) keys[t] = p[3 * verts[lo + t] + axis];
  const median = selectNth(keys, size >> 1);
  sides[0] = 0;
  sides[1] = 0;
  for (let t = lo; t < lo + size; t++) {
    const v = verts[t];
    where[v] = p[3 * v + axis] < median ? SIDE_A : SIDE_B;
  }
  let count = 0;
  for (let t = lo; t < lo + size; t++) {
    const v = verts[t];
    if (where[v] === SIDE_A) {
      sides[0]++;
      continue;
    }
    let touchesA = false;
    for (let q = offsets[v]; q < offsets[v + 1]; q++) {
      const u = adjacency[q];
      if (owner[u] === id && where[u] === SIDE_A) {
        touchesA = true;
        break;
      }
    }
    if (touchesA) {
      where[v] = SEPARATOR;
      separator[count++] = v;
    } else {
      sides[1]++;
    }
  }
  return count;
}

/**
 * The value that would stand at index `nth` if `a` were sorted (a is reordered): Hoare's
 * selection with a median-of-three pivot, linear time on average, where sorting a million
 * keys per cut cost a third of the ordering.
 */
function selectNth(a: Float64Array, nth: number): number {
  let lo = 0;
  let hi = a.length - 1;
  while (hi > lo) {
    const mid = (lo + hi) >> 1;
    const x = a[lo], y = a[mid], z = a[hi];
    const pivot = x < y ? (y < z ? y : x < z ? z : x) : x < z ? x : y < z ? z : y;
    let i = lo;
    let j = hi;
    while (i <= j) {
      while (a[i] < pivot) i++;
      while (a[j] > pivot) j--;
      if (i <= j) {
        const t = a[i];
        a[i] = a[j];
        a[j] = t;
        i++;
        j--;
      }
    }
    if (nth <= j) hi = j;
    else if (nth >= i) lo = i;
    else return a[nth];
  }
  return a[nth];
}
