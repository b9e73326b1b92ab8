import type { Term } from '../simulate/result.js';

/**
 * Bring a sum of terms to its plainest equivalent form: terms sharing the same exponent σ and
 * frequency ω are merged, and each group is written as the simplest kind that holds it
 * (a constant or e^(λt), a damped cosine/sine, a polynomial times e^(λt), or the general form).
 */
export function simplifyTerms(terms: Term[]): Term[] {
  type Group = { sigma: number; omega: number; cos: number[]; sin: number[] };
  // by σ, then ω (number keys: no string per term for the thousands of terms of a large circuit;
  // the same grouping, 0 and −0 together)
  const groups = new Map<number, Map<number, Group>>();
  const order: Group[] = [];
  for (const t of terms) {
    const q = asQuasi(t);
    let bySigma = groups.get(q.sigma);
    if (!bySigma) groups.set(q.sigma, (bySigma = new Map()));
    let g = bySigma.get(q.omega);
    if (!g) {
      g = { sigma: q.sigma, omega: q.omega, cos: [], sin: [] };
      bySigma.set(q.omega, g);
      order.push(g);
    }
    q.cos.forEach((v, k) => (g!.cos[k] = (g!.cos[k] ?? 0) + v));
    q.sin.forEach((v, k) => (g!.sin[k] = (g!.sin[k] ?? 0) + v));
  }
  const out: Term[] = [];
  for (const g of order) {
    const cos = trim(Array.from(g.cos, (v) => v ?? 0));
    const sin = g.omega === 0 ? [] : trim(Array.from(g.sin, (v) => v ?? 0));
    if (cos.length === 0 && sin.length === 0) continue;
    if (g.omega === 0) {
      out.push(cos.length === 1 ? { kind: 'exp', lambda: g.sigma, coef: cos[0] } : { kind: 'poly-exp', lambda: g.sigma, polyCoefs: cos });
    } else if (cos.length <= 1 && sin.length <= 1) {
      out.push({ kind: 'osc', sigma: g.sigma, omega: g.omega, cosCoef: cos[0] ?? 0, sinCoef: sin[0] ?? 0 });
    } else {
      out.push({ kind: 'quasi', sigma: g.sigma, omega: g.omega, cosPoly: cos, sinPoly: sin });
    }
  }
  // constants first, then by decay (slowest first)
  return out.sort((a, b) => rank(a) - rank(b));
}

function rank(t: Term): number {
  // (no object per comparison)
  const sigma = t.kind === 'exp' || t.kind === 'poly-exp' ? t.lambda : t.sigma;
  const omega = t.kind === 'exp' || t.kind === 'poly-exp' ? 0 : t.omega;
  if (sigma === 0 && omega === 0) return -Infinity;
  return -sigma;
}

function asQuasi(t: Term): { sigma: number; omega: number; cos: number[]; sin: number[] } {
  switch (t.kind) {
    case 'exp':
      return { sigma: t.lambda, omega: 0, cos: [t.coef], sin: [] };
    case 'poly-exp':
      return { sigma: t.lambda, omega: 0, cos: t.polyCoefs.slice(), sin: [] };
    case 'osc':
      return { sigma: t.sigma, omega: t.omega, cos: [t.cosCoef], sin: [t.sinCoef] };
    case 'quasi':
      return { sigma: t.sigma, omega: t.omega, cos: t.cosPoly.slice(), sin: t.sinPoly.slice() };
  }
}

function trim(a: number[]): number[] {
  const out = a.slice();
  while (out.length && out[out.length - 1] === 0) out.pop();
  return out;
}
