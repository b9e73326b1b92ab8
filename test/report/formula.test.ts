import { describe, expect, it } from 'vitest';
import { formatPieces, formatTerms, timeVariable, unitCoefs } from '../../src/report/formula.js';
import type { Piece } from '../../src/simulate/result.js';

const V = unitCoefs('V');

describe('closed forms in words', () => {
  it('writes exponentials with their time constant', () => {
    expect(formatTerms([{ kind: 'exp', lambda: 0, coef: 12 }, { kind: 'exp', lambda: -1000, coef: -12 }], 't', V)).toBe('12 V − 12 V·e^(−t/1.00 ms)');
  });

  it('writes an oscillation as amplitude, envelope, frequency in Hz and phase in degrees', () => {
    // cos x + sin x = √2·cos(x − 45°)
    const text = formatTerms([{ kind: 'osc', sigma: -5000, omega: 2 * Math.PI * 1000, cosCoef: 1, sinCoef: 1 }], 't', V);
    expect(text).toBe('1.414 V·e^(−t/200 µs)·cos(2π·1.000 kHz·t − 45°)');
  });

  it('writes a repeated pole as a polynomial in t/τ, and drops a bare 1', () => {
    const text = formatTerms([{ kind: 'poly-exp', lambda: -1e4, polyCoefs: [-1, -1e4] }], 't', unitCoefs(''));
    expect(text).toBe('(−1 − (t/100 µs))·e^(−t/100 µs)');
  });

  it('writes a ramp with a per-second unit and leaves out rounding noise', () => {
    const floor = { value: 1e-12, timeScale: 1e-3 };
    expect(formatTerms([{ kind: 'poly-exp', lambda: 0, polyCoefs: [1e-17, 16.5e3] }], 't', V, [], floor)).toBe('16.5 kV/s·t');
    expect(formatTerms([{ kind: 'exp', lambda: 0, coef: 24 }, { kind: 'poly-exp', lambda: 0, polyCoefs: [0, 2e-10] }], 't', V, [], floor)).toBe('24 V');
  });

  it('measures later pieces from their start and names the interval', () => {
    expect(timeVariable(1e-3)).toBe('(t − 1 ms)');
    const pieces: Piece[] = [
      { t0: 0, t1: 1e-3, terms: [{ kind: 'exp', lambda: 0, coef: 0 }], impulseArea: 0 },
      { t0: 1e-3, t1: Infinity, terms: [{ kind: 'exp', lambda: -1000, coef: 5 }], impulseArea: 2e-6 },
    ];
    expect(formatPieces('v(x)', 'V', pieces, 5e-3)).toEqual([
      'for 0 s ≤ t < 1 ms:',
      '  v(x) = 0 V',
      'for t ≥ 1 ms:',
      '  v(x) = 5 V·e^(−(t − 1 ms)/1.00 ms) + 2 µV·s·δ(t − 1 ms)',
    ]);
  });
});

describe('noise judgement across units', () => {
  it('keeps ordinary terms beside a high-order polynomial whose coefficients are huge in per-second units', () => {
    const lambda = -11255;
    const poly = [0, 0, -13.41 * lambda ** 2, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, -19.22e-12 * (-lambda) ** 16];
    const text = formatTerms(
      [
        { kind: 'poly-exp', lambda: 0, polyCoefs: [29.21, 40e3] },
        { kind: 'poly-exp', lambda, polyCoefs: poly },
        { kind: 'osc', sigma: -25887, omega: 58037, cosCoef: -2.4, sinCoef: -6.96 },
      ],
      't',
      unitCoefs('A'),
      [],
      { value: 1e-12 * 20, timeScale: 50e-6 },
    );
    expect(text).toContain('29.21 A + 40 kA/s·t');
    expect(text).toContain('cos(2π·9.237 kHz·t');
    expect(text).toContain('13.41 A·(t/88.8 µs)²');
    expect(text).not.toContain('¹⁶'); // 19 pA·(50 µs/88.8 µs)¹⁶ is far below the noise floor
  });
});
