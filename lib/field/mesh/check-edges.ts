/**
 * The edge and vertex half of checking a surface: which edges are non-manifold or joined with
 * opposite orientations, which vertices pinch pieces together, and how many pieces there are —
 * counted in full from the triangle list, where building the topology would stop at the first.
 */
import { EXAMPLE_LIMIT } from './read/soup';
import { nextHalfedge } from './topology';

/** A list that counts everything pushed but keeps only the first few, for examples. */
export class Examples {
  readonly items: number[] = [];
  count = 0;

  add(...values: number[]): void {
    if (this.items.length + values.length <= EXAMPLE_LIMIT * values.length) this.items.push(...values);
    this.count++;
  }
}


/** Disjoint sets over 0 … n − 1, with path halving and union by size. */
class DisjointSets {
  private readonly parent: Int32Array;
  private readonly size: Int32Array;

  constructor(n: number) {
    this.parent = new Int32Array(n);
    for (let i = 0; i < n; i++) this.parent[i] = i;
    this.size = new Int32Array(n).fill(1);
  }

  find(x: number): number {
    const p = this.parent;
    while (p[x] !== x) {
      p[x] = p[p[x]];
      x = p[x];
    }
    return x;
  }

  union(a: number, b: number): void {
    let ra = this.find(a);
    let rb = this.find(b);
    if (ra === rb) return;
    if (this.size[ra] < this.size[rb]) [ra, rb] = [rb, ra];
    this.parent[rb] = ra;
    this.size[ra] += this.size[rb];
  }
}

export interface EdgeAnalysis {
  readonly edgeCount: number;
  readonly nonManifold: Examples;
  readonly misoriented: Examples;
  readonly pinched: Examples;
  readonly componentCount: number;
  /** The lowest-numbered face of each component, in order. */
  readonly componentStarts: number[];
}

/**
 * Groups the sides of the valid faces into edges by their two end vertices and judges each
 * edge and vertex. Done here rather than through `buildTopology`, which stops at the first kind
 * of problem, so that every problem can be counted and shown.
 *
 * Halfedges are sorted by (lower end, higher end) with two counting sorts, linear in the size of
 * the mesh whatever the vertex degrees.
 */
export function analyseEdges(tri: Uint32Array, nV: number, valid: Uint8Array): EdgeAnalysis {
  const nF = valid.length;
  const lo = (h: number) => Math.min(tri[h], tri[nextHalfedge(h)]);
  const hi = (h: number) => Math.max(tri[h], tri[nextHalfedge(h)]);
  let nH = 0;
  for (let f = 0; f < nF; f++) nH += 3 * valid[f];
  const byHigh = countingSort(nV, nH, (emit) => {
    for (let f = 0; f < nF; f++) if (valid[f]) for (let k = 0; k < 3; k++) emit(3 * f + k, hi(3 * f + k));
  });
  const sorted = countingSort(nV, nH, (emit) => {
    for (const h of byHigh) emit(h, lo(h));
  });

  const faces = new DisjointSets(nF);
  const fans = new DisjointSets(3 * nF);
  // The corner of the face of halfedge h at vertex v, as a halfedge index: h when v is h's tail.
  const cornerAt = (h: number, v: number) => (tri[h] === v ? h : nextHalfedge(h));
  const nonManifold = new Examples();
  const misoriented = new Examples();
  let edgeCount = 0;
  for (let i = 0; i < nH; ) {
    const first = sorted[i];
    const a = lo(first);
    const b = hi(first);
    let j = i;
    let forward = 0;
    while (j < nH && lo(sorted[j]) === a && hi(sorted[j]) === b) {
      const h = sorted[j];
      if (tri[h] === a) forward++;
      if (j > i) {
        faces.union((first / 3) | 0, (h / 3) | 0);
        fans.union(cornerAt(first, a), cornerAt(h, a));
        fans.union(cornerAt(first, b), cornerAt(h, b));
      }
      j++;
    }
    const n = j - i;
    if (n > 2) nonManifold.add(a, b);
    else if (n === 2 && forward !== 1) misoriented.add(a, b);
    edgeCount++;
    i = j;
  }

  // A vertex whose corners fall into more than one fan joins pieces that share only the vertex.
  const fanOf = new Int32Array(nV).fill(-1);
  const pinchedVertex = new Uint8Array(nV);
  const pinched = new Examples();
  for (let f = 0; f < nF; f++) {
    if (!valid[f]) continue;
    for (let k = 0; k < 3; k++) {
      const h = 3 * f + k;
      const v = tri[h];
      const fan = fans.find(h);
      if (fanOf[v] === -1) fanOf[v] = fan;
      else if (fanOf[v] !== fan && !pinchedVertex[v]) {
        pinchedVertex[v] = 1;
        pinched.add(v);
      }
    }
  }
  pinched.items.sort((x, y) => x - y);

  const componentStarts: number[] = [];
  const seen = new Uint8Array(nF);
  for (let f = 0; f < nF; f++) {
    if (!valid[f]) continue;
    const root = faces.find(f);
    if (!seen[root]) {
      seen[root] = 1;
      componentStarts.push(f);
    }
  }
  return { edgeCount, nonManifold, misoriented, pinched, componentCount: componentStarts.length, componentStarts };
}

/** Stable counting sort of `count` items by integer keys in [0, keys), items given through `emit`. */
function countingSort(keys: number, count: number, each: (emit: (item: number, key: number) => void) => void): Uint32Array {
  const start = new Uint32Array(keys + 1);
  each((_item, key) => start[key + 1]++);
  for (let k = 0; k < keys; k++) start[k + 1] += start[k];
  const out = new Uint32Array(count);
  each((item, key) => {
    out[start[key]++] = item;
  });
  return out;
}
