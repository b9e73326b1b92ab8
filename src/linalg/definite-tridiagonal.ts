/**
 * Eigen-decomposition of a definite symmetric tridiagonal matrix in O(n²) with high relative
 * accuracy: the core of the MRRR algorithm (Dhillon & Parlett; LAPACK dstemr, dlar1v), from memory,
 * limited to its root representation.
 *
 * A positive definite T factors as L·D·Lᵀ with D > 0, and that factorization determines every
 * eigenvalue to high relative accuracy (it is a bidiagonal Cholesky factor in disguise: Demmel &
 * Kahan). Eigenvalues well separated *relative to their own size* then get eigenvectors by one
 * twisted factorization each (L·D·Lᵀ − λI = N_r·Δ·N_rᵀ, solve N_rᵀ·z = e_r), orthogonal without
 * any Gram–Schmidt. This is what the state matrix of an RC ladder needs: its spectrum spans many
 * decades, so close in absolute terms (where inverse iteration on T must reorthogonalize) while
 * well separated in relative terms. The few relative clusters are orthogonalized among themselves.
 *
 * T has diagonal d[0..n−1] and off-diagonal e[0..n−2]; it may be negative definite (T = −(LDLᵀ)).
 */

import type { TridiagonalEig } from './tridiagonal.js';

const EPS = 2 ** -52;
// neighbours closer than this relative gap are orthogonalized against each other; the twisted
// vectors alone are orthogonal to about ε/relgap
const RELATIVE_CLUSTER = 1e-2;
// Rayleigh-quotient corrections per eigenvalue before falling back to bisection
const MAX_RQI = 6;

/**
 * Eigenvalues (ascending) and orthonormal eigenvectors (column-major) of the definite symmetric
 * tridiagonal (d, e), or null when T is not definite or a cluster is too tight for this method
 * (the caller then takes inverse iteration with reorthogonalization or QL).
 */
export function eigDefiniteTridiagonal(d: Float64Array, e: Float64Array, approx: Float64Array): TridiagonalEig | null {
  const n = d.length;
  if (n === 0) return { values: new Float64Array(0), z: new Float64Array(0) };
  // work on the positive definite one of ±T
  const sign = d[0] < 0 ? -1 : 1;
  const D = new Float64Array(n);
  const L = new Float64Array(Math.max(n - 1, 0));
  const LD = new Float64Array(Math.max(n - 1, 0));
  const LLD = new Float64Array(Math.max(n - 1, 0));
  D[0] = sign * d[0];
  for (let i = 0; i + 1 < n; i++) {
    if (!(D[i] > 0)) return null;
    const ei = sign * e[i];
    L[i] = ei / D[i];
    LD[i] = ei;
    LLD[i] = ei * L[i];
    D[i + 1] = sign * d[i + 1] - LLD[i];
  }
  if (!(D[n - 1] > 0)) return null;
  let tnorm = 0;
  for (let i = 0; i < n; i++) tnorm = Math.max(tnorm, Math.abs(d[i]) + (i > 0 ? Math.abs(e[i - 1]) : 0) + (i + 1 < n ? Math.abs(e[i]) : 0));
  // start values: the eigenvalues of T to absolute accuracy, ascending for +T
  const lam = new Float64Array(n);
  for (let k = 0; k < n; k++) lam[k] = sign > 0 ? approx[k] : -approx[n - 1 - k];
  const tw = new Twisted(n);
  const z = new Float64Array(n * n);
  const tol = 4 * Math.log(n + 1) * EPS;
  for (let j = 0; j < n; j++) {
    let x = Math.max(lam[j], 0);
    const gap = Math.min(j > 0 ? x - lam[j - 1] : Infinity, j + 1 < n ? lam[j + 1] - x : Infinity);
    let ok = false;
    let small = 0;
    for (let it = 0; it < MAX_RQI && !ok; it++) {
      tw.factor(D, L, LD, LLD, x);
      // the pivots below and above the twist count the eigenvalues below x, whichever side of λⱼ
      // x lies on (the twist's own pivot carries that side): anything but j means RQI is heading
      // for a neighbour
      if (tw.neg !== j) break;
      // done when the residual ‖(LDLᵀ − xI)·z‖/‖z‖ = |γ_r|/‖z‖ is below tol·gap (the vector's
      // angle to the true one is at most their ratio) or at round-off of x; or when the
      // Rayleigh-quotient correction γ_r/‖z‖² has been at round-off of x twice (dlarrv stops at
      // once, but the vector computed at the converged x has a residual up to ‖z‖ times smaller)
      const corr = tw.gamma / tw.ztz;
      if (Math.abs(corr) <= 2 * EPS * x) small++;
      ok = Math.abs(tw.gamma) <= Math.max(tol * gap, 4 * EPS * x) * Math.sqrt(tw.ztz) || small === 2;
      x += corr;
    }
    if (!ok) {
      // bisection on the sign counts to full relative accuracy, then one twisted factorization
      x = bisect(D, LLD, j, 2 * tnorm);
      tw.factor(D, L, LD, LLD, x);
    }
    if (!Number.isFinite(x) || !Number.isFinite(tw.ztz)) return null;
    lam[j] = x;
    const zj = j * n;
    const s = 1 / Math.sqrt(tw.ztz);
    for (let i = 0; i < n; i++) z[zj + i] = tw.z[i] * s;
  }
  // ascending, and distinct relative to the accuracy reached
  for (let j = 1; j < n; j++) if (!(lam[j] > lam[j - 1])) return null;
  // relative neighbours: each vector loses its components along the earlier vectors within the
  // relative gap (a window, not the whole chain: beyond it they are already orthogonal to ~ε/gap);
  // a vector that loses most of its length was nearly a copy of an earlier one (too tight a
  // cluster for this method)
  let first = 0;
  for (let k = 1; k < n; k++) {
    while (lam[k] - lam[first] >= RELATIVE_CLUSTER * lam[k]) first++;
    if (first < k && !orthogonalize(z, n, first, k)) return null;
  }
  const values = new Float64Array(n);
  if (sign > 0) return { values: lam, z };
  // T = −(LDLᵀ): eigenvalues negated, order reversed
  const zr = new Float64Array(n * n);
  for (let k = 0; k < n; k++) {
    values[k] = -lam[n - 1 - k];
    zr.set(z.subarray((n - 1 - k) * n, (n - k) * n), k * n);
  }
  return { values, z: zr };
}

/** Twisted factorization of L·D·Lᵀ − λI and the vector it gives (dlar1v structure). */
class Twisted {
  lplus: Float64Array;
  umin: Float64Array;
  s: Float64Array;
  p: Float64Array;
  negPlus: Uint8Array;
  negMinus: Uint8Array;
  z: Float64Array;
  gamma = 0;
  ztz = 0;
  neg = 0;
  constructor(n: number) {
    this.lplus = new Float64Array(n);
    this.umin = new Float64Array(n);
    this.s = new Float64Array(n);
    this.p = new Float64Array(n);
    this.negPlus = new Uint8Array(n);
    this.negMinus = new Uint8Array(n);
    this.z = new Float64Array(n);
  }

  factor(D: Float64Array, L: Float64Array, LD: Float64Array, LLD: Float64Array, lambda: number): void {
    const n = D.length;
    const { lplus, umin, s, p, negPlus, negMinus, z } = this;
    // stationary transform, top down: L₊·D₊·L₊ᵀ = L·D·Lᵀ − λI (s[i] holds s_i + λ), and
    // progressive transform, bottom up: U₋·D₋·U₋ᵀ = L·D·Lᵀ − λI (p[i] holds D₋ᵢ − lldᵢ₋₁); both in
    // one loop, since each is a chain of dependent divisions and the two are independent
    s[0] = 0;
    let sc = -lambda;
    p[n - 1] = D[n - 1] - lambda;
    for (let i = 0, m = n - 2; i + 1 < n; i++, m--) {
      let dplus = D[i] + sc;
      // a vanishing pivot (λ an eigenvalue of a leading block) becomes a round-off-sized one, so
      // the quotients stay finite
      if (Math.abs(dplus) < EPS * EPS * (D[i] + Math.abs(sc))) dplus = -EPS * (D[i] + Math.abs(sc));
      negPlus[i] = dplus < 0 ? 1 : 0;
      const lp = LD[i] / dplus;
      lplus[i] = lp;
      const si = sc * lp * L[i];
      s[i + 1] = si;
      sc = si - lambda;
      const pm = p[m + 1];
      let dminus = LLD[m] + pm;
      if (Math.abs(dminus) < EPS * EPS * (LLD[m] + Math.abs(pm))) dminus = -EPS * (LLD[m] + Math.abs(pm));
      negMinus[m + 1] = dminus < 0 ? 1 : 0;
      const t = D[m] / dminus;
      umin[m] = L[m] * t;
      p[m] = pm * t - lambda;
    }
    // the twist r where |γ_r| (1 / the diagonal of the inverse) is smallest
    let r = 0;
    let g = s[0] + p[0];
    for (let k = 1; k < n; k++) {
      const t = s[k] + p[k];
      if (Math.abs(t) <= Math.abs(g)) {
        g = t;
        r = k;
      }
    }
    if (g === 0) g = EPS * Math.max(Math.abs(lambda), Number.MIN_VALUE);
    let neg = 0;
    for (let i = 0; i < r; i++) neg += negPlus[i];
    for (let i = r + 1; i < n; i++) neg += negMinus[i];
    // N_rᵀ·z = e_r
    z[r] = 1;
    let ztz = 1;
    for (let i = r - 1; i >= 0; i--) {
      const v = -lplus[i] * z[i + 1];
      z[i] = v;
      ztz += v * v;
    }
    for (let i = r; i + 1 < n; i++) {
      const v = -umin[i] * z[i];
      z[i + 1] = v;
      ztz += v * v;
    }
    this.gamma = g;
    this.ztz = ztz;
    this.neg = neg;
  }
}

/** Number of eigenvalues of L·D·Lᵀ below σ (the stationary transform's negative pivots; dlaneg). */
function negCount(D: Float64Array, LLD: Float64Array, sigma: number): number {
  const n = D.length;
  let neg = 0;
  let t = -sigma;
  for (let i = 0; i + 1 < n; i++) {
    let dplus = D[i] + t;
    if (Math.abs(dplus) < EPS * EPS * (D[i] + Math.abs(t))) dplus = -EPS * (D[i] + Math.abs(t));
    if (dplus < 0) neg++;
    t = (t / dplus) * LLD[i] - sigma;
  }
  if (D[n - 1] + t < 0) neg++;
  return neg;
}

/** Eigenvalue j (0-based, ascending) of the positive definite L·D·Lᵀ by bisection in [0, hi]. */
function bisect(D: Float64Array, LLD: Float64Array, j: number, hi: number): number {
  let lo = 0;
  while (hi - lo > 2 * EPS * hi) {
    const mid = 0.5 * (lo + hi);
    if (mid <= lo || mid >= hi) break;
    if (negCount(D, LLD, mid) > j) hi = mid;
    else lo = mid;
  }
  return 0.5 * (lo + hi);
}

/**
 * Column k of z (unit) loses its components along columns start..k−1 (orthonormal) by modified
 * Gram–Schmidt, a second time only when the first removed more than a tiny part (the components
 * are of order ε/relgap, so one pass normally leaves it orthogonal to working precision); false
 * when less than half of it is left.
 */
function orthogonalize(z: Float64Array, n: number, start: number, k: number): boolean {
  const zk = k * n;
  for (let pass = 0; pass < 2; pass++) {
    let removed = 0;
    for (let c = start; c < k; c++) {
      const zc = c * n;
      let s = 0;
      for (let i = 0; i < n; i++) s += z[zk + i] * z[zc + i];
      for (let i = 0; i < n; i++) z[zk + i] -= s * z[zc + i];
      removed += s * s;
    }
    let nrm = 0;
    for (let i = 0; i < n; i++) nrm += z[zk + i] * z[zk + i];
    nrm = Math.sqrt(nrm);
    if (!(nrm > 0.5)) return false;
    for (let i = 0; i < n; i++) z[zk + i] /= nrm;
    if (removed < 1e-8) break;
  }
  return true;
}
