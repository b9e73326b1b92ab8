/**
 * Closed-form measurements beyond the step metrics: 50 % delay, ringing frequency and logarithmic
 * decrement, maximum slope, average and RMS. Every expected value is a textbook closed form
 * (first- and second-order responses, circuits and control-engineering textbooks, from memory) or
 * an integral worked by hand, as named in each test.
 */
import { describe, expect, it } from 'vitest';
import { evaluatePieces } from '../../src/measure/evaluate.js';
import { computeMetrics } from '../../src/measure/metrics.js';
import { averageAndRms, maxSlope, ringing } from '../../src/measure/shape.js';
import { buildTrack, stretchesOf } from '../../src/measure/track.js';
import type { Piece } from '../../src/simulate/result.js';
import { grid, piece, sampleAll, underdampedStep } from './helpers.js';

const twoPct = { kind: 'relative', fraction: 0.02 } as const;

function metricsOf(pieces: Piece[], end: number, n = 1001) {
  const times = grid(0, end, n);
  return computeMetrics(times, sampleAll(pieces, times, evaluatePieces), pieces, twoPct);
}

const rel = (a: number, b: number) => Math.abs(a - b) / Math.abs(b);

describe('RC charge, y = V(1 − e^(−t/τ))', () => {
  const tau = 1e-3;
  const V = 12;
  const pieces = [piece(0, Infinity, [{ kind: 'exp', lambda: 0, coef: V }, { kind: 'exp', lambda: -1 / tau, coef: -V }])];
  // span of 40 τ: the end value (the final value of the transition) equals V to rounding
  const m = metricsOf(pieces, 40 * tau);

  it('50 % delay is τ·ln 2 (solve 1 − e^(−t/τ) = ½; first-order step, from memory)', () => {
    expect(rel(m.delay50!, tau * Math.log(2))).toBeLessThan(1e-12);
  });

  it('50 % delay of a falling first-order step V·e^(−t/τ) is τ·ln 2 too', () => {
    const fall = metricsOf([piece(0, Infinity, [{ kind: 'exp', lambda: -1 / tau, coef: V }])], 40 * tau);
    expect(rel(fall.delay50!, tau * Math.log(2))).toBeLessThan(1e-12);
  });

  it('maximum slope is V/τ at t = 0+ (d/dt of the charge curve, largest where e^(−t/τ) = 1)', () => {
    expect(rel(m.maxSlope!.value, V / tau)).toBeLessThan(1e-12);
    expect(m.maxSlope!.time).toBe(0);
  });

  for (const T of [0.5 * tau, 3 * tau, 10 * tau]) {
    it(`average over [0, ${T / tau}τ] is V(1 − (τ/T)(1 − e^(−T/τ))) (integral by hand)`, () => {
      const r = averageAndRms(pieces, 0, T)!;
      expect(rel(r.average, V * (1 - (tau / T) * (1 - Math.exp(-T / tau))))).toBeLessThan(1e-12);
    });
  }

  it('RMS² over [0, T] is V²(1 − 2(τ/T)(1 − e^(−T/τ)) + (τ/2T)(1 − e^(−2T/τ))) (integral by hand)', () => {
    const T = 3 * tau;
    const r = averageAndRms(pieces, 0, T)!;
    const ms = V * V * (1 - ((2 * tau) / T) * (1 - Math.exp(-T / tau)) + (tau / (2 * T)) * (1 - Math.exp((-2 * T) / tau)));
    expect(rel(r.rms, Math.sqrt(ms))).toBeLessThan(1e-12);
  });

  it('has no ringing', () => {
    expect(m.ringingHz).toBeNull();
    expect(m.logDecrement).toBeNull();
  });
});

describe('second-order underdamped step (control-engineering textbook, from memory)', () => {
  const wn = 2 * Math.PI * 1000;
  for (const zeta of [0.05, 0.3, 0.7]) {
    const pieces = underdampedStep(wn, zeta);
    const wd = wn * Math.sqrt(1 - zeta * zeta);
    const end = 40 / (zeta * wn);
    const m = metricsOf(pieces, end, 201);

    it(`ζ = ${zeta}: ringing frequency is ωd/2π = ωn√(1−ζ²)/2π`, () => {
      expect(rel(m.ringingHz!, wd / (2 * Math.PI))).toBeLessThan(1e-12);
    });

    it(`ζ = ${zeta}: logarithmic decrement is 2πζ/√(1−ζ²)`, () => {
      expect(rel(m.logDecrement!, (2 * Math.PI * zeta) / Math.sqrt(1 - zeta * zeta))).toBeLessThan(1e-12);
    });

    it(`ζ = ${zeta}: the decrement from the mode agrees with ln of successive peaks of y − 1 located on the closed form`, () => {
      const track = buildTrack(grid(0, end, 201), new Float64Array(201), pieces);
      const s = stretchesOf(track)[0]!;
      // local maxima among the knots (every extremum is a knot)
      const peaks: number[] = [];
      for (let k = 1; k + 1 < s.ts.length && peaks.length < 2; k++) if (s.ys[k]! > s.ys[k - 1]! && s.ys[k]! > s.ys[k + 1]!) peaks.push(s.ys[k]! - 1);
      expect(peaks.length).toBe(2);
      expect(rel(Math.log(peaks[0]! / peaks[1]!), m.logDecrement!)).toBeLessThan(1e-9);
    });

    it(`ζ = ${zeta}: 50 % delay is where 1 − e^(−ζωn·t)(cos ωd·t + ζ/√(1−ζ²)·sin ωd·t) = ½`, () => {
      const y = (t: number) => evaluatePieces(pieces, t);
      expect(Math.abs(y(m.delay50!) - 0.5)).toBeLessThan(1e-13);
      // first crossing: below ½ just before
      expect(y(m.delay50! * (1 - 1e-6))).toBeLessThan(0.5);
    });

    it(`ζ = ${zeta}: maximum slope is at the first root of y'' (tan ωd·t = √(1−ζ²)/ζ, t = acos(ζ)/ωd)`, () => {
      // y' = (ωn/√(1−ζ²))·e^(−ζωn·t)·sin ωd·t; y'' = 0 where ωd·t = atan(√(1−ζ²)/ζ) = acos ζ
      const t = Math.acos(zeta) / wd;
      const slope = (wn / Math.sqrt(1 - zeta * zeta)) * Math.exp(-zeta * wn * t) * Math.sin(wd * t);
      expect(rel(m.maxSlope!.time, t)).toBeLessThan(1e-9);
      expect(rel(m.maxSlope!.value, slope)).toBeLessThan(1e-12);
    });
  }

  it('the slowest of two decaying oscillations is the dominant one', () => {
    const slow = { kind: 'osc', sigma: -100, omega: 2 * Math.PI * 1e3, cosCoef: 0.3, sinCoef: 0 } as const;
    const fast = { kind: 'osc', sigma: -5000, omega: 2 * Math.PI * 50e3, cosCoef: 1, sinCoef: 0 } as const;
    const r = ringing([piece(0, Infinity, [{ kind: 'exp', lambda: 0, coef: 1 }, fast, slow])], 0, 0.01, 1e-3)!;
    expect(rel(r.hz, 1e3)).toBeLessThan(1e-15);
    expect(rel(r.logDecrement, (2 * Math.PI * 100) / (2 * Math.PI * 1e3))).toBeLessThan(1e-15);
  });

  it('an oscillation of negligible weight is not ringing', () => {
    const tiny = { kind: 'osc', sigma: -100, omega: 1e4, cosCoef: 1e-9, sinCoef: 0 } as const;
    expect(ringing([piece(0, Infinity, [{ kind: 'exp', lambda: -10, coef: 1 }, tiny])], 0, 1, 1e-3)).toBeNull();
  });
});

describe('sinusoid A·sin(ωt)', () => {
  const A = 325;
  const f = 50;
  const w = 2 * Math.PI * f;
  const pieces = [piece(0, Infinity, [{ kind: 'osc', sigma: 0, omega: w, cosCoef: 0, sinCoef: A }])];

  for (const periods of [1, 3, 10]) {
    it(`over ${periods} whole period(s): RMS is A/√2 and the average 0 (sine-wave RMS, from memory)`, () => {
      const r = averageAndRms(pieces, 0, periods / f)!;
      expect(rel(r.rms, A / Math.SQRT2)).toBeLessThan(1e-12);
      expect(Math.abs(r.average)).toBeLessThan(1e-12 * A);
    });
  }

  it('maximum slope is A·ω, first at t = 0 (d/dt sin ωt = ω cos ωt)', () => {
    const s = maxSlope(pieces, 0, 2 / f, grid(0, 2 / f, 101))!;
    expect(rel(s.value, A * w)).toBeLessThan(1e-12);
    expect(s.time).toBe(0);
  });

  it('an undamped oscillation is not reported as ringing (it may be the drive)', () => {
    const m = metricsOf(pieces, 2 / f);
    expect(m.ringingHz).toBeNull();
    expect(m.delay50).toBeNull();
    expect(rel(m.rms!, A / Math.SQRT2)).toBeLessThan(1e-12);
  });
});

describe('pieces and impulses', () => {
  it('a rectangular pulse 0 → 5 → 0 (5 V for 1 ms of a 4 ms span): average 1.25 V, RMS 2.5 V', () => {
    const pieces = [
      piece(0, 1e-3, [{ kind: 'exp', lambda: 0, coef: 5 }]),
      piece(1e-3, Infinity, [{ kind: 'exp', lambda: 0, coef: 0 }]),
    ];
    const r = averageAndRms(pieces, 0, 4e-3)!;
    expect(rel(r.average, 1.25)).toBeLessThan(1e-12);
    expect(rel(r.rms, 2.5)).toBeLessThan(1e-12);
  });

  it('a Dirac impulse in the span adds its area to the average and makes the RMS unbounded', () => {
    const pieces = [{ t0: 0, t1: Infinity, terms: [{ kind: 'exp', lambda: 0, coef: 1 } as const], impulseArea: 2e-3 }];
    const r = averageAndRms(pieces, 0, 1e-3)!;
    expect(rel(r.average, 1 + 2e-3 / 1e-3)).toBeLessThan(1e-12);
    expect(r.rms).toBe(Infinity);
  });

  it('without a closed form the new figures are null', () => {
    const times = grid(0, 1, 11);
    const m = computeMetrics(times, times.map((t) => t), [], twoPct);
    expect([m.ringingHz, m.logDecrement, m.maxSlope, m.average, m.rms]).toEqual([null, null, null, null, null]);
    expect(m.delay50).toBeCloseTo(0.5, 12);
  });
});
