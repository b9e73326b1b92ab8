/**
 * Undershoot (pre-shoot) and per-event overshoot / undershoot (src/measure/undershoot.ts).
 */
import { describe, expect, it } from 'vitest';
import { computeMetrics } from '../../src/measure/metrics.js';
import { evaluatePieces } from '../../src/measure/evaluate.js';
import type { Piece } from '../../src/simulate/result.js';
import { grid, piece, sampleAll } from './helpers.js';

const twoPct = { kind: 'relative', fraction: 0.02 } as const;

function metricsOf(pieces: Piece[], end: number, n = 1001) {
  const times = grid(0, end, n);
  return computeMetrics(times, sampleAll(pieces, times, evaluatePieces), pieces, twoPct);
}

const rel = (a: number, b: number) => Math.abs(a - b) / Math.abs(b);

describe('undershoot of the whole transition', () => {
  it('an RC step has 0 overshoot and 0 undershoot, and one event with both 0', () => {
    const tau = 1e-3;
    const m = metricsOf([piece(0, Infinity, [{ kind: 'exp', lambda: 0, coef: 12 }, { kind: 'exp', lambda: -1 / tau, coef: -12 }])], 40 * tau);
    expect(m.overshootPct).toBe(0);
    expect(m.undershootPct).toBe(0);
    expect(m.events).toHaveLength(1);
    expect(m.events![0]).toMatchObject({ t: 0, from: 0, overshootPct: 0, undershootPct: 0 });
  });

  // y = 1 − 3e^(−t) + 2e^(−2t): y(0) = 0, y' = 3e^(−t) − 4e^(−2t) = 0 at e^(−t) = 3/4, where
  // y = 1 − 9/4 + 9/8 = −1/8; y − 1 = x(2x − 3) < 0 for x = e^(−t) in (0, 1], so it never passes 1.
  // Undershoot 12.5 %, overshoot 0 (worked by hand).
  const dip = (sign: number) =>
    [piece(0, Infinity, [{ kind: 'exp', lambda: 0, coef: sign }, { kind: 'exp', lambda: -1, coef: -3 * sign }, { kind: 'exp', lambda: -2, coef: 2 * sign }])];

  it('a pre-dip of 1/8 of a unit rise reads 12.5 % undershoot, exactly, between samples', () => {
    const m = metricsOf(dip(1), 40, 7); // samples far apart: the dip at t = ln(4/3) is found on the closed form
    expect(rel(m.undershootPct!, 12.5)).toBeLessThan(1e-12);
    expect(m.overshootPct).toBe(0);
    expect(rel(m.valley.time, Math.log(4 / 3))).toBeLessThan(1e-9);
  });

  it('the mirror image (a falling transition with a pre-bump) gives the same 12.5 %', () => {
    const m = metricsOf(dip(-1), 40);
    expect(rel(m.undershootPct!, 12.5)).toBeLessThan(1e-12);
    expect(m.overshootPct).toBe(0);
    expect(rel(m.events![0]!.undershootPct, 12.5)).toBeLessThan(1e-12);
  });

  it('ringing below the initial level after the 50 % instant is not undershoot', () => {
    // a lightly damped step (ζ = 0.05) swings back below 0 after its first peak, past the 50 %
    // instant: that is ringing, so undershoot 0; overshoot exp(−πζ/√(1−ζ²)).
    const z = 0.05;
    const wd = Math.sqrt(1 - z * z);
    const m = metricsOf([piece(0, Infinity, [{ kind: 'exp', lambda: 0, coef: 1 }, { kind: 'osc', sigma: -z, omega: wd, cosCoef: -1, sinCoef: -z / wd }])], 1000);
    expect(m.undershootPct).toBe(0);
    expect(rel(m.overshootPct!, 100 * Math.exp((-Math.PI * z) / wd))).toBeLessThan(1e-9);
  });
});

describe('per-event overshoot and undershoot', () => {
  // A second-order low-pass (ωn = 1, ζ = 0.3) driven by a step of +2 at t = 0 and −3 at t = T:
  // each transition overshoots by exp(−πζ/√(1−ζ²)) of its own size (second-order step response,
  // control textbook, from memory). T = 200: e^(−ζ·T) = e^(−60), the first step has settled.
  const z = 0.3;
  const wd = Math.sqrt(1 - z * z);
  const T = 200;
  const s = (a: number) => [
    { kind: 'osc' as const, sigma: -z, omega: wd, cosCoef: -a, sinCoef: (-a * z) / wd },
  ];
  const pieces = [
    piece(0, T, [{ kind: 'exp', lambda: 0, coef: 2 }, ...s(2)]),
    piece(T, Infinity, [{ kind: 'exp', lambda: 0, coef: -1 }, ...s(-3)]),
  ];
  const m = metricsOf(pieces, 2 * T, 2001);
  const expected = 100 * Math.exp((-Math.PI * z) / wd);

  it('two events, up 0 → 2 at t = 0 and down 2 → −1 at t = T', () => {
    expect(m.events).toHaveLength(2);
    const [up, down] = m.events!;
    expect(up!.t).toBe(0);
    expect(up!.from).toBe(0);
    expect(rel(up!.to, 2)).toBeLessThan(1e-12);
    expect(down!.t).toBe(T);
    expect(rel(down!.from, 2)).toBeLessThan(1e-12);
    expect(rel(down!.to, -1)).toBeLessThan(1e-12);
  });

  it('each event overshoots by exp(−πζ/√(1−ζ²)) of its own transition, with no undershoot', () => {
    for (const e of m.events!) {
      expect(rel(e.overshootPct, expected)).toBeLessThan(1e-9);
      expect(e.undershootPct).toBe(0);
    }
  });

  it('events whose transition is under 0.1 % of the swing are left out', () => {
    // a flat stretch before the step (0 → 0), and a step of 1e-4 after it settles
    const tiny = [
      piece(0, 1, [{ kind: 'exp', lambda: 0, coef: 0 }]),
      piece(1, 300, [{ kind: 'exp', lambda: 0, coef: 1 }, ...s(1)]),
      piece(300, Infinity, [{ kind: 'exp', lambda: 0, coef: 1 + 1e-4 }, ...s(1e-4)]),
    ];
    const mt = metricsOf(tiny, 600, 2001);
    expect(mt.events!.map((e) => e.t)).toEqual([1]);
  });
});
