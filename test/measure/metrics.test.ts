import { describe, expect, it } from 'vitest';
import { computeMetrics } from '../../src/measure/metrics.js';
import { evaluatePieces } from '../../src/measure/evaluate.js';
import { riseTime } from '../../src/measure/rise.js';
import { buildTrack } from '../../src/measure/track.js';
import type { Piece } from '../../src/simulate/result.js';
import { grid, piece, sampleAll, underdampedStep } from './helpers.js';

const twoPct = { kind: 'relative', fraction: 0.02 } as const;

function metricsOf(pieces: Piece[], end: number, n = 1001, band: Parameters<typeof computeMetrics>[3] = twoPct) {
  const times = grid(0, end, n);
  return computeMetrics(times, sampleAll(pieces, times, evaluatePieces), pieces, band);
}

function rel(a: number, b: number) {
  return Math.abs(a - b) / Math.abs(b);
}

describe('first-order step, y = A(1 − e^(−t/τ))', () => {
  const tau = 1e-3;
  const A = 12;
  const pieces = [piece(0, Infinity, [{ kind: 'exp', lambda: 0, coef: A }, { kind: 'exp', lambda: -1 / tau, coef: -A }])];
  // span of 40 τ: the end value equals A to rounding
  const m = metricsOf(pieces, 40 * tau);

  it('rise time 10 → 90 % is τ·ln 9 (first-order step response, circuits textbook, from memory)', () => {
    expect(rel(m.riseTime!, tau * Math.log(9))).toBeLessThan(1e-12);
  });

  it('settling into ±2 % takes τ·ln 50 (solve e^(−t/τ) = 0.02, same source)', () => {
    expect(rel(m.settlingTime!, tau * Math.log(50))).toBeLessThan(1e-12);
  });

  it('settling into an absolute band of ±10 mV takes τ·ln(A/10 mV)', () => {
    const abs = metricsOf(pieces, 40 * tau, 1001, { kind: 'absolute', value: 0.01 });
    expect(rel(abs.settlingTime!, tau * Math.log(A / 0.01))).toBeLessThan(1e-12);
  });

  it('has no overshoot, initial 0 and final A', () => {
    expect(m.overshootPct).toBe(0);
    expect(m.initial).toBe(0);
    expect(m.final).toBeCloseTo(A, 12);
    expect(m.valley).toEqual({ value: 0, time: 0 });
  });
});

describe('first-order discharge, y = V0·e^(−t/τ) (falling transition)', () => {
  const tau = 2.2e-6;
  const pieces = [piece(0, Infinity, [{ kind: 'exp', lambda: -1 / tau, coef: 5 }])];
  const m = metricsOf(pieces, 40 * tau);
  it('fall time 90 → 10 % is τ·ln 9 (first-order response, from memory)', () => {
    expect(rel(m.riseTime!, tau * Math.log(9))).toBeLessThan(1e-11);
    expect(m.overshootPct).toBe(0);
  });
});

describe('second-order underdamped step (control-engineering textbook, from memory)', () => {
  const wn = 2 * Math.PI * 1000;
  for (const zeta of [0.05, 0.3, 0.7]) {
    const pieces = underdampedStep(wn, zeta);
    const wd = wn * Math.sqrt(1 - zeta * zeta);
    // the envelope e^(−ζωn·t) is below 1e-17 at the end of the span
    const end = 40 / (zeta * wn);
    // a deliberately coarse grid: the peak lies between samples
    const m = metricsOf(pieces, end, 201);

    it(`ζ = ${zeta}: overshoot is 100·exp(−πζ/√(1−ζ²)) %`, () => {
      const expected = 100 * Math.exp((-Math.PI * zeta) / Math.sqrt(1 - zeta * zeta));
      expect(rel(m.overshootPct!, expected)).toBeLessThan(1e-9);
    });

    it(`ζ = ${zeta}: peak time is π/ωd`, () => {
      expect(rel(m.peak.time, Math.PI / wd)).toBeLessThan(1e-12);
    });

    it(`ζ = ${zeta}: the signal stays inside ±2 % after the settling time and touches the band edge there`, () => {
      const ts = m.settlingTime!;
      const y = (t: number) => evaluatePieces(pieces, t);
      expect(Math.abs(Math.abs(y(ts) - 1) - 0.02)).toBeLessThan(1e-12);
      for (let k = 1; k <= 20000; k++) {
        const t = ts + ((end - ts) * k) / 20000;
        expect(Math.abs(y(t) - 1)).toBeLessThanOrEqual(0.02 + 1e-12);
      }
    });

    it(`ζ = ${zeta}: rise-time crossings sit exactly on 10 % and 90 %`, () => {
      const times = grid(0, end, 201);
      const r = riseTime(buildTrack(times, sampleAll(pieces, times, evaluatePieces), pieces), 0, 1)!;
      expect(Math.abs(evaluatePieces(pieces, r.t10) - 0.1)).toBeLessThan(1e-14);
      expect(Math.abs(evaluatePieces(pieces, r.t90) - 0.9)).toBeLessThan(1e-14);
      expect(r.t90).toBeLessThan(Math.PI / wd);
      expect(rel(m.riseTime!, r.duration)).toBeLessThan(1e-12);
    });
  }
});

describe('critically damped second-order step, y = 1 − (1 + ωn·t)e^(−ωn·t) (from memory)', () => {
  const wn = 1e4;
  const pieces = [piece(0, Infinity, [{ kind: 'exp', lambda: 0, coef: 1 }, { kind: 'poly-exp', lambda: -wn, polyCoefs: [-1, -wn] }])];
  const m = metricsOf(pieces, 50 / wn);
  it('does not overshoot and rises monotonically', () => {
    expect(m.overshootPct).toBe(0);
    expect(m.riseTime!).toBeGreaterThan(0);
  });
  it('2 % settling satisfies (1 + ωn·t)e^(−ωn·t) = 0.02', () => {
    const x = wn * m.settlingTime!;
    expect(Math.abs((1 + x) * Math.exp(-x) - 0.02)).toBeLessThan(1e-14);
  });
});

describe('a delayed step (pieces with t0 > 0)', () => {
  const tau = 1e-4;
  const t0 = 1e-3;
  const pieces = [
    piece(0, t0, [{ kind: 'exp', lambda: 0, coef: 0 }]),
    piece(t0, Infinity, [{ kind: 'exp', lambda: 0, coef: 1 }, { kind: 'exp', lambda: -1 / tau, coef: -1 }]),
  ];
  const m = metricsOf(pieces, t0 + 40 * tau);
  it('measures from the step: rise τ·ln 9, settling t0 + τ·ln 50', () => {
    expect(rel(m.riseTime!, tau * Math.log(9))).toBeLessThan(1e-10);
    expect(rel(m.settlingTime!, t0 + tau * Math.log(50))).toBeLessThan(1e-12);
  });
});

describe('a jump', () => {
  const pieces = [piece(0, 1e-3, [{ kind: 'exp', lambda: 0, coef: 0 }]), piece(1e-3, Infinity, [{ kind: 'exp', lambda: 0, coef: 2 }])];
  const m = metricsOf(pieces, 2e-3);
  it('crosses 10 % and 90 % at the jump: rise time 0, settled at the jump', () => {
    expect(m.riseTime).toBe(0);
    expect(m.settlingTime).toBe(1e-3);
    expect(m.overshootPct).toBe(0);
  });
});

describe('no transition', () => {
  const pieces = [piece(0, Infinity, [{ kind: 'exp', lambda: 0, coef: 3.3 }])];
  it('gives null overshoot, rise and relative settling', () => {
    const m = metricsOf(pieces, 1e-3);
    expect(m.overshootPct).toBeNull();
    expect(m.riseTime).toBeNull();
    expect(m.settlingTime).toBeNull();
  });
  it('a pulse that returns to its start still has an absolute settling time', () => {
    const tau = 1e-4;
    // y = (t/τ)e^(−t/τ): peaks at t = τ with value 1/e, returns to 0
    const pulse = [piece(0, Infinity, [{ kind: 'poly-exp', lambda: -1 / tau, polyCoefs: [0, 1 / tau] }] as const)] as Piece[];
    const m = metricsOf(pulse, 60 * tau, 1001, { kind: 'absolute', value: 0.01 });
    expect(m.overshootPct).toBeNull();
    expect(rel(m.peak.time, tau)).toBeLessThan(1e-12);
    expect(rel(m.peak.value, Math.exp(-1))).toBeLessThan(1e-14);
    const x = m.settlingTime! / tau;
    expect(Math.abs(x * Math.exp(-x) - 0.01)).toBeLessThan(1e-15);
  });
});

describe('sampled fallback (no pieces)', () => {
  it('measures on the samples by linear interpolation', () => {
    const times = grid(0, 10, 11);
    const values = times.map((t) => Math.min(t, 5));
    const m = computeMetrics(times, values, [], twoPct);
    expect(m.initial).toBe(0);
    expect(m.final).toBe(5);
    expect(m.riseTime).toBeCloseTo(4, 12);
    expect(m.settlingTime).toBeCloseTo(4.9, 12);
  });
});

describe('a pulse that has nearly returned by the end of the span', () => {
  it('is not a transition: no overshoot of millions of percent', () => {
    const tau = 1e-4;
    const pulse = [piece(0, Infinity, [{ kind: 'poly-exp', lambda: -1 / tau, polyCoefs: [0, 1 / tau] }])];
    // at 12 τ the pulse is at 12·e^(−12) ≈ 7.4e-5, below 0.1 % of its excursion 1/e
    const m = metricsOf(pulse, 12 * tau);
    expect(m.overshootPct).toBeNull();
    expect(m.riseTime).toBeNull();
    expect(m.settlingTime).toBeNull();
  });
});

describe('overshoot rounding noise', () => {
  it('a peak a few ulps past the final value is no overshoot', async () => {
    const { overshootPercent } = await import('../../src/measure/overshoot.js');
    expect(overshootPercent(0, 3.3, 3.3000000000000003, 0)).toBe(0);
    expect(overshootPercent(0, 1, 1.2, 0)).toBeCloseTo(20, 12);
    expect(overshootPercent(5, 1, 5, 0.5)).toBeCloseTo(12.5, 12);
  });
});
