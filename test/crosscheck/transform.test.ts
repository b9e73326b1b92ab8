import { describe, expect, it } from 'vitest';
import type { StateSpace } from '../../src/model/state-space.js';
import type { Piece } from '../../src/simulate/result.js';
import { transformCheck, transformWeights } from '../../src/simulate/transform-check.js';
import type { InputSchedule } from '../../src/waveform/schedule.js';
import { analyzeText } from '../../src/pipeline.js';

// The Laplace-domain cross-check must (a) agree with exact closed forms and (b) notice when a closed
// form is wrong. The closed forms are the textbook first- and second-order step and impulse responses
// (any circuits text, e.g. Nilsson & Riedel, Electric Circuits, ch. 7–8; from memory).

const one = (A: number[][], B: number[][]): StateSpace => ({ n: A.length, m: 1, A, B, Bx1: A.map(() => [0]), states: [], inputs: ['V1'] });
const readout = (C: number[]) => ({ C, D: [0], D1: [0] });
const stepSchedule = (V: number, T: number): InputSchedule => ({
  intervals: [{ t0: 0, t1: T, components: [{ input: 0, power: 0, sigma: 0, omega: 0, re: V, im: 0 }], slopes: [] }],
  diracs: [],
  jumps: [],
  outside: [],
  approximation: [0],
});

describe('Laplace-domain cross-check', () => {
  const R = 4.7e3;
  const Cap = 2.2e-6;
  const tau = R * Cap;
  const V = 9;
  const T = 6 * tau;
  const ss = one([[-1 / tau]], [[1 / tau]]);
  const rcPieces = (tc: number): Piece[] => [{ t0: 0, t1: T, impulseArea: 0, terms: [{ kind: 'exp', lambda: 0, coef: V }, { kind: 'exp', lambda: -1 / tc, coef: -V }] }];
  const end = V * (1 - Math.exp(-T / tau));

  it('agrees with the RC step response v = V(1 − e^(−t/RC)) to round-off', () => {
    const r = transformCheck({ ss, readouts: [readout([1])], schedule: stepSchedule(V, T), a: 0, b: T, xiStart: [0], xiEnd: [end], pieces: [rcPieces(tau)] }, transformWeights(ss, T));
    expect(r.absErr[0] / V).toBeLessThan(1e-13);
  });

  it('flags a time constant off by one part in a million', () => {
    const r = transformCheck({ ss, readouts: [readout([1])], schedule: stepSchedule(V, T), a: 0, b: T, xiStart: [0], xiEnd: [end], pieces: [rcPieces(tau * (1 + 1e-6))] }, transformWeights(ss, T));
    // the pointwise error peaks at V·e^(−1)·1e-6 ≈ 3.3e-6 V; a weighted average of it must still
    // stand far above the 1e-9 tolerance
    expect(r.absErr[0] / V).toBeGreaterThan(1e-8);
  });

  it('agrees with the underdamped series RLC capacitor voltage, and flags a wrong ringing frequency', () => {
    const L = 1e-3;
    const C = 1e-6;
    const Rs = 10;
    const alpha = Rs / (2 * L);
    const wd = Math.sqrt(1 / (L * C) - alpha * alpha);
    const Tr = 10 / alpha;
    // states (vC, iL): vC' = iL/C, iL' = (V − vC − R·iL)/L
    const rlc = one([[0, 1 / C], [-1 / L, -Rs / L]], [[0], [1 / L]]);
    const pieces = (w: number): Piece[] => [{ t0: 0, t1: Tr, impulseArea: 0, terms: [{ kind: 'exp', lambda: 0, coef: V }, { kind: 'osc', sigma: -alpha, omega: w, cosCoef: -V, sinCoef: (-V * alpha) / w }] }];
    const vC = (t: number) => V * (1 - Math.exp(-alpha * t) * (Math.cos(wd * t) + (alpha / wd) * Math.sin(wd * t)));
    const iL = (t: number) => ((C * V * (alpha * alpha + wd * wd)) / wd) * Math.exp(-alpha * t) * Math.sin(wd * t);
    const data = { ss: rlc, readouts: [readout([1, 0])], schedule: stepSchedule(V, Tr), a: 0, b: Tr, xiStart: [0, 0], xiEnd: [vC(Tr), iL(Tr)] };
    const good = transformCheck({ ...data, pieces: [pieces(wd)] }, transformWeights(rlc, Tr));
    expect(good.absErr[0] / V).toBeLessThan(1e-12);
    const bad = transformCheck({ ...data, pieces: [pieces(wd * (1 + 1e-6))] }, transformWeights(rlc, Tr));
    expect(bad.absErr[0] / V).toBeGreaterThan(1e-8);
  });

  it('accounts for an impulse inside the epoch: RC response Q/(RC)·e^(−(t − td)/RC)', () => {
    const Q = 3e-3; // V·s
    const td = 2 * tau;
    const schedule: InputSchedule = {
      intervals: [
        { t0: 0, t1: td, components: [], slopes: [] },
        { t0: td, t1: T, components: [], slopes: [] },
      ],
      diracs: [{ t: td, area: [Q] }],
      jumps: [],
      outside: [],
      approximation: [0],
    };
    const amp = Q / tau;
    const pieces: Piece[] = [
      { t0: 0, t1: td, impulseArea: 0, terms: [] },
      { t0: td, t1: T, impulseArea: 0, terms: [{ kind: 'exp', lambda: -1 / tau, coef: amp }] },
    ];
    const xiEnd = [amp * Math.exp(-(T - td) / tau)];
    const r = transformCheck({ ss, readouts: [readout([1])], schedule, a: 0, b: T, xiStart: [0], xiEnd, pieces: [pieces] }, transformWeights(ss, T));
    expect(r.absErr[0] / amp).toBeLessThan(1e-13);
    // the same response started 1 % of τ late is caught
    const late = [pieces[0], { ...pieces[1], t0: td + 0.01 * tau }];
    const r2 = transformCheck({ ss, readouts: [readout([1])], schedule, a: 0, b: T, xiStart: [0], xiEnd, pieces: [late] }, transformWeights(ss, T));
    expect(r2.absErr[0] / amp).toBeGreaterThan(1e-4);
  });

  it('runs for circuits above the time-domain size and passes on a 48-section RC ladder driven by a ramp', () => {
    const lines = ['voltage-source V1 in -> gnd ramp rate 250kV/s until 20us', 'resistor R0 in -> n1 220'];
    for (let k = 1; k <= 48; k++) {
      lines.push(`capacitor C${k} n${k} -> gnd ${k % 3 === 0 ? '2n2' : '1n'}`);
      if (k < 48) lines.push(`resistor R${k} n${k} -> n${k + 1} ${k % 2 ? '100' : '330'}`);
    }
    lines.push('resistor RL n48 -> gnd 10k', 'watch node n48', 'watch node n1', 'samples 500', 'span 20ms');
    const r = analyzeText(lines.join('\n') + '\n', 'ladder48.rdn', { partSignals: false });
    expect(r.states.length).toBe(48);
    expect(r.crossCheck.method).toMatch(/Laplace/);
    expect(r.crossCheck.transformWeights?.length).toBeGreaterThan(2);
    expect(r.crossCheck.passed).toBe(true);
    // DC end value: the 10 kΩ load against the string of series resistors (divider, from the netlist)
    const series = 220 + 24 * 100 + 23 * 330;
    // 20 ms is more than 30 of the slowest time constants (below 0.7 ms: 10 kΩ·70 nF bounds it)
    const final = r.traces[0].values[r.traces[0].values.length - 1];
    expect(Math.abs(final - (5 * 10e3) / (10e3 + series)) / 5).toBeLessThan(1e-10);
  });
});
