/**
 * Time above a threshold (`watch … above LEVEL`): total time with y > LEVEL and the first and last
 * crossings, on the exact closed form. Expected values: the RC charge crossing time
 * t = −τ·ln(1 − k) for the level k·V (first-order step response, circuits textbooks, from
 * memory); a sinusoid A·sin(ωt) spends (π − 2·asin(c/A))/ω of each period above c (trigonometry:
 * sin θ > c/A for asin(c/A) < θ < π − asin(c/A)); the rest are worked by hand as named.
 */
import { describe, expect, it } from 'vitest';
import { timeAbove } from '../../src/measure/above.js';
import { evaluatePieces } from '../../src/measure/evaluate.js';
import { computeMetrics } from '../../src/measure/metrics.js';
import { buildTrack } from '../../src/measure/track.js';
import type { Piece } from '../../src/simulate/result.js';
import { grid, piece, sampleAll } from './helpers.js';

const twoPct = { kind: 'relative', fraction: 0.02 } as const;
const rel = (a: number, b: number) => Math.abs(a - b) / Math.abs(b);

function measure(pieces: Piece[], end: number, threshold: number, n = 1001) {
  const times = grid(0, end, n);
  const values = sampleAll(pieces, times, evaluatePieces);
  return computeMetrics(times, values, pieces, twoPct, threshold).timeAbove!;
}

describe('RC charge to V: crosses k·V at t = −τ·ln(1 − k)', () => {
  const tau = 1e-3;
  const V = 12;
  const span = 5 * tau;
  const pieces = [piece(0, Infinity, [{ kind: 'exp', lambda: 0, coef: V }, { kind: 'exp', lambda: -1 / tau, coef: -V }])];

  for (const k of [0.1, 0.5, 0.632, 0.9, 0.99]) {
    it(`k = ${k}: one crossing, time above = span − crossing`, () => {
      const a = measure(pieces, span, k * V);
      const tc = -tau * Math.log(1 - k);
      expect(a.threshold).toBe(k * V);
      expect(rel(a.first!, tc)).toBeLessThan(1e-12);
      expect(a.last).toBe(a.first);
      expect(rel(a.total, span - tc)).toBeLessThan(1e-12);
    });
  }

  it('a level it never reaches: no time above, no crossing', () => {
    // at 5 τ the charge is V(1 − e^−5) ≈ 0.9933 V
    expect(measure(pieces, span, 0.995 * V)).toEqual({ threshold: 0.995 * V, total: 0, first: null, last: null });
  });

  it('a level below the start: above the whole span except t = 0, no crossing counted at the start', () => {
    const a = measure(pieces, span, -1);
    expect(a.total).toBe(span);
    expect(a.first).toBeNull();
    expect(a.last).toBeNull();
  });

  it('without a threshold the metrics leave the figure out', () => {
    const times = grid(0, span, 101);
    expect(computeMetrics(times, sampleAll(pieces, times, evaluatePieces), pieces, twoPct).timeAbove).toBeUndefined();
  });
});

describe('sinusoid A·sin(ωt): (π − 2·asin(c/A))/ω above c per period', () => {
  const A = 2;
  const w = 2 * Math.PI * 50;
  const T = (2 * Math.PI) / w;
  const periods = 7;
  const pieces = [piece(0, Infinity, [{ kind: 'osc', sigma: 0, omega: w, cosCoef: 0, sinCoef: A }])];

  for (const c of [0.5, 1.9, -0.7, 0]) {
    it(`c = ${c} over ${periods} whole periods`, () => {
      const a = measure(pieces, periods * T, c);
      const s = Math.asin(c / A);
      expect(rel(a.total, (periods * (Math.PI - 2 * s)) / w)).toBeLessThan(1e-11);
      // first upward crossing at θ = asin(c/A) (the start, for c = 0, is not a crossing: the
      // first is then the downward one at θ = π), last downward crossing at θ = π − asin(c/A)
      // in the last period
      const first = c > 0 ? s / w : c < 0 ? (Math.PI - s) / w : Math.PI / w;
      expect(Math.abs(a.first! - first)).toBeLessThan(1e-12 * periods * T);
      const last = c >= 0 ? (periods - 1) * T + (Math.PI - s) / w : (periods - 1) * T + (2 * Math.PI + s) / w;
      expect(Math.abs(a.last! - last)).toBeLessThan(1e-12 * periods * T);
    });
  }
});

describe('pieces and jumps (worked by hand)', () => {
  it('a jump across the level between pieces is a crossing at the jump', () => {
    // 0 on [0, 1 s), 5 on [1 s, 2 s), 0 on [2 s, 3 s]; level 2: above for 1 s, crossings at 1 s and 2 s
    const pieces = [
      piece(0, 1, [{ kind: 'exp', lambda: 0, coef: 0 }]),
      piece(1, 2, [{ kind: 'exp', lambda: 0, coef: 5 }]),
      piece(2, Infinity, [{ kind: 'exp', lambda: 0, coef: 0 }]),
    ];
    expect(measure(pieces, 3, 2, 31)).toEqual({ threshold: 2, total: 1, first: 1, last: 2 });
  });

  it('a piece boundary the signal passes above the level continuously is no crossing', () => {
    // y = t on [0, 1 s), y = 1 + (t − 1) on [1 s, 2 s]: the same line in two pieces; level 0.5
    const pieces = [
      piece(0, 1, [{ kind: 'poly-exp', lambda: 0, polyCoefs: [0, 1] }]),
      piece(1, Infinity, [{ kind: 'poly-exp', lambda: 0, polyCoefs: [1, 1] }]),
    ];
    const a = measure(pieces, 2, 0.5, 21);
    expect(Math.abs(a.total - 1.5)).toBeLessThan(1e-14);
    expect(Math.abs(a.first! - 0.5)).toBeLessThan(1e-14);
    expect(a.last).toBe(a.first);
  });

  it('a sampled signal (no closed form) uses the straight lines between samples', () => {
    // triangle 0 → 2 → 0 over 2 s, level 1: above from 0.5 s to 1.5 s
    const track = buildTrack(new Float64Array([0, 1, 2]), new Float64Array([0, 2, 0]), []);
    expect(timeAbove(track, 1)).toEqual({ threshold: 1, total: 1, first: 0.5, last: 1.5 });
  });
});
