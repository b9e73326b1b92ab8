/**
 * The text report's cautions, transfer functions, periodic steady state and discharge sections, the
 * shortened interval list, and the JSON fields that go with them, on real circuits. Expected values:
 * first-order RC H(s) = (1/RC)/(s + 1/RC) (circuit theory, from memory); RC discharge time
 * t = RC·ln(V0/Vsafe) (from memory); interval labels checked for being distinct (our own rule).
 */
import { describe, expect, it } from 'vitest';
import { analyzeText } from '../../src/pipeline.js';
import { formatPieces, distinctDigits } from '../../src/report/formula.js';
import { formatJSON } from '../../src/report/json.js';
import { formatTextReport } from '../../src/report/text.js';

const run = (lines: string[]) => analyzeText(lines.join('\n'), 'inline.rdn');

describe('text report sections', () => {
  const rc = run(['voltage-source V1 in -> gnd step from 0V to 150V', 'resistor R1 in -> out 1k', 'capacitor C1 out -> gnd 1uF', 'watch node out', 'span 20ms', 'samples 201']);
  const text = formatTextReport(rc, { chart: false });
  it('transfer functions follow the natural modes: 1000 / (s + 1000) for RC = 1 ms', () => {
    const modes = text.indexOf('Natural modes');
    const tf = text.indexOf('Transfer functions');
    expect(modes).toBeGreaterThanOrEqual(0);
    expect(tf).toBeGreaterThan(modes);
    expect(text).toContain('v(out) from V1 (V/V): H(s) = 1000 / (s + 1000)');
  });
  it('cautions come after the part stress and before the safety notice, danger first, with threshold and source', () => {
    const stress = text.indexOf('Part stress');
    const cautions = text.indexOf('Cautions');
    const safety = text.indexOf('Safety:');
    expect(stress).toBeGreaterThan(0);
    expect(cautions).toBeGreaterThan(stress);
    expect(safety).toBeGreaterThan(cautions);
    const section = text.slice(cautions, safety);
    expect(section).toContain('[DANGER] Voltage above extra-low voltage');
    expect(section).toMatch(/threshold: \|v\| > 120 V peak; source: IEC 61140/);
    const marks = [...section.matchAll(/\[(DANGER|WARNING|NOTE)\]/g)].map((m) => m[1]);
    const rank = { DANGER: 0, WARNING: 1, NOTE: 2 } as Record<string, number>;
    expect(marks).toEqual([...marks].sort((a, b) => rank[a!]! - rank[b!]!));
  });
  it('a circuit without hazards says so', () => {
    const low = run(['voltage-source V1 in -> gnd step from 0V to 5V', 'resistor R1 in -> out 1k', 'capacitor C1 out -> gnd 1uF', 'watch node out', 'span 5ms']);
    expect(formatTextReport(low, { chart: false })).toMatch(/Cautions[^\n]*\n─+\n {2}none:/);
  });
});

describe('discharge after the sources are removed', () => {
  it('a 100 V bank on 1 kΩ ‖ 1 mF: below 60 V after RC·ln(V0/60 V) = 509.8 ms (V0 = 99.90 V, the 1 Ω ‖ 1 kΩ divider)', () => {
    const r = run(['voltage-source V1 in -> gnd 100V', 'resistor R0 in -> out 1ohm', 'resistor R1 out -> gnd 1k', 'capacitor C1 out -> gnd 1mF', 'watch node out', 'span 10ms']);
    const d = r.discharge!.find((x) => x.part === 'C1')!;
    const expected = 1 * 1e-3 * 1e3 * Math.log(Math.abs(d.from) / 60);
    expect(Math.abs(d.time! - expected)).toBeLessThan(1e-6 * expected);
    const text = formatTextReport(r, { chart: false });
    expect(text).toContain('Discharge after the sources are removed');
    expect(text).toMatch(/C1: from 99\.90 V, below 60 V after 509\.8 ms/);
    const json = JSON.parse(formatJSON(r));
    expect(json.discharge[0].part).toBe('C1');
  });
  it('a charged capacitor with nothing across it: "no discharge path", a danger caution', () => {
    const r = run(['voltage-source V1 in -> gnd 100V', 'resistor R0 in -> out 1ohm', 'capacitor C1 out -> gnd 1uF', 'watch node out', 'span 1ms']);
    const text = formatTextReport(r, { chart: false });
    expect(text).toContain('no discharge path');
    expect(text).toContain('[DANGER] C1 has no discharge path');
  });
});

describe('periodic steady state', () => {
  // RC low-pass (τ = 10 µs) driven by a 5 V, 50 % square wave of 10 µs period
  const r = run(['voltage-source V1 in -> gnd pulse from 0V to 5V period 10us width 5us', 'resistor R1 in -> out 1k', 'capacitor C1 out -> gnd 10nF', 'watch node out', 'span 1ms', 'samples 2001']);
  it('the section gives period, min, max, mean, RMS, ripple and the settling', () => {
    expect(r.periodic).toBeTruthy();
    const text = formatTextReport(r, { chart: false });
    expect(text).toContain('Periodic steady state');
    expect(text).toContain('the sources repeat every 10.00 µs');
    expect(text).toMatch(/v\(out\): min [\d.]+ V, max [\d.]+ V, mean 2\.500 V, RMS [\d.]+ V, ripple [\d.]+ \w?V\s+peak to peak; (within the ±2 % settling band after \d+ periods?|does not settle)/);
  });
  it('the ripple of the square-wave-driven RC is V·tanh(T/(4τ)) peak to peak (from memory)', () => {
    const w = r.periodic!.watches[0]!;
    expect(Math.abs(w.max - w.min - 5 * Math.tanh(10e-6 / (4 * 10e-6)))).toBeLessThan(1e-9 * 5);
  });
  it('the closed form lists the first 3 and the last 2 intervals and says how many were left out; JSON keeps them all', () => {
    const text = formatTextReport(r, { chart: false });
    const fors = text.match(/^ {4}for .*:$/gm) ?? [];
    expect(fors.length).toBe(5);
    const n = r.traces[0]!.pieces.filter((p) => p.t0 < r.span).length;
    expect(text).toContain(`… ${n - 5} more intervals left out`);
    const json = JSON.parse(formatJSON(r));
    expect(json.traces[0].pieces.length).toBe(r.traces[0]!.pieces.length);
    expect(json.periodic.period).toBeCloseTo(10e-6, 15);
    expect(Array.isArray(json.cautions)).toBe(true);
    expect(json.transfers[0].h.den).toHaveLength(2);
  });
});

describe('interval labels', () => {
  it('boundaries 20 ns apart near 990 µs get enough digits to differ', () => {
    const piece = (t0: number, t1: number) => ({ t0, t1, impulseArea: 0, terms: [{ kind: 'exp' as const, lambda: 0, coef: 1 }] });
    const pieces = [piece(0, 990e-6), piece(990e-6, 990.02e-6), piece(990.02e-6, Infinity)];
    const lines = formatPieces('v(x)', 'V', pieces, 2e-3);
    const ranges = lines.filter((l) => l.startsWith('for '));
    expect(ranges).toEqual(['for 0 s ≤ t < 990 µs:', 'for 990 µs ≤ t < 990.02 µs:', 'for t ≥ 990.02 µs:']);
    expect(distinctDigits([990e-6, 990.0000001e-6])).toBeGreaterThan(4);
  });
  it('charge shared at the start without any switch: the event says so, not "all switches open"; 3 µJ lost', () => {
    // C1 (1 µF, 0 V) and C2 (2 µF, 3 V) in parallel share to 2 V; energy lost ½·2µ·9 − ½·3µ·4 = 3 µJ
    // (charge conservation, physics textbook, from memory)
    const r = run(['capacitor C1 a -> gnd 1uF', 'capacitor C2 a -> gnd 2uF initial 3V', 'resistor R1 a -> gnd 1k', 'watch node a', 'start rest', 'span 5ms', 'samples 51']);
    const t = formatTextReport(r, { chart: false });
    expect(t).toContain('t = 0 s: the start (no switches)');
    expect(t).not.toContain('all switches open');
    expect(Math.abs(r.events![0]!.energyLost - 3e-6)).toBeLessThan(1e-15);
  });
});
