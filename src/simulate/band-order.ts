import type { StateSpace } from '../model/state-space.js';

/**
 * A symmetric renumbering of a sparse matrix's rows and columns that narrows its band: reverse
 * Cuthill–McKee (breadth-first, neighbours by increasing degree, the order reversed; a textbook
 * method, from memory), from the start of several tried that gives the cheapest band. A random
 * RLC mesh's state matrix has about three nonzeros per row scattered over the whole width;
 * renumbered, its band is about a sixth of n at 1000 states, so an LU within the band (pivoting
 * and all) costs a fifth of the dense one. Only entries move: P·M·Pᵀ is factored, no value changes.
 */
export interface BandOrder {
  /** new index → old */
  order: Int32Array;
  /** old index → new */
  pos: Int32Array;
  /** lower and upper bandwidths after the renumbering */
  kl: number;
  ku: number;
}

/** how many starting vertices are tried */
const STARTS = 16;

/**
 * The renumbering of the n×n pattern given by its nonzeros (rows I, columns J), or the identity
 * when it does not make the band cheaper to factor.
 */
export function bandOrder(n: number, I: ArrayLike<number>, J: ArrayLike<number>): BandOrder {
  let kl0 = 0;
  let ku0 = 0;
  for (let q = 0; q < I.length; q++) {
    kl0 = Math.max(kl0, I[q]! - J[q]!);
    ku0 = Math.max(ku0, J[q]! - I[q]!);
  }
  const identity = (): BandOrder => {
    const order = new Int32Array(n);
    for (let i = 0; i < n; i++) order[i] = i;
    return { order, pos: order.slice(), kl: kl0, ku: ku0 };
  };
  if (kl0 + ku0 <= 2) return identity();
  // symmetric adjacency (compressed rows, duplicates kept: they only repeat a visit test)
  const deg = new Int32Array(n);
  for (let q = 0; q < I.length; q++) {
    if (I[q] === J[q]) continue;
    deg[I[q]!]++;
    deg[J[q]!]++;
  }
  const start = new Int32Array(n + 1);
  for (let i = 0; i < n; i++) start[i + 1] = start[i]! + deg[i]!;
  const adj = new Int32Array(start[n]!);
  const fill = start.slice(0, n);
  for (let q = 0; q < I.length; q++) {
    const i = I[q]!;
    const j = J[q]!;
    if (i === j) continue;
    adj[fill[i]!++] = j;
    adj[fill[j]!++] = i;
  }
  const level = new Int32Array(n).fill(-1);
  const placed = new Uint8Array(n);
  // breadth-first levels from r over the unplaced vertices, into `queue` (from `at`); returns the end
  const bfs = (r: number, queue: Int32Array, at: number, sortByDegree: boolean): number => {
    let head = at;
    let tail = at;
    queue[tail++] = r;
    level[r] = 0;
    while (head < tail) {
      const v = queue[head++]!;
      const from = tail;
      for (let e = start[v]!; e < start[v + 1]!; e++) {
        const w = adj[e]!;
        if (placed[w] || level[w] >= 0) continue;
        level[w] = level[v]! + 1;
        queue[tail++] = w;
      }
      if (sortByDegree && tail - from > 1) queue.subarray(from, tail).sort((a, b) => deg[a]! - deg[b]! || a - b);
    }
    return tail;
  };
  const scratch = new Int32Array(n);
  // a pseudo-peripheral vertex of seed's component: restart from the end of the deepest level
  // until the depth stops growing
  const peripheral = (seed: number): number => {
    let r = seed;
    let depth = -1;
    for (let tries = 0; tries < 8; tries++) {
      const end = bfs(r, scratch, 0, false);
      const last = level[scratch[end - 1]!]!;
      let best = -1;
      for (let k = end - 1; k >= 0 && level[scratch[k]!] === last; k--) {
        const v = scratch[k]!;
        if (best < 0 || deg[v]! < deg[best]!) best = v;
      }
      for (let k = 0; k < end; k++) level[scratch[k]!] = -1;
      if (last <= depth) break;
      depth = last;
      r = best;
    }
    return r;
  };
  // the reversed breadth-first order from `first` (then the other components, each from a
  // pseudo-peripheral vertex)
  const orderFrom = (first: number): Int32Array => {
    placed.fill(0);
    const order = new Int32Array(n);
    let count = 0;
    for (let seed = -1; seed < n; seed++) {
      const s = seed < 0 ? first : seed;
      if (placed[s]) continue;
      const end = bfs(seed < 0 ? first : peripheral(s), order, count, true);
      for (let k = count; k < end; k++) {
        placed[order[k]!] = 1;
        level[order[k]!] = -1;
      }
      count = end;
    }
    return order.reverse();
  };
  // an LU within the band costs about n·kl·(kl + ku): the band of a random mesh depends much on
  // where the search starts (a pseudo-peripheral vertex is no better than the median there), so
  // several starts are tried and the cheapest kept (each O(nonzeros))
  const cost = (kl: number, ku: number) => kl * (kl + ku + 1);
  let best: BandOrder | null = null;
  const starts = new Set([peripheral(0)]);
  for (let k = 0; k < STARTS; k++) starts.add(Math.floor((k * n) / STARTS));
  for (const first of starts) {
    const order = orderFrom(first);
    const pos = new Int32Array(n);
    for (let k = 0; k < n; k++) pos[order[k]!] = k;
    let kl = 0;
    let ku = 0;
    for (let q = 0; q < I.length; q++) {
      kl = Math.max(kl, pos[I[q]!]! - pos[J[q]!]!);
      ku = Math.max(ku, pos[J[q]!]! - pos[I[q]!]!);
    }
    if (!best || cost(kl, ku) < cost(best.kl, best.ku)) best = { order, pos, kl, ku };
  }
  return best && cost(best.kl, best.ku) < cost(kl0, ku0) ? best : identity();
}

// the cross-check and the settled start factor matrices of the same pattern: renumbered once per model
const orderOf = new WeakMap<StateSpace, BandOrder>();

/** bandOrder of the state matrix's nonzero pattern, once per model. */
export function stateOrder(ss: StateSpace): BandOrder {
  let o = orderOf.get(ss);
  if (!o) {
    const I: number[] = [];
    const J: number[] = [];
    ss.A.forEach((row, i) => {
      for (let j = 0; j < row.length; j++) {
        if (row[j] === 0) continue;
        I.push(i);
        J.push(j);
      }
    });
    o = bandOrder(ss.n, I, J);
    orderOf.set(ss, o);
  }
  return o;
}
