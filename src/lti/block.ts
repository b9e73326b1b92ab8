import type { Term } from '../simulate/result.js';
import { type Mat, type Vec, identity, matvec } from '../linalg/dense.js';
import { solveSquare } from '../linalg/factor.js';
import type { Block } from './modal.js';

/**
 * Exact response of one modal block  ξ' = T·ξ + g0 + g1·τ  from ξ(0) = ξ0, written as
 *
 *   ξ(τ) = Σ_j poly[j]·τʲ + e^(Tτ)·w
 *
 * The polynomial is the particular solution; w = ξ0 − poly[0]. When T is (nearly) singular
 * relative to the span (an integrator: a capacitor fed by a current source with no path to
 * discharge), no particular solution exists and the whole response is a power series in τ,
 * summed until the terms are negligible over the span.
 */
export interface BlockSolution {
  poly: Vec[];
  w: Vec | null;
}

export function solveBlock(b: Block, xi0: Vec, g0: Vec, g1: Vec, span: number): BlockSolution {
  const k = b.T.length;
  if (isFlat(b, span)) return { poly: seriesSolution(b.T, xi0, g0, g1, span), w: null };
  // T·p1 = −g1;  T·p0 = p1 − g0
  const p1 = solveVec(b.T, g1.map((v) => -v));
  const p0 = solveVec(b.T, p1.map((v, i) => v - g0[i]));
  const w = xi0.map((v, i) => v - p0[i]);
  void k;
  return { poly: [p0, p1], w };
}

/** |λ|·span so small that e^(λτ) is a polynomial to working precision over the span. */
function isFlat(b: Block, span: number): boolean {
  const r = Math.max(...b.eig.map((e) => Math.hypot(e.re, e.im)));
  return r * span < 1e-6;
}

function solveVec(T: Mat, v: Vec): Vec {
  if (T.length === 1) return [v[0] / T[0][0]];
  return solveSquare(T, v.map((x) => [x])).map((r) => r[0]);
}

/** ξ(τ) = Σ T^j τ^j/j! ξ0 + Σ T^j τ^(j+1)/(j+1)! g0 + Σ T^j τ^(j+2)/(j+2)! g1, as coefficients of τ^j. */
function seriesSolution(T: Mat, xi0: Vec, g0: Vec, g1: Vec, span: number): Vec[] {
  const k = T.length;
  const out: Vec[] = [];
  const addAt = (deg: number, v: Vec, f: number) => {
    while (out.length <= deg) out.push(new Array<number>(k).fill(0));
    for (let i = 0; i < k; i++) out[deg][i] += v[i] * f;
  };
  let a = xi0.slice();
  let b0 = g0.slice();
  let b1 = g1.slice();
  let fact = 1;
  for (let j = 0; j < 40; j++) {
    addAt(j, a, 1 / fact);
    addAt(j + 1, b0, 1 / (fact * (j + 1)));
    addAt(j + 2, b1, 1 / (fact * (j + 1) * (j + 2)));
    a = matvec(T, a);
    b0 = matvec(T, b0);
    b1 = matvec(T, b1);
    fact *= j + 1;
    const size = Math.max(maxAbsVec(a), maxAbsVec(b0) * span, maxAbsVec(b1) * span * span);
    if (size * span ** (j + 1) / (fact * (j + 1)) < 1e-20 * (1 + maxAbsVec(out[0]))) break;
  }
  return out;
}

/** e^(Tτ)·w evaluated exactly for the block kind. */
export function blockExp(b: Block, tau: number, w: Vec): Vec {
  const T = b.T;
  switch (b.kind) {
    case 'real':
      return [Math.exp(T[0][0] * tau) * w[0]];
    case 'pair': {
      const { mu, omega } = pairParams(T);
      const c0 = Math.exp(mu * tau) * Math.cos(omega * tau);
      const c1 = (Math.exp(mu * tau) * Math.sin(omega * tau)) / omega;
      const Nw = matvec(shift(T, mu), w);
      return w.map((v, i) => c0 * v + c1 * Nw[i]);
    }
    case 'cluster': {
      const { mu, powers } = clusterSeries(T, w, tau);
      const em = Math.exp(mu * tau);
      const out = new Array<number>(w.length).fill(0);
      let f = 1;
      powers.forEach((p, j) => {
        if (j > 0) f *= tau / j;
        for (let i = 0; i < out.length; i++) out[i] += em * f * p[i];
      });
      return out;
    }
  }
}

/** Terms of γ·e^(Tτ)·w for an output row γ restricted to the block. */
export function blockTerms(b: Block, gamma: Vec, w: Vec, span: number): Term[] {
  const T = b.T;
  const g = (v: Vec) => gamma.reduce((acc, c, i) => acc + c * v[i], 0);
  switch (b.kind) {
    case 'real':
      return [{ kind: 'exp', lambda: T[0][0], coef: gamma[0] * w[0] }];
    case 'pair': {
      const { mu, omega } = pairParams(T);
      return [{ kind: 'osc', sigma: mu, omega, cosCoef: g(w), sinCoef: g(matvec(shift(T, mu), w)) / omega }];
    }
    case 'cluster': {
      const { mu, powers } = clusterSeries(T, w, span);
      let f = 1;
      const polyCoefs = powers.map((p, j) => {
        if (j > 0) f /= j;
        return g(p) * f;
      });
      return [{ kind: 'poly-exp', lambda: mu, polyCoefs }];
    }
  }
}

function pairParams(T: Mat): { mu: number; omega: number } {
  const mu = (T[0][0] + T[1][1]) / 2;
  const det = T[0][0] * T[1][1] - T[0][1] * T[1][0];
  return { mu, omega: Math.sqrt(Math.max(det - mu * mu, 0)) };
}

function shift(T: Mat, mu: number): Mat {
  return T.map((row, i) => row.map((v, j) => v - (i === j ? mu : 0)));
}

/** μ = mean eigenvalue; powers[j] = Nʲ·w with N = T − μI, as many as matter over `span`. */
function clusterSeries(T: Mat, w: Vec, span: number): { mu: number; powers: Vec[] } {
  const k = T.length;
  let mu = 0;
  for (let i = 0; i < k; i++) mu += T[i][i];
  mu /= k;
  const N = shift(T, mu);
  const powers: Vec[] = [w.slice()];
  let fact = 1;
  const base = Math.max(maxAbsVec(w), 1e-300);
  for (let j = 1; j < 200; j++) {
    const next = matvec(N, powers[j - 1]);
    fact *= j;
    const size = maxAbsVec(next);
    if (size === 0) break;
    powers.push(next);
    if (j >= k && (size * Math.abs(span) ** j) / fact < 1e-18 * base) break;
  }
  return { mu, powers };
}

export { identity };

function maxAbsVec(v: Vec): number {
  let m = 0;
  for (const x of v) m = Math.max(m, Math.abs(x));
  return m;
}
