import { describe, expect, it } from 'vitest';
import { ProductIntegrals } from '../../src/lti/gram.js';
import { integrateProduct } from '../../src/lti/integrate.js';
import { emptyGroups, groupsValue, groupTermsAlike, termsValue } from '../../src/lti/term.js';
import { JointPeaks } from '../../src/measure/joint-peaks.js';
import { peakMagnitude } from '../../src/measure/peak.js';
import { pieceDerivative, pieceValue } from '../../src/measure/evaluate.js';
import type { Piece, Term } from '../../src/simulate/result.js';

const rel = (a: number, b: number) => Math.abs(a - b) / Math.abs(b);

describe('ProductIntegrals: ∫ f·g by one shared table of exponent integrals', () => {
  it('∫0^T e^(−at)·e^(−bt) dt = (1 − e^(−(a+b)T))/(a+b) (calculus, from memory)', () => {
    const P = new ProductIntegrals();
    const a = 3;
    const b = 5;
    const T = 0.7;
    P.pair([{ kind: 'exp', lambda: -a, coef: 1 }], [{ kind: 'exp', lambda: -b, coef: 1 }], T);
    expect(rel(P.fg, (1 - Math.exp(-(a + b) * T)) / (a + b))).toBeLessThan(1e-13);
    // and ∫ g² = (1 − e^(−2bT))/(2b)
    expect(rel(P.gg, (1 - Math.exp(-2 * b * T)) / (2 * b))).toBeLessThan(1e-13);
  });

  it('∫0^T sin²(ωt) dt = T/2 − sin(2ωT)/(4ω) and ∫0^T cos(ωt)·sin(ωt) dt = sin²(ωT)/(2ω) (from memory)', () => {
    const P = new ProductIntegrals();
    const w = 7;
    const T = 1.3;
    const sin: Term[] = [{ kind: 'osc', sigma: 0, omega: w, cosCoef: 0, sinCoef: 1 }];
    const cos: Term[] = [{ kind: 'osc', sigma: 0, omega: w, cosCoef: 1, sinCoef: 0 }];
    P.pair(cos, sin, T);
    expect(rel(P.gg, T / 2 - Math.sin(2 * w * T) / (4 * w))).toBeLessThan(1e-13);
    expect(rel(P.fg, Math.sin(w * T) ** 2 / (2 * w))).toBeLessThan(1e-13);
  });

  it('equals integrateProduct (term pair by term pair) on sums sharing modes, in any order and over several lengths', () => {
    // many "parts" drawn from the same modes, as a run's part voltages and currents are
    let seed = 7;
    const rnd = () => ((seed = (Math.imul(seed, 1664525) + 1013904223) >>> 0) / 4294967296) * 2 - 1;
    const modes = [-1e3, -2.5e3, -7e4, 0];
    const osc = [
      { sigma: -400, omega: 9e3 },
      { sigma: -3e3, omega: 2e4 },
    ];
    const draw = (): Term[] => {
      const t: Term[] = modes.map((lambda) => ({ kind: 'exp', lambda, coef: rnd() }));
      for (const o of osc) t.push({ kind: 'osc', ...o, cosCoef: rnd(), sinCoef: rnd() });
      t.push({ kind: 'poly-exp', lambda: -1e3, polyCoefs: [rnd(), 1e3 * rnd()] });
      t.push({ kind: 'quasi', sigma: -400, omega: 9e3, cosPoly: [rnd(), 100 * rnd()], sinPoly: [rnd()] });
      // reversed order: the layout must not depend on it
      return rnd() > 0 ? t : t.reverse();
    };
    const P = new ProductIntegrals();
    for (const T of [1e-5, 3e-4, 2e-3]) {
      for (let k = 0; k < 6; k++) {
        const f = draw();
        const g = draw();
        P.pair(f, g, T);
        const fg = integrateProduct(f, g, T);
        const gg = integrateProduct(g, g, T);
        const scale = (x: Term[]) => Math.sqrt(integrateProduct(x, x, T));
        expect(Math.abs(P.fg - fg)).toBeLessThan(1e-13 * scale(f) * scale(g));
        expect(Math.abs(P.gg - gg)).toBeLessThan(1e-13 * gg);
      }
    }
  });
});

describe('groupTermsAlike', () => {
  it('gives each sum its own value in one shared layout', () => {
    const a: Term[] = [
      { kind: 'exp', lambda: -2, coef: 1.5 },
      { kind: 'osc', sigma: -1, omega: 3, cosCoef: 0.2, sinCoef: -0.7 },
    ];
    const b: Term[] = [
      { kind: 'poly-exp', lambda: -2, polyCoefs: [0.1, 0.4, -0.3] },
      { kind: 'exp', lambda: -9, coef: 2 },
    ];
    const A = emptyGroups();
    const B = emptyGroups();
    groupTermsAlike([a, b], [A, B]);
    expect(B.kr).toBe(A.kr);
    for (const t of [0, 0.3, 1.7]) {
      expect(groupsValue(A, t)).toBeCloseTo(termsValue(a, t), 14);
      expect(groupsValue(B, t)).toBeCloseTo(termsValue(b, t), 14);
    }
  });
});

describe('JointPeaks against the one-signal search of peak.ts (peakMagnitude)', () => {
  it('finds the same peak |v|, |i| and |v·i| of a ringing response', () => {
    // an underdamped series RLC's capacitor voltage and current (shape from memory): 1 − e^(−σt)(cos ωt + σ/ω sin ωt)
    const s = 300;
    const w = 5e3;
    const v: Piece = { t0: 0, t1: 0.01, impulseArea: 0, terms: [{ kind: 'exp', lambda: 0, coef: 1 }, { kind: 'osc', sigma: -s, omega: w, cosCoef: -1, sinCoef: -s / w }] };
    const i: Piece = { t0: 0, t1: 0.01, impulseArea: 0, terms: [{ kind: 'osc', sigma: -s, omega: w, cosCoef: 0, sinCoef: 2e-3 }] };
    const J = new JointPeaks();
    const pv = { value: 0, time: 0 };
    const pi = { value: 0, time: 0 };
    const pp = { value: 0, time: 0 };
    J.search(v, i, 0, 0.01, w, s, pv, pi, pp);
    const one = (f: (t: number) => number, df: (t: number) => number) => peakMagnitude({ f, df, lo: 0, hi: 0.01, omega: 2 * w, rate: 2 * s });
    const ev = one((t) => pieceValue(v, t), (t) => pieceDerivative(v, t));
    const ei = one((t) => pieceValue(i, t), (t) => pieceDerivative(i, t));
    const ep = one(
      (t) => pieceValue(v, t) * pieceValue(i, t),
      (t) => pieceDerivative(v, t) * pieceValue(i, t) + pieceValue(v, t) * pieceDerivative(i, t),
    );
    expect(rel(pv.value, ev.value)).toBeLessThan(1e-12);
    expect(Math.abs(pv.time - ev.time)).toBeLessThan(1e-12);
    expect(rel(pi.value, ei.value)).toBeLessThan(1e-12);
    expect(Math.abs(pi.time - ei.time)).toBeLessThan(1e-12);
    expect(rel(pp.value, ep.value)).toBeLessThan(1e-12);
    expect(Math.abs(pp.time - ep.time)).toBeLessThan(1e-12);
    // first overshoot of the voltage at t = π/ω, 1 + e^(−σπ/ω) (from memory)
    expect(rel(pv.value, 1 + Math.exp((-s * Math.PI) / w))).toBeLessThan(1e-12);
    expect(rel(pv.time, Math.PI / w)).toBeLessThan(1e-9);
  });
});
