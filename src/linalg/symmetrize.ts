/**
 * Diagonal symmetrization: finds D with D⁻¹·A·D symmetric, when there is one.
 *
 * The state matrix of an RC network, A = −C⁻¹·G, has this form (C diagonal positive, G symmetric):
 * then its eigenvalues are real and a symmetric solver applies. (D⁻¹AD)ᵢⱼ = Aᵢⱼ·dⱼ/dᵢ is symmetric
 * exactly when (dᵢ/dⱼ)² = Aᵢⱼ/Aⱼᵢ for every nonzero pair, which needs a symmetric zero pattern and
 * Aᵢⱼ·Aⱼᵢ > 0. The ratios are fixed along a spanning tree of the pattern's graph and every other
 * pair is verified (a cycle could contradict them).
 */

export interface Symmetrized {
  /** the scaling D (diagonal) */
  scale: Float64Array;
  /**
   * S = D⁻¹·A·D made exactly symmetric: Sᵢⱼ = sign(Aᵢⱼ)·√(Aᵢⱼ·Aⱼᵢ); row-major. Built from `a` on
   * first use, so `a` must not change before.
   */
  S: Float64Array;
  /** neighbours of each index in the zero pattern (off-diagonal) */
  adjacency: number[][];
}

/**
 * Returns the symmetrization of the row-major n×n matrix a, or null when A is not diagonally
 * similar to a symmetric matrix within relTol (relative mismatch of Aᵢⱼ·dⱼ² against Aⱼᵢ·dᵢ²).
 * Replacing A by D·S·D⁻¹ changes each entry by at most relTol/2 of itself.
 */
export function symmetrize(a: Float64Array, n: number, relTol: number): Symmetrized | null {
  const adjacency: number[][] = Array.from({ length: n }, () => []);
  // rows read in order, the transposed entry only where a row has a nonzero (a column walk over
  // the whole matrix would miss the cache n² times); a pair with a zero on one side fails from
  // the side that has the nonzero
  for (let i = 0; i < n; i++) {
    const row = i * n;
    for (let j = 0; j < n; j++) {
      const aij = a[row + j];
      if (aij === 0 || j === i) continue;
      if (!(aij * a[j * n + i] > 0)) return null; // one-sided coupling or opposite signs (an LC exchange)
      if (j > i) {
        adjacency[i].push(j);
        adjacency[j].push(i);
      }
    }
  }
  // d² along a breadth-first spanning forest; squares avoid square roots until the end
  const d2 = new Float64Array(n);
  const queue = new Int32Array(n);
  for (let root = 0; root < n; root++) {
    if (d2[root] !== 0) continue;
    d2[root] = 1;
    let head = 0;
    let tail = 0;
    queue[tail++] = root;
    while (head < tail) {
      const i = queue[head++];
      for (const j of adjacency[i]) {
        if (d2[j] !== 0) continue;
        // (dᵢ/dⱼ)² = Aᵢⱼ/Aⱼᵢ
        d2[j] = (d2[i] * a[j * n + i]) / a[i * n + j];
        if (!(d2[j] > 0 && Number.isFinite(d2[j]) && d2[j] > 1e-250 && d2[j] < 1e250)) return null;
        queue[tail++] = j;
      }
    }
  }
  for (let i = 0; i < n; i++) {
    for (const j of adjacency[i]) {
      if (j < i) continue;
      const x = a[i * n + j] * d2[j];
      const y = a[j * n + i] * d2[i];
      if (Math.abs(x - y) > relTol * Math.abs(x)) return null;
    }
  }
  const scale = new Float64Array(n);
  for (let i = 0; i < n; i++) scale[i] = Math.sqrt(d2[i]);
  // S is built on first use: a ladder's solver reads only its tridiagonal (symmetricEntry), and the
  // modal stage only the scale
  let S: Float64Array | null = null;
  return {
    scale,
    get S(): Float64Array {
      if (!S) {
        S = new Float64Array(n * n);
        for (let i = 0; i < n; i++) {
          S[i * n + i] = a[i * n + i];
          for (const j of adjacency[i]) S[i * n + j] = symmetricEntry(a, n, i, j);
        }
      }
      return S;
    },
    adjacency,
  };
}

/** Sᵢⱼ = sign(Aᵢⱼ)·√(Aᵢⱼ·Aⱼᵢ) for a symmetrizable A (Sᵢᵢ = Aᵢᵢ). */
export function symmetricEntry(a: Float64Array, n: number, i: number, j: number): number {
  const aij = a[i * n + j];
  return i === j ? aij : (aij < 0 ? -1 : 1) * Math.sqrt(aij * a[j * n + i]);
}

/**
 * When the graph of the pattern is a union of simple paths (every index has at most two
 * neighbours and there is no cycle), the order that walks the paths one after the other: in that
 * order the symmetric matrix is tridiagonal (an RC ladder). Otherwise null.
 */
export function pathOrder(adjacency: number[][]): number[] | null {
  const n = adjacency.length;
  if (adjacency.some((nb) => nb.length > 2)) return null;
  const order: number[] = [];
  const seen = new Uint8Array(n);
  for (let s = 0; s < n; s++) {
    if (seen[s] || adjacency[s].length === 2) continue;
    // s is a path end (or isolated): walk to the other end
    let prev = -1;
    let cur = s;
    while (cur >= 0) {
      seen[cur] = 1;
      order.push(cur);
      const next: number = adjacency[cur].find((x) => x !== prev && !seen[x]) ?? -1;
      prev = cur;
      cur = next;
    }
  }
  // indices not reached from a path end lie on cycles
  return order.length === n ? order : null;
}
