import type { Term } from '../simulate/result.js';
import { type C, c, cadd, cdiv, cexp, cmul, cscale } from './complex.js';

/**
 * Exact integrals of closed forms over [0, T]: of one sum of terms, and of the product of two
 * (power v·i, or i²·R). Every term is Re[Σ_k C_k·τ^k·e^(κτ)]; a product of two such terms is again
 * of that form (exponents add, conjugate or not), and ∫0^T τ^k·e^(κτ) dτ has a closed form.
 */
interface Mono {
  coef: C;
  k: number;
  kappa: C;
}

function monomials(t: Term): Mono[] {
  const out: Mono[] = [];
  const push = (coef: C, k: number, kappa: C) => {
    if (coef.re !== 0 || coef.im !== 0) out.push({ coef, k, kappa });
  };
  switch (t.kind) {
    case 'exp':
      push(c(t.coef), 0, c(t.lambda));
      break;
    case 'poly-exp':
      t.polyCoefs.forEach((a, k) => push(c(a), k, c(t.lambda)));
      break;
    case 'osc':
      // e^(στ)(a cos ωτ + b sin ωτ) = Re[(a − jb)·e^((σ + jω)τ)]
      push(c(t.cosCoef, -t.sinCoef), 0, c(t.sigma, t.omega));
      break;
    case 'quasi': {
      const n = Math.max(t.cosPoly.length, t.sinPoly.length);
      for (let k = 0; k < n; k++) push(c(t.cosPoly[k] ?? 0, -(t.sinPoly[k] ?? 0)), k, c(t.sigma, t.omega));
      break;
    }
  }
  return out;
}

/** ∫0^T τ^k·e^(κτ) dτ */
export function powerExpIntegral(k: number, kappa: C, T: number): C {
  const z = cscale(kappa, T);
  const small = Math.hypot(z.re, z.im) < 1;
  if (small) {
    // Σ_j κ^j·T^(k+j+1)/(j!·(k+j+1))
    let sum = c(0);
    let term = c(T ** (k + 1));
    for (let j = 0; j < 60; j++) {
      const add = cscale(term, 1 / (k + j + 1));
      sum = cadd(sum, add);
      if (Math.hypot(add.re, add.im) <= 1e-18 * Math.hypot(sum.re, sum.im)) break;
      term = cscale(cmul(term, kappa), T / (j + 1));
    }
    return sum;
  }
  // I_0 = (e^(κT) − 1)/κ,  I_k = (T^k·e^(κT) − k·I_(k−1))/κ
  const e = cexp(z);
  let I = cdiv(cadd(e, c(-1)), kappa);
  for (let j = 1; j <= k; j++) I = cdiv(cadd(cscale(e, T ** j), cscale(I, -j)), kappa);
  return I;
}

export function integrateTerms(terms: Term[], T: number): number {
  let s = 0;
  for (const t of terms) for (const m of monomials(t)) s += cmul(m.coef, powerExpIntegral(m.k, m.kappa, T)).re;
  return s;
}

/** ∫0^T f·g dτ for two sums of terms. */
export function integrateProduct(f: Term[], g: Term[], T: number): number {
  const a = f.flatMap(monomials);
  const b = g.flatMap(monomials);
  let s = 0;
  for (const x of a) {
    for (const y of b) {
      // Re[X]·Re[Y] = ½·Re[X·Y + X·conj(Y)]
      const k = x.k + y.k;
      const direct = cmul(cmul(x.coef, y.coef), powerExpIntegral(k, cadd(x.kappa, y.kappa), T));
      const yc = { re: y.coef.re, im: -y.coef.im };
      const kc = { re: y.kappa.re, im: -y.kappa.im };
      const mixed = cmul(cmul(x.coef, yc), powerExpIntegral(k, cadd(x.kappa, kc), T));
      s += 0.5 * (direct.re + mixed.re);
    }
  }
  return s;
}
