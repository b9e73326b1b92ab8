/**
 * Symmetric tridiagonal eigenproblem in O(n²). A definite block (an RC ladder) goes to
 * definite-tridiagonal.ts (twisted factorizations, relative accuracy). Otherwise: eigenvalues by
 * implicit QL without vectors (EISPACK tql1 structure), eigenvectors by inverse iteration on the
 * tridiagonal with reorthogonalisation inside clusters of close eigenvalues (LAPACK dstein
 * structure). Both from memory of the textbook algorithms (Wilkinson & Reinsch, Handbook for
 * Automatic Computation II).
 *
 * T has diagonal d[0..n−1] and off-diagonal e[0..n−2] (e[i] = T[i][i+1] = T[i+1][i]).
 */

import { eigDefiniteTridiagonal } from './definite-tridiagonal.js';

const EPS = 2 ** -52;

export interface TridiagonalEig {
  /** eigenvalues, ascending */
  values: Float64Array;
  /** orthonormal eigenvectors, column-major: vector k is z[k·n .. k·n + n − 1] */
  z: Float64Array;
}

/** Eigenvalues and orthonormal eigenvectors of the symmetric tridiagonal (d, e). */
export function eigTridiagonal(d: Float64Array, e: Float64Array): TridiagonalEig {
  const n = d.length;
  const values = new Float64Array(n);
  const z = new Float64Array(n * n);
  // split where the coupling is negligible against its neighbours: the blocks are solved apart,
  // so their eigenvectors have exact zeros outside the block
  let start = 0;
  for (let i = 0; i < n; i++) {
    if (i < n - 1 && Math.abs(e[i]) > EPS * (Math.abs(d[i]) + Math.abs(d[i + 1]))) continue;
    const m = i + 1 - start;
    const bd = d.slice(start, i + 1);
    const be = e.slice(start, start + m - 1);
    let w = tridiagonalEigenvalues(bd, be);
    // definite (an RC network): relative accuracy, one twisted factorization per vector
    const def = eigDefiniteTridiagonal(bd, be, w);
    if (def) w = def.values;
    let zb = def ? def.z : inverseIterationWork(bd, be, w) < qlWork(m) ? tridiagonalEigenvectors(bd, be, w) : null;
    if (!zb) {
      // large clusters (Gram–Schmidt would cost more than accumulating the QL rotations), or
      // inverse iteration did not converge
      zb = new Float64Array(m * m);
      for (let k = 0; k < m; k++) zb[k * m + k] = 1;
      w = Float64Array.from(bd);
      tridiagonalQL(w, be, zb);
    }
    // one block (the usual case): already ascending, no copies
    if (m === n) return { values: w, z: zb };
    for (let k = 0; k < m; k++) {
      values[start + k] = w[k];
      z.set(zb.subarray(k * m, k * m + m), (start + k) * n + start);
    }
    start = i + 1;
  }
  // ascending order over all blocks
  const order = Array.from(values.keys()).sort((p, q) => values[p] - values[q]);
  const sv = new Float64Array(n);
  const sz = new Float64Array(n * n);
  order.forEach((k, j) => {
    sv[j] = values[k];
    sz.set(z.subarray(k * n, k * n + n), j * n);
  });
  return { values: sv, z: sz };
}

/** Ascending eigenvalues of the symmetric tridiagonal (d, e) by implicit QL with shifts, O(n²). */
export function tridiagonalEigenvalues(d0: Float64Array, e0: Float64Array): Float64Array {
  const d = Float64Array.from(d0);
  tridiagonalQL(d, Float64Array.from(e0), null);
  return d;
}

/**
 * Implicit QL with Wilkinson-type shifts (EISPACK tql1/tql2 structure, from memory), in place:
 * d becomes the ascending eigenvalues, e (T[i][i+1] in e[i], length ≥ n − 1) is destroyed. With
 * z (column-major n×n, holding Q on entry) the rotations accumulate into its columns, which are
 * sorted with the eigenvalues: z := Q·(eigenvectors of T). Without z it is O(n²).
 */
export function tridiagonalQL(d: Float64Array, e0: Float64Array, z: Float64Array | null): void {
  const n = d.length;
  const e = new Float64Array(n);
  e.set(e0.subarray(0, Math.max(n - 1, 0)));
  let f = 0;
  let tst1 = 0;
  for (let l = 0; l < n; l++) {
    tst1 = Math.max(tst1, Math.abs(d[l]) + Math.abs(e[l]));
    let m = l;
    while (m < n - 1 && Math.abs(e[m]) > EPS * tst1) m++;
    if (m > l) {
      let iter = 0;
      do {
        if (++iter > 60) throw new Error('eig: the symmetric QL iteration did not converge');
        let g = d[l];
        let p = (d[l + 1] - g) / (2 * e[l]);
        let r = Math.hypot(p, 1);
        if (p < 0) r = -r;
        d[l] = e[l] / (p + r);
        d[l + 1] = e[l] * (p + r);
        const dl1 = d[l + 1];
        let h = g - d[l];
        for (let i = l + 2; i < n; i++) d[i] -= h;
        f += h;
        p = d[m];
        let c = 1;
        let c2 = c;
        let c3 = c;
        const el1 = e[l + 1];
        let s = 0;
        let s2 = 0;
        for (let i = m - 1; i >= l; i--) {
          c3 = c2;
          c2 = c;
          s2 = s;
          g = c * e[i];
          h = c * p;
          r = hypot(p, e[i]);
          e[i + 1] = s * r;
          s = e[i] / r;
          c = p / r;
          p = c * d[i] - s * g;
          d[i + 1] = h + s * (c * g + s * d[i]);
          if (z) {
            const ci = i * n;
            const ci1 = ci + n;
            for (let k = 0; k < n; k++) {
              const hk = z[ci1 + k];
              const zk = z[ci + k];
              z[ci1 + k] = s * zk + c * hk;
              z[ci + k] = c * zk - s * hk;
            }
          }
        }
        p = (-s * s2 * c3 * el1 * e[l]) / dl1;
        e[l] = s * p;
        d[l] = c * p;
      } while (Math.abs(e[l]) > EPS * tst1);
    }
    d[l] += f;
    e[l] = 0;
  }
  // selection sort into ascending order (n swaps at most)
  for (let i = 0; i < n - 1; i++) {
    let k = i;
    let p = d[i];
    for (let j = i + 1; j < n; j++) {
      if (d[j] < p) {
        k = j;
        p = d[j];
      }
    }
    if (k !== i) {
      d[k] = d[i];
      d[i] = p;
      if (z) {
        const ci = i * n;
        const ck = k * n;
        for (let j = 0; j < n; j++) {
          const t = z[ci + j];
          z[ci + j] = z[ck + j];
          z[ck + j] = t;
        }
      }
    }
  }
}

/**
 * √(a² + b²) without Math.hypot's cost (it dominates the QL sweep otherwise); Math.hypot only
 * where the squares could overflow or underflow.
 */
function hypot(a: number, b: number): number {
  const r = Math.sqrt(a * a + b * b);
  return r > 1e-150 && r < 1e150 ? r : Math.hypot(a, b);
}

/** ‖T‖₁ of the symmetric tridiagonal (d, e). */
function oneNorm(d: Float64Array, e: Float64Array): number {
  const n = d.length;
  let r = 0;
  for (let i = 0; i < n; i++) r = Math.max(r, Math.abs(d[i]) + (i > 0 ? Math.abs(e[i - 1]) : 0) + (i < n - 1 ? Math.abs(e[i]) : 0));
  return r;
}

/**
 * Clusters: eigenvalues closer than this fraction of ‖T‖₁ to their neighbour are orthogonalized
 * against each other (dstein's value).
 */
const CLUSTER = 1e-3;

/**
 * Work estimate of inverse iteration: about two solves per vector plus Gram–Schmidt inside
 * clusters, in units of the QL estimate below (blocked Gram–Schmidt runs about twice as fast per
 * flop as the QL rotations: measured on n = 400 and 800 RC ladders).
 */
function inverseIterationWork(d: Float64Array, e: Float64Array, w: Float64Array): number {
  const n = d.length;
  const ortol = CLUSTER * oneNorm(d, e);
  let pairs = 0;
  let gpind = 0;
  for (let j = 1; j < n; j++) {
    if (w[j] - w[j - 1] > ortol) gpind = j;
    pairs += j - gpind;
  }
  return 2 * (30 * n * n + 2 * n * pairs);
}

/**
 * Work estimate of QL with the rotations accumulated: about 1.5 sweeps per eigenvalue, 6n flops
 * per rotation, at half the cost per flop of plain Gram–Schmidt.
 */
function qlWork(n: number): number {
  return 2.25 * n * n * n;
}

const MAX_ITS = 5;
// solves after the growth test first passes (dstein takes 2; 1 measured as orthogonal, 3e-15 at
// n = 800, on the graded RC ladders and Toeplitz matrices)
const EXTRA = 1;

/**
 * Orthonormal eigenvectors of the unreduced symmetric tridiagonal (d, e) for the ascending
 * eigenvalues w, by inverse iteration: O(n) per vector, plus modified Gram–Schmidt against the
 * earlier vectors of the same cluster (eigenvalues closer than 10⁻³·‖T‖₁, as in dstein), where
 * inverse iteration alone would return nearly the same vector twice. Column-major result; null
 * when a vector does not converge.
 */
export function tridiagonalEigenvectors(d: Float64Array, e: Float64Array, w: Float64Array): Float64Array | null {
  const n = d.length;
  const z = new Float64Array(n * n);
  if (n === 1) {
    z[0] = 1;
    return z;
  }
  let onenrm = Math.max(Math.abs(d[0]) + Math.abs(e[0]), Math.abs(d[n - 1]) + Math.abs(e[n - 2]));
  for (let i = 1; i < n - 1; i++) onenrm = Math.max(onenrm, Math.abs(d[i]) + Math.abs(e[i - 1]) + Math.abs(e[i]));
  const ortol = CLUSTER * onenrm;
  const dtol = Math.sqrt(0.1);
  // LU factors of T − λI with partial pivoting: U has diagonal u0, superdiagonals u1, u2
  const u0 = new Float64Array(n);
  const u1 = new Float64Array(n);
  const u2 = new Float64Array(n);
  const mult = new Float64Array(n);
  const swap = new Uint8Array(n);
  const b = new Float64Array(n);
  // deterministic start vector (dstein uses a random one too: anything not orthogonal to the target)
  let seed = 0x2545f491;
  const rand = (): number => {
    seed = (Math.imul(seed, 1664525) + 1013904223) >>> 0;
    return seed / 4294967296 - 0.5;
  };
  let gpind = 0; // first vector of the current cluster
  let xjm = 0;
  for (let j = 0; j < n; j++) {
    let xj = w[j];
    if (j > 0) {
      const eps1 = Math.abs(xj) * EPS * 10;
      const pertol = 10 * eps1;
      // coincident eigenvalues get distinct shifts, so the factorizations differ
      if (xj - xjm < pertol) xj = xjm + pertol;
      if (xj - xjm > ortol) gpind = j;
    }
    xjm = xj;
    factor(d, e, xj, u0, u1, u2, mult, swap);
    const tol = Math.max(EPS * onenrm, Number.MIN_VALUE);
    for (let i = 0; i < n; i++) b[i] = rand();
    let its = 0;
    let nrmchk = 0;
    for (;;) {
      if (++its > MAX_ITS) return null; // dstein flags this; the caller takes another method
      let asum = 0;
      for (let i = 0; i < n; i++) asum += Math.abs(b[i]);
      const scl = (n * onenrm * Math.max(EPS, Math.abs(u0[n - 1]))) / asum;
      for (let i = 0; i < n; i++) b[i] *= scl;
      solve(n, u0, u1, u2, mult, swap, b, tol);
      orthogonalize(b, z, n, gpind, j);
      let nrm = 0;
      for (let i = 0; i < n; i++) nrm = Math.max(nrm, Math.abs(b[i]));
      if (nrm < dtol) continue;
      if (++nrmchk < EXTRA + 1) continue;
      break;
    }
    let s2 = 0;
    let jmax = 0;
    for (let i = 0; i < n; i++) {
      s2 += b[i] * b[i];
      if (Math.abs(b[i]) > Math.abs(b[jmax])) jmax = i;
    }
    // unit norm, largest component positive (a fixed sign makes the result reproducible)
    const scl = (b[jmax] < 0 ? -1 : 1) / Math.sqrt(s2);
    const zj = j * n;
    for (let i = 0; i < n; i++) z[zj + i] = b[i] * scl;
  }
  return z;
}

/**
 * b := b minus its components along the orthonormal columns gpind..j−1 of z: modified Gram–Schmidt
 * over blocks of four columns, classical within a block (the four dot products share one pass
 * over b, and so do the four updates).
 */
function orthogonalize(b: Float64Array, z: Float64Array, n: number, gpind: number, j: number): void {
  let k = gpind;
  for (; k + 3 < j; k += 4) {
    const z0 = k * n;
    const z1 = z0 + n;
    const z2 = z1 + n;
    const z3 = z2 + n;
    let s0 = 0;
    let s1 = 0;
    let s2 = 0;
    let s3 = 0;
    for (let i = 0; i < n; i++) {
      const bi = b[i];
      s0 += bi * z[z0 + i];
      s1 += bi * z[z1 + i];
      s2 += bi * z[z2 + i];
      s3 += bi * z[z3 + i];
    }
    for (let i = 0; i < n; i++) b[i] -= s0 * z[z0 + i] + s1 * z[z1 + i] + s2 * z[z2 + i] + s3 * z[z3 + i];
  }
  for (; k < j; k++) {
    const zk = k * n;
    let s = 0;
    for (let i = 0; i < n; i++) s += b[i] * z[zk + i];
    for (let i = 0; i < n; i++) b[i] -= s * z[zk + i];
  }
}

/** Gaussian elimination with row interchanges of the tridiagonal T − λI (LAPACK dgttrf structure). */
function factor(
  d: Float64Array,
  e: Float64Array,
  lambda: number,
  u0: Float64Array,
  u1: Float64Array,
  u2: Float64Array,
  mult: Float64Array,
  swap: Uint8Array,
): void {
  const n = d.length;
  for (let i = 0; i < n; i++) u0[i] = d[i] - lambda;
  for (let i = 0; i < n - 1; i++) u1[i] = e[i];
  for (let i = 0; i < n - 1; i++) {
    const sub = e[i];
    if (Math.abs(u0[i]) >= Math.abs(sub)) {
      swap[i] = 0;
      u2[i] = 0;
      const f = u0[i] !== 0 ? sub / u0[i] : 0;
      mult[i] = f;
      u0[i + 1] -= f * u1[i];
    } else {
      // row i+1 becomes the pivot row: [sub, u0[i+1], e[i+1]]
      swap[i] = 1;
      const f = u0[i] / sub;
      mult[i] = f;
      const a1 = u0[i + 1];
      const c1 = i < n - 2 ? e[i + 1] : 0;
      u0[i] = sub;
      u0[i + 1] = u1[i] - f * a1;
      u1[i] = a1;
      u2[i] = c1;
      if (i < n - 2) u1[i + 1] = -f * c1;
    }
  }
}

/** Solves (T − λI)·x = b in place with the factors; pivots below tol are replaced by ±tol. */
function solve(
  n: number,
  u0: Float64Array,
  u1: Float64Array,
  u2: Float64Array,
  mult: Float64Array,
  swap: Uint8Array,
  b: Float64Array,
  tol: number,
): void {
  for (let i = 0; i < n - 1; i++) {
    if (swap[i]) {
      const t = b[i];
      b[i] = b[i + 1];
      b[i + 1] = t - mult[i] * b[i];
    } else b[i + 1] -= mult[i] * b[i];
  }
  for (let i = n - 1; i >= 0; i--) {
    let t = b[i];
    if (i + 1 < n) t -= u1[i] * b[i + 1];
    if (i + 2 < n) t -= u2[i] * b[i + 2];
    let p = u0[i];
    if (Math.abs(p) < tol) p = p < 0 ? -tol : tol;
    b[i] = t / p;
    // overflow guard: rescale the whole iterate (its direction is what matters)
    if (!(Math.abs(b[i]) < 1e150)) {
      const s = 1 / Math.abs(b[i]);
      for (let k = i; k < n; k++) b[k] *= s;
    }
  }
}
