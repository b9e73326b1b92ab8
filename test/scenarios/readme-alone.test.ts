/**
 * Circuits written from README.md's language section alone, each against a closed form.
 * Exact paths: 1e-9 relative to the signal's peak.
 */
import { describe, expect, it } from 'vitest';
import { REL_TOL, assertClose, runText, trace } from './helpers.js';

describe('written from the README alone', () => {
  it('switched 50 Hz sinusoid into a series RL: first current peak (AC switching of an RL load, textbook, from memory)', async () => {
    const r = await runText(`
title "mains closed onto an RL load at a voltage zero"
voltage-source V1 src -> gnd sine amplitude 325V freq 50Hz
switch S1 src -> a on 1mohm closes 10ms
resistor R1 a -> b 10ohm
inductor L1 b -> gnd 100mH
watch current L1 as "load current"
span 60ms
samples 6001
`);
    // i(t) = (Vm/Z)·[sin(ωt − θ) − sin(ωts − θ)·e^(−(t − ts)R/L)] for t ≥ ts, 0 before
    const Vm = 325, w = 2 * Math.PI * 50, R = 10.001, L = 0.1, ts = 10e-3;
    const Z = Math.hypot(R, w * L), th = Math.atan2(w * L, R);
    const i = (t: number) => (t < ts ? 0 : (Vm / Z) * (Math.sin(w * t - th) - Math.sin(w * ts - th) * Math.exp(-(t - ts) * R / L)));
    const di = (t: number) => (Vm / Z) * (w * Math.cos(w * t - th) + (R / L) * Math.sin(w * ts - th) * Math.exp(-(t - ts) * R / L));
    const tr = trace(r, 'load current');
    assertClose(tr.values, r.times, i, 'load current');
    // first peak: the first zero of i' after ts (scan, then bisection on the closed form's
    // derivative). Closing at the falling voltage zero, the current first swings negative.
    let lo = ts + 1e-6;
    const s0 = Math.sign(di(lo));
    while (Math.sign(di(lo + 1e-4)) === s0) lo += 1e-4;
    let hi = lo + 1e-4;
    for (let k = 0; k < 200; k++) {
      const mid = (lo + hi) / 2;
      if (Math.sign(di(mid)) === s0) lo = mid; else hi = mid;
    }
    const tp = (lo + hi) / 2, ip = i(tp);
    expect(Math.abs(ip) / (Vm / Z)).toBeGreaterThan(1.3); // the DC offset of switching at a voltage zero (1 + e^(−R·t/L) at the peak)
    const m = ip < 0 ? tr.metrics.valley : tr.metrics.peak;
    expect(Math.abs(m.value - ip) / Math.abs(ip)).toBeLessThanOrEqual(REL_TOL);
    expect(Math.abs(m.time - tp)).toBeLessThanOrEqual(1e-9 * r.span);
  });

  it('current-source ramp into a parallel RC (first-order ramp response, textbook, from memory)', async () => {
    const r = await runText(`
current-source I1 gnd -> out ramp at 0 rate 10A/s until 2ms
resistor  R1 out -> gnd 1k
capacitor C1 out -> gnd 1uF
watch node out
span 8ms
samples 801
`);
    const R = 1e3, tau = 1e-3, k = 10, T = 2e-3;
    const up = (t: number) => R * k * (t - tau * (1 - Math.exp(-t / tau)));
    const v = (t: number) => (t <= 0 ? 0 : t < T ? up(t) : R * k * T + (up(T) - R * k * T) * Math.exp(-(t - T) / tau));
    assertClose(r.traces[0]!.values, r.times, v, 'v(out)');
  });

  it('delayed exponential approach source into an RC low-pass (first-order, textbook, from memory)', async () => {
    const r = await runText(`
voltage-source V1 in -> gnd approach from 1V to 5V tau 500us delay 2ms
resistor  R1 in -> out 1k
capacitor C1 out -> gnd 200nF
watch node out
span 6ms
samples 601
`);
    // v = to + (from − to)·(τs·e^(−τ/τs) − τc·e^(−τ/τc))/(τs − τc), τ = t − 2 ms; 1 V before
    const from = 1, to = 5, ts = 500e-6, tc = 200e-6, t0 = 2e-3;
    const v = (t: number) => {
      if (t < t0) return from;
      const x = t - t0;
      return to + ((from - to) * (ts * Math.exp(-x / ts) - tc * Math.exp(-x / tc))) / (ts - tc);
    };
    assertClose(r.traces[0]!.values, r.times, v, 'v(out)');
  });
});
