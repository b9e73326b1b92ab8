/**
 * Measurements of pieces that repeat (src/measure/repeat.ts): the periods of a steady tail share
 * their term arrays and their lengths differ by ulps of t. The references are the same
 * measurements on a full step-by-step solution (every period solved from the state before it, no
 * shared arrays), and the closed forms evaluated directly.
 */
import { describe, expect, it } from 'vitest';
import { loadCircuit } from '../../src/circuit/load.js';
import { modalDecomposition } from '../../src/lti/modal.js';
import { termsValue } from '../../src/lti/term.js';
import { computeMetrics } from '../../src/measure/metrics.js';
import { averageAndRms } from '../../src/measure/shape.js';
import { partStress } from '../../src/measure/stress.js';
import { clipTable } from '../../src/measure/repeat.js';
import { buildTrack } from '../../src/measure/track.js';
import { buildModel } from '../../src/model/build.js';
import { voltageProbe } from '../../src/model/descriptor.js';
import { analyzeText } from '../../src/pipeline.js';
import type { Piece, Term } from '../../src/simulate/result.js';
import { sampleUniform } from '../../src/simulate/sample.js';
import { solveExact } from '../../src/simulate/solve.js';
import { eventTimes } from '../../src/waveform/events.js';
import { buildSchedule } from '../../src/waveform/schedule.js';
import { grid, piece } from './helpers.js';

const rel = (a: number, b: number) => (a === b ? 0 : Math.abs(a - b) / Math.max(Math.abs(a), Math.abs(b)));

describe('a steady tail measures as the full step-by-step run', () => {
  // 100 kHz PWM into an LC filter for 1500 periods; the level 5.1 V lies inside the steady ripple
  // (about 4.97 V … 5.14 V), so the time above it is summed over every period and its last
  // crossing lies in the last one: both come from the knots laid on the repeated periods
  const text = [
    'voltage-source Vsw sw -> gnd pulse to 12V freq 100kHz duty 42% rise 20ns fall 20ns',
    'inductor L1 sw -> out 10uH',
    'resistor Resr out -> c 15mohm',
    'capacitor C1 c -> gnd 22uF',
    'resistor Rload out -> gnd 2.5ohm',
    'start rest',
    'watch node out above 5.1V',
    'span 15ms',
    'samples 6001',
  ].join('\n');
  const r = analyzeText(text + '\n', 'pwm-lc.rdn', { partSignals: false });
  const tail = r.traces[0];

  // the full run: the whole schedule solved interval by interval from rest
  const circuit = loadCircuit(text + '\n', 'pwm-lc.rdn');
  const model = buildModel(circuit);
  const { ss } = model;
  const readout = model.readout(voltageProbe(model.descriptor, 'out', 'gnd'));
  const waves = ss.inputs.map((name) => circuit.parts.find((p) => p.name === name)!.waveform!);
  const full = solveExact(ss, modalDecomposition(ss.A), [readout], buildSchedule(waves, r.span, 0), new Array<number>(ss.n).fill(0), r.span).pieces[0];
  const events = eventTimes(circuit, r.span);
  const band = circuit.analysis.settle;
  const mTail = tail.metrics;
  const mFull = computeMetrics(r.times, sampleUniform(full, r.times), full, band, 5.1, events);

  it('the run lays shared steady periods on the same breakpoints', () => {
    expect(r.crossCheck.scope).toBeDefined();
    // (the start-up takes about 400 periods to reach the steady state to round-off)
    expect(new Set(tail.pieces.map((p) => p.terms)).size).toBeLessThan(tail.pieces.length / 3);
    expect(tail.pieces.length).toBe(full.length);
    for (let i = 0; i < full.length; i++) expect(tail.pieces[i].t0).toBe(full[i].t0);
  });

  it('extremes, integrals, slope and time above agree', () => {
    for (const k of ['peak', 'valley'] as const) {
      expect(rel(mTail[k].value, mFull[k].value)).toBeLessThan(1e-12);
      expect(Math.abs(mTail[k].time - mFull[k].time)).toBeLessThan(1e-12 * r.span);
    }
    expect(rel(mTail.average!, mFull.average!)).toBeLessThan(1e-12);
    expect(rel(mTail.rms!, mFull.rms!)).toBeLessThan(1e-12);
    expect(rel(mTail.maxSlope!.value, mFull.maxSlope!.value)).toBeLessThan(1e-12);
    const a = mTail.timeAbove!;
    const b = mFull.timeAbove!;
    expect(a.total).toBeGreaterThan(0.1 * r.span);
    expect(rel(a.total, b.total)).toBeLessThan(1e-10);
    expect(Math.abs(a.first! - b.first!)).toBeLessThan(1e-13 * r.span);
    expect(Math.abs(a.last! - b.last!)).toBeLessThan(1e-13 * r.span);
    // the last crossing is in the last period
    expect(a.last!).toBeGreaterThan(r.span - 1e-5);
  });

  it('every event: the same time, levels and shoots', () => {
    const et = mTail.events!;
    const ef = mFull.events!;
    expect(et.length).toBe(ef.length);
    expect(et.length).toBeGreaterThan(2900);
    const swing = mFull.peak.value - mFull.valley.value;
    for (let i = 0; i < ef.length; i++) {
      expect(et[i].t).toBe(ef[i].t);
      expect(Math.abs(et[i].from - ef[i].from)).toBeLessThan(1e-13 * swing);
      expect(Math.abs(et[i].to - ef[i].to)).toBeLessThan(1e-13 * swing);
      // in % of a transition at least 0.1 % of the swing: 1e-13 of the swing is 1e-8 %
      expect(Math.abs(et[i].overshootPct - ef[i].overshootPct)).toBeLessThan(1e-8);
      expect(Math.abs(et[i].undershootPct - ef[i].undershootPct)).toBeLessThan(1e-8);
    }
  });
});

describe('repeats over ranges a few ulps apart', () => {
  // y(τ) = 1e9·τ + sin(2π·τ/T) on pieces of one shared array, laid at t = 1 + k·T: the lengths
  // differ by ulps of 1 (2.2e-16 s), over which y moves by about 2e-7 (1e9 V/s), 2e-10 of its size
  const T = 1e-6;
  const terms: Term[] = [
    { kind: 'poly-exp', lambda: 0, polyCoefs: [0, 1e9] },
    { kind: 'osc', sigma: 0, omega: (2 * Math.PI) / T, cosCoef: 0, sinCoef: 1 },
  ];
  const pieces: Piece[] = [];
  for (let k = 0; k < 200; k++) pieces.push(piece(1 + k * T, 1 + (k + 1) * T, terms));
  const times = grid(1, 1 + 200 * T, 401);
  const track = buildTrack(times, new Float64Array(times.length), pieces);

  it('the pieces are found to repeat and their lengths do differ', () => {
    const c = clipTable(pieces, times[0], times[times.length - 1]);
    expect(c.count).toBe(200);
    for (let k = 1; k < 200; k++) expect(c.rep[k]).toBe(0);
    const lengths = new Set(pieces.slice(0, -1).map((p, k) => pieces[k + 1].t0 - p.t0));
    expect(lengths.size).toBeGreaterThan(1);
  });

  it('each stretch ends on the closed form at its own end, and its knots are its own times', () => {
    // (calculus: y = 1e9·τ + sin(2πτ/T) is monotone, 1e9 > 2π/T·1 = 6.3e6: only the ends are knots)
    const { ts, ys, first } = track;
    expect(first.length - 1).toBe(200);
    for (let k = 0; k < 200; k++) {
      const p = pieces[k];
      const hi = k + 1 < 200 ? pieces[k + 1].t0 : times[times.length - 1];
      const a = first[k];
      const b = first[k + 1] - 1;
      expect(ts[a]).toBe(p.t0);
      expect(ts[b]).toBe(hi);
      // the direct value at the end: 1e9·(hi − t0) + sin(2π(hi − t0)/T), within round-off of ~1e3
      const exact = termsValue(terms, hi - p.t0);
      expect(Math.abs(ys[b] - exact)).toBeLessThan(4e-13 * Math.abs(exact));
      expect(ys[a]).toBe(termsValue(terms, 0));
    }
  });

  it('average and RMS from the first piece carried to each length, against the integrals piece by piece', () => {
    // calculus: ∫0^b y dτ = 5e8·b² + (T/2π)(1 − cos(2πb/T)); ∫0^b y² dτ = 1e18·b³/3 + 2e9·∫τ·sin + ∫sin²,
    // with ∫0^b τ·sin(wτ) dτ = (sin(wb) − wb·cos(wb))/w² and ∫0^b sin² = b/2 − sin(2wb)/(4w)
    const w = (2 * Math.PI) / T;
    let sum = 0;
    let sq = 0;
    const end = times[times.length - 1];
    for (let k = 0; k < 200; k++) {
      const b = (k + 1 < 200 ? pieces[k + 1].t0 : end) - pieces[k].t0;
      sum += 5e8 * b * b + (1 - Math.cos(w * b)) / w;
      sq += (1e18 * b ** 3) / 3 + (2e9 * (Math.sin(w * b) - w * b * Math.cos(w * b))) / (w * w) + b / 2 - Math.sin(2 * w * b) / (4 * w);
    }
    const m = averageAndRms(pieces, times[0], end)!;
    const span = end - times[0];
    expect(rel(m.average, sum / span)).toBeLessThan(1e-12);
    expect(rel(m.rms, Math.sqrt(sq / span))).toBeLessThan(1e-12);
  });
});

describe('part stress and energy over periods that share their term arrays', () => {
  // a pulse train into an RC low-pass (first-order step responses, from memory): on for 0.3 ms,
  // the capacitor charges as 5 + (v0 − 5)·e^(−t/RC); off for 0.7 ms it decays as v0·e^(−t/RC); the
  // resistor carries (5 − v)/R on and −v/R off. From period 50 on the state repeats to round-off and
  // the copy `shared` reuses the arrays of period 50 (the times accumulate, so the lengths differ by
  // ulps); `separate` has its own arrays throughout: the stress figures must agree
  const RC = 1e-3;
  const R = 1e3;
  const mk = (share: boolean) => {
    const v: Piece[] = [];
    const i: Piece[] = [];
    let y0 = 0;
    let t = 0;
    let onV: Term[] | null = null;
    let onI: Term[] | null = null;
    let offV: Term[] | null = null;
    let offI: Term[] | null = null;
    for (let k = 0; k < 300; k++) {
      const reuse = share && k > 50;
      const aV: Term[] = reuse ? onV! : [{ kind: 'exp', lambda: 0, coef: 5 }, { kind: 'exp', lambda: -1 / RC, coef: y0 - 5 }];
      const aI: Term[] = reuse ? onI! : [{ kind: 'exp', lambda: -1 / RC, coef: (5 - y0) / R }];
      onV = aV;
      onI = aI;
      v.push(piece(t, t + 3e-4, aV));
      i.push(piece(t, t + 3e-4, aI));
      y0 = 5 + (y0 - 5) * Math.exp(-3e-4 / RC);
      t += 3e-4;
      const bV: Term[] = reuse ? offV! : [{ kind: 'exp', lambda: -1 / RC, coef: y0 }];
      const bI: Term[] = reuse ? offI! : [{ kind: 'exp', lambda: -1 / RC, coef: -y0 / R }];
      offV = bV;
      offI = bI;
      v.push(piece(t, t + 7e-4, bV));
      i.push(piece(t, t + 7e-4, bI));
      y0 *= Math.exp(-7e-4 / RC);
      t += 7e-4;
    }
    return { v, i, end: t };
  };
  const shared = mk(true);
  const separate = mk(false);
  const times = grid(0, shared.end, 3001);

  it('shares the arrays of the later periods', () => {
    expect(new Set(shared.v.map((p) => p.terms)).size).toBeLessThan(110);
    expect(new Set(separate.v.map((p) => p.terms)).size).toBe(600);
  });

  it('the same peaks, heat and I²t', () => {
    const a = partStress({ part: 'R1', voltage: shared.v, current: shared.i }, 'resistor', R, 0, shared.end, times);
    const b = partStress({ part: 'R1', voltage: separate.v, current: separate.i }, 'resistor', R, 0, separate.end, times);
    for (const k of ['voltage', 'current', 'power'] as const) expect(rel(a[k].value, b[k].value)).toBeLessThan(1e-12);
    expect(rel(a.energy!, b.energy!)).toBeLessThan(1e-12);
    expect(rel(a.i2t, b.i2t)).toBeLessThan(1e-12);
  });
});
