/**
 * Approximate minimum degree: the fill-reducing ordering for small matrices and for the leaves
 * of nested dissection, where a local greedy rule is as good as any and costs the least.
 */
import type { AdjacencyGraph } from './graph';

/**
 * Approximate minimum degree ordering on the quotient graph: eliminated vertices become
 * cliques ("elements") kept implicitly as member lists, so memory stays O(edges) however
 * much fill the elimination implies. Degrees are the usual upper bounds
 * |A_i| + |L_p \ i| + Σ|L_e \ L_p| rather than exact counts; indistinguishable vertices are
 * merged into supervariables and eliminated together; elements whose members all lie in
 * the new pivot's element are absorbed.
 *
 * Guarantees: returns a permutation `perm` of 0..n-1 with perm[k] = the vertex eliminated
 * k-th. Deterministic for a given graph.
 */
export function minimumDegreeOrder(graph: AdjacencyGraph): Int32Array {
  const n = graph.n;
  const order = new Int32Array(n);
  if (n === 0) return order;
  const { offsets, adjacency } = graph;

  let capacity = Math.max(offsets[n] + (offsets[n] >> 1) + 4 * n + 64, 256);
  let pool = new Int32Array(capacity);
  pool.set(adjacency);
  let poolEnd = offsets[n];

  const start = new Int32Array(n); // list start in pool
  const length = new Int32Array(n); // list length
  const elementCount = new Int32Array(n); // for variables: how many of the list entries are elements
  const weight = new Int32Array(n); // supervariable size (variables); 0 once absorbed
  // 0 = variable, 1 = element, 2 = dead (absorbed variable or absorbed element)
  const state = new Uint8Array(n);
  const degree = new Int32Array(n); // approximate external degree (variables); weighted |L_e| (elements)
  const w = new Float64Array(n); // |L_e \ L_p| bookkeeping, offset by stamp
  let stamp = 1;
  const mark = new Int32Array(n).fill(-1);
  let markStamp = 0;

  // degree buckets (doubly linked), one per possible degree
  const bucketHead = new Int32Array(n + 1).fill(-1);
  const bucketNext = new Int32Array(n).fill(-1);
  const bucketPrev = new Int32Array(n).fill(-1);
  const insert = (v: number, d: number) => {
    const h = bucketHead[d];
    bucketNext[v] = h;
    bucketPrev[v] = -1;
    if (h >= 0) bucketPrev[h] = v;
    bucketHead[d] = v;
  };
  const remove = (v: number) => {
    const nx = bucketNext[v];
    const pv = bucketPrev[v];
    if (pv >= 0) bucketNext[pv] = nx;
    else bucketHead[degree[v]] = nx;
    if (nx >= 0) bucketPrev[nx] = pv;
  };

  // members of a supervariable, as a singly linked chain from its principal
  const chainNext = new Int32Array(n).fill(-1);
  const chainTail = new Int32Array(n);

  const hashHead = new Int32Array(n).fill(-1);
  const hashNext = new Int32Array(n).fill(-1);
  const hashOf = new Int32Array(n);

  for (let v = 0; v < n; v++) {
    start[v] = offsets[v];
    length[v] = offsets[v + 1] - offsets[v];
    weight[v] = 1;
    degree[v] = length[v];
    chainTail[v] = v;
    insert(v, degree[v]);
  }
  let minDegree = 0;

  const compact = (needed: number) => {
    // Garbage (shrunk lists, lists of absorbed nodes) is reclaimed by sliding live lists
    // down in pool order; each live list's first slot temporarily holds −(node+1) so the
    // scan can recognise list starts without sorting.
    const firstEntry = new Int32Array(n);
    for (let v = 0; v < n; v++) {
      if (state[v] !== 2 && length[v] > 0) {
        firstEntry[v] = pool[start[v]];
        pool[start[v]] = -(v + 1);
      }
    }
    let dst = 0;
    let q = 0;
    while (q < poolEnd) {
      const code = pool[q];
      if (code < 0) {
        const v = -code - 1;
        const len = length[v];
        pool[dst] = firstEntry[v];
        for (let t = 1; t < len; t++) pool[dst + t] = pool[q + t];
        start[v] = dst;
        dst += len;
        q += len;
      } else {
        q++;
      }
    }
    poolEnd = dst;
    if (poolEnd + needed > capacity * 0.8) {
      capacity = Math.max(2 * capacity, poolEnd + 2 * needed);
      const bigger = new Int32Array(capacity);
      bigger.set(pool.subarray(0, poolEnd));
      pool = bigger;
    }
  };

  let eliminated = 0;
  let orderPos = 0;
  while (eliminated < n) {
    while (bucketHead[minDegree] < 0) minDegree++;
    const p = bucketHead[minDegree];
    remove(p);
    const pWeight = weight[p];
    eliminated += pWeight;
    for (let v = p; v >= 0; v = chainNext[v]) order[orderPos++] = v;

    // ---- form the new element L_p = (A_p ∪ ⋃_{e ∈ E_p} L_e) \ {p}
    let bound = length[p] - elementCount[p];
    for (let t = 0; t < elementCount[p]; t++) bound += length[pool[start[p] + t]];
    if (poolEnd + bound > capacity) compact(bound);
    markStamp++;
    mark[p] = markStamp;
    const lpStart = poolEnd;
    let lpEnd = lpStart;
    let lpWeight = 0;
    const pStart = start[p];
    const pElements = elementCount[p];
    for (let t = 0; t < length[p]; t++) {
      const x = pool[pStart + t];
      if (t < pElements) {
        if (state[x] !== 1) continue;
        const xs = start[x];
        for (let u = 0; u < length[x]; u++) {
          const i = pool[xs + u];
          if (state[i] === 0 && mark[i] !== markStamp) {
            mark[i] = markStamp;
            pool[lpEnd++] = i;
            lpWeight += weight[i];
          }
        }
        state[x] = 2; // absorbed into p
      } else if (state[x] === 0 && mark[x] !== markStamp) {
        mark[x] = markStamp;
        pool[lpEnd++] = x;
        lpWeight += weight[x];
      }
    }
    poolEnd = lpEnd;
    state[p] = 1;
    start[p] = lpStart;
    length[p] = lpEnd - lpStart;
    elementCount[p] = 0;
    degree[p] = lpWeight;

    // ---- rebuild each member's lists in place and count |L_e \ L_p| for its elements
    if (stamp + 2 * n + 2 > 2 ** 50) {
      w.fill(0);
      stamp = 1;
    }
    for (let t = lpStart; t < lpEnd; t++) {
      const i = pool[t];
      remove(i);
      const is = start[i];
      const ne = elementCount[i];
      const len = length[i];
      let out = is;
      for (let u = 0; u < ne; u++) {
        const e = pool[is + u];
        if (state[e] !== 1) continue;
        pool[out++] = e;
        if (w[e] < stamp) w[e] = degree[e] + stamp;
        w[e] -= weight[i];
      }
      const keptElements = out - is;
      for (let u = ne; u < len; u++) {
        const j = pool[is + u];
        // neighbours inside L_p are now reached through p; absorbed/eliminated ones are gone
        if (state[j] !== 0 || mark[j] === markStamp) continue;
        pool[out++] = j;
      }
      // p joins the element part; at least one entry (p itself or an absorbed element)
      // was dropped, so the slot at `out` is free.
      if (out > is + keptElements) pool[out] = pool[is + keptElements];
      pool[is + keptElements] = p;
      out++;
      elementCount[i] = keptElements + 1;
      length[i] = out - is;
    }

    // ---- absorb elements whose members all lie in L_p: p already says all they say.
    // Done before hashing so that indistinguishable members hash alike.
    for (let t = lpStart; t < lpEnd; t++) {
      const i = pool[t];
      const is = start[i];
      for (let u = 0; u < elementCount[i]; u++) {
        const e = pool[is + u];
        if (e !== p && state[e] === 1 && w[e] - stamp <= 0) state[e] = 2;
      }
    }

    // ---- approximate degrees and hashes
    const remaining = n - eliminated;
    for (let t = lpStart; t < lpEnd; t++) {
      const i = pool[t];
      const is = start[i];
      const ne = elementCount[i];
      const len = length[i];
      let external = 0;
      let hash = 0;
      let out = is;
      for (let u = 0; u < ne; u++) {
        const e = pool[is + u];
        if (state[e] !== 1) continue;
        if (e !== p) external += w[e] - stamp;
        pool[out++] = e;
        hash += e;
      }
      const keptElements = out - is;
      for (let u = ne; u < len; u++) {
        const j = pool[is + u];
        if (state[j] !== 0) continue;
        pool[out++] = j;
        external += weight[j];
        hash += j;
      }
      elementCount[i] = keptElements;
      length[i] = out - is;
      const wi = weight[i];
      const d = Math.min(degree[i] + lpWeight - wi, remaining - wi, external + lpWeight - wi);
      degree[i] = d;
      hashOf[i] = hash % n;
    }
    stamp += n + 1;

    // ---- merge indistinguishable members (same elements, same variable neighbours)
    for (let t = lpStart; t < lpEnd; t++) {
      const i = pool[t];
      const h = hashOf[i];
      hashNext[i] = hashHead[h];
      hashHead[h] = i;
    }
    for (let t = lpStart; t < lpEnd; t++) {
      const h = hashOf[pool[t]];
      let i = hashHead[h];
      if (i < 0) continue;
      hashHead[h] = -1;
      for (; i >= 0; i = hashNext[i]) {
        if (weight[i] === 0) continue;
        markStamp++;
        const is = start[i];
        const li = length[i];
        for (let u = 0; u < li; u++) mark[pool[is + u]] = markStamp;
        let prev = i;
        for (let j = hashNext[i]; j >= 0; j = hashNext[j]) {
          if (weight[j] === 0 || length[j] !== li || elementCount[j] !== elementCount[i]) {
            prev = j;
            continue;
          }
          const js = start[j];
          let same = true;
          for (let u = 0; u < li; u++) {
            if (mark[pool[js + u]] !== markStamp) {
              same = false;
              break;
            }
          }
          if (!same) {
            prev = j;
            continue;
          }
          degree[i] -= weight[j];
          weight[i] += weight[j];
          weight[j] = 0;
          state[j] = 2;
          chainNext[chainTail[i]] = j;
          chainTail[i] = chainTail[j];
          hashNext[prev] = hashNext[j];
        }
      }
    }

    // ---- back into the buckets; drop merged members from L_p
    let out = lpStart;
    for (let t = lpStart; t < lpEnd; t++) {
      const i = pool[t];
      if (state[i] !== 0) continue;
      pool[out++] = i;
      const d = Math.max(0, degree[i]);
      degree[i] = d;
      insert(i, d);
      if (d < minDegree) minDegree = d;
    }
    length[p] = out - lpStart;
    if (length[p] === 0) state[p] = 2;
  }
  return order;
}
