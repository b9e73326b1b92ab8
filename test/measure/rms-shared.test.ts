/**
 * The RMS integrals of a run's watches share their Gram matrices (lti/integrate.ts GramStore):
 * the watches of one circuit have the same modes, so the edge pieces of a pulse train have the same
 * layouts in every watch, with each watch's own coefficients. Reference: the direct integrals of
 * each piece (integrateTerms / integrateProduct, the closed forms term by term) and, end to end,
 * the same run with each watch on a store of its own.
 */
import { describe, expect, it } from 'vitest';
import { GramStore, integrateProduct, integrateTerms, RepeatedIntegrals } from '../../src/lti/integrate.js';
import { analyzeText } from '../../src/pipeline.js';
import type { Term } from '../../src/simulate/result.js';

const rel = (a: number, b: number) => Math.abs(a - b) / Math.abs(b);

// 30 real exponentials and 15 damped oscillations (60 monomials: a large layout), the coefficients
// set by `seed` (a watch) and `k` (a piece)
const piece = (seed: number, k: number, rate = 1): Term[] => {
  const t: Term[] = [{ kind: 'exp', lambda: 0, coef: seed + 0.1 * k }];
  for (let i = 0; i < 30; i++) t.push({ kind: 'exp', lambda: -2e3 * rate * (1 + i) ** 1.3, coef: Math.sin(5 * i + k + 11 * seed) });
  for (let i = 0; i < 15; i++) t.push({ kind: 'osc', sigma: -4e3 * rate * (1 + i), omega: 3e4 * (1 + i), cosCoef: Math.cos(2 * i + k * seed), sinCoef: 0.3 * Math.sin(i - k + seed) });
  return t;
};

describe('Gram matrices shared between measurements', () => {
  it('three measurements on one store, pieces interleaved: each piece matches its own direct integrals', () => {
    // a and b: the same exponents (two watches of one circuit); c: as many monomials with other
    // decay rates (it must not take their Gram matrices)
    const store = new GramStore();
    const a = new RepeatedIntegrals(store);
    const b = new RepeatedIntegrals(store);
    const c = new RepeatedIntegrals(store);
    const T = 4e-5;
    // lengths a few ulps apart, as differences of breakpoints are
    const lengths = [T, T * (1 + 2 * Number.EPSILON), T, T * (1 - 4 * Number.EPSILON), T];
    lengths.forEach((L, k) => {
      for (const [r, seed, rate] of [[a, 1, 1], [b, 7, 1], [c, 3, 1.5]] as const) {
        const t = piece(seed, k, rate);
        r.integrate(t, L);
        expect(rel(r.square, integrateProduct(t, t, L))).toBeLessThan(1e-13);
        expect(Math.abs(r.sum - integrateTerms(t, L))).toBeLessThan(1e-13 * Math.abs(integrateTerms(t, L)) + 1e-18);
      }
    });
  });

  it('a pulse train into a 40-node RC/RL mesh: the same averages and RMS as with a store per watch', () => {
    // my own scenario: a 2 µs-edged pulse into a small mesh, three watches (60+ modes each)
    const lines = ['voltage-source V1 in -> gnd pulse from 0V to 5V period 40us width 15us rise 2us fall 2us cycles 6', 'resistor Rin in -> n0 4.7'];
    for (let i = 0; i < 40; i++) {
      lines.push(`capacitor C${i} n${i} -> gnd ${(1 + (i % 7) * 0.37).toFixed(3)}uF`);
      if (i > 0) lines.push(`resistor R${i} n${i - 1} -> n${i} ${(2 + (i % 5)).toFixed(1)}`);
      if (i % 3 === 0 && i + 3 < 40) lines.push(`inductor L${i} n${i} -> n${i + 3} ${(1 + (i % 4)).toFixed(1)}uH`);
      if (i % 4 === 2) lines.push(`resistor Rg${i} n${i} -> gnd ${(50 + i).toFixed(0)}`);
    }
    lines.push('watch node n5', 'watch node n20', 'watch node n39', 'span 300us', 'samples 601');
    const text = lines.join('\n') + '\n';
    const shared = analyzeText(text, 'mesh.rdn', { partSignals: false });
    // the same measurement, each watch on a store of its own (averageAndRms without a share key)
    for (const tr of shared.traces) {
      expect(tr.pieces.length).toBeGreaterThan(12);
      const own = new RepeatedIntegrals();
      let sq = 0;
      for (const p of tr.pieces) {
        const a = Math.max(p.t0, shared.times[0]!);
        const b = Math.min(p.t1, shared.times[shared.times.length - 1]!);
        if (!(b > a) || a !== p.t0) continue;
        own.integrate(p.terms, b - p.t0);
        sq += own.square;
      }
      const span = shared.times[shared.times.length - 1]! - shared.times[0]!;
      expect(rel(tr.metrics.rms!, Math.sqrt(sq / span))).toBeLessThan(1e-12);
    }
  });
});
