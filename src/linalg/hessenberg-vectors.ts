import { bidiagonalForward } from './tridiagonal-vectors.js';

/**
 * Eigenvectors of an upper Hessenberg matrix for known eigenvalues, by inverse iteration (the
 * LAPACK dlaein structure, from memory): Gaussian elimination of H − λI with row interchanges
 * between neighbouring rows (all a Hessenberg matrix needs), then solves with the factors. Each
 * row of U only reaches as far as the rows it came from, so a banded H (a ladder: tridiagonal)
 * costs O(n) per vector and a full one O(n²).
 *
 * A vector is accepted when one solve grows it by at least ACCEPT/‖H‖: then
 * ‖(H − λI)·x‖ ≤ ‖x‖·‖H‖/ACCEPT, a relative residual of 1/ACCEPT. Otherwise null: the caller
 * falls back to the Schur-form method.
 */

const EPS = 2 ** -52;
const ACCEPT = 1e13;
const MAX_SOLVES = 5;
const EXTRA = 1;

/**
 * X (row-major n×n) with the eigenvectors of H in eig()'s convention: column i real for im[i] = 0;
 * for a pair (im[i] > 0, im[i+1] = −im[i]) columns i and i+1 hold Re v and Im v of the vector of
 * re[i] + j·im[i]. Only the upper Hessenberg part of H (row-major) is read. Null when inverse
 * iteration does not reach the residual bound.
 */
export function hessenbergEigenvectors(H: Float64Array, n: number, re: Float64Array, im: Float64Array): Float64Array | null {
  let hnorm = 0;
  const rowEnd = new Int32Array(n);
  for (let i = 0; i < n; i++) {
    let end = i;
    let s = 0;
    for (let j = Math.max(i - 1, 0); j < n; j++) {
      const v = H[i * n + j];
      if (v !== 0) {
        end = j;
        s += Math.abs(v);
      }
    }
    rowEnd[i] = Math.max(end, Math.min(i + 1, n - 1));
    hnorm = Math.max(hnorm, s);
  }
  if (hnorm === 0) hnorm = 1;
  const eps3 = hnorm * EPS;
  const X = new Float64Array(n * n);
  const w = new Workspace(n);
  for (let k = 0; k < n; k++) {
    if (im[k] === 0) {
      if (!realVector(H, n, rowEnd, re[k], eps3, hnorm, w)) return null;
      for (let i = 0; i < n; i++) X[i * n + k] = w.xr[i];
    } else if (im[k] > 0) {
      if (!complexVector(H, n, rowEnd, re[k], im[k], eps3, hnorm, w)) return null;
      for (let i = 0; i < n; i++) {
        X[i * n + k] = w.xr[i];
        X[i * n + k + 1] = w.xi[i];
      }
      k++;
    }
  }
  return X;
}

/** Scratch space reused across eigenvalues: U (real and imaginary parts), multipliers, vectors. */
class Workspace {
  ur: Float64Array;
  ui: Float64Array;
  uEnd: Int32Array;
  lr: Float64Array;
  li: Float64Array;
  swap: Uint8Array;
  xr: Float64Array;
  xi: Float64Array;
  cr: Float64Array;
  ci: Float64Array;
  constructor(n: number) {
    this.ur = new Float64Array(n * n);
    this.ui = new Float64Array(n * n);
    this.uEnd = new Int32Array(n);
    this.lr = new Float64Array(n);
    this.li = new Float64Array(n);
    this.swap = new Uint8Array(n);
    this.xr = new Float64Array(n);
    this.xi = new Float64Array(n);
    this.cr = new Float64Array(n);
    this.ci = new Float64Array(n);
  }
}

function realVector(H: Float64Array, n: number, rowEnd: Int32Array, lambda: number, eps3: number, hnorm: number, w: Workspace): boolean {
  const { ur: U, uEnd, lr: L, swap, xr: x, cr: cur } = w;
  // factor: cur holds the row being carried down (row k after eliminations), extent cEnd
  let cEnd = rowEnd[0];
  for (let j = 0; j <= cEnd; j++) cur[j] = H[j];
  cur[0] -= lambda;
  for (let k = 0; k < n - 1; k++) {
    const b1 = (k + 1) * n;
    const e1 = rowEnd[k + 1];
    const sub = H[b1 + k];
    const end = Math.max(cEnd, e1);
    const uk = k * n;
    if (Math.abs(cur[k]) >= Math.abs(sub)) {
      swap[k] = 0;
      const piv = cur[k] !== 0 ? cur[k] : eps3;
      const f = sub / piv;
      L[k] = f;
      U[uk + k] = piv;
      // column k+1 carries −λ; beyond it, where both rows reach, no tests are needed
      const c1 = cur[k + 1];
      U[uk + k + 1] = c1;
      cur[k + 1] = H[b1 + k + 1] - lambda - f * c1;
      const both = Math.min(cEnd, e1);
      for (let j = k + 2; j <= both; j++) {
        const c = cur[j];
        U[uk + j] = c;
        cur[j] = H[b1 + j] - f * c;
      }
      for (let j = both + 1; j <= cEnd; j++) {
        const c = cur[j];
        U[uk + j] = c;
        cur[j] = -f * c;
      }
      for (let j = Math.max(both + 1, k + 2); j <= e1; j++) {
        U[uk + j] = 0;
        cur[j] = H[b1 + j];
      }
    } else {
      swap[k] = 1;
      const f = cur[k] / sub;
      L[k] = f;
      U[uk + k] = sub;
      const h1 = H[b1 + k + 1] - lambda;
      U[uk + k + 1] = h1;
      cur[k + 1] = cur[k + 1] - f * h1;
      const both = Math.min(cEnd, e1);
      for (let j = k + 2; j <= both; j++) {
        const h = H[b1 + j];
        U[uk + j] = h;
        cur[j] -= f * h;
      }
      for (let j = both + 1; j <= cEnd; j++) U[uk + j] = 0;
      for (let j = Math.max(both + 1, k + 2); j <= e1; j++) {
        const h = H[b1 + j];
        U[uk + j] = h;
        cur[j] = -f * h;
      }
    }
    uEnd[k] = end;
    cEnd = end;
  }
  U[(n - 1) * n + n - 1] = cur[n - 1] !== 0 ? cur[n - 1] : eps3;
  uEnd[n - 1] = n - 1;
  // first solve: U·x = b = (eps3, …, eps3) (dlaein's choice); then (H − λI)·x = c with c the
  // elimination undone on b, whose norm is computed here exactly
  cur.fill(eps3);
  for (let k = n - 2; k >= 0; k--) {
    cur[k + 1] += L[k] * cur[k];
    if (swap[k]) {
      const t = cur[k];
      cur[k] = cur[k + 1];
      cur[k + 1] = t;
    }
  }
  let prev = 0;
  let passed = 0;
  for (let i = 0; i < n; i++) prev = Math.max(prev, Math.abs(cur[i]));
  x.fill(eps3);
  for (let its = 0; its < MAX_SOLVES; its++) {
    if (its > 0) {
      // a true inverse-iteration step: apply P and L⁻¹ before U⁻¹
      for (let k = 0; k < n - 1; k++) {
        if (swap[k]) {
          const t = x[k];
          x[k] = x[k + 1];
          x[k + 1] = t - L[k] * x[k];
        } else x[k + 1] -= L[k] * x[k];
      }
    }
    for (let i = n - 1; i >= 0; i--) {
      const ui = i * n;
      let t = x[i];
      const e = uEnd[i];
      for (let j = i + 1; j <= e; j++) t -= U[ui + j] * x[j];
      let p = U[ui + i];
      if (Math.abs(p) < eps3) p = p < 0 ? -eps3 : eps3;
      x[i] = t / p;
    }
    let big = 0;
    for (let i = 0; i < n; i++) big = Math.max(big, Math.abs(x[i]));
    if (!(big > 0) || !Number.isFinite(big)) return false;
    const growth = big / prev;
    for (let i = 0; i < n; i++) x[i] /= big;
    prev = 1;
    // ‖(H − λI)·x‖ / (‖x‖·‖H‖) = 1 / (growth·‖H‖); once there, one more solve refines the
    // direction (residuals then match the Schur-form path's)
    if (growth * hnorm >= ACCEPT && ++passed > EXTRA) {
      normalizeReal(x, n);
      return true;
    }
  }
  return false;
}

function normalizeReal(x: Float64Array, n: number): void {
  let s = 0;
  for (let i = 0; i < n; i++) s += x[i] * x[i];
  const f = 1 / Math.sqrt(s);
  for (let i = 0; i < n; i++) x[i] *= f;
}

function complexVector(
  H: Float64Array,
  n: number,
  rowEnd: Int32Array,
  wr: number,
  wi: number,
  eps3: number,
  hnorm: number,
  w: Workspace,
): boolean {
  const { ur: Ur, ui: Ui, uEnd, lr: Lr, li: Li, swap, xr, xi, cr, ci } = w;
  let cEnd = rowEnd[0];
  for (let j = 0; j <= cEnd; j++) {
    cr[j] = H[j];
    ci[j] = 0;
  }
  cr[0] -= wr;
  ci[0] -= wi;
  for (let k = 0; k < n - 1; k++) {
    const b1 = (k + 1) * n;
    const e1 = rowEnd[k + 1];
    const sub = H[b1 + k]; // real: below the diagonal
    const end = Math.max(cEnd, e1);
    const uk = k * n;
    const ar = cr[k];
    const ai = ci[k];
    if (Math.abs(ar) + Math.abs(ai) >= Math.abs(sub)) {
      swap[k] = 0;
      let pr = ar;
      let pi = ai;
      if (pr === 0 && pi === 0) pr = eps3;
      // f = sub / (pr + j·pi)
      const den = pr * pr + pi * pi;
      const fr = (sub * pr) / den;
      const fi = (-sub * pi) / den;
      Lr[k] = fr;
      Li[k] = fi;
      Ur[uk + k] = pr;
      Ui[uk + k] = pi;
      {
        const xr0 = cr[k + 1];
        const xi0 = ci[k + 1];
        Ur[uk + k + 1] = xr0;
        Ui[uk + k + 1] = xi0;
        cr[k + 1] = H[b1 + k + 1] - wr - (fr * xr0 - fi * xi0);
        ci[k + 1] = -wi - (fr * xi0 + fi * xr0);
      }
      const both = Math.min(cEnd, e1);
      for (let j = k + 2; j <= both; j++) {
        const xr0 = cr[j];
        const xi0 = ci[j];
        Ur[uk + j] = xr0;
        Ui[uk + j] = xi0;
        cr[j] = H[b1 + j] - (fr * xr0 - fi * xi0);
        ci[j] = -(fr * xi0 + fi * xr0);
      }
      for (let j = both + 1; j <= cEnd; j++) {
        const xr0 = cr[j];
        const xi0 = ci[j];
        Ur[uk + j] = xr0;
        Ui[uk + j] = xi0;
        cr[j] = -(fr * xr0 - fi * xi0);
        ci[j] = -(fr * xi0 + fi * xr0);
      }
      for (let j = Math.max(both + 1, k + 2); j <= e1; j++) {
        Ur[uk + j] = 0;
        Ui[uk + j] = 0;
        cr[j] = H[b1 + j];
        ci[j] = 0;
      }
    } else {
      swap[k] = 1;
      // f = (ar + j·ai) / sub
      const fr = ar / sub;
      const fi = ai / sub;
      Lr[k] = fr;
      Li[k] = fi;
      Ur[uk + k] = sub;
      Ui[uk + k] = 0;
      {
        const hr = H[b1 + k + 1] - wr;
        const hi = -wi;
        Ur[uk + k + 1] = hr;
        Ui[uk + k + 1] = hi;
        cr[k + 1] -= fr * hr - fi * hi;
        ci[k + 1] -= fr * hi + fi * hr;
      }
      const both = Math.min(cEnd, e1);
      // H's row is real beyond the diagonal: (fr + j·fi)·hr
      for (let j = k + 2; j <= both; j++) {
        const hr = H[b1 + j];
        Ur[uk + j] = hr;
        Ui[uk + j] = 0;
        cr[j] -= fr * hr;
        ci[j] -= fi * hr;
      }
      for (let j = both + 1; j <= cEnd; j++) {
        Ur[uk + j] = 0;
        Ui[uk + j] = 0;
      }
      for (let j = Math.max(both + 1, k + 2); j <= e1; j++) {
        const hr = H[b1 + j];
        Ur[uk + j] = hr;
        Ui[uk + j] = 0;
        cr[j] = -fr * hr;
        ci[j] = -fi * hr;
      }
    }
    uEnd[k] = end;
    cEnd = end;
  }
  {
    const last = (n - 1) * n + n - 1;
    const zero = cr[n - 1] === 0 && ci[n - 1] === 0;
    Ur[last] = zero ? eps3 : cr[n - 1];
    Ui[last] = zero ? 0 : ci[n - 1];
    uEnd[n - 1] = n - 1;
  }
  cr.fill(eps3);
  ci.fill(0);
  for (let k = n - 2; k >= 0; k--) {
    cr[k + 1] += Lr[k] * cr[k] - Li[k] * ci[k];
    ci[k + 1] += Lr[k] * ci[k] + Li[k] * cr[k];
    if (swap[k]) {
      const tr = cr[k];
      const ti = ci[k];
      cr[k] = cr[k + 1];
      ci[k] = ci[k + 1];
      cr[k + 1] = tr;
      ci[k + 1] = ti;
    }
  }
  let prev = 0;
  let passed = 0;
  for (let i = 0; i < n; i++) prev = Math.max(prev, Math.abs(cr[i]) + Math.abs(ci[i]));
  xr.fill(eps3);
  xi.fill(0);
  for (let its = 0; its < MAX_SOLVES; its++) {
    if (its > 0) bidiagonalForward(n, Lr, Li, swap, xr, xi);
    for (let i = n - 1; i >= 0; i--) {
      const ui = i * n;
      let tr = xr[i];
      let ti = xi[i];
      const e = uEnd[i];
      for (let j = i + 1; j <= e; j++) {
        const a = Ur[ui + j];
        const b = Ui[ui + j];
        tr -= a * xr[j] - b * xi[j];
        ti -= a * xi[j] + b * xr[j];
      }
      let pr = Ur[ui + i];
      let pi = Ui[ui + i];
      if (Math.abs(pr) + Math.abs(pi) < eps3) {
        pr = eps3;
        pi = 0;
      }
      // (tr + j·ti) / (pr + j·pi), scaled (Smith's formula)
      if (Math.abs(pr) >= Math.abs(pi)) {
        const r = pi / pr;
        const d = pr + r * pi;
        xr[i] = (tr + r * ti) / d;
        xi[i] = (ti - r * tr) / d;
      } else {
        const r = pr / pi;
        const d = pi + r * pr;
        xr[i] = (r * tr + ti) / d;
        xi[i] = (r * ti - tr) / d;
      }
    }
    let big = 0;
    for (let i = 0; i < n; i++) big = Math.max(big, Math.abs(xr[i]) + Math.abs(xi[i]));
    if (!(big > 0) || !Number.isFinite(big)) return false;
    const growth = big / prev;
    for (let i = 0; i < n; i++) {
      xr[i] /= big;
      xi[i] /= big;
    }
    prev = 1;
    // ‖(H − λI)·x‖ / (‖x‖·‖H‖) = 1 / (growth·‖H‖); once there, one more solve refines the
    // direction (residuals then match the Schur-form path's)
    if (growth * hnorm >= ACCEPT && ++passed > EXTRA) {
      let s = 0;
      for (let i = 0; i < n; i++) s += xr[i] * xr[i] + xi[i] * xi[i];
      const f = 1 / Math.sqrt(s);
      for (let i = 0; i < n; i++) {
        xr[i] *= f;
        xi[i] *= f;
      }
      return true;
    }
  }
  return false;
}
