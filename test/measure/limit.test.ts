import { describe, expect, it } from 'vitest';
import { steadyStateLimit } from '../../src/measure/limit.js';
import { piece, underdampedStep } from './helpers.js';

describe('steadyStateLimit', () => {
  it('is the constant part when every other term decays', () => {
    expect(steadyStateLimit(underdampedStep(1e3, 0.2, 5))).toBe(5);
    expect(steadyStateLimit([piece(0, 1, [{ kind: 'exp', lambda: -3, coef: 2 }])])).toBe(0);
  });
  it('uses the last piece', () => {
    const ps = [piece(0, 1, [{ kind: 'exp', lambda: 0, coef: 1 }]), piece(1, Infinity, [{ kind: 'exp', lambda: 0, coef: 7 }])];
    expect(steadyStateLimit(ps)).toBe(7);
  });
  it('is null for a ramp, an undamped oscillation or no pieces', () => {
    expect(steadyStateLimit([piece(0, Infinity, [{ kind: 'poly-exp', lambda: 0, polyCoefs: [1, 2] }])])).toBeNull();
    expect(steadyStateLimit([piece(0, Infinity, [{ kind: 'osc', sigma: 0, omega: 5, cosCoef: 1, sinCoef: 0 }])])).toBeNull();
    expect(steadyStateLimit([])).toBeNull();
  });
});
