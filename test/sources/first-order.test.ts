import { describe, expect, it } from 'vitest';
import { analyzeCircuit } from '../../src/pipeline.js';
import { circuit, part, source, watchPart, worst } from './build.js';

// First-order RC and RL responses to the non-step source kinds, against closed forms obtained by
// solving the first-order linear ODE τ·v' + v = u(t) by hand (integrating factor; any circuits
// textbook, from memory). Exact paths: 1e-9 relative to the signal's peak.

const R = 1e3;
const C = 1e-6;
const tau = R * C;

describe('RC low-pass, exact convolution with each source kind', () => {
  it('ramp u = k·t: v = k·(t − τ·(1 − e^(−t/τ)))', () => {
    const k = 2e3; // V/s
    const c = circuit(
      [source('voltage-source', 'V1', 'in', 'gnd', { kind: 'ramp', at: 0, slope: k, until: Infinity }), part('resistor', 'R1', 'in', 'out', R), part('capacitor', 'C1', 'out', 'gnd', C)],
      [watchPart('part-voltage', 'C1')],
      5 * tau,
    );
    const r = analyzeCircuit(c);
    expect(r.crossCheck.passed).toBe(true);
    expect(worst(r.times, r.traces[0].values, (t) => k * (t - tau * (1 - Math.exp(-t / tau))))).toBeLessThan(1e-9);
  });

  it('exponential approach u = V·(1 − e^(−t/τ2)): v = V·[1 − (τ·e^(−t/τ) − τ2·e^(−t/τ2))/(τ − τ2)]', () => {
    const V = 5;
    const tau2 = 0.3e-3;
    const c = circuit(
      [source('voltage-source', 'V1', 'in', 'gnd', { kind: 'approach', from: 0, to: V, at: 0, tau: tau2 }), part('resistor', 'R1', 'in', 'out', R), part('capacitor', 'C1', 'out', 'gnd', C)],
      [watchPart('part-voltage', 'C1')],
      6 * tau,
    );
    const r = analyzeCircuit(c);
    expect(r.crossCheck.passed).toBe(true);
    const want = (t: number) => V * (1 - (tau * Math.exp(-t / tau) - tau2 * Math.exp(-t / tau2)) / (tau - tau2));
    expect(worst(r.times, r.traces[0].values, want)).toBeLessThan(1e-9);
  });

  it('exponential approach at the circuit’s own time constant (resonant case): v = V·(1 − (1 + t/τ)·e^(−t/τ))', () => {
    const V = 5;
    const c = circuit(
      [source('voltage-source', 'V1', 'in', 'gnd', { kind: 'approach', from: 0, to: V, at: 0, tau }), part('resistor', 'R1', 'in', 'out', R), part('capacitor', 'C1', 'out', 'gnd', C)],
      [watchPart('part-voltage', 'C1')],
      8 * tau,
    );
    const r = analyzeCircuit(c);
    expect(r.crossCheck.passed).toBe(true);
    expect(worst(r.times, r.traces[0].values, (t) => V * (1 - (1 + t / tau) * Math.exp(-t / tau)))).toBeLessThan(1e-9);
  });

  it('sinusoid A·sin(ωt) from rest: v = A/(1+(ωτ)²)·(sin ωt − ωτ·cos ωt + ωτ·e^(−t/τ)); steady amplitude A/√(1+(ωτ)²), phase −atan(ωτ) (phasor analysis)', () => {
    const A = 10;
    const f = 400;
    const w = 2 * Math.PI * f;
    const c = circuit(
      [source('voltage-source', 'V1', 'in', 'gnd', { kind: 'sine', amplitude: A, freq: f, phase: 0, at: 0, decay: Infinity }), part('resistor', 'R1', 'in', 'out', R), part('capacitor', 'C1', 'out', 'gnd', C)],
      [watchPart('part-voltage', 'C1')],
      10e-3,
      4001,
    );
    const r = analyzeCircuit(c);
    expect(r.crossCheck.passed).toBe(true);
    const wt = w * tau;
    const want = (t: number) => (A / (1 + wt * wt)) * (Math.sin(w * t) - wt * Math.cos(w * t) + wt * Math.exp(-t / tau));
    expect(worst(r.times, r.traces[0].values, want)).toBeLessThan(1e-9);
    // steady state from the phasor: amplitude and phase of the last cycles
    const amp = A / Math.sqrt(1 + wt * wt);
    const phase = -Math.atan(wt);
    const t = 9.9e-3;
    const i = r.times.findIndex((x) => x >= t);
    const tt = r.times[i];
    expect(Math.abs(r.traces[0].values[i] - amp * Math.sin(w * tt + phase)) / amp).toBeLessThan(1e-9 + Math.exp(-tt / tau) * wt);
  });

  it('RL current from a ramp: i = (k/R)·(t − (L/R)(1 − e^(−tR/L)))', () => {
    const L = 10e-3;
    const Rl = 5;
    const k = 100;
    const tl = L / Rl;
    const c = circuit(
      [source('voltage-source', 'V1', 'in', 'gnd', { kind: 'ramp', at: 0, slope: k, until: Infinity }), part('resistor', 'R1', 'in', 'a', Rl), part('inductor', 'L1', 'a', 'gnd', L)],
      [watchPart('part-current', 'L1')],
      6 * tl,
    );
    const r = analyzeCircuit(c);
    expect(worst(r.times, r.traces[0].values, (t) => (k / Rl) * (t - tl * (1 - Math.exp(-t / tl))))).toBeLessThan(1e-9);
  });
});
