/**
 * Eigenvectors of a real nonsymmetric tridiagonal matrix for approximate eigenvalues, O(n) each,
 * with the eigenvalues refined on the way.
 *
 * Inverse iteration (LAPACK dlaein structure, from memory) with Gaussian elimination of T − λI
 * with row interchanges, in complex arithmetic (a real λ keeps every imaginary part exactly zero).
 * The eigenvalue is then refined by the two-sided Rayleigh quotient λ' = yᵀTx / yᵀx with the left
 * eigenvector y = W·x, W = diag(wₖ), w₀ = 1, wₖ₊₁ = wₖ·bₖ/cₖ (T is diagonally similar to a complex
 * symmetric matrix, whose left and right eigenvectors coincide): its error is quadratic in the
 * vector's, so one pass brings an estimate off by many ulps of ‖T‖ (the complex QL of
 * complex-symmetric-tridiagonal.ts leaves such errors) to full accuracy. A vector is done when its
 * explicit residual ‖T·x − λ'·x‖∞ at the refined λ' is within ROUND_OFF·‖T‖·‖x‖∞; after
 * MAX_SOLVES solves it is accepted within RESIDUAL·‖T‖·‖x‖∞.
 */

const EPS = 2 ** -52;
const ROUND_OFF = 4 * EPS;
const RESIDUAL = 1e-13;
const MAX_SOLVES = 6;

export interface TridiagonalVectors {
  /**
   * column-major n×n (vector k is X[k·n .. k·n + n − 1]), eig()'s convention: vector k real, or
   * Re v and Im v in vectors k, k+1
   */
  X: Float64Array;
  re: Float64Array;
  im: Float64Array;
}

/**
 * d: diagonal; b: superdiagonal (T[k][k+1]); c: subdiagonal (T[k+1][k]); re, im: eigenvalue
 * estimates in eig()'s layout (pairs adjacent, im[k] > 0 first, conjugates exact). Returns the
 * vectors and the refined eigenvalues, or null when a vector does not reach the residual bound or
 * some bₖ·cₖ is zero.
 */
export function tridiagonalVectors(
  d: Float64Array,
  b: Float64Array,
  c: Float64Array,
  re0: Float64Array,
  im0: Float64Array,
): TridiagonalVectors | null {
  const n = d.length;
  const re = Float64Array.from(re0);
  const im = Float64Array.from(im0);
  const w = new Float64Array(n);
  w[0] = 1;
  for (let k = 0; k + 1 < n; k++) {
    w[k + 1] = (w[k] * b[k]) / c[k];
    if (!(Number.isFinite(w[k + 1]) && w[k + 1] !== 0)) return null;
  }
  let norm = 0;
  for (let k = 0; k < n; k++) norm = Math.max(norm, Math.abs(d[k]) + (k > 0 ? Math.abs(b[k - 1]) : 0) + (k + 1 < n ? Math.abs(c[k]) : 0));
  if (norm === 0) norm = 1;
  const ws = new Work(n);
  const X = new Float64Array(n * n);
  for (let k = 0; k < n; k++) {
    if (im[k] < 0) continue;
    if (!vector(d, b, c, w, norm, re[k], im[k], ws)) return null;
    const { xr, xi } = ws;
    // unit 2-norm (a pair: ‖Re v‖² + ‖Im v‖² = 1)
    let s = 0;
    for (let i = 0; i < n; i++) s += xr[i] * xr[i] + xi[i] * xi[i];
    const f = 1 / Math.sqrt(s);
    const xk = k * n;
    if (im[k] === 0) {
      re[k] = ws.lr;
      for (let i = 0; i < n; i++) X[xk + i] = xr[i] * f;
    } else {
      re[k] = ws.lr;
      im[k] = ws.li;
      re[k + 1] = ws.lr;
      im[k + 1] = -ws.li;
      for (let i = 0; i < n; i++) {
        X[xk + i] = xr[i] * f;
        X[xk + n + i] = xi[i] * f;
      }
      k++;
    }
  }
  return { X, re, im };
}

class Work {
  // U of the elimination: diagonal, first and second superdiagonal (real, imaginary parts)
  u0r: Float64Array;
  u0i: Float64Array;
  u1r: Float64Array;
  u1i: Float64Array;
  u2: Float64Array;
  mr: Float64Array;
  mi: Float64Array;
  swap: Uint8Array;
  // reciprocals of U's diagonal (pivots below eps3 taken as eps3): the solves then only multiply
  vr: Float64Array;
  vi: Float64Array;
  xr: Float64Array;
  xi: Float64Array;
  lr = 0;
  li = 0;
  constructor(n: number) {
    this.u0r = new Float64Array(n);
    this.u0i = new Float64Array(n);
    this.u1r = new Float64Array(n);
    this.u1i = new Float64Array(n);
    this.u2 = new Float64Array(n);
    this.mr = new Float64Array(n);
    this.mi = new Float64Array(n);
    this.swap = new Uint8Array(n);
    this.vr = new Float64Array(n);
    this.vi = new Float64Array(n);
    this.xr = new Float64Array(n);
    this.xi = new Float64Array(n);
  }
}

/** Elimination with row interchanges of T − λI (LAPACK dgttrf structure, complex shift). */
function factor(d: Float64Array, b: Float64Array, c: Float64Array, lr: number, li: number, eps3: number, ws: Work): void {
  const n = d.length;
  const { u0r, u0i, u1r, u1i, u2, mr, mi, swap } = ws;
  for (let i = 0; i < n; i++) {
    u0r[i] = d[i] - lr;
    u0i[i] = -li;
  }
  for (let i = 0; i + 1 < n; i++) {
    u1r[i] = b[i];
    u1i[i] = 0;
  }
  for (let i = 0; i + 1 < n; i++) {
    const sub = c[i];
    const ar = u0r[i];
    const ai = u0i[i];
    if (Math.abs(ar) + Math.abs(ai) >= Math.abs(sub)) {
      swap[i] = 0;
      u2[i] = 0;
      let pr = ar;
      const pi = ai;
      if (pr === 0 && pi === 0) pr = eps3;
      u0r[i] = pr;
      // f = sub / p
      const q = sub / (pr * pr + pi * pi);
      const fr = pr * q;
      const fi = -pi * q;
      mr[i] = fr;
      mi[i] = fi;
      // row i+1 −= f · row i (row i: u0, u1 at column i+1)
      const xr = u1r[i];
      const xi = u1i[i];
      u0r[i + 1] -= fr * xr - fi * xi;
      u0i[i + 1] -= fr * xi + fi * xr;
    } else {
      // row i+1 is the pivot row: [c_i, u0[i+1], b[i+1]]
      swap[i] = 1;
      // f = a / sub
      const fr = ar / sub;
      const fi = ai / sub;
      mr[i] = fr;
      mi[i] = fi;
      const nr = u0r[i + 1];
      const ni = u0i[i + 1];
      const br = i + 2 < n ? b[i + 1] : 0;
      // new row i = old row i+1; new row i+1 = old row i − f·(old row i+1)
      const or1 = u1r[i];
      const oi1 = u1i[i];
      u0r[i] = sub;
      u0i[i] = 0;
      u1r[i] = nr;
      u1i[i] = ni;
      u2[i] = br;
      u0r[i + 1] = or1 - (fr * nr - fi * ni);
      u0i[i + 1] = oi1 - (fr * ni + fi * nr);
      if (i + 2 < n) {
        u1r[i + 1] = -fr * br;
        u1i[i + 1] = -fi * br;
      }
    }
  }
  if (u0r[n - 1] === 0 && u0i[n - 1] === 0) u0r[n - 1] = eps3;
  // independent divisions, off the elimination's dependency chain
  const { vr, vi } = ws;
  for (let i = 0; i < n; i++) {
    let pr = u0r[i];
    let pi = u0i[i];
    if (Math.abs(pr) + Math.abs(pi) < eps3) {
      pr = eps3;
      pi = 0;
    }
    const q = 1 / (pr * pr + pi * pi);
    vr[i] = pr * q;
    vi[i] = -pi * q;
  }
}

/** x := U⁻¹·x (backward substitution with the reciprocal pivots); returns max |re| + |im| of x. */
function backSolve(n: number, ws: Work): number {
  const { u1r, u1i, u2, vr, vi, xr, xi } = ws;
  let big = 0;
  for (let i = n - 1; i >= 0; i--) {
    let tr = xr[i];
    let ti = xi[i];
    if (i + 1 < n) {
      const ar = u1r[i];
      const ai = u1i[i];
      tr -= ar * xr[i + 1] - ai * xi[i + 1];
      ti -= ar * xi[i + 1] + ai * xr[i + 1];
    }
    if (i + 2 < n) {
      tr -= u2[i] * xr[i + 2];
      ti -= u2[i] * xi[i + 2];
    }
    const ar = tr * vr[i] - ti * vi[i];
    const ai = tr * vi[i] + ti * vr[i];
    xr[i] = ar;
    xi[i] = ai;
    big = Math.max(big, Math.abs(ar) + Math.abs(ai));
  }
  return big;
}

/**
 * x := L⁻¹·P·x for a complex LU with partial pivoting whose L has one multiplier per column
 * (m_k, below the diagonal) and whose rows k, k+1 were exchanged where swap[k]: the factor of a
 * tridiagonal or Hessenberg matrix.
 */
export function bidiagonalForward(n: number, mr: Float64Array, mi: Float64Array, swap: Uint8Array, xr: Float64Array, xi: Float64Array): void {
  for (let k = 0; k + 1 < n; k++) {
    const fr = mr[k];
    const fi = mi[k];
    if (swap[k]) {
      const tr = xr[k];
      const ti = xi[k];
      xr[k] = xr[k + 1];
      xi[k] = xi[k + 1];
      xr[k + 1] = tr - (fr * xr[k] - fi * xi[k]);
      xi[k + 1] = ti - (fr * xi[k] + fi * xr[k]);
    } else {
      xr[k + 1] -= fr * xr[k] - fi * xi[k];
      xi[k + 1] -= fr * xi[k] + fi * xr[k];
    }
  }
}

/** Scales x by 1/big (its max-norm |re| + |im|, from backSolve); false when that is not finite. */
function rescale(n: number, big: number, ws: Work): boolean {
  const { xr, xi } = ws;
  if (!(big > 0) || !Number.isFinite(big)) return false;
  const f = 1 / big;
  for (let i = 0; i < n; i++) {
    xr[i] *= f;
    xi[i] *= f;
  }
  return true;
}

/**
 * Two-sided Rayleigh quotient Σ wᵢ·xᵢ·(T·x)ᵢ / Σ wᵢ·xᵢ² of ws.x into ws.lr, ws.li (imaginary part
 * kept zero for a real x); false when it is not finite.
 */
function rayleigh(d: Float64Array, b: Float64Array, c: Float64Array, w: Float64Array, real: boolean, ws: Work): boolean {
  const n = d.length;
  const { xr, xi } = ws;
  let nr = 0;
  let ni = 0;
  let dr = 0;
  let di = 0;
  for (let i = 0; i < n; i++) {
    let tr = d[i] * xr[i];
    let ti = d[i] * xi[i];
    if (i > 0) {
      tr += c[i - 1] * xr[i - 1];
      ti += c[i - 1] * xi[i - 1];
    }
    if (i + 1 < n) {
      tr += b[i] * xr[i + 1];
      ti += b[i] * xi[i + 1];
    }
    const wi = w[i];
    nr += wi * (xr[i] * tr - xi[i] * ti);
    ni += wi * (xr[i] * ti + xi[i] * tr);
    dr += wi * (xr[i] * xr[i] - xi[i] * xi[i]);
    di += wi * 2 * xr[i] * xi[i];
  }
  const den = dr * dr + di * di;
  const qr = (nr * dr + ni * di) / den;
  const qi = real ? 0 : (ni * dr - nr * di) / den;
  if (!Number.isFinite(qr) || !Number.isFinite(qi)) return false;
  ws.lr = qr;
  ws.li = qi;
  return true;
}

/** max over i of |(T·x − λ·x)ᵢ| (|re| + |im|). */
function residual(d: Float64Array, b: Float64Array, c: Float64Array, lr: number, li: number, ws: Work): number {
  const n = d.length;
  const { xr, xi } = ws;
  let res = 0;
  for (let i = 0; i < n; i++) {
    let tr = (d[i] - lr) * xr[i] + li * xi[i];
    let ti = (d[i] - lr) * xi[i] - li * xr[i];
    if (i > 0) {
      tr += c[i - 1] * xr[i - 1];
      ti += c[i - 1] * xi[i - 1];
    }
    if (i + 1 < n) {
      tr += b[i] * xr[i + 1];
      ti += b[i] * xi[i + 1];
    }
    res = Math.max(res, Math.abs(tr) + Math.abs(ti));
  }
  return res;
}

/**
 * The eigenvector of the eigenvalue near lr + j·li into ws.xr, ws.xi and the refined eigenvalue
 * into ws.lr, ws.li; false when the residual bound is not reached. Two solves with the
 * factorization at the estimate (each shrinks the other eigenvectors' share by |λ̂ − λ|/gap), the
 * Rayleigh quotient, the residual there; only when that fails, a new factorization at the
 * refined value and more solves.
 */
function vector(d: Float64Array, b: Float64Array, c: Float64Array, w: Float64Array, norm: number, lr: number, li: number, ws: Work): boolean {
  const n = d.length;
  const eps3 = norm * EPS;
  const real = li === 0;
  factor(d, b, c, lr, li, eps3, ws);
  // dlaein's start: U·x = (1, …, 1)
  ws.xr.fill(1);
  ws.xi.fill(0);
  if (!rescale(n, backSolve(n, ws), ws)) return false;
  let res = Infinity;
  for (let its = 0; its < MAX_SOLVES; its++) {
    bidiagonalForward(n, ws.mr, ws.mi, ws.swap, ws.xr, ws.xi);
    if (!rescale(n, backSolve(n, ws), ws)) return false;
    if (!rayleigh(d, b, c, w, real, ws)) return false;
    res = residual(d, b, c, ws.lr, ws.li, ws);
    if (res <= ROUND_OFF * norm) return true;
    if (its >= 1) {
      // slow convergence (a poor estimate): shift to the refined value
      lr = ws.lr;
      li = ws.li;
      factor(d, b, c, lr, li, eps3, ws);
    }
  }
  // not at round-off after all the solves (a close neighbour slows the convergence)
  return res <= RESIDUAL * norm;
}
