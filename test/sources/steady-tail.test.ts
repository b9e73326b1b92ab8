import { describe, expect, it } from 'vitest';
import { termsValue } from '../../src/lti/term.js';
import { analyzeText } from '../../src/pipeline.js';
import type { Piece } from '../../src/simulate/result.js';

// A pulse train into an RC low-pass for 400 periods: once the start-up has decayed to round-off,
// the run lays the steady period's closed forms on the remaining periods instead of solving each.
// References (first-order circuits, textbook, from memory): in the periodic steady state the
// capacitor charges as V + (Vmin − V)·e^(−φ/τ) while the pulse is high and decays as
// Vmax·e^(−(φ − DT)/τ) while it is low, with Vmax = V(1 − e^(−DT/τ))/(1 − e^(−T/τ)) and
// Vmin = Vmax·e^(−(1−D)T/τ); at the period starts v(kT) = Vmin·(1 − e^(−kT/τ)) from rest.
describe('long pulse trains: the steady periods', () => {
  const V = 5;
  const T = 50e-6;
  const D = 0.3;
  const tau = 1e3 * 100e-9;
  const text = [
    'voltage-source V1 in -> gnd pulse to 5V period 50us duty 30%',
    'resistor R1 in -> out 1k',
    'capacitor C1 out -> gnd 100n',
    'start rest',
    'watch node out',
    'span 20ms',
    'samples 4001',
  ].join('\n');
  const r = analyzeText(text + '\n', 'pwm-rc.rdn');
  const pieces = r.traces[0].pieces;
  const at = (t: number) => {
    let lo = 0;
    let hi = pieces.length - 1;
    while (lo < hi) {
      const mid = (lo + hi + 1) >> 1;
      if (pieces[mid].t0 <= t) lo = mid;
      else hi = mid - 1;
    }
    const p: Piece = pieces[lo];
    return termsValue(p.terms, t - p.t0);
  };
  const vmax = (V * (1 - Math.exp((-D * T) / tau))) / (1 - Math.exp(-T / tau));
  const vmin = vmax * Math.exp((-(1 - D) * T) / tau);
  const steady = (phase: number) => (phase < D * T ? V + (vmin - V) * Math.exp(-phase / tau) : vmax * Math.exp(-(phase - D * T) / tau));

  it('shares the steady closed forms over most of the span', () => {
    expect(pieces.length).toBe(800);
    expect(new Set(pieces.map((p) => p.terms)).size).toBeLessThan(300);
    expect(r.crossCheck.passed).toBe(true);
  });

  it('follows the start-up at every period start and the steady waveform at the end', () => {
    for (const k of [1, 5, 20, 60, 100, 250, 399]) {
      const exact = vmin * (1 - Math.exp((-k * T) / tau));
      expect(Math.abs(at(k * T) - exact) / V).toBeLessThan(1e-12);
    }
    for (const phase of [0.1, 0.25, 0.31, 0.5, 0.93].map((f) => f * T)) {
      const t = 399 * T + phase;
      expect(Math.abs(at(t) - steady(phase)) / V).toBeLessThan(1e-12);
    }
    // the samples carry the same values
    const values = r.traces[0].values;
    const tk = r.times[r.times.length - 2];
    expect(Math.abs(values[values.length - 2] - steady(tk - 399 * T)) / V).toBeLessThan(1e-12);
  });

  it('reports the same average as the exact steady waveform over the steady periods', () => {
    // the mean of the steady waveform is D·V (the capacitor carries no DC current)
    expect(Math.abs(r.periodic!.watches[0].mean - D * V) / V).toBeLessThan(1e-12);
  });
});
