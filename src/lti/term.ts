import type { Term } from '../simulate/result.js';

/** Value of one closed-form term at τ (seconds after the start of its piece). */
export function termValue(term: Term, tau: number): number {
  switch (term.kind) {
    case 'exp':
      return term.lambda === 0 ? term.coef : term.coef * Math.exp(term.lambda * tau);
    case 'osc': {
      const wt = term.omega * tau;
      return Math.exp(term.sigma * tau) * (term.cosCoef * Math.cos(wt) + term.sinCoef * Math.sin(wt));
    }
    case 'poly-exp': {
      let p = 0;
      for (let k = term.polyCoefs.length - 1; k >= 0; k--) p = p * tau + term.polyCoefs[k];
      return term.lambda === 0 ? p : p * Math.exp(term.lambda * tau);
    }
    case 'quasi': {
      const wt = term.omega * tau;
      return Math.exp(term.sigma * tau) * (horner(term.cosPoly, tau) * Math.cos(wt) + horner(term.sinPoly, tau) * Math.sin(wt));
    }
  }
}

function horner(p: number[], x: number): number {
  let v = 0;
  for (let k = p.length - 1; k >= 0; k--) v = v * x + p[k];
  return v;
}

function hornerSlope(p: number[], x: number): number {
  let v = 0;
  for (let k = p.length - 1; k >= 1; k--) v = v * x + k * p[k];
  return v;
}

/** Time derivative of a term at τ. */
export function termSlope(term: Term, tau: number): number {
  switch (term.kind) {
    case 'exp':
      return term.lambda === 0 ? 0 : term.lambda * term.coef * Math.exp(term.lambda * tau);
    case 'osc': {
      const wt = term.omega * tau;
      const e = Math.exp(term.sigma * tau);
      const c = term.cosCoef * Math.cos(wt) + term.sinCoef * Math.sin(wt);
      const s = -term.cosCoef * Math.sin(wt) + term.sinCoef * Math.cos(wt);
      return e * (term.sigma * c + term.omega * s);
    }
    case 'poly-exp': {
      let p = 0;
      let dp = 0;
      for (let k = term.polyCoefs.length - 1; k >= 0; k--) {
        dp = dp * tau + p;
        p = p * tau + term.polyCoefs[k];
      }
      return term.lambda === 0 ? dp : (dp + term.lambda * p) * Math.exp(term.lambda * tau);
    }
    case 'quasi': {
      const wt = term.omega * tau;
      const cw = Math.cos(wt);
      const sw = Math.sin(wt);
      const P = horner(term.cosPoly, tau);
      const Q = horner(term.sinPoly, tau);
      const dP = hornerSlope(term.cosPoly, tau);
      const dQ = hornerSlope(term.sinPoly, tau);
      const v = P * cw + Q * sw;
      const dv = dP * cw - P * term.omega * sw + dQ * sw + Q * term.omega * cw;
      return Math.exp(term.sigma * tau) * (term.sigma * v + dv);
    }
  }
}

export function termsValue(terms: Term[], tau: number): number {
  let s = 0;
  for (const t of terms) s += termValue(t, tau);
  return s;
}

/**
 * A sum of terms regrouped by exponent: Σ_g Re[P_g(τ)·e^(κ_g·τ)], P_g a polynomial with complex
 * coefficients. Terms with the same exponent (a mode's free response and the particular solution
 * that shares it, an oscillation's cosine and sine) cost one exponential together, and derivatives
 * are the same layout with new coefficients: d/dτ (c_k·τ^k·e^(κτ)) = κ·c_k·τ^k·e^(κτ) + k·c_k·τ^(k−1)·e^(κτ).
 */
export interface Groups {
  /** number of groups */
  n: number;
  /** exponent κ = kr + j·ki per group */
  kr: number[];
  ki: number[];
  /** group g owns coefficients off[g] .. off[g+1]−1 (power 0 first) */
  off: number[];
  cr: number[];
  ci: number[];
}

/** An empty grouped sum, to be filled by groupTerms or groupsDerivative (scratch reused per piece). */
export function emptyGroups(): Groups {
  return { n: 0, kr: [], ki: [], off: [0], cr: [], ci: [] };
}

/**
 * Regroups terms by exponent (e^(στ)(a cos ωτ + b sin ωτ) = Re[(a − jb)·e^((σ + jω)τ)]), into `out`
 * when given (its arrays are reused: long pulse trains group tens of thousands of pieces).
 */
export function groupTerms(terms: readonly Term[], out: Groups = emptyGroups()): Groups {
  // first pass: the exponents and each group's polynomial length (kept in off[g + 1]); second: the coefficients
  const { kr, ki, off, cr, ci } = out;
  let n = 0;
  for (let i = 0; i < terms.length; i++) {
    const t = terms[i]!;
    const a = t.kind === 'exp' || t.kind === 'poly-exp' ? t.lambda : t.sigma;
    const w = t.kind === 'exp' || t.kind === 'poly-exp' ? 0 : t.omega;
    const len = t.kind === 'poly-exp' ? t.polyCoefs.length : t.kind === 'quasi' ? Math.max(t.cosPoly.length, t.sinPoly.length) : 1;
    let g = 0;
    while (g < n && !(kr[g] === a && ki[g] === w)) g++;
    if (g === n) {
      kr[n] = a;
      ki[n] = w;
      off[n + 1] = 1;
      n++;
    }
    if (len > off[g + 1]!) off[g + 1] = len;
  }
  off[0] = 0;
  for (let g = 0; g < n; g++) off[g + 1] = off[g]! + off[g + 1]!;
  for (let i = 0; i < off[n]!; i++) {
    cr[i] = 0;
    ci[i] = 0;
  }
  for (let i = 0; i < terms.length; i++) {
    const t = terms[i]!;
    const a = t.kind === 'exp' || t.kind === 'poly-exp' ? t.lambda : t.sigma;
    const w = t.kind === 'exp' || t.kind === 'poly-exp' ? 0 : t.omega;
    let g = 0;
    while (!(kr[g] === a && ki[g] === w)) g++;
    addCoefficients(t, off[g]!, cr, ci);
  }
  out.n = n;
  return out;
}

/** d/dτ of a grouped sum: the same layout (shared), new coefficients (into `out` when given). */
export function groupsDerivative(g: Groups, out: Groups = emptyGroups()): Groups {
  const cr = out.cr;
  const ci = out.ci;
  for (let q = 0; q < g.n; q++) {
    const a = g.kr[q]!;
    const w = g.ki[q]!;
    const start = g.off[q]!;
    const end = g.off[q + 1]!;
    for (let i = start; i < end; i++) {
      const k = i - start;
      const nr = i + 1 < end ? (k + 1) * g.cr[i + 1]! : 0;
      const ni = i + 1 < end ? (k + 1) * g.ci[i + 1]! : 0;
      cr[i] = a * g.cr[i]! - w * g.ci[i]! + nr;
      ci[i] = a * g.ci[i]! + w * g.cr[i]! + ni;
    }
  }
  out.n = g.n;
  out.kr = g.kr;
  out.ki = g.ki;
  out.off = g.off;
  return out;
}

/** Adds a term's polynomial coefficients (real and imaginary parts) into its group starting at o. */
function addCoefficients(t: Term, o: number, cr: number[], ci: number[]): void {
  switch (t.kind) {
    case 'exp':
      cr[o] += t.coef;
      break;
    case 'poly-exp':
      for (let k = 0; k < t.polyCoefs.length; k++) cr[o + k] += t.polyCoefs[k]!;
      break;
    case 'osc':
      cr[o] += t.cosCoef;
      if (t.omega !== 0) ci[o] -= t.sinCoef;
      break;
    case 'quasi':
      for (let k = 0; k < t.cosPoly.length; k++) cr[o + k] += t.cosPoly[k]!;
      if (t.omega !== 0) for (let k = 0; k < t.sinPoly.length; k++) ci[o + k] -= t.sinPoly[k]!;
      break;
  }
}

/** Value of group q of a grouped sum at τ. */
export function groupValue(g: Groups, q: number, tau: number): number {
  const a = g.kr[q]!;
  const w = g.ki[q]!;
  let pr = 0;
  let pi = 0;
  for (let i = g.off[q + 1]! - 1; i >= g.off[q]!; i--) {
    pr = pr * tau + g.cr[i]!;
    pi = pi * tau + g.ci[i]!;
  }
  if (w === 0) return a === 0 ? pr : pr * Math.exp(a * tau);
  const m = a === 0 ? 1 : Math.exp(a * tau);
  return m * (pr * Math.cos(w * tau) - pi * Math.sin(w * tau));
}

/** Value of a grouped sum at τ. */
export function groupsValue(g: Groups, tau: number): number {
  let s = 0;
  for (let q = 0; q < g.n; q++) s += groupValue(g, q, tau);
  return s;
}

/**
 * An upper bound of |Σ groups| over τ ∈ [a, b] (0 ≤ a ≤ b): Σ_g Σ_k |c_k|·b^k·max(e^(Re κ·a), e^(Re κ·b)).
 * NaN when a coefficient is.
 */
export function groupsBound(g: Groups, a: number, b: number): number {
  let s = 0;
  for (let q = 0; q < g.n; q++) {
    let p = 0;
    // |c| as √(re² + im²): overflows to Infinity only beyond 1e154, which leaves the bound valid
    for (let i = g.off[q + 1]! - 1; i >= g.off[q]!; i--) p = p * b + Math.sqrt(g.cr[i]! * g.cr[i]! + g.ci[i]! * g.ci[i]!);
    if (p === 0) continue;
    const kr = g.kr[q]!;
    s += kr === 0 ? p : p * Math.exp(Math.max(kr * a, kr * b));
  }
  return s;
}

/**
 * Several sums of terms regrouped into one shared layout (the union of their exponents, each group
 * as long as its longest polynomial), so that they can be evaluated together: outs[c] gets the
 * coefficients of lists[c]; all outs share the layout arrays of outs[0]. A map finds the groups
 * (a part's voltage and current hold hundreds of modes each).
 */
export function groupTermsAlike(lists: readonly (readonly Term[])[], outs: Groups[]): void {
  const L = outs[0]!;
  const { kr, ki, off } = L;
  const byRe = new Map<number, Map<number, number>>();
  const len: number[] = [];
  let n = 0;
  const groupOf = (a: number, w: number): number => {
    let byIm = byRe.get(a);
    if (!byIm) byRe.set(a, (byIm = new Map()));
    let g = byIm.get(w);
    if (g === undefined) {
      g = n++;
      byIm.set(w, g);
      kr[g] = a;
      ki[g] = w;
      len[g] = 1;
    }
    return g;
  };
  const at: Int32Array[] = lists.map((terms) => {
    const where = new Int32Array(terms.length);
    for (let i = 0; i < terms.length; i++) {
      const t = terms[i]!;
      const a = t.kind === 'exp' || t.kind === 'poly-exp' ? t.lambda : t.sigma;
      const w = t.kind === 'exp' || t.kind === 'poly-exp' ? 0 : t.omega;
      const g = groupOf(a, w);
      where[i] = g;
      const l = t.kind === 'poly-exp' ? t.polyCoefs.length : t.kind === 'quasi' ? Math.max(t.cosPoly.length, t.sinPoly.length) : 1;
      if (l > len[g]!) len[g] = l;
    }
    return where;
  });
  off[0] = 0;
  for (let g = 0; g < n; g++) off[g + 1] = off[g]! + len[g]!;
  L.n = n;
  for (let c = 0; c < lists.length; c++) {
    const out = outs[c]!;
    if (c > 0) {
      out.n = n;
      out.kr = kr;
      out.ki = ki;
      out.off = off;
    }
    const { cr, ci } = out;
    for (let i = 0; i < off[n]!; i++) {
      cr[i] = 0;
      ci[i] = 0;
    }
    const terms = lists[c]!;
    const where = at[c]!;
    for (let i = 0; i < terms.length; i++) {
      const t = terms[i]!;
      addCoefficients(t, off[where[i]!]!, cr, ci);
    }
  }
}
