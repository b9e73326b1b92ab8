/**
 * The example circuits in circuits/ against independent closed forms, physics and golden data.
 * Each check names its source. Exact paths: 1e-9 relative to the signal's peak.
 */
import { describe, expect, it } from 'vitest';
import { REL_TOL, assertClose, compareGolden, evalPieces, loadGolden, runFile, runText, trace } from './helpers.js';
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { ROOT } from './helpers.js';

describe('solenoid-snubber.rdn', () => {
  // Values as in the file.
  const Vs = 24, L = 0.3, Rcoil = 30, Rsn = 47, Csn = 2.2e-6, Ron = 0.01, t1 = 1e-3;
  // Before the opening: DC (inductor a short, capacitor open; Ohm's law).
  const i0 = Vs / (Rcoil + Ron);
  const vd0 = i0 * Ron;
  const vc0 = vd0 - Vs; // v(s) − v(sup), no current in the snubber
  // After the opening: coil and snubber form a series RLC loop (hand-derived, KVL around the loop,
  // textbook second-order free response, from memory): L i' + R i + vC = 0, C vC' = i.
  const R = Rcoil + Rsn;
  const alpha = R / (2 * L);
  const wd = Math.sqrt(1 / (L * Csn) - alpha * alpha);
  const di0 = -(R * i0 + vc0) / L;
  const K = (di0 + alpha * i0) / wd;
  const iAfter = (tau: number) => Math.exp(-alpha * tau) * (i0 * Math.cos(wd * tau) + K * Math.sin(wd * tau));
  const diAfter = (tau: number) =>
    Math.exp(-alpha * tau) * ((-alpha * i0 + wd * K) * Math.cos(wd * tau) + (-alpha * K - wd * i0) * Math.sin(wd * tau));
  const vcAfter = (tau: number) => -L * diAfter(tau) - R * iAfter(tau);
  const coil = (t: number) => (t < t1 ? i0 : iAfter(t - t1));
  const vcap = (t: number) => (t < t1 ? vc0 : vcAfter(t - t1));
  const vsw = (t: number) => (t < t1 ? vd0 : Vs + Rsn * iAfter(t - t1) + vcAfter(t - t1));

  it('coil current is continuous through the opening (inductor current continuity, textbook)', async () => {
    const r = await runFile('circuits/solenoid-snubber.rdn');
    const p = trace(r, 'coil current').pieces;
    expect(Math.abs(evalPieces(p, t1 - 1e-12) - i0) / i0).toBeLessThanOrEqual(REL_TOL);
    expect(Math.abs(evalPieces(p, t1) - i0) / i0).toBeLessThanOrEqual(REL_TOL);
    const ev = (r.events ?? []).find((e) => Math.abs(e.t - t1) < 1e-15);
    expect(ev).toBeDefined();
    expect(Math.abs(ev!.energyLost)).toBeLessThanOrEqual(1e-9 * 0.5 * L * i0 * i0);
  });

  it('coil current, snubber voltage and switch voltage match the series-RLC closed form (hand-derived)', async () => {
    const r = await runFile('circuits/solenoid-snubber.rdn');
    assertClose(trace(r, 'coil current').values, r.times, coil, 'coil current');
    assertClose(trace(r, 'snubber capacitor voltage').values, r.times, vcap, 'snubber voltage');
    assertClose(trace(r, 'switch voltage').values, r.times, vsw, 'switch voltage');
  });
});

describe('contactor-banks.rdn', () => {
  const C1 = 2200e-6, C2 = 1000e-6, V1 = 48, V2 = 12, R = 0.02, t1 = 1e-3;
  // Charge conservation (physics textbook, from memory).
  const Vf = (C1 * V1 + C2 * V2) / (C1 + C2);
  const Ceq = (C1 * C2) / (C1 + C2);
  const tau = R * Ceq;

  it('with 20 milliohm: current (V1 − V2)/R·e^(−t/τ), τ = R·C1C2/(C1+C2), banks end at (C1V1 + C2V2)/(C1+C2) (textbook RC, from memory)', async () => {
    const r = await runFile('circuits/contactor-banks.rdn');
    const i = (t: number) => (t < t1 ? 0 : ((V1 - V2) / R) * Math.exp(-(t - t1) / tau));
    assertClose(trace(r, 'contactor current').values, r.times, i, 'contactor current');
    const v1 = (t: number) => (t < t1 ? V1 : Vf + (V1 - Vf) * Math.exp(-(t - t1) / tau));
    const v2 = (t: number) => (t < t1 ? V2 : Vf + (V2 - Vf) * Math.exp(-(t - t1) / tau));
    assertClose(trace(r, 'bank 1 voltage').values, r.times, v1, 'bank 1');
    assertClose(trace(r, 'bank 2 voltage').values, r.times, v2, 'bank 2');
    const ev = (r.events ?? []).find((e) => Math.abs(e.t - t1) < 1e-15);
    expect(ev, 'closing event').toBeDefined();
    expect(Math.abs(ev!.energyLost)).toBeLessThanOrEqual(1e-9 * 0.5 * C1 * V1 * V1); // no jump through a resistance
  });

  it('with zero resistance: instant sharing, energy lost ½·C1C2/(C1+C2)·(V1−V2)² (physics textbook, from memory)', async () => {
    // A switch needs on > 0, so the zero-resistance case is the two banks wired straight together
    // with different initial voltages: the jump happens at t = 0.
    const r = await runText(`
capacitor C1 b -> gnd 2200uF initial 48V
capacitor C2 b -> gnd 1000uF initial 12V
watch voltage C1
watch voltage C2
span 1ms
samples 11
`);
    const lost = 0.5 * Ceq * (V1 - V2) ** 2;
    const ev = (r.events ?? [])[0];
    expect(ev, 'the t = 0 jump is reported as an event').toBeDefined();
    expect(Math.abs(ev!.energyLost - lost) / lost).toBeLessThanOrEqual(REL_TOL);
    for (const j of ev!.jumps) expect(Math.abs(j.after - Vf) / Vf).toBeLessThanOrEqual(REL_TOL);
    for (const tr of r.traces) assertClose(tr.values, r.times, () => Vf, tr.label);
  });
});

describe('bleeder-discharge.rdn', () => {
  const V = 400, Ron = 0.1, Rbl = 33e3, C = 1000e-6, t1 = 1;
  const V0 = (V * Rbl) / (Rbl + Ron); // voltage divider while the supply is connected (Ohm's law)
  const RC = Rbl * C;
  // v = V0·e^(−t/RC) after the disconnect (textbook RC discharge, from memory)
  const v = (t: number) => (t < t1 ? V0 : V0 * Math.exp(-(t - t1) / RC));

  it('bank voltage and bleeder current follow V0·e^(−t/RC) (textbook RC discharge, from memory)', async () => {
    const r = await runFile('circuits/bleeder-discharge.rdn');
    assertClose(trace(r, 'bank voltage').values, r.times, v, 'bank voltage');
    assertClose(trace(r, 'bleeder current').values, r.times, (t) => v(t) / Rbl, 'bleeder current');
  });

  it('falls to 60 V (a commonly used safe-to-touch DC level: common practice, from memory) at RC·ln(V0/60 V) after the disconnect', async () => {
    const r = await runFile('circuits/bleeder-discharge.rdn');
    const t60 = t1 + RC * Math.log(V0 / 60);
    expect(t60 - t1).toBeCloseTo(62.6, 1); // the number quoted in the file's comment
    const p = trace(r, 'bank voltage').pieces;
    expect(Math.abs(evalPieces(p, t60) - 60) / V0).toBeLessThanOrEqual(REL_TOL);
  });
});

describe('pwm-lc-filter.rdn', () => {
  it('whole start-up transient against exact expm golden data (test/golden/make_scenario_golden.py)', async () => {
    const r = await runFile('circuits/pwm-lc-filter.rdn');
    compareGolden(r, loadGolden('scenario-pwm-transient'));
  });

  it('last cycle equals the periodic steady state from the one-period map fixed point (make_scenario_golden.py)', async () => {
    const r = await runFile('circuits/pwm-lc-filter.rdn');
    const g = loadGolden('scenario-pwm-pss');
    const first = r.times.length - g.times.length;
    expect(Math.abs(g.times[0]! - 99 * 10e-6)).toBeLessThanOrEqual(1e-12 * r.span); // the last period starts at 990 us
    compareGolden(r, g, first);
  });
});

describe('rail-load-step.rdn', () => {
  it('rail voltage and capacitor currents against exact expm golden data (test/golden/make_scenario_golden.py)', async () => {
    const r = await runFile('circuits/rail-load-step.rdn');
    compareGolden(r, loadGolden('scenario-rail-load-step'));
  });
});

describe('scope-current.rdn', () => {
  it('the table file is plausible: a header and a few dozen rows, times increasing', () => {
    const lines = readFileSync(join(ROOT, 'circuits', 'scope-current.csv'), 'utf8').trim().split('\n');
    expect(lines[0]).toBe('time_s,current_A');
    expect(lines.length - 1).toBeGreaterThanOrEqual(24);
    const ts = lines.slice(1).map((l) => Number(l.split(',')[0]));
    for (let i = 1; i < ts.length; i++) expect(ts[i]!).toBeGreaterThan(ts[i - 1]!);
  });
  // the comparison with scipy.signal.lsim golden data is in table-golden.test.ts
});
