/**
 * Integrals of products of closed forms (the RMS and energy of a trace) against elementary
 * integrals (textbook, from memory): ∫0^T e^(at)·e^(bt) dt = (e^((a+b)T) − 1)/(a + b) and
 * ∫0^T e^(2σt)·cos²(ωt) dt = (e^(2σT) − 1)/(4σ) + Re[(e^((2σ + 2jω)T) − 1)/(2·(2σ + 2jω))],
 * over spans where each mode has decayed a little, a lot, or below the range of doubles.
 */
import { describe, expect, it } from 'vitest';
import { integrateProduct } from '../../src/lti/integrate.js';
import type { Term } from '../../src/simulate/result.js';

describe('integrateProduct', () => {
  it('two real exponentials and their square, decays e^(−0.5) … e^(−2000) over the span', () => {
    for (const T of [1e-4, 3e-3, 1]) {
      const a = -5e3;
      const b = -2e3;
      const f: Term[] = [{ kind: 'exp', lambda: a, coef: 1.5 }];
      const g: Term[] = [{ kind: 'exp', lambda: b, coef: -0.7 }];
      const cross = (1.5 * -0.7 * Math.expm1((a + b) * T)) / (a + b);
      expect(Math.abs(integrateProduct(f, g, T) - cross) / Math.abs(cross)).toBeLessThan(1e-13);
      const sq = (1.5 * 1.5 * Math.expm1(2 * a * T)) / (2 * a);
      expect(Math.abs(integrateProduct(f, f, T) - sq) / Math.abs(sq)).toBeLessThan(1e-13);
    }
  });

  it('a damped cosine squared, with a second mode beside it', () => {
    const sigma = -300;
    const omega = 2 * Math.PI * 1e4;
    for (const T of [1e-3, 1e-2, 4]) {
      const f: Term[] = [{ kind: 'osc', sigma, omega, cosCoef: 1, sinCoef: 0 }];
      const re2 = 2 * sigma;
      const im2 = 2 * omega;
      const e = Math.exp(re2 * T);
      // Re[(e^((re2 + j·im2)T) − 1)/(re2 + j·im2)] / 2
      const nr = e * Math.cos(im2 * T) - 1;
      const ni = e * Math.sin(im2 * T);
      const osc = (nr * re2 + ni * im2) / (re2 * re2 + im2 * im2) / 2;
      const want = Math.expm1(re2 * T) / (4 * sigma) + osc;
      expect(Math.abs(integrateProduct(f, f, T) - want) / want).toBeLessThan(1e-12);
      // a fast mode beside it changes nothing it does not reach: f·h with h = e^(−1e6 t)
      const h: Term[] = [{ kind: 'exp', lambda: -1e6, coef: 1 }];
      const fh = (() => {
        // ∫ e^((σ − 1e6)t)·cos ωt dt = Re[(e^(κT) − 1)/κ], κ = σ − 1e6 + jω
        const kr = sigma - 1e6;
        const m = Math.exp(kr * T);
        const ar = m * Math.cos(omega * T) - 1;
        const ai = m * Math.sin(omega * T);
        return (ar * kr + ai * omega) / (kr * kr + omega * omega);
      })();
      expect(Math.abs(integrateProduct(f, h, T) - fh) / Math.abs(fh)).toBeLessThan(1e-12);
    }
  });
});
