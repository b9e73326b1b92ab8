/**
 * The band-narrowing renumbering (reverse Cuthill–McKee) and the two solves that use it: the
 * Laplace-domain cross-check and the settled start. Sources: a path graph numbered along itself is
 * tridiagonal (graph theory, from memory); the series RLC step response and the resistive divider
 * at DC (any circuits text, from memory).
 */
import { describe, expect, it } from 'vitest';
import { bandOrder } from '../../src/simulate/band-order.js';
import type { StateSpace } from '../../src/model/state-space.js';
import type { Piece } from '../../src/simulate/result.js';
import { transformCheck, transformWeights } from '../../src/simulate/transform-check.js';
import type { InputSchedule } from '../../src/waveform/schedule.js';
import { loadCircuit } from '../../src/circuit/load.js';
import { buildModel } from '../../src/model/build.js';
import { analyzeText } from '../../src/pipeline.js';

/** a fixed shuffle of 0 … n−1 (linear congruential, seeded) */
function shuffled(n: number, seed: number): number[] {
  const p = Array.from({ length: n }, (_, i) => i);
  let s = seed;
  for (let i = n - 1; i > 0; i--) {
    s = (Math.imul(s, 1664525) + 1013904223) >>> 0;
    const j = s % (i + 1);
    [p[i], p[j]] = [p[j]!, p[i]!];
  }
  return p;
}

function bandOf(I: number[], J: number[], pos: ArrayLike<number>): number {
  let b = 0;
  for (let q = 0; q < I.length; q++) b = Math.max(b, Math.abs(pos[I[q]!]! - pos[J[q]!]!));
  return b;
}

describe('band-narrowing renumbering', () => {
  it('gives a scrambled path graph back its tridiagonal band', () => {
    const n = 60;
    const label = shuffled(n, 7);
    const I: number[] = [];
    const J: number[] = [];
    for (let k = 0; k < n; k++) {
      I.push(label[k]!);
      J.push(label[k]!);
      if (k + 1 < n) {
        I.push(label[k]!, label[k + 1]!);
        J.push(label[k + 1]!, label[k]!);
      }
    }
    const identity = Array.from({ length: n }, (_, i) => i);
    expect(bandOf(I, J, identity)).toBeGreaterThan(10);
    const o = bandOrder(n, I, J);
    expect([...o.order].sort((a, b) => a - b)).toEqual(identity);
    for (let k = 0; k < n; k++) expect(o.pos[o.order[k]!]).toBe(k);
    expect(o.kl).toBe(1);
    expect(o.ku).toBe(1);
    expect(bandOf(I, J, o.pos)).toBe(1);
  });

  it('keeps the order of a pattern that is already narrow', () => {
    const I = [0, 0, 1, 1, 1, 2, 2, 3];
    const J = [0, 1, 0, 1, 2, 1, 3, 2];
    const o = bandOrder(4, I, J);
    expect([...o.order]).toEqual([0, 1, 2, 3]);
  });
});

describe('the Laplace-domain cross-check on a renumbered state matrix', () => {
  // K series RLC circuits side by side, circuit k's states (vC, iL) numbered k and k + K: the band
  // of A is K wide until renumbered. Each vC is the textbook underdamped step response.
  const K = 20;
  const V = 5;
  const L = 1e-3;
  const C = 1e-6;
  const Rs = (k: number) => 4 + k;
  const alpha = (k: number) => Rs(k) / (2 * L);
  const wd = (k: number) => Math.sqrt(1 / (L * C) - alpha(k) ** 2);
  const T = 10 / alpha(0);
  const n = 2 * K;
  const A = Array.from({ length: n }, () => new Array<number>(n).fill(0));
  const B = Array.from({ length: n }, () => [0]);
  for (let k = 0; k < K; k++) {
    // vC' = iL/C, iL' = (V − vC − R·iL)/L
    A[k]![k + K] = 1 / C;
    A[k + K]![k] = -1 / L;
    A[k + K]![k + K] = -Rs(k) / L;
    B[k + K]![0] = 1 / L;
  }
  const ss: StateSpace = { n, m: 1, A, B, Bx1: A.map(() => [0]), states: [], inputs: ['V1'] };
  const schedule: InputSchedule = {
    intervals: [{ t0: 0, t1: T, components: [{ input: 0, power: 0, sigma: 0, omega: 0, re: V, im: 0 }], slopes: [] }],
    diracs: [],
    jumps: [],
    outside: [],
    approximation: [0],
  };
  const vC = (k: number, t: number) => V * (1 - Math.exp(-alpha(k) * t) * (Math.cos(wd(k) * t) + (alpha(k) / wd(k)) * Math.sin(wd(k) * t)));
  const iL = (k: number, t: number) => ((C * V * (alpha(k) ** 2 + wd(k) ** 2)) / wd(k)) * Math.exp(-alpha(k) * t) * Math.sin(wd(k) * t);
  const pieces = (k: number, w: number): Piece[] => [
    { t0: 0, t1: T, impulseArea: 0, terms: [{ kind: 'exp', lambda: 0, coef: V }, { kind: 'osc', sigma: -alpha(k), omega: w, cosCoef: -V, sinCoef: (-V * alpha(k)) / w }] },
  ];
  const readouts = Array.from({ length: K }, (_, k) => ({ C: A.map((_, i) => (i === k ? 1 : 0)), D: [0], D1: [0] }));
  const xiEnd = Array.from({ length: n }, (_, i) => (i < K ? vC(i, T) : iL(i - K, T)));
  const data = { ss, readouts, schedule, a: 0, b: T, xiStart: new Array<number>(n).fill(0), xiEnd };

  it('is renumbered to a narrow band', () => {
    const I: number[] = [];
    const J: number[] = [];
    A.forEach((row, i) => row.forEach((v, j) => v !== 0 && (I.push(i), J.push(j))));
    const o = bandOrder(n, I, J);
    expect(o.kl + o.ku).toBeLessThanOrEqual(2);
  });

  it('agrees with every exact response, and flags one ringing frequency off by 1e-6', () => {
    const good = transformCheck({ ...data, pieces: readouts.map((_, k) => pieces(k, wd(k))) }, transformWeights(ss, T));
    for (const e of good.absErr) expect(e / V).toBeLessThan(1e-12);
    const wrong = 13;
    const bad = transformCheck({ ...data, pieces: readouts.map((_, k) => pieces(k, k === wrong ? wd(k) * (1 + 1e-6) : wd(k))) }, transformWeights(ss, T));
    bad.absErr.forEach((e, k) => {
      if (k === wrong) expect(e / V).toBeGreaterThan(1e-8);
      else expect(e / V).toBeLessThan(1e-12);
    });
  });
});

describe('the settled start of a circuit renumbered for its solve', () => {
  it('a 40-section R–L ladder with capacitors declared out of order sits at the divider voltages', () => {
    // source 12 V through 10 Ω; section k: capacitor at node nk, then R_k and L_k in series to n(k+1);
    // 50 Ω from n40 to ground. At DC the coils are shorts and the capacitors open (textbook)
    const N = 40;
    const R = (k: number) => 1 + (k % 7);
    const lines = ['voltage-source V1 in -> gnd 12V', 'resistor R0 in -> n1 10'];
    for (const k of shuffled(N, 3)) lines.push(`capacitor C${k + 1} n${k + 1} -> gnd ${1 + (k % 5)}u`);
    for (let k = 1; k < N; k++) lines.push(`resistor R${k} n${k} -> x${k} ${R(k)}`, `inductor L${k} x${k} -> n${k + 1} ${10 + k}u`);
    lines.push(`resistor RL n${N} -> gnd 50`, 'watch node n1', 'watch node n17', `watch node n${N}`, 'span 1ms', 'samples 11');
    const text = lines.join('\n') + '\n';
    const { ss } = buildModel(loadCircuit(text, 'ladder.rdn'));
    // the states come out of order (else this test would not exercise the renumbering)
    const I: number[] = [];
    const J: number[] = [];
    ss.A.forEach((row, i) => row.forEach((v, j) => v !== 0 && (I.push(i), J.push(j))));
    expect(ss.n).toBeGreaterThan(32);
    const o = bandOrder(ss.n, I, J);
    expect(o.kl + o.ku).toBeLessThan(bandOf(I, J, Array.from({ length: ss.n }, (_, i) => i)));
    const r = analyzeText(text, 'ladder.rdn', { partSignals: false });
    expect(r.start).toBe('settled');
    expect(r.crossCheck.method).toMatch(/Laplace/);
    expect(r.crossCheck.passed).toBe(true);
    let total = 10 + 50;
    for (let k = 1; k < N; k++) total += R(k);
    const I0 = 12 / total;
    // node k's voltage: the current times the resistance between it and ground
    const below = (k: number) => {
      let s = 50;
      for (let j = k; j < N; j++) s += R(j);
      return s;
    };
    [1, 17, N].forEach((k, w) => {
      for (const v of r.traces[w]!.values) expect(Math.abs(v - I0 * below(k)) / 12).toBeLessThan(1e-12);
    });
  });
});
