/**
 * More degenerate circuits, against textbook closed forms (from memory) named beside each check:
 * repeated ringing poles (identical underdamped or lossless sections fed by one ideal source, so
 * the state matrix has each complex pole twice), exactly critical damping twice over (two Jordan
 * blocks of the same eigenvalue), lightly damped tanks whose chosen span would hold millions of
 * periods, and spans at the floating-point edge. Exact paths are held to 1e-9 of the signal's
 * peak; every run must pass its own cross-check.
 */
import { describe, expect, it } from 'vitest';
import { CHOSEN_SPAN_MAX_PERIODS } from '../../src/lti/modes.js';
import { MIN_SPAN } from '../../src/circuit/limits.js';
import { InputError } from '../../src/diagnostics.js';
import { analyzeText } from '../../src/pipeline.js';
import { parseSpanOption } from '../../src/cli/options.js';
import type { RunResult } from '../../src/simulate/result.js';

const REL_TOL = 1e-9;

function worst(r: RunResult, label: string, want: (t: number) => number): number {
  const tr = r.traces.find((x) => x.label === label)!;
  let peak = 0;
  r.times.forEach((t, i) => (peak = Math.max(peak, Math.abs(tr.values[i]!), Math.abs(want(t)))));
  let err = 0;
  r.times.forEach((t, i) => (err = Math.max(err, Math.abs(tr.values[i]! - want(t)) / peak)));
  return err;
}

/** Series RLC, capacitor voltage after a unit step at 0, underdamped or lossless (textbook, from memory). */
const underdamped = (R: number, L: number, C: number) => {
  const a = R / (2 * L);
  const wd = Math.sqrt(1 / (L * C) - a * a);
  return (t: number) => 1 - Math.exp(-a * t) * (Math.cos(wd * t) + (a / wd) * Math.sin(wd * t));
};

const sections = (k: number, R: string | null, L: string, C: string): string => {
  const out = ['voltage-source V1 in -> gnd step to 1V'];
  for (let i = 1; i <= k; i++) {
    if (R) out.push(`resistor R${i} in -> a${i} ${R}`);
    out.push(`inductor L${i} ${R ? `a${i}` : 'in'} -> b${i} ${L}`, `capacitor C${i} b${i} -> gnd ${C}`);
  }
  for (let i = 1; i <= k; i++) out.push(`watch voltage C${i}`);
  return out.join('\n') + '\n';
};

describe('repeated ringing poles: identical sections behind one ideal source', () => {
  // before the fix the equal pairs were merged into one cluster around their real mean: NaN traces
  // and a failed cross-check
  for (const k of [2, 3]) {
    it(`${k} identical underdamped series RLCs (10 Ω, 1 mH, 1 µF): each v(C) to 1e-9`, () => {
      const r = analyzeText(sections(k, '10ohm', '1mH', '1uF') + 'span 2ms\nsamples 801\n', 'twins.rdn');
      expect(r.crossCheck.passed).toBe(true);
      expect(r.modes.filter((m) => m.kind === 'oscillatory')).toHaveLength(k);
      const f = underdamped(10, 1e-3, 1e-6);
      for (let i = 1; i <= k; i++) expect(worst(r, `v(C${i})`, f)).toBeLessThanOrEqual(REL_TOL);
    });
  }

  it('2 identical lossless LCs (1 mH, 1 µF): v(C) = 1 − cos(ω0·t) to 1e-9 on both', () => {
    const r = analyzeText(sections(2, null, '1mH', '1uF') + 'span 2ms\nsamples 801\n', 'lc-twins.rdn');
    expect(r.crossCheck.passed).toBe(true);
    const w0 = 1 / Math.sqrt(1e-9);
    for (const l of ['v(C1)', 'v(C2)']) expect(worst(r, l, (t) => 1 - Math.cos(w0 * t))).toBeLessThanOrEqual(REL_TOL);
  });

  it('2 identical critically damped RLCs (2 Ω, 1 H, 1 F): two Jordan blocks, v(C) = 1 − (1 + t)·e^(−t) to 1e-9', () => {
    const r = analyzeText(sections(2, '2ohm', '1H', '1F') + 'span 20s\nsamples 801\n', 'critical-twins.rdn');
    expect(r.crossCheck.passed).toBe(true);
    for (const l of ['v(C1)', 'v(C2)']) expect(worst(r, l, (t) => 1 - (1 + t) * Math.exp(-t))).toBeLessThanOrEqual(REL_TOL);
  });

  it('two identical ringing sections with different drives keep their own responses (not a sum)', () => {
    // V2 steps to 3 V: by linearity its section is 3× the unit response
    const text = sections(1, '10ohm', '1mH', '1uF').replace('watch voltage C1\n', '') +
      'voltage-source V2 in2 -> gnd step to 3V\nresistor R2 in2 -> a2 10ohm\ninductor L2 a2 -> b2 1mH\ncapacitor C2 b2 -> gnd 1uF\nwatch voltage C1\nwatch voltage C2\nspan 2ms\nsamples 801\n';
    const r = analyzeText(text, 'two-drives.rdn');
    expect(r.crossCheck.passed).toBe(true);
    const f = underdamped(10, 1e-3, 1e-6);
    expect(worst(r, 'v(C1)', f)).toBeLessThanOrEqual(REL_TOL);
    expect(worst(r, 'v(C2)', (t) => 3 * f(t))).toBeLessThanOrEqual(REL_TOL);
  });
});

describe('lightly damped tanks', () => {
  it(`Q = 10⁶ (1 µΩ, 1 H, 1 F): the chosen span stops at ${CHOSEN_SPAN_MAX_PERIODS} periods, not 7 time constants (2.2·10⁶ periods), and v(C) is exact`, () => {
    const t0 = Date.now();
    const r = analyzeText('voltage-source V1 in -> gnd step to 1V\nresistor R1 in -> a 1e-6\ninductor L1 a -> b 1H\ncapacitor C1 b -> gnd 1F\nwatch voltage C1\nsamples 1001\n', 'tank.rdn', { partSignals: false });
    expect(Date.now() - t0).toBeLessThan(30_000);
    expect(r.spanChosen).toBe(true);
    const wd = Math.sqrt(1 - 0.25e-12);
    expect(r.span).toBeCloseTo((CHOSEN_SPAN_MAX_PERIODS * 2 * Math.PI) / wd, 3);
    expect(r.crossCheck.passed).toBe(true);
    expect(worst(r, 'v(C1)', underdamped(1e-6, 1, 1))).toBeLessThanOrEqual(REL_TOL);
  }, 60_000);
});

describe('spans at the floating-point edge', () => {
  it(`a span below ${MIN_SPAN} s (5e-324 failed the cross-check with an infinite error) is refused, in the file and on the command line`, () => {
    let e: unknown;
    try {
      analyzeText('voltage-source V1 in -> gnd step to 1V\nresistor R1 in -> a 1k\ncapacitor C1 a -> gnd 1uF\nwatch node a\nspan 5e-324\n', 'tiny.rdn');
    } catch (x) {
      e = x;
    }
    expect((e as InputError).diagnostics[0]).toMatchObject({ message: 'span must be at least 1e-100 s, got 5e-324 s', loc: { line: 5, col: 6 } });
    expect(() => parseSpanOption('1e-200')).toThrow(/at least 1e-100 s/);
    expect(parseSpanOption('1e-100')).toBe(1e-100);
  });

  it('a 1e-30 s time constant (1e-12 Ω, 1e-18 F) over its chosen span: v = E·(1 − e^(−t/RC)) to 1e-9', () => {
    const r = analyzeText('voltage-source V1 in -> gnd step to 5V\nresistor R1 in -> a 1e-12\ncapacitor C1 a -> gnd 1e-18F\nwatch node a\n', 'fast.rdn');
    expect(r.crossCheck.passed).toBe(true);
    expect(worst(r, 'v(a)', (t) => 5 * -Math.expm1(-t / 1e-30))).toBeLessThanOrEqual(REL_TOL);
  });
});

describe('the settled start with decoupled, conserved states', () => {
  // Before t = 0 the supply has been on forever: C1 is charged to the supply (DC operating point,
  // textbook). A capacitor with one end open (C2) carries no current and keeps its rest charge;
  // before the fix its zero row and column made the whole operating point "missing" and every
  // capacitor started from rest, so v(out) rose from 0 instead of staying at 5 V.
  it('an RC on a 5 V supply with a capacitor left open at one end: v(out) = 5 V throughout', () => {
    const r = analyzeText('voltage-source V1 in -> gnd 5V\nresistor R1 in -> out 1k\ncapacitor C1 out -> gnd 1uF\ncapacitor C2 out -> lonely 1nF\nwatch node out\nwatch node lonely\nspan 5ms\nsamples 101\n', 'open-end.rdn');
    expect(r.start).toBe('settled');
    expect(r.notices.some((n) => n.includes('no DC operating point'))).toBe(false);
    // v(lonely) = v(out) − v(C2) with v(C2) = 0 (C2 never carried a current)
    for (const l of ['v(out)', 'v(lonely)']) expect(worst(r, l, () => 5)).toBeLessThanOrEqual(REL_TOL);
  });

  it('two equal capacitors in series across the supply beside an RC: the middle at 2.5 V (equal charges), v(out) = 5 V', () => {
    const r = analyzeText('voltage-source V1 in -> gnd 5V\ncapacitor C1 in -> mid 1uF\ncapacitor C2 mid -> gnd 1uF\nresistor R1 in -> out 1k\ncapacitor C3 out -> gnd 1uF\nwatch node mid\nwatch node out\nspan 5ms\nsamples 101\n', 'series-caps.rdn');
    expect(r.start).toBe('settled');
    expect(worst(r, 'v(mid)', () => 2.5)).toBeLessThanOrEqual(REL_TOL);
    expect(worst(r, 'v(out)', () => 5)).toBeLessThanOrEqual(REL_TOL);
  });

  it('a capacitor charged by a constant current with no discharge path still has no operating point: rest, and said so', () => {
    // v = I·t/C from rest (textbook)
    const r = analyzeText('current-source I1 gnd -> a 1mA\ncapacitor C1 a -> gnd 1uF\nwatch node a\nspan 1ms\nsamples 101\n', 'charging.rdn');
    expect(r.start).toBe('rest');
    expect(r.notices.some((n) => n.includes('no DC operating point'))).toBe(true);
    expect(worst(r, 'v(a)', (t) => (1e-3 * t) / 1e-6)).toBeLessThanOrEqual(REL_TOL);
  });
});

describe('two equal RC lags, the second loading the first by 1e-18 .. 1e-30 (nearly defective, extreme weights)', () => {
  // R1 = 10^-k Ω into C1 = 10^k F (τ1 = 1 s), R2 = 10^k Ω into C2 = 10^-k F (τ2 = 1 s). The loading
  // R1/R2 = 10^-2k moves the poles to −1 ± 10^-k /s with nearly parallel eigenvectors; the response
  // is that of two equal first-order lags to within 10^-2k (textbook cascade, from memory):
  //   v(b) = 1 − (1 + t)·e^(−t)
  const text = (k: number) =>
    `voltage-source V1 in -> gnd step to 1V\nresistor R1 in -> a 1e-${k}\ncapacitor C1 a -> gnd 1e${k}F\nresistor R2 a -> b 1e${k}\ncapacitor C2 b -> gnd 1e-${k}F\nwatch node b\nspan 7\nsamples 201\n`;
  // k = 9 lost 2.7e-8 (u/√ε) before such neighbours were merged on the symmetric route, k = 12 2.4e-4
  for (const k of [9, 12, 15]) {
    it(`k = ${k}: v(b) to 1e-9, cross-check passes`, () => {
      const r = analyzeText(text(k), 'lags.rdn');
      expect(r.crossCheck.passed).toBe(true);
      expect(worst(r, 'v(b)', (t) => 1 - (1 + t) * Math.exp(-t))).toBeLessThanOrEqual(REL_TOL);
    });
  }
  // Still open: at k = 18 (1e-18 Ω into 1e18 F, loading 1e-36) v(b) comes out as 0. The in-run
  // cross-check catches it (0.99 relative, exit code 3), so no wrong number goes out unflagged; the
  // coupling 1/(R2·C1) = 1e-36 beside 1 is lost in the model's reduction or the modal route.
  it.fails('k = 18: v(b) to 1e-9 (known failure: v(b) = 0, the cross-check says so)', () => {
    const r = analyzeText(text(18), 'lags.rdn');
    expect(worst(r, 'v(b)', (t) => 1 - (1 + t) * Math.exp(-t))).toBeLessThanOrEqual(REL_TOL);
  });
});
