/**
 * The certified peak search of the part stress (joint-peaks.ts without the sample times,
 * certify.ts): every peak |v|, |i|, |v·i| against a brute-force search of the same closed form —
 * a dense evaluation (hundreds of points per period of the fastest mode) and golden-section
 * refinement of |y| around the best dense points. Reference: that brute force (plain calculus:
 * the largest of a continuous function is at a sample or within a step of one); the values are
 * my own.
 */
import { describe, expect, it } from 'vitest';
import { intervalBound, hermiteBound } from '../../src/measure/certify.js';
import { pieceValue } from '../../src/measure/evaluate.js';
import { JointPeaks } from '../../src/measure/joint-peaks.js';
import { clipPieces, termsOmega, termsRate, type MagnitudePeak } from '../../src/measure/peak.js';
import { runStress } from '../../src/measure/stress.js';
import { analyzeText } from '../../src/pipeline.js';
import type { Piece, Term } from '../../src/simulate/result.js';
import { piece } from './helpers.js';

/** Largest |f| on [lo, hi]: n + 1 equally spaced points, the best few refined by golden section. */
function bruteMax(f: (t: number) => number, lo: number, hi: number, n: number): MagnitudePeak & { sampled: number } {
  const h = (hi - lo) / n;
  const ys = new Float64Array(n + 1);
  for (let k = 0; k <= n; k++) ys[k] = Math.abs(f(k === n ? hi : lo + k * h));
  let sampled = 0;
  for (let k = 0; k <= n; k++) sampled = Math.max(sampled, ys[k]!);
  const best: MagnitudePeak = { value: ys[0]!, time: lo };
  if (ys[n]! > best.value) Object.assign(best, { value: ys[n]!, time: hi });
  // every local maximum of the samples within 1e-6 of the largest
  for (let k = 1; k < n; k++) {
    if (!(ys[k]! > ys[k - 1]! && ys[k]! >= ys[k + 1]! && ys[k]! >= sampled * (1 - 1e-6))) continue;
    let a = lo + (k - 1) * h;
    let b = lo + (k + 1) * h;
    const g = (Math.sqrt(5) - 1) / 2;
    for (let it = 0; it < 200 && b - a > 1e-15 * Math.max(Math.abs(a), Math.abs(b)); it++) {
      const x1 = b - g * (b - a);
      const x2 = a + g * (b - a);
      if (Math.abs(f(x1)) >= Math.abs(f(x2))) b = x2;
      else a = x1;
    }
    const t = 0.5 * (a + b);
    const y = Math.abs(f(t));
    if (y > best.value) Object.assign(best, { value: y, time: t });
  }
  return { ...best, sampled };
}

function peakOf(pieces: readonly Piece[], f: (p: Piece, t: number) => number, start: number, end: number, perPiece: number) {
  let best = { value: 0, time: start, sampled: 0 };
  for (const { piece: p, lo, hi } of clipPieces(pieces, start, end)) {
    const b = bruteMax((t) => f(p, t), lo, hi, perPiece);
    if (b.value > best.value) best = { ...b, sampled: Math.max(b.sampled, best.sampled) };
    else best.sampled = Math.max(best.sampled, b.sampled);
  }
  return best;
}

describe('part stress of a fast ringing tank beside a slow RC (one step): every peak against the brute force', () => {
  // 2 µH with 3.3 nF rings at about 1.96 MHz (Q about 12 with 2 Ω), the RC charges over 47 µs;
  // the span holds about 200 ringing periods, the brute force 4000 points per period
  const text = [
    'voltage-source V1 in -> gnd step from 0V to 24V at 0',
    'resistor Rs in -> a 2',
    'inductor L1 a -> b 2uH',
    'capacitor C1 b -> gnd 3.3nF',
    'resistor Rd b -> gnd 470',
    'resistor R2 in -> c 4.7k',
    'capacitor C2 c -> gnd 10nF',
    'watch voltage C1',
    'span 100us',
    'samples 201',
  ].join('\n');
  const r = analyzeText(text, 'tank-rc.rdn');
  const stress = runStress(r);
  const start = r.times[0]!;
  const end = r.times[r.times.length - 1]!;
  for (const forms of r.parts!) {
    const s = stress.find((x) => x.part === forms.part)!;
    const cases: [string, MagnitudePeak, (p: Piece, t: number) => number, readonly Piece[]][] = [
      ['|v|', s.voltage, pieceValue, forms.voltage],
      ['|i|', s.current, pieceValue, forms.current],
    ];
    for (const [what, got, f, pieces] of cases) {
      it(`${forms.part}: peak ${what}`, () => {
        const ref = peakOf(pieces, f, start, end, 800_000);
        expect(got.value).toBeGreaterThanOrEqual(ref.sampled * (1 - 1e-13));
        expect(Math.abs(got.value - ref.value)).toBeLessThanOrEqual(1e-9 * ref.value);
      });
    }
    it(`${forms.part}: peak |v·i|`, () => {
      const ci = clipPieces(forms.current, start, end);
      let ref = { value: 0, time: start, sampled: 0 };
      clipPieces(forms.voltage, start, end).forEach(({ piece: pv, lo, hi }, k) => {
        const pi = ci[k]!.piece;
        const b = bruteMax((t) => pieceValue(pv, t) * pieceValue(pi, t), lo, hi, 800_000);
        if (b.value > ref.value) ref = { ...b, sampled: Math.max(b.sampled, ref.sampled) };
        else ref.sampled = Math.max(ref.sampled, b.sampled);
      });
      expect(s.power.value).toBeGreaterThanOrEqual(ref.sampled * (1 - 1e-13));
      expect(Math.abs(s.power.value - ref.value)).toBeLessThanOrEqual(1e-9 * ref.value);
    });
  }
});

describe('a grid told far too little (the time scales passed as 1e-3 of the real ones): the certification finds every peak', () => {
  // v = 0.2 + e^(−0.1t)·(sin 30t + 0.5·cos 47t), i = 1 + 0.5·e^(−0.3t)·sin 3t over [0, 10]: about 64
  // grid intervals for some 120 extrema of v; the roots of v' the grid misses lie in intervals
  // whose ends have v' of one sign, or in brackets with three roots
  const vt: Term[] = [
    { kind: 'exp', lambda: 0, coef: 0.2 },
    { kind: 'osc', sigma: -0.1, omega: 30, cosCoef: 0, sinCoef: 1 },
    { kind: 'osc', sigma: -0.1, omega: 47, cosCoef: 0.5, sinCoef: 0 },
  ];
  const it_: Term[] = [
    { kind: 'exp', lambda: 0, coef: 1 },
    { kind: 'osc', sigma: -0.3, omega: 3, cosCoef: 0, sinCoef: 0.5 },
  ];
  const pv = piece(0, Infinity, vt);
  const pi = piece(0, Infinity, it_);
  const v = { value: 0, time: 0 };
  const i = { value: 0, time: 0 };
  const w = { value: 0, time: 0 };
  new JointPeaks(undefined, false).search(pv, pi, 0, 10, 1e-3 * termsOmega(vt), 1e-3 * termsRate(vt), v, i, w);
  const cases: [string, MagnitudePeak, (t: number) => number][] = [
    ['|v|', v, (t) => pieceValue(pv, t)],
    ['|i|', i, (t) => pieceValue(pi, t)],
    ['|v·i|', w, (t) => pieceValue(pv, t) * pieceValue(pi, t)],
  ];
  for (const [what, got, f] of cases) {
    it(`peak ${what} is the brute force’s to 1e-12 (the tie tolerance of every peak search), at its time`, () => {
      const ref = bruteMax(f, 0, 10, 1_000_000);
      expect(Math.abs(got.value - ref.value)).toBeLessThanOrEqual(1e-12 * ref.value);
      expect(Math.abs(got.time - ref.time)).toBeLessThanOrEqual(1e-7);
      expect(got.value).toBeGreaterThanOrEqual(ref.sampled * (1 - 1e-13));
    });
  }
});

describe('the interval bounds of certify.ts hold', () => {
  // y = sin(3t) + 0.5·cos(7t) on [a, a + h]: |y''| ≤ 9 + 24.5, |y⁗| ≤ 81 + 1200.5
  const y = (t: number) => Math.sin(3 * t) + 0.5 * Math.cos(7 * t);
  const dy = (t: number) => 3 * Math.cos(3 * t) - 3.5 * Math.sin(7 * t);
  it('never below max |y| on the interval, for many intervals and widths (calculus: Taylor and Hermite remainders)', () => {
    for (const h of [0.01, 0.1, 0.3, 1]) {
      for (let a = 0; a < 6; a += 0.037) {
        const b = a + h;
        let m = 0;
        for (let k = 0; k <= 2000; k++) m = Math.max(m, Math.abs(y(a + (h * k) / 2000)));
        expect(intervalBound(y(a), dy(a), y(b), dy(b), h, 33.5, 1281.5)).toBeGreaterThanOrEqual(m);
        expect(hermiteBound(y(a), dy(a), y(b), dy(b), h, 1281.5)).toBeGreaterThanOrEqual(m);
      }
    }
  });
  it('tight for a short interval: within 1e-6 of the largest value when h = 0.01', () => {
    const a = 0.4;
    const h = 0.01;
    let m = 0;
    for (let k = 0; k <= 2000; k++) m = Math.max(m, Math.abs(y(a + (h * k) / 2000)));
    expect(hermiteBound(y(a), dy(a), y(a + h), dy(a + h), h, 1281.5)).toBeLessThan(m * (1 + 1e-6));
  });
});
