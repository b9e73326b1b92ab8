import { describe, expect, it } from 'vitest';
import type { Piece } from '../../src/simulate/result.js';
import { sampleUniform } from '../../src/simulate/sample.js';

// The recurrence sampler against the formulas evaluated directly at every sample:
// v(t) = 3 − 2·e^(−t/τ) on the first piece, then e^(−αt)(cos ωt + 0.4·sin ωt) + 0.5·t·e^(−t/τ).
describe('uniform-grid sampling of closed forms', () => {
  const tau = 1.3e-4;
  const alpha = 2.1e3;
  const w = 2 * Math.PI * 47e3;
  const t1 = 3.7e-4;
  const span = 2e-3;
  const pieces: Piece[] = [
    { t0: 0, t1, impulseArea: 0, terms: [{ kind: 'exp', lambda: 0, coef: 3 }, { kind: 'exp', lambda: -1 / tau, coef: -2 }] },
    {
      t0: t1,
      t1: span,
      impulseArea: 0,
      terms: [
        { kind: 'osc', sigma: -alpha, omega: w, cosCoef: 1, sinCoef: 0.4 },
        { kind: 'poly-exp', lambda: -1 / tau, polyCoefs: [0, 0.5] },
      ],
    },
  ];
  const direct = (t: number) => {
    if (t < t1) return 3 - 2 * Math.exp(-t / tau);
    const s = t - t1;
    return Math.exp(-alpha * s) * (Math.cos(w * s) + 0.4 * Math.sin(w * s)) + 0.5 * s * Math.exp(-s / tau);
  };

  it('matches direct evaluation to a few ulps of the terms on 10 001 samples', () => {
    const N = 10001;
    const times = new Float64Array(N);
    for (let k = 0; k < N; k++) times[k] = (span * k) / (N - 1);
    const v = sampleUniform(pieces, times);
    let worst = 0;
    for (let k = 0; k < N; k++) worst = Math.max(worst, Math.abs(v[k] - direct(times[k])));
    expect(worst).toBeLessThan(1e-13);
    // each sample lands on the piece that starts at or before it
    const k1 = Math.ceil((t1 / span) * (N - 1));
    expect(v[k1]).toBeCloseTo(direct(times[k1]), 13);
  });

  it('handles pieces holding only a few samples each', () => {
    const times = new Float64Array([0, 1e-4, 3.69e-4, 3.7e-4, 1e-3, 2e-3]);
    const v = sampleUniform(pieces, times);
    times.forEach((t, k) => expect(Math.abs(v[k] - direct(t))).toBeLessThan(1e-15));
  });

  it('stops a decayed term only where it is far below the rounding of the sum', () => {
    // 5e3·e^(−t/1 ns) dies within a few samples; 2·e^(−t/0.4 ms) carries the rest
    const p: Piece[] = [{ t0: 0, t1: 1e-3, impulseArea: 0, terms: [{ kind: 'exp', lambda: -1e9, coef: 5e3 }, { kind: 'exp', lambda: -2.5e3, coef: 2 }, { kind: 'osc', sigma: -3e8, omega: 1e9, cosCoef: 40, sinCoef: -7 }] }];
    const N = 4001;
    const times = new Float64Array(N);
    for (let k = 0; k < N; k++) times[k] = (1e-3 * k) / (N - 1);
    const v = sampleUniform(p, times);
    for (let k = 0; k < N; k++) {
      const t = times[k];
      const exact = 5e3 * Math.exp(-1e9 * t) + 2 * Math.exp(-2.5e3 * t) + Math.exp(-3e8 * t) * (40 * Math.cos(1e9 * t) - 7 * Math.sin(1e9 * t));
      expect(Math.abs(v[k] - exact)).toBeLessThanOrEqual(1e-15 * Math.max(1, Math.abs(exact)) + 1e-18 * 5e3);
    }
  });
});
