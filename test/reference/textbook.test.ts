/**
 * Textbook closed forms and rules of thumb. Each check names its source beside it.
 * Tolerance on exact paths: 1e-9 relative to the signal's peak magnitude over the run
 * (assertClose below), unless a comment says otherwise and why.
 */
import { readFileSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import type { RunResult } from '../../src/simulate/result.js';

const ROOT = join(dirname(fileURLToPath(import.meta.url)), '..', '..');
const REL_TOL = 1e-9;

/** Imported lazily so a broken solver fails each test with its own message. */
async function run(text: string, opts?: { samples?: number; span?: number }): Promise<RunResult> {
  const { analyzeText } = await import('../../src/pipeline.js');
  return analyzeText(text, 'inline.rdn', opts);
}

/** Every sample of `values` against `f(t)`, 1e-9 relative to the larger of the two peaks. */
function assertClose(values: Float64Array, times: Float64Array, f: (t: number) => number, what: string, tol = REL_TOL) {
  expect(values.length).toBe(times.length);
  const want = Array.from(times, f);
  const peak = Math.max(...want.map(Math.abs), ...Array.from(values, Math.abs));
  let worst = 0;
  let at = 0;
  for (let i = 0; i < want.length; i++) {
    const e = Math.abs(values[i]! - want[i]!) / peak;
    if (!(e <= worst)) {
      worst = e;
      at = i;
    }
  }
  expect(worst, `${what}: worst ${worst.toExponential(3)} (rel. to peak ${peak}) at t = ${times[at]}: got ${values[at]}, expected ${want[at]}`).toBeLessThanOrEqual(tol);
}

// ---------------------------------------------------------------------------------------------
// Series RLC driven by a voltage step, capacitor voltage. Textbook second-order system
// (control-engineering textbook, from memory): α = R/(2L), ω0 = 1/√(LC), ζ = α/ω0.
// v(t)/V = 1 − e^(−αt)·(Ch(t) + α·Sh(t)), with q = α² − ω0² and
//   Ch = cosh(√q t) (q > 0) or cos(√−q t) (q < 0);  Sh = sinh(√q t)/√q or sin(√−q t)/√−q,
// both evaluated by their power series Σ (q t²)^k/(2k)! and t·Σ (q t²)^k/(2k+1)! when |q t²| < 1,
// which is exact and stable for any damping, including ζ = 1 ± 1e-9 (no 0/0 in the tiny root split).
// ---------------------------------------------------------------------------------------------
function seriesRlcStep(V: number, R: number, L: number, C: number): (t: number) => number {
  const alpha = R / (2 * L);
  const w0 = 1 / Math.sqrt(L * C);
  const q = (alpha - w0) * (alpha + w0);
  return (t: number) => {
    if (t <= 0) return 0;
    const z = q * t * t;
    let ch: number;
    let sh: number;
    if (Math.abs(z) < 1) {
      ch = 0;
      sh = 0;
      let termC = 1; // z^k/(2k)!
      let termS = t; // t·z^k/(2k+1)!
      for (let k = 0; k < 40; k++) {
        ch += termC;
        sh += termS;
        termC *= z / ((2 * k + 1) * (2 * k + 2));
        termS *= z / ((2 * k + 2) * (2 * k + 3));
      }
    } else if (q > 0) {
      const b = Math.sqrt(q);
      ch = Math.cosh(b * t);
      sh = Math.sinh(b * t) / b;
    } else {
      const wd = Math.sqrt(-q);
      ch = Math.cos(wd * t);
      sh = Math.sin(wd * t) / wd;
    }
    return V * (1 - Math.exp(-alpha * t) * (ch + alpha * sh));
  };
}

const seriesRlcText = (R: string, source = 'step from 0V to 12V at 0', extra = '') => `
title "series RLC"
voltage-source V1 in -> gnd ${source}
resistor R1 in -> a ${R}
inductor L1 a -> out 1mH
capacitor C1 out -> gnd 10uF
watch voltage C1 as "v(C1)"
${extra}
`;

describe('first-order circuits', () => {
  it('RC charging: 63.2 % at one time constant, over 99.3 % at five (common practice); exact 1 − e^(−t/RC) (textbook formula, from memory)', async () => {
    const res = await run(`
voltage-source V1 in -> gnd step to 10V
resistor R1 in -> out 1k
capacitor C1 out -> gnd 1uF
watch node out
span 5ms
samples 501
`);
    const v = res.traces[0]!.values;
    // t = τ = 1 ms at index 100, t = 5τ at index 500
    expect(v[100]! / 10).toBeGreaterThanOrEqual(0.632);
    expect(v[100]! / 10).toBeLessThan(0.633);
    expect(v[500]! / 10).toBeGreaterThan(0.993);
    assertClose(v, res.times, (t) => 10 * (1 - Math.exp(-t / 1e-3)), 'RC charge');
    expect(res.states.length).toBe(1);
  });

  it('RL current rise i = V/R·(1 − e^(−tR/L)) (textbook formula, from memory)', async () => {
    const res = await run(`
voltage-source V1 in -> gnd step to 5V
resistor R1 in -> a 10ohm
inductor L1 a -> gnd 2mH
watch current L1
span 1ms
samples 501
`);
    assertClose(res.traces[0]!.values, res.times, (t) => 0.5 * (1 - Math.exp((-t * 10) / 2e-3)), 'RL rise');
  });

  it('RL coil de-energising through a resistor: i = I0·e^(−tR/L), kickback v = −R·i (textbook formula, from memory)', async () => {
    const res = await run(`
inductor L1 a -> gnd 10mH initial 0.5A
resistor R1 a -> gnd 47ohm
watch current L1
watch node a
span 1ms
samples 501
`);
    const tau = 10e-3 / 47;
    assertClose(res.traces[0]!.values, res.times, (t) => 0.5 * Math.exp(-t / tau), 'coil current');
    assertClose(res.traces[1]!.values, res.times, (t) => -47 * 0.5 * Math.exp(-t / tau), 'coil kickback voltage');
  });
});

describe('series RLC step (control-engineering textbook, from memory)', () => {
  const L = 1e-3;
  const C = 10e-6;
  const w0 = 1e4;

  it('underdamped R = 10 Ω: closed form 12·(1 − e^(−αt)(cos ωd t + (α/ωd) sin ωd t))', async () => {
    const text = readFileSync(join(ROOT, 'circuits', 'textbook-series-rlc.rdn'), 'utf8');
    const { analyzeText } = await import('../../src/pipeline.js');
    const res = analyzeText(text, 'circuits/textbook-series-rlc.rdn', { samples: 2001 });
    const alpha = 10 / (2 * L);
    const wd = Math.sqrt(w0 * w0 - alpha * alpha);
    assertClose(res.traces[0]!.values, res.times, (t) =>
      12 * (1 - Math.exp(-alpha * t) * (Math.cos(wd * t) + (alpha / wd) * Math.sin(wd * t))), 'underdamped');
    // the general stable form agrees with the textbook one
    assertClose(res.traces[0]!.values, res.times, seriesRlcStep(12, 10, L, C), 'underdamped (series form)');
  });

  it('overshoot exp(−πζ/√(1−ζ²)) = 16.30 % at peak time π/ωd = 362.8 µs', async () => {
    const zeta = 0.5;
    const wd = w0 * Math.sqrt(1 - zeta * zeta);
    const tp = Math.PI / wd;
    expect(Math.abs(tp - 362.8e-6)).toBeLessThan(0.05e-6); // the textbook figure, 4 digits
    const os = Math.exp((-Math.PI * zeta) / Math.sqrt(1 - zeta * zeta));
    expect(Math.abs(os - 0.163)).toBeLessThan(0.00005); // 16.30 %
    // span = 20 peak times: the peak falls exactly on sample 100 and the ringing has died out
    const res = await run(seriesRlcText('10ohm'), { span: 20 * tp, samples: 2001 });
    const v = res.traces[0]!.values;
    expect(Math.abs(v[100]! - 12 * (1 + os)) / (12 * (1 + os))).toBeLessThanOrEqual(REL_TOL);
    expect(v[99]!).toBeLessThan(v[100]!);
    expect(v[101]!).toBeLessThan(v[100]!);
    const m = res.traces[0]!.metrics;
    expect(Math.abs(m.peak.value - 12 * (1 + os))).toBeLessThanOrEqual(REL_TOL * 12 * (1 + os));
    expect(Math.abs(m.peak.time - tp)).toBeLessThanOrEqual(1e-9 * tp);
    expect(m.overshootPct).not.toBeNull();
    expect(Math.abs(m.overshootPct! - 100 * os)).toBeLessThan(1e-6);
    // modes: one oscillatory pair with ζ = 0.5, ωn = 10 krad/s
    const osc = res.modes.filter((md) => md.kind === 'oscillatory');
    expect(osc.length).toBe(1);
    const md = osc[0]!;
    if (md.kind === 'oscillatory') {
      expect(Math.abs(md.zeta - 0.5)).toBeLessThan(1e-12);
      expect(Math.abs(md.wn - w0) / w0).toBeLessThan(1e-12);
      expect(Math.abs(md.omegaD - wd) / wd).toBeLessThan(1e-12);
    }
  });

  it('critically damped R = 20 Ω: 12·(1 − (1 + ω0 t)e^(−ω0 t)), ω0 = 10 krad/s', async () => {
    const text = readFileSync(join(ROOT, 'circuits', 'textbook-critical-rlc.rdn'), 'utf8');
    const { analyzeText } = await import('../../src/pipeline.js');
    const res = analyzeText(text, 'circuits/textbook-critical-rlc.rdn', { samples: 2001 });
    assertClose(res.traces[0]!.values, res.times, (t) => 12 * (1 - (1 + w0 * t) * Math.exp(-w0 * t)), 'critical');
    // no overshoot (textbook: ζ = 1 is the fastest response without overshoot)
    expect(Math.max(...res.traces[0]!.values)).toBeLessThanOrEqual(12 * (1 + REL_TOL));
  });

  it('overdamped R = 100 Ω: two real roots s1,2 = −α ± √(α² − ω0²), v = 12·(1 + (s2 e^(s1 t) − s1 e^(s2 t))/(s1 − s2))', async () => {
    const alpha = 100 / (2 * L);
    const beta = Math.sqrt((alpha - w0) * (alpha + w0));
    const s2 = -alpha - beta;
    const s1 = (w0 * w0) / s2; // = −α + β without cancellation (s1·s2 = ω0²)
    const res = await run(seriesRlcText('100ohm', undefined, 'span 5ms\nsamples 2001'));
    assertClose(res.traces[0]!.values, res.times,
      (t) => 12 * (1 + (s2 * Math.exp(s1 * t) - s1 * Math.exp(s2 * t)) / (s1 - s2)), 'overdamped');
    expect(res.modes.every((md) => md.kind !== 'oscillatory')).toBe(true);
  });

  for (const [R, zeta] of [['20.00000002', '1 + 1e-9'], ['19.99999998', '1 − 1e-9']] as const) {
    it(`near-critical ζ = ${zeta} (R = ${R} Ω) matches the stable series closed form`, async () => {
      const res = await run(seriesRlcText(`${R}ohm`, undefined, 'span 2ms\nsamples 2001'));
      assertClose(res.traces[0]!.values, res.times, seriesRlcStep(12, Number(R), L, C), `near-critical ${zeta}`);
      // The exactly critical form differs from the near-critical one by at most 4.5e-10 of the peak
      // over this span (evaluated in 40-digit arithmetic when this test was written), so it must hold too.
      assertClose(res.traces[0]!.values, res.times, (t) => 12 * (1 - (1 + w0 * t) * Math.exp(-w0 * t)),
        `near-critical ${zeta} vs critical`);
      for (const v of res.traces[0]!.values) expect(Number.isFinite(v)).toBe(true);
    });
  }
});

describe('impulse response is the derivative of the step response (textbook linear-systems fact, from memory)', () => {
  const L = 1e-3;
  const C = 10e-6;
  const alpha = 10 / (2 * L); // R/(2L) with R = 10 Ω: 5000 /s
  const w0 = 1 / Math.sqrt(L * C); // 10 krad/s
  const wd = Math.sqrt(w0 * w0 - alpha * alpha);
  const A = 1e-3; // V·s

  it('impulse of area A: v_C = A·d/dt[step response per volt] = A·(ω0²/ωd)·e^(−αt)·sin ωd t', async () => {
    const res = await run(seriesRlcText('10ohm', 'impulse 1mVs', 'span 2ms\nsamples 2001'));
    assertClose(res.traces[0]!.values, res.times,
      (t) => (t <= 0 ? 0 : ((A * w0 * w0) / wd) * Math.exp(-alpha * t) * Math.sin(wd * t)), 'impulse response');
  });

  it('impulse run versus central finite differences of a 1 V step run', async () => {
    const opts = { span: 2e-3, samples: 20001 };
    const imp = (await run(seriesRlcText('10ohm', 'impulse 1mVs'), opts)).traces[0]!.values;
    const stepRes = await run(seriesRlcText('10ohm', 'step to 1V'), opts);
    const s = stepRes.traces[0]!.values;
    const h = opts.span / (opts.samples - 1);
    const peak = Math.max(...Array.from(imp, Math.abs));
    // Not an exact path: the central difference has truncation error ≤ h²·max|s'''|/6 (Taylor, from
    // memory). Per volt s' = (ω0²/ωd)e^(−αt) sin ωd t and each derivative multiplies the amplitude by
    // at most √(α² + ωd²) = ω0, so max|s'''| ≤ ω0⁴/ωd. That bound (≈ 4e-7 of the peak here) plus the
    // 1e-9 exact-path tolerance on each of the three samples involved (the two step samples' errors
    // are amplified by A/(2h) each) is the allowance.
    const peakStep = Math.max(...Array.from(s, Math.abs));
    const bound = (A * h * h * w0 ** 4) / (6 * wd) + REL_TOL * peak + (A / h) * REL_TOL * peakStep;
    let worst = 0;
    for (let i = 1; i < s.length - 1; i++) {
      const fd = (A * (s[i + 1]! - s[i - 1]!)) / (2 * h);
      worst = Math.max(worst, Math.abs(imp[i]! - fd));
    }
    expect(worst).toBeLessThanOrEqual(bound);
  });
});

describe('system properties (linear time-invariant networks, textbook definitions)', () => {
  const rlc = fc.record({
    R: fc.double({ min: 1, max: 100, noNaN: true }),
    Lm: fc.double({ min: 0.1, max: 10, noNaN: true }),   // mH
    Cu: fc.double({ min: 1, max: 100, noNaN: true }),    // µF
  });
  const netlist = (p: { R: number; Lm: number; Cu: number }, source: string) => `
voltage-source V1 in -> gnd ${source}
resistor R1 in -> a ${p.R.toFixed(6)}ohm
inductor L1 a -> out ${p.Lm.toFixed(6)}mH initial 0A
capacitor C1 out -> gnd ${p.Cu.toFixed(6)}uF
watch voltage C1
watch current L1
span 2ms
samples 2001
`;

  it('linearity: scaling the source by k scales every response by k', async () => {
    await fc.assert(
      fc.asyncProperty(rlc, fc.double({ min: 0.1, max: 10, noNaN: true }), fc.boolean(), async (p, k, neg) => {
        const kk = neg ? -k : k;
        const base = await run(netlist(p, 'step to 1V'));
        const scaled = await run(netlist(p, `step to ${kk.toPrecision(17)}V`));
        base.traces.forEach((tr, j) => {
          const want = Float64Array.from(tr.values, (v) => kk * v);
          const peak = Math.max(...Array.from(want, Math.abs));
          want.forEach((w, i) => expect(Math.abs(scaled.traces[j]!.values[i]! - w)).toBeLessThanOrEqual(REL_TOL * peak));
        });
      }),
      { numRuns: 20 },
    );
  });

  it('time invariance: delaying the step by d delays the response by d', async () => {
    await fc.assert(
      fc.asyncProperty(rlc, fc.integer({ min: 1, max: 500 }), async (p, d) => {
        // the grid step is 1 µs, so a delay of d µs is exactly d samples
        const base = await run(netlist(p, 'step to 5V'));
        const late = await run(netlist(p, `step to 5V at ${d}us`));
        base.traces.forEach((tr, j) => {
          const peak = Math.max(...Array.from(tr.values, Math.abs));
          const got = late.traces[j]!.values;
          for (let i = 0; i < got.length; i++) {
            const want = i < d ? 0 : tr.values[i - d]!;
            expect(Math.abs(got[i]! - want)).toBeLessThanOrEqual(REL_TOL * peak);
          }
        });
      }),
      { numRuns: 20 },
    );
  });
});

describe('degenerate topologies reduce the state count (Kirchhoff, from memory)', () => {
  it('capacitor loop: C1 ∥ C2 with no resistor between them act as one C1 + C2', async () => {
    const res = await run(`
voltage-source V1 in -> gnd step to 10V
resistor R1 in -> a 1k
capacitor C1 a -> gnd 1uF
capacitor C2 a -> gnd 2.2uF
watch node a
watch current C2
span 20ms
samples 1001
`);
    expect(res.states.length).toBe(1);
    const tau = 1e3 * 3.2e-6;
    assertClose(res.traces[0]!.values, res.times, (t) => 10 * (1 - Math.exp(-t / tau)), 'parallel C voltage');
    // C2 takes its share 2.2/3.2 of the charging current (10 V/1k)·e^(−t/τ)
    assertClose(res.traces[1]!.values, res.times, (t) => (2.2 / 3.2) * 0.01 * Math.exp(-t / tau), 'C2 current');
  });

  it('inductor cut-set: L1 and L2 alone at a node act as one L1 + L2', async () => {
    const res = await run(`
voltage-source V1 in -> gnd step to 10V
resistor R1 in -> a 10ohm
inductor L1 a -> b 1mH
inductor L2 b -> gnd 2.2mH
watch current L1
watch current L2
watch node b
span 2ms
samples 1001
`);
    expect(res.states.length).toBe(1);
    const tau = 3.2e-3 / 10;
    const i = (t: number) => 1 * (1 - Math.exp(-t / tau));
    assertClose(res.traces[0]!.values, res.times, i, 'L1 current');
    assertClose(res.traces[1]!.values, res.times, i, 'L2 current');
    // v(b) = L2·di/dt = L2·(1 A/τ)·e^(−t/τ) = 10 V·(2.2/3.2)·e^(−t/τ)
    assertClose(res.traces[2]!.values, res.times, (t) => 10 * (2.2 / 3.2) * Math.exp(-t / tau), 'v(b)');
  });
});
