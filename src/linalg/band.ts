/**
 * LU with partial pivoting restricted to the band of a matrix: with lower bandwidth kl and upper
 * bandwidth ku, pivots come from the kl rows below the diagonal and the fill stays within ku + kl
 * above it (Golub & Van Loan, Matrix Computations, §4.3, from memory), so a ladder (kl = ku = 1)
 * costs O(n) and a dense matrix the usual n³/3. Storage: row i's entry in column j sits at
 * `off[i] + j`, either the plain row-major n×n array or, when the band is narrow, the band alone
 * (kl + ku + 1 entries per row, O(n) memory for a ladder).
 */
export interface BandLU {
  n: number;
  lu: Float64Array;
  /** row i's column j is lu[off[i] + j] */
  off: Int32Array;
  piv: Int32Array;
  kl: number;
  /** upper bandwidth of U after the fill of pivoting */
  ku: number;
  singular: boolean;
}

/** A zero matrix of the given bandwidths, to be filled with `set` and factored with bandFactor. */
export interface BandMatrix {
  n: number;
  a: Float64Array;
  off: Int32Array;
  kl: number;
  /** upper bandwidth of the matrix (before the fill of pivoting) */
  ku0: number;
}

export function bandMatrix(n: number, kl: number, ku0: number): BandMatrix {
  const ku = Math.min(n - 1, ku0 + kl);
  const w = kl + ku + 1;
  const off = new Int32Array(n);
  // the band alone when it is narrower than a row
  const packed = w < n;
  for (let i = 0; i < n; i++) off[i] = packed ? i * w - i + kl : i * n;
  return { n, a: new Float64Array(packed ? n * w : n * n), off, kl, ku0 };
}

/** The bandwidths of a row-major n×n array. */
export function bandwidths(a: Float64Array, n: number): { kl: number; ku: number } {
  let kl = 0;
  let ku = 0;
  for (let i = 0; i < n; i++) {
    const row = i * n;
    for (let j = 0; j < n; j++) {
      if (a[row + j] === 0) continue;
      if (i - j > kl) kl = i - j;
      if (j - i > ku) ku = j - i;
    }
  }
  return { kl, ku };
}

/** Factors the row-major n×n array `a` (overwritten). */
export function bandLU(a: Float64Array, n: number): BandLU {
  const { kl, ku } = bandwidths(a, n);
  const off = new Int32Array(n);
  for (let i = 0; i < n; i++) off[i] = i * n;
  return bandFactor({ n, a, off, kl, ku0: ku });
}

/** Factors a band matrix (its storage is overwritten). */
export function bandFactor(m: BandMatrix): BandLU {
  const { n, a, off, kl } = m;
  const ku = Math.min(n - 1, m.ku0 + kl);
  const piv = new Int32Array(n);
  let singular = false;
  // each row's last nonzero column, carried through the swaps and the fill: a row update stops
  // there instead of at the band's edge (after a bandwidth-reducing renumbering the nonzeros of a
  // mesh fill about half the band). The skipped operations subtract f·0: the same numbers.
  const rowEnd = new Int32Array(n);
  for (let i = 0; i < n; i++) {
    const oi = off[i];
    let e = i;
    for (let j = Math.min(n - 1, i + ku); j > i; j--) {
      if (a[oi + j] !== 0) {
        e = j;
        break;
      }
    }
    rowEnd[i] = e;
  }
  for (let k = 0; k < n; k++) {
    const last = Math.min(n - 1, k + kl);
    const ok = off[k];
    let p = k;
    let best = Math.abs(a[ok + k]);
    for (let i = k + 1; i <= last; i++) {
      const v = Math.abs(a[off[i] + k]);
      if (v > best) {
        best = v;
        p = i;
      }
    }
    piv[k] = p;
    if (p !== k) {
      const op = off[p];
      const swapEnd = Math.max(rowEnd[k], rowEnd[p]);
      for (let j = k; j <= swapEnd; j++) {
        const t = a[ok + j];
        a[ok + j] = a[op + j];
        a[op + j] = t;
      }
      const e = rowEnd[k];
      rowEnd[k] = rowEnd[p];
      rowEnd[p] = e;
    }
    const d = a[ok + k];
    if (d === 0) {
      singular = true;
      continue;
    }
    const end = rowEnd[k];
    for (let i = k + 1; i <= last; i++) {
      const oi = off[i];
      const f = (a[oi + k] /= d);
      if (f === 0) continue;
      for (let j = k + 1; j <= end; j++) a[oi + j] -= f * a[ok + j];
      if (end > rowEnd[i]) rowEnd[i] = end;
    }
  }
  return { n, lu: a, off, piv, kl, ku, singular };
}

/** Solves A·x = b with the factors (b is overwritten with x). */
export function bandSolve(f: BandLU, b: Float64Array): Float64Array {
  const { n, lu, off, piv, kl, ku } = f;
  for (let k = 0; k < n; k++) {
    const p = piv[k];
    if (p !== k) {
      const t = b[k];
      b[k] = b[p];
      b[p] = t;
    }
    const bk = b[k];
    if (bk === 0) continue;
    const last = Math.min(n - 1, k + kl);
    for (let i = k + 1; i <= last; i++) b[i] -= lu[off[i] + k] * bk;
  }
  for (let i = n - 1; i >= 0; i--) {
    const oi = off[i];
    let acc = b[i];
    const end = Math.min(n - 1, i + ku);
    for (let j = i + 1; j <= end; j++) acc -= lu[oi + j] * b[j];
    b[i] = acc / lu[oi + i];
  }
  return b;
}
