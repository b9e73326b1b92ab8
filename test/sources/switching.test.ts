import { describe, expect, it } from 'vitest';
import { termsValue } from '../../src/lti/term.js';
import { analyzeCircuit } from '../../src/pipeline.js';
import { circuit, part, source, sw, watchPart, watchNode, worst } from './build.js';

describe('sinusoid switched on into a series RL (textbook AC transient, from memory)', () => {
  // v = Vm·sin(ωt) applied at a zero crossing: i = (Vm/|Z|)·[sin(ωt − φ) + sin φ·e^(−tR/L)], φ = atan(ωL/R)
  const Vm = 325;
  const f = 50;
  const w = 2 * Math.PI * f;
  it('matches the closed form; the first current peak nears twice the steady amplitude when ωL ≫ R (common practice)', () => {
    const R = 0.5;
    const L = 0.1; // ωL = 31.4 Ω ≫ R
    const c = circuit(
      [source('voltage-source', 'V1', 'in', 'gnd', { kind: 'sine', amplitude: Vm, freq: f, phase: 0, at: 0, decay: Infinity }), part('resistor', 'R1', 'in', 'a', R), part('inductor', 'L1', 'a', 'gnd', L)],
      [watchPart('part-current', 'L1')],
      0.1,
      20001,
    );
    const r = analyzeCircuit(c);
    expect(r.crossCheck.passed).toBe(true);
    const Z = Math.hypot(R, w * L);
    const phi = Math.atan2(w * L, R);
    const want = (t: number) => (Vm / Z) * (Math.sin(w * t - phi) + Math.sin(phi) * Math.exp((-t * R) / L));
    expect(worst(r.times, r.traces[0].values, want)).toBeLessThan(1e-9);
    const steady = Vm / Z;
    const peak = r.traces[0].metrics.peak.value;
    expect(peak / steady).toBeGreaterThan(1.9);
    expect(peak / steady).toBeLessThan(2);
  });
});

describe('lossless series LC driven at its own resonance (secular growth; textbook, from memory)', () => {
  it('v_C = (V/2)·(sin ω0t − ω0t·cos ω0t)', () => {
    const L = 1e-3;
    const C = 1e-6;
    const w0 = 1 / Math.sqrt(L * C);
    const V = 1;
    const c = circuit(
      [source('voltage-source', 'V1', 'in', 'gnd', { kind: 'sine', amplitude: V, freq: w0 / (2 * Math.PI), phase: 0, at: 0, decay: Infinity }), part('inductor', 'L1', 'in', 'a', L), part('capacitor', 'C1', 'a', 'gnd', C)],
      [watchPart('part-voltage', 'C1')],
      (20 * 2 * Math.PI) / w0,
      4001,
    );
    const r = analyzeCircuit(c);
    expect(r.crossCheck.passed).toBe(true);
    const want = (t: number) => (V / 2) * (Math.sin(w0 * t) - w0 * t * Math.cos(w0 * t));
    expect(worst(r.times, r.traces[0].values, want)).toBeLessThan(1e-9);
  });
});

describe('charge sharing between two capacitors (physics textbook, from memory)', () => {
  const C1 = 10e-6;
  const C2 = 22e-6;
  const V0 = 100;
  const vFinal = (C1 * V0) / (C1 + C2);
  const lost = 0.5 * ((C1 * C2) / (C1 + C2)) * V0 * V0;
  it('ideal switch: the voltages jump to C1·V0/(C1+C2); energy ½·C1C2/(C1+C2)·V0² is lost in the instant', () => {
    const c = circuit(
      [part('capacitor', 'C1', 'a', 'gnd', C1, { initial: V0 }), sw('S1', 'a', 'b', 0, false, [{ t: 1e-3, closed: true }]), part('capacitor', 'C2', 'b', 'gnd', C2), part('resistor', 'Rleak', 'a', 'gnd', 1e12)],
      [watchNode('a'), watchNode('b')],
      2e-3,
      201,
    );
    const r = analyzeCircuit(c);
    const ev = r.events!.find((e) => e.t === 1e-3)!;
    expect(ev).toBeDefined();
    expect(Math.abs(ev.energyLost - lost) / lost).toBeLessThan(1e-6); // Rleak drains 1e-12 relative per ms
    const after = r.traces[0].values[r.times.length - 1];
    expect(Math.abs(after - vFinal) / vFinal).toBeLessThan(1e-6);
    expect(Math.abs(r.traces[1].values[r.times.length - 1] - vFinal) / vFinal).toBeLessThan(1e-6);
  });

  it('through a resistor: same final voltage, and the resistor dissipates the same energy whatever its value', () => {
    for (const Rs of [1, 100]) {
      const tau = (Rs * C1 * C2) / (C1 + C2);
      const c = circuit(
        [part('capacitor', 'C1', 'a', 'gnd', C1, { initial: V0 }), sw('S1', 'a', 'b', Rs, false, [{ t: 1e-6, closed: true }]), part('capacitor', 'C2', 'b', 'gnd', C2)],
        [watchPart('part-current', 'S1'), watchNode('b')],
        1e-6 + 40 * tau,
        20001,
      );
      const r = analyzeCircuit(c);
      expect(r.crossCheck.passed).toBe(true);
      // i(t) = (V0/Rs)·e^(−(t−t0)/τ); ∫ i²R dt = V0²·τ/(2Rs) = ½·C1C2/(C1+C2)·V0²
      const want = (t: number) => (t < 1e-6 ? 0 : (V0 / Rs) * Math.exp(-(t - 1e-6) / tau));
      expect(worst(r.times.subarray(1), r.traces[0].values.subarray(1), want)).toBeLessThan(1e-9);
      expect(Math.abs(r.traces[1].values[r.times.length - 1] - vFinal) / vFinal).toBeLessThan(1e-9);
      expect(Math.abs((V0 * V0 * tau) / (2 * Rs) - lost) / lost).toBeLessThan(1e-12);
    }
  });
});

describe('coil turned off through a resistor snubber (Thevenin + first order, textbook, from memory)', () => {
  it('i_L = I0·e^(−t·(RL+Rs)/L) after the switch opens; the coil voltage starts at −I0·Rs', () => {
    const V = 24;
    const RL = 48; // coil resistance
    const L = 0.2;
    const Rs = 470;
    const t0 = 1e-3;
    const tau = L / (RL + Rs);
    const c = circuit(
      [
        source('voltage-source', 'V1', 'sup', 'gnd', { kind: 'constant', value: V }),
        sw('S1', 'sup', 'top', 0.01, true, [{ t: t0, closed: false }]),
        part('resistor', 'RL', 'top', 'm', RL),
        part('inductor', 'L1', 'm', 'gnd', L),
        part('resistor', 'Rs', 'top', 'gnd', Rs),
      ],
      [watchPart('part-current', 'L1'), watchNode('top')],
      t0 + 10 * tau,
      4001,
      'settled',
    );
    const r = analyzeCircuit(c);
    expect(r.start).toBe('settled');
    expect(r.crossCheck.passed).toBe(true);
    // before the switch opens the supply (through 10 mΩ) feeds RL+L (settled DC) and Rs
    const Gtop = 1 / 0.01 + 1 / RL + 1 / Rs;
    const vtop = (V / 0.01) / Gtop;
    const iStart = vtop / RL;
    const want = (t: number) => (t < t0 ? iStart : iStart * Math.exp(-(t - t0) / tau));
    expect(worst(r.times, r.traces[0].values, want)).toBeLessThan(1e-9);
    // right after the opening, from the closed form of the piece that starts there
    const piece = r.traces[1].pieces.find((p) => p.t0 === t0)!;
    expect(Math.abs(termsValue(piece.terms, 0) - -iStart * Rs) / (iStart * Rs)).toBeLessThan(1e-9);
  });
});

describe('PWM into an RC: periodic steady state ripple (textbook, from memory)', () => {
  it('v_max = V(1 − e^(−DT/τ))/(1 − e^(−T/τ)), v_min = v_max·e^(−(1−D)T/τ)', () => {
    const R = 1e3;
    const C = 1e-6;
    const tau = R * C;
    const T = 200e-6;
    const D = 0.3;
    const V = 5;
    const cycles = 200; // 40 ms = 40 τ: steady to e^−40
    const c = circuit(
      [
        source('voltage-source', 'V1', 'in', 'gnd', { kind: 'pulse', low: 0, high: V, period: T, width: D * T, rise: 0, fall: 0, start: 0, cycles: Infinity }),
        part('resistor', 'R1', 'in', 'out', R),
        part('capacitor', 'C1', 'out', 'gnd', C),
      ],
      [watchPart('part-voltage', 'C1')],
      cycles * T,
      cycles * 20 + 1,
    );
    const r = analyzeCircuit(c);
    expect(r.crossCheck.passed).toBe(true);
    const vmax = (V * (1 - Math.exp((-D * T) / tau))) / (1 - Math.exp(-T / tau));
    const vmin = vmax * Math.exp((-(1 - D) * T) / tau);
    // the last cycle: sample at its start (minimum) and at the end of the high phase (maximum)
    const last = (cycles - 1) * T;
    const idxMin = r.times.findIndex((t) => Math.abs(t - last) < 1e-12);
    const idxMax = r.times.findIndex((t) => Math.abs(t - (last + D * T)) < T / 1e6);
    expect(Math.abs(r.traces[0].values[idxMin] - vmin) / V).toBeLessThan(1e-9);
    expect(Math.abs(r.traces[0].values[idxMax] - vmax) / V).toBeLessThan(1e-9);
  });
});
