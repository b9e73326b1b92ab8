import { describe, expect, it } from 'vitest';
import {
  evaluatePieces,
  evaluatePiecesBefore,
  evaluatePiecesDerivative,
  termDerivative,
  termValue,
} from '../../src/measure/evaluate.js';
import type { Term } from '../../src/simulate/result.js';
import { piece } from './helpers.js';

const terms: Term[] = [
  { kind: 'exp', lambda: 0, coef: 3 },
  { kind: 'exp', lambda: -1e3, coef: -2 },
  { kind: 'osc', sigma: -500, omega: 2e4, cosCoef: 1.5, sinCoef: -0.7 },
  { kind: 'osc', sigma: 0, omega: 100, cosCoef: 0, sinCoef: 1 },
  { kind: 'poly-exp', lambda: -2e3, polyCoefs: [1, 4e3, -3e6] },
  { kind: 'poly-exp', lambda: 0, polyCoefs: [0, 2] },
];

describe('term evaluation', () => {
  it('matches the written-out formulas', () => {
    const tau = 3.7e-4;
    expect(termValue(terms[1]!, tau)).toBeCloseTo(-2 * Math.exp(-1e3 * tau), 15);
    const osc = Math.exp(-500 * tau) * (1.5 * Math.cos(2e4 * tau) - 0.7 * Math.sin(2e4 * tau));
    expect(termValue(terms[2]!, tau)).toBeCloseTo(osc, 15);
    const pe = (1 + 4e3 * tau - 3e6 * tau * tau) * Math.exp(-2e3 * tau);
    expect(termValue(terms[4]!, tau)).toBeCloseTo(pe, 15);
    expect(termValue(terms[5]!, tau)).toBeCloseTo(2 * tau, 15);
  });

  it('derivatives agree with a central difference', () => {
    const tau = 2.3e-4;
    const h = 1e-9;
    for (const term of terms) {
      const fd = (termValue(term, tau + h) - termValue(term, tau - h)) / (2 * h);
      const d = termDerivative(term, tau);
      expect(Math.abs(d - fd)).toBeLessThan(1e-5 * Math.max(1, Math.abs(d)));
    }
  });
});

describe('piece selection', () => {
  const pieces = [piece(0, 1e-3, [{ kind: 'exp', lambda: 0, coef: 1 }]), piece(1e-3, Infinity, [{ kind: 'exp', lambda: -1e3, coef: 5 }])];

  it('uses τ = t − t0 of the piece that holds t', () => {
    expect(evaluatePieces(pieces, 0.5e-3)).toBe(1);
    expect(evaluatePieces(pieces, 2e-3)).toBeCloseTo(5 * Math.exp(-1), 14);
    expect(evaluatePiecesDerivative(pieces, 2e-3)).toBeCloseTo(-5e3 * Math.exp(-1), 10);
  });

  it('gives the right-hand value on a boundary and the left-hand limit on request', () => {
    expect(evaluatePieces(pieces, 1e-3)).toBe(5);
    expect(evaluatePiecesBefore(pieces, 1e-3)).toBe(1);
  });
});

describe('quasi terms (a mode driven by a ramp or a sinusoid)', () => {
  const q: Term = { kind: 'quasi', sigma: -300, omega: 5e3, cosPoly: [1, 200, -4e4], sinPoly: [0.5, -100] };
  it('value is e^(στ)(P(τ)cos ωτ + S(τ)sin ωτ)', () => {
    const tau = 4.1e-4;
    const P = 1 + 200 * tau - 4e4 * tau * tau;
    const S = 0.5 - 100 * tau;
    const expected = Math.exp(-300 * tau) * (P * Math.cos(5e3 * tau) + S * Math.sin(5e3 * tau));
    expect(termValue(q, tau)).toBeCloseTo(expected, 14);
  });
  it('derivative agrees with a central difference', () => {
    const tau = 7.7e-4;
    const h = 1e-9;
    const fd = (termValue(q, tau + h) - termValue(q, tau - h)) / (2 * h);
    expect(Math.abs(termDerivative(q, tau) - fd)).toBeLessThan(1e-5 * Math.abs(fd));
  });
});
