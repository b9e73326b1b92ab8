import type { Term } from '../simulate/result.js';
import type { C } from './complex.js';

/**
 * Exact integrals of closed forms over [0, T]: of one sum of terms, and of the product of two
 * (power v·i, or i²·R). Every term is Re[Σ_k C_k·τ^k·e^(κτ)]; a product of two such terms is again
 * of that form (exponents add, conjugate or not), and ∫0^T τ^k·e^(κτ) dτ has a closed form.
 * Written with plain numbers (no complex objects): long pulse trains integrate tens of thousands
 * of pieces.
 */
interface Monos {
  /** per monomial: coefficient (re, im), power k, exponent (re, im) */
  cre: number[];
  cim: number[];
  k: number[];
  kre: number[];
  kim: number[];
}

function monomials(terms: Term[]): Monos {
  const m: Monos = { cre: [], cim: [], k: [], kre: [], kim: [] };
  const push = (re: number, im: number, k: number, kr: number, ki: number) => {
    if (re === 0 && im === 0) return;
    m.cre.push(re);
    m.cim.push(im);
    m.k.push(k);
    m.kre.push(kr);
    m.kim.push(ki);
  };
  for (const t of terms) {
    switch (t.kind) {
      case 'exp':
        push(t.coef, 0, 0, t.lambda, 0);
        break;
      case 'poly-exp':
        t.polyCoefs.forEach((a, k) => push(a, 0, k, t.lambda, 0));
        break;
      case 'osc':
        // e^(στ)(a cos ωτ + b sin ωτ) = Re[(a − jb)·e^((σ + jω)τ)]
        push(t.cosCoef, -t.sinCoef, 0, t.sigma, t.omega);
        break;
      case 'quasi': {
        const n = Math.max(t.cosPoly.length, t.sinPoly.length);
        for (let k = 0; k < n; k++) push(t.cosPoly[k] ?? 0, -(t.sinPoly[k] ?? 0), k, t.sigma, t.omega);
        break;
      }
    }
  }
  return m;
}

// output slots of powerExpIntegralInto (no allocation on the hot path)
let outRe = 0;
let outIm = 0;

/** ∫0^T τ^k·e^(κτ) dτ into (outRe, outIm). */
function powerExpIntegralInto(k: number, kr: number, ki: number, T: number): void {
  const zr = kr * T;
  const zi = ki * T;
  if (zr * zr + zi * zi < 1) {
    // Σ_j κ^j·T^(k+j+1)/(j!·(k+j+1))
    let sr = 0;
    let si = 0;
    let tr = T ** (k + 1);
    let ti = 0;
    for (let j = 0; j < 60; j++) {
      const f = 1 / (k + j + 1);
      const ar = tr * f;
      const ai = ti * f;
      sr += ar;
      si += ai;
      // |a| ≤ 1e-18·|s| (with the 1-norm, cheaper than hypot on this hot path)
      if (Math.abs(ar) + Math.abs(ai) <= 1e-18 * (Math.abs(sr) + Math.abs(si))) break;
      // term *= κ·T/(j+1)
      const nr = (tr * kr - ti * ki) * (T / (j + 1));
      const ni = (tr * ki + ti * kr) * (T / (j + 1));
      tr = nr;
      ti = ni;
    }
    outRe = sr;
    outIm = si;
    return;
  }
  // I_0 = (e^(κT) − 1)/κ,  I_j = (T^j·e^(κT) − j·I_(j−1))/κ
  const m = Math.exp(zr);
  const er = m * Math.cos(zi);
  const ei = m * Math.sin(zi);
  const den = kr * kr + ki * ki;
  const div = (ar: number, ai: number) => {
    outRe = (ar * kr + ai * ki) / den;
    outIm = (ai * kr - ar * ki) / den;
  };
  div(er - 1, ei);
  for (let j = 1; j <= k; j++) {
    const tj = T ** j;
    div(er * tj - j * outRe, ei * tj - j * outIm);
  }
}

/** ∫0^T τ^k·e^(κτ) dτ */
export function powerExpIntegral(k: number, kappa: C, T: number): C {
  powerExpIntegralInto(k, kappa.re, kappa.im, T);
  return { re: outRe, im: outIm };
}

export function integrateTerms(terms: Term[], T: number): number {
  const m = monomials(terms);
  let s = 0;
  for (let i = 0; i < m.k.length; i++) {
    powerExpIntegralInto(m.k[i], m.kre[i], m.kim[i], T);
    s += m.cre[i] * outRe - m.cim[i] * outIm;
  }
  return s;
}

/** ∫0^T f·g dτ for two sums of terms. */
export function integrateProduct(f: Term[], g: Term[], T: number): number {
  const a = monomials(f);
  const b = monomials(g);
  let s = 0;
  for (let x = 0; x < a.k.length; x++) {
    for (let y = 0; y < b.k.length; y++) {
      // Re[X]·Re[Y] = ½·Re[X·Y + X·conj(Y)]
      const k = a.k[x] + b.k[y];
      const pr = a.cre[x] * b.cre[y] - a.cim[x] * b.cim[y];
      const pi = a.cre[x] * b.cim[y] + a.cim[x] * b.cre[y];
      powerExpIntegralInto(k, a.kre[x] + b.kre[y], a.kim[x] + b.kim[y], T);
      let re = pr * outRe - pi * outIm;
      const qr = a.cre[x] * b.cre[y] + a.cim[x] * b.cim[y];
      const qi = -a.cre[x] * b.cim[y] + a.cim[x] * b.cre[y];
      powerExpIntegralInto(k, a.kre[x] + b.kre[y], a.kim[x] - b.kim[y], T);
      re += qr * outRe - qi * outIm;
      s += 0.5 * re;
    }
  }
  return s;
}
