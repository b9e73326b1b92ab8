/**
 * LU with partial pivoting restricted to the band of a matrix: with lower bandwidth kl and upper
 * bandwidth ku, pivots come from the kl rows below the diagonal and the fill stays within ku + kl
 * above it (Golub & Van Loan, Matrix Computations, §4.3, from memory), so a ladder (kl = ku = 1)
 * costs O(n) and a dense matrix the usual n³/3. Storage is the plain row-major n×n array.
 */
export interface BandLU {
  n: number;
  lu: Float64Array;
  piv: Int32Array;
  kl: number;
  /** upper bandwidth of U after the fill of pivoting */
  ku: number;
  singular: boolean;
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

/** Factors `a` (overwritten). */
export function bandLU(a: Float64Array, n: number): BandLU {
  const { kl, ku: ku0 } = bandwidths(a, n);
  const ku = Math.min(n - 1, ku0 + kl);
  const piv = new Int32Array(n);
  let singular = false;
  for (let k = 0; k < n; k++) {
    const last = Math.min(n - 1, k + kl);
    let p = k;
    let best = Math.abs(a[k * n + k]);
    for (let i = k + 1; i <= last; i++) {
      const v = Math.abs(a[i * n + k]);
      if (v > best) {
        best = v;
        p = i;
      }
    }
    piv[k] = p;
    const end = Math.min(n - 1, k + ku);
    if (p !== k) {
      for (let j = k; j <= end; j++) {
        const t = a[k * n + j];
        a[k * n + j] = a[p * n + j];
        a[p * n + j] = t;
      }
    }
    const d = a[k * n + k];
    if (d === 0) {
      singular = true;
      continue;
    }
    for (let i = k + 1; i <= last; i++) {
      const f = (a[i * n + k] /= d);
      if (f === 0) continue;
      for (let j = k + 1; j <= end; j++) a[i * n + j] -= f * a[k * n + j];
    }
  }
  return { n, lu: a, piv, kl, ku, singular };
}

/** Solves A·x = b with the factors (b is overwritten with x). */
export function bandSolve(f: BandLU, b: Float64Array): Float64Array {
  const { n, lu, piv, kl, ku } = f;
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
    for (let i = k + 1; i <= last; i++) b[i] -= lu[i * n + k] * bk;
  }
  for (let i = n - 1; i >= 0; i--) {
    let acc = b[i];
    const end = Math.min(n - 1, i + ku);
    for (let j = i + 1; j <= end; j++) acc -= lu[i * n + j] * b[j];
    b[i] = acc / lu[i * n + i];
  }
  return b;
}
