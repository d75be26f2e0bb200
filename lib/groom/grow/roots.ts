import { grow, MaxHeap } from '../place/heap';
import { hash32 } from './random';

/**
 * Guide roots: blue-noise points on the growth surface, by weighted sample elimination (Yuksel,
 * "Sample Elimination for Generating Poisson Disk Sample Sets", Computer Graphics Forum 34(2),
 * Eurographics 2015): scatter several times too many random candidates, then remove, one at a
 * time, the candidate most crowded by its neighbours until exactly the wanted number is left.
 *
 * Roots come in one fixed order for a surface and seed, whatever the count, so that a guide's
 * number is its identity: the k-guide set is the first k roots of that order. The order is built
 * in levels of 64, 128, 256, … roots: each level keeps the roots of the levels before it (they
 * weigh on the candidates but are never removed) and adds as many again, eliminated from fresh
 * candidates; within a level the added roots are ordered by continuing the elimination to the
 * last one (the paper's progressive sampling), so the last removed — the ones filling the
 * largest holes — come first. A denser set therefore keeps the roots of every sparser one.
 */
export interface Roots {
  readonly count: number;
  /** x, y, z of each root, on the surface. */
  readonly position: Float64Array;
  /** The face each root lies in. */
  readonly face: Uint32Array;
  /** Weights of the root on its face's three corners, in the face's corner order (3 per root). */
  readonly barycentric: Float64Array;
}

export interface RootRequest {
  readonly positions: Float64Array;
  readonly triangles: Uint32Array;
  readonly faceArea: Float64Array;
  /** How many roots. */
  readonly count: number;
  /** 1 for faces roots may grow on; all faces when absent. */
  readonly allowedFace?: Uint8Array;
  /** Relative density per vertex (≥ 0), blended across each face; uniform when absent. */
  readonly vertexDensity?: Float64Array;
  readonly seed: number;
}

/** Candidates per root added at a level; the paper finds 5 ample for a Poisson-disk quality set. */
const CANDIDATES_PER_ROOT = 5;
/** The paper's r_min parameters (its weight exponent, 8, is written out in `pairWeight`). */
const BETA = 0.65;
const GAMMA = 1.5;
/** No root's spacing is allowed to exceed this many times the mean spacing, so sparse regions do not make the search grid coarse. */
const MAX_SPACING_RATIO = 4;
/** Roots of the first level; each later level doubles the total. */
export const FIRST_LEVEL_ROOTS = 64;

/** Points of one level's elimination: the roots kept so far first, then the level's candidates. */
class PointSet {
  x: number[] = []; y: number[] = []; z: number[] = [];
  face: number[] = []; bary: number[] = []; density: number[] = [];
  get length(): number { return this.x.length; }
  push(x: number, y: number, z: number, face: number, wa: number, wb: number, wc: number, density: number): void {
    this.x.push(x); this.y.push(y); this.z.push(z); this.face.push(face); this.bary.push(wa, wb, wc); this.density.push(density);
  }
  copy(from: PointSet, i: number): void {
    this.push(from.x[i], from.y[i], from.z[i], from.face[i], from.bary[3 * i], from.bary[3 * i + 1], from.bary[3 * i + 2], from.density[i]);
  }
}

/**
 * Samples roots.
 *
 * Guarantees: exactly `count` roots (0 when the allowed faces have no area), each inside an
 * allowed face of non-zero density; spread like a Poisson-disk set at the local density; the same
 * request (same seed) gives the same roots in the same order; and for two counts a < b of the
 * same surface, mask, densities and seed, the a roots are the first a of the b roots, exactly.
 * Candidates are drawn face by face from a hash of (seed, level, face, number), so a face's
 * candidates depend on its own area and barycentric coordinates only. Cost: the levels up to the
 * first that reaches `count`, at most about twice the work of eliminating for `count` alone.
 */
export function sampleRoots(request: RootRequest): Roots {
  const { positions: p, triangles: tri, faceArea, count, allowedFace, vertexDensity } = request;
  const nF = tri.length / 3;
  const faceWeight = new Float64Array(nF);
  let total = 0;
  for (let f = 0; f < nF; f++) {
    let weight = allowedFace && !allowedFace[f] ? 0 : faceArea[f];
    if (vertexDensity && weight > 0) weight *= (vertexDensity[tri[3 * f]] + vertexDensity[tri[3 * f + 1]] + vertexDensity[tri[3 * f + 2]]) / 3;
    faceWeight[f] = weight > 0 ? weight : 0;
    total += faceWeight[f];
  }
  if (count <= 0 || !(total > 0)) return { count: 0, position: new Float64Array(0), face: new Uint32Array(0), barycentric: new Float64Array(0) };

  const seed = request.seed >>> 0;
  let kept = new PointSet();
  for (let level = 0, levelTotal = FIRST_LEVEL_ROOTS; kept.length < count; level++, levelTotal *= 2) {
    const adding = levelTotal - kept.length;
    const candidates = new PointSet();
    for (let i = 0; i < kept.length; i++) candidates.copy(kept, i);
    // Each round scatters CANDIDATES_PER_ROOT × adding candidates on average; a second round is
    // needed only when chance left fewer candidates than roots to add.
    for (let round = 0; candidates.length - kept.length < CANDIDATES_PER_ROOT * adding && (round === 0 || candidates.length - kept.length < adding); round++) {
      const perWeight = (CANDIDATES_PER_ROOT * adding) / total;
      const stream = hash32(hash32(seed, level), round);
      for (let f = 0; f < nF; f++) {
        if (faceWeight[f] === 0) continue;
        const faceStream = hash32(stream, f);
        const n = Math.floor(faceWeight[f] * perWeight + unit(faceStream, 0));
        for (let j = 0; j < n; j++) {
          const s = Math.sqrt(unit(faceStream, 2 * j + 1)), t = unit(faceStream, 2 * j + 2);
          const wa = 1 - s, wb = s * (1 - t), wc = s * t;
          const a = 3 * tri[3 * f], b = 3 * tri[3 * f + 1], c = 3 * tri[3 * f + 2];
          const density = vertexDensity ? wa * vertexDensity[tri[3 * f]] + wb * vertexDensity[tri[3 * f + 1]] + wc * vertexDensity[tri[3 * f + 2]] : 1;
          candidates.push(
            wa * p[a] + wb * p[b] + wc * p[c], wa * p[a + 1] + wb * p[b + 1] + wc * p[c + 1], wa * p[a + 2] + wb * p[b + 2] + wc * p[c + 2],
            f, wa, wb, wc, density,
          );
        }
      }
    }
    const order = eliminate(candidates, kept.length, adding, Math.sqrt(total / (2 * Math.sqrt(3) * levelTotal)));
    const next = new PointSet();
    for (let i = 0; i < kept.length; i++) next.copy(kept, i);
    for (const i of order) next.copy(candidates, i);
    kept = next;
  }

  const position = new Float64Array(3 * count);
  const face = new Uint32Array(count);
  const barycentric = new Float64Array(3 * count);
  for (let i = 0; i < count; i++) {
    position[3 * i] = kept.x[i]; position[3 * i + 1] = kept.y[i]; position[3 * i + 2] = kept.z[i];
    face[i] = kept.face[i];
    barycentric.set(kept.bary.slice(3 * i, 3 * i + 3), 3 * i);
  }
  return { count, position, face, barycentric };
}

/** A number in [0, 1) for one purpose of one hashed stream. */
const unit = (stream: number, channel: number) => hash32(stream, channel) / 4294967296;

/**
 * Eliminates the candidates after the first `fixed` points (which weigh on them but stay) down to
 * `adding`, then on to none, and returns the last `adding` removed, last removed first: the
 * level's additions in their progressive order. `meanRadius` is the spacing of the level's total.
 */
function eliminate(points: PointSet, fixed: number, adding: number, meanRadius: number): number[] {
  const m = points.length;
  const cx = Float64Array.from(points.x), cy = Float64Array.from(points.y), cz = Float64Array.from(points.z);
  const radius = new Float64Array(m);
  let largest = 0;
  for (let i = 0; i < m; i++) {
    radius[i] = Math.min(MAX_SPACING_RATIO * meanRadius, meanRadius / Math.sqrt(Math.max(points.density[i], 1e-12)));
    largest = Math.max(largest, radius[i]);
  }
  // Points are renumbered in grid-cell order, so that neighbours sit next to each other in
  // memory: with random order the neighbour visits below are mostly cache misses.
  const order = cellOrder(cx, cy, cz, 2 * largest);
  for (const a of [cx, cy, cz, radius]) a.set(Float64Array.from(order, (i) => a[i]));
  const isCandidate = Uint8Array.from(order, (i) => (i >= fixed ? 1 : 0));
  const grid = buildGrid(cx, cy, cz, 2 * largest);
  const shrink = BETA * (1 - Math.pow(Math.min(1, adding / Math.max(1, m - fixed)), GAMMA));
  // Every pair closer than twice its radius with a candidate in it, with its weight, found once
  // per candidate (compressed rows); a kept root's weight is never needed.
  const neighbourStart = new Int32Array(m + 1);
  let neighbour = new Int32Array(24 * m);
  let pairWeight = new Float32Array(24 * m);
  const weight = new Float64Array(m);
  let pairs = 0;
  for (let i = 0; i < m; i++) {
    let w = 0;
    if (isCandidate[i]) {
      grid.forNeighbour(i, (j) => {
        const r = 0.5 * (radius[i] + radius[j]);
        const dx = cx[i] - cx[j], dy = cy[i] - cy[j], dz = cz[i] - cz[j];
        const d = Math.max(Math.sqrt(dx * dx + dy * dy + dz * dz), shrink * r);
        if (d >= 2 * r) return;
        const q = 1 - d / (2 * r), q2 = q * q, q4 = q2 * q2;
        if (pairs === neighbour.length) {
          neighbour = grow(neighbour);
          pairWeight = grow(pairWeight);
        }
        neighbour[pairs] = j;
        pairWeight[pairs++] = q4 * q4;
        w += q4 * q4;
      });
    }
    weight[i] = w;
    neighbourStart[i + 1] = pairs;
  }

  // Remove the most crowded candidate until none is left. Weights only ever fall, so the heap
  // keeps stale (too high) keys and re-files an entry when it surfaces with a key above its weight.
  const heap = new MaxHeap(m);
  for (let i = 0; i < m; i++) if (isCandidate[i]) heap.push(i, weight[i]);
  const alive = Uint8Array.from(isCandidate);
  const removed: number[] = [];
  const candidates = m - fixed;
  while (removed.length < candidates) {
    const key = heap.topKey();
    const i = heap.pop();
    if (!alive[i]) continue;
    if (key !== weight[i]) {
      heap.push(i, weight[i]);
      continue;
    }
    alive[i] = 0;
    removed.push(i);
    for (let e = neighbourStart[i]; e < neighbourStart[i + 1]; e++) if (isCandidate[neighbour[e]]) weight[neighbour[e]] -= pairWeight[e];
  }
  const out: number[] = [];
  for (let k = 0; k < Math.min(adding, candidates); k++) out.push(order[removed[candidates - 1 - k]]);
  return out;
}

/** Cell coordinates of a point in cubes of side `cell` from the points' lowest corner. */
function cellsOf(x: Float64Array, y: Float64Array, z: Float64Array, cell: number) {
  const n = x.length;
  let minX = Infinity, minY = Infinity, minZ = Infinity;
  for (let i = 0; i < n; i++) {
    minX = Math.min(minX, x[i]); minY = Math.min(minY, y[i]); minZ = Math.min(minZ, z[i]);
  }
  const ci = new Int32Array(n), cj = new Int32Array(n), ck = new Int32Array(n);
  const key = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    ci[i] = Math.floor((x[i] - minX) / cell);
    cj[i] = Math.floor((y[i] - minY) / cell);
    ck[i] = Math.floor((z[i] - minZ) / cell);
    key[i] = pack(ci[i], cj[i], ck[i]);
  }
  return { ci, cj, ck, key };
}

/** Cell coordinates packed into one number (21 bits each), exact in a double. */
const pack = (i: number, j: number, k: number) => (i * 2097152 + j) * 2097152 + k;

/** Open-addressing hash table from packed cell coordinates to a slot. */
class CellTable {
  readonly keys: Float64Array;
  private readonly mask: number;
  constructor(entries: number) {
    let size = 1;
    while (size < 2 * entries) size <<= 1;
    this.mask = size - 1;
    this.keys = new Float64Array(size).fill(-1);
  }
  /** The slot holding the cell, or the empty slot where it would go. */
  slot(i: number, j: number, k: number, packed: number): number {
    let h = (Math.imul(i, 73856093) ^ Math.imul(j, 19349663) ^ Math.imul(k, 83492791)) & this.mask;
    while (this.keys[h] !== -1 && this.keys[h] !== packed) h = (h + 1) & this.mask;
    return h;
  }
}

/**
 * The points' indices sorted by cell (ties by index): the distinct cells are sorted, then the
 * points counted into them, which is much faster than sorting the points themselves.
 */
export function cellOrder(x: Float64Array, y: Float64Array, z: Float64Array, cell: number): Uint32Array {
  const n = x.length;
  const { ci, cj, ck, key } = cellsOf(x, y, z, cell);
  const table = new CellTable(n);
  const slotOfPoint = new Int32Array(n);
  const distinct: number[] = [];
  for (let i = 0; i < n; i++) {
    const h = table.slot(ci[i], cj[i], ck[i], key[i]);
    if (table.keys[h] === -1) {
      table.keys[h] = key[i];
      distinct.push(key[i]);
    }
    slotOfPoint[i] = h;
  }
  const sorted = Float64Array.from(distinct).sort();
  const rankOfSlot = new Int32Array(table.keys.length);
  for (let r = 0; r < sorted.length; r++) {
    const k = sorted[r];
    const i = Math.floor(k / 4398046511104), j = Math.floor(k / 2097152) % 2097152;
    rankOfSlot[table.slot(i, j, k % 2097152, k)] = r;
  }
  const start = new Int32Array(sorted.length + 1);
  for (let i = 0; i < n; i++) start[rankOfSlot[slotOfPoint[i]] + 1]++;
  for (let c = 0; c < sorted.length; c++) start[c + 1] += start[c];
  const order = new Uint32Array(n);
  for (let i = 0; i < n; i++) order[start[rankOfSlot[slotOfPoint[i]]]++] = i;
  return order;
}

/**
 * Points (already in `cellOrder`) bucketed in cubes of side `cell`, for visiting every other
 * point within `cell` of one.
 */
function buildGrid(x: Float64Array, y: Float64Array, z: Float64Array, cell: number) {
  const n = x.length;
  const { ci, cj, ck, key } = cellsOf(x, y, z, cell);
  const table = new CellTable(n);
  const tableStart = new Int32Array(table.keys.length);
  const tableEnd = new Int32Array(table.keys.length);
  for (let r = 0; r < n; r++) {
    const h = table.slot(ci[r], cj[r], ck[r], key[r]);
    if (table.keys[h] === -1) {
      table.keys[h] = key[r];
      tableStart[h] = r;
    }
    tableEnd[h] = r + 1;
  }
  return {
    forNeighbour(i: number, visit: (j: number) => void): void {
      for (let di = -1; di <= 1; di++) {
        const a = ci[i] + di;
        if (a < 0) continue;
        for (let dj = -1; dj <= 1; dj++) {
          const b = cj[i] + dj;
          if (b < 0) continue;
          for (let dk = -1; dk <= 1; dk++) {
            const c = ck[i] + dk;
            if (c < 0) continue;
            const packed = pack(a, b, c);
            const h = table.slot(a, b, c, packed);
            if (table.keys[h] !== packed) continue;
            for (let r = tableStart[h], end = tableEnd[h]; r < end; r++) if (r !== i) visit(r);
          }
        }
      }
    },
  };
}
