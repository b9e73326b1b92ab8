import { toArray } from './dense.js';

/**
 * LU factorization with partial pivoting on a flat Float64Array (row-major), and solves with it.
 * The dense workhorse of the model and LTI stages; typed arrays keep it several times faster than
 * nested JavaScript arrays for the few-hundred-state circuits engineers paste in.
 */
export interface LU {
  n: number;
  lu: Float64Array;
  piv: Int32Array;
  /** smallest and largest |U_ii|: a cheap indication of conditioning */
  minPivot: number;
  maxPivot: number;
}

export function luFactor(a: number[][]): LU {
  const n = a.length;
  const lu = new Float64Array(n * n);
  for (let i = 0; i < n; i++) for (let j = 0; j < n; j++) lu[i * n + j] = a[i][j];
  const piv = new Int32Array(n);
  for (let i = 0; i < n; i++) piv[i] = i;
  let minPivot = Infinity;
  let maxPivot = 0;
  for (let k = 0; k < n; k++) {
    let p = k;
    let best = Math.abs(lu[k * n + k]);
    for (let i = k + 1; i < n; i++) {
      const v = Math.abs(lu[i * n + k]);
      if (v > best) {
        best = v;
        p = i;
      }
    }
    if (p !== k) {
      for (let j = 0; j < n; j++) {
        const t = lu[k * n + j];
        lu[k * n + j] = lu[p * n + j];
        lu[p * n + j] = t;
      }
      const t = piv[k];
      piv[k] = piv[p];
      piv[p] = t;
    }
    const d = lu[k * n + k];
    minPivot = Math.min(minPivot, Math.abs(d));
    maxPivot = Math.max(maxPivot, Math.abs(d));
    if (d === 0) continue;
    for (let i = k + 1; i < n; i++) {
      const f = (lu[i * n + k] /= d);
      if (f === 0) continue;
      const ri = i * n;
      const rk = k * n;
      for (let j = k + 1; j < n; j++) lu[ri + j] -= f * lu[rk + j];
    }
  }
  return { n, lu, piv, minPivot: n ? minPivot : 1, maxPivot: n ? maxPivot : 1 };
}

export function luSingular(f: LU): boolean {
  return f.minPivot === 0 || !Number.isFinite(f.maxPivot);
}

/** Solve A·X = B for a matrix B (n × m), returning nested arrays. */
export function luSolve(f: LU, b: number[][]): number[][] {
  const { n, piv } = f;
  const m = n ? b[0].length : 0;
  const x = new Float64Array(n * m);
  for (let i = 0; i < n; i++) {
    const src = b[piv[i]];
    for (let j = 0; j < m; j++) x[i * m + j] = src[j];
  }
  substitute(f, x, m);
  return Array.from({ length: n }, (_, i) => toArray(x, i * m, m));
}

/** Solve A·X = B with B and X row-major in flat arrays of m columns. */
export function luSolveFlat(f: LU, b: Float64Array, m: number): Float64Array {
  const { n, piv } = f;
  const x = new Float64Array(n * m);
  for (let i = 0; i < n; i++) for (let j = 0; j < m; j++) x[i * m + j] = b[piv[i] * m + j];
  substitute(f, x, m);
  return x;
}

/** Forward and back substitution on the permuted right-hand sides x (n × m, row-major). */
function substitute(f: LU, x: Float64Array, m: number): void {
  const { n, lu } = f;
  for (let i = 0; i < n; i++) {
    const ri = i * n;
    for (let k = 0; k < i; k++) {
      const l = lu[ri + k];
      if (l === 0) continue;
      for (let j = 0; j < m; j++) x[i * m + j] -= l * x[k * m + j];
    }
  }
  for (let i = n - 1; i >= 0; i--) {
    const ri = i * n;
    for (let k = i + 1; k < n; k++) {
      const u = lu[ri + k];
      if (u === 0) continue;
      for (let j = 0; j < m; j++) x[i * m + j] -= u * x[k * m + j];
    }
    const d = lu[ri + i];
    for (let j = 0; j < m; j++) x[i * m + j] /= d;
  }
}
