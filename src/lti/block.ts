import type { Term } from '../simulate/result.js';
import { type Mat, type Vec, matvec } from '../linalg/dense.js';
import type { Block } from './modal.js';

/**
 * The free response e^(Tτ)·w of one modal block, evaluated and written as terms, exactly for
 * each block kind: a real pole, a complex pair (2×2), or a cluster (series around its mean).
 * Forced responses are in response.ts.
 */

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


function maxAbsVec(v: Vec): number {
  let m = 0;
  for (const x of v) m = Math.max(m, Math.abs(x));
  return m;
}
