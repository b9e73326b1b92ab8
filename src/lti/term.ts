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

export function termsSlope(terms: Term[], tau: number): number {
  let s = 0;
  for (const t of terms) s += termSlope(t, tau);
  return s;
}
