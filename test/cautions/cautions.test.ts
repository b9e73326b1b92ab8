/**
 * Each caution fires just above its threshold and stays silent just below, on results computed
 * from real circuits. Thresholds and their sources: IEC 61140 / IEC 60449 voltage bands (120 V
 * ripple-free DC, 50 V AC RMS, from memory); IEC 61010-1 350 mJ for charged capacitance (from
 * memory); 60 V DC touch-safe level (common practice); 1 s / 5 s discharge (common practice);
 * 1 V/ns edges (common practice). Expected energies from ½·C·v² and ½·L·i² (physics).
 */
import { describe, expect, it } from 'vitest';
import { type DischargeInfo, LIMITS, cautions, maxSlope, rmsOver } from '../../src/measure/cautions.js';
import { analyzeText } from '../../src/pipeline.js';

const run = (lines: string[]) => analyzeText(lines.join('\n'), 'inline.rdn');
const ids = (lines: string[], extra?: { discharge?: DischargeInfo[] }) => cautions(run(lines), extra).map((c) => c.id);

describe('voltage beyond extra-low voltage (IEC 61140 bands, from memory)', () => {
  const rc = (v: string) => [`voltage-source V1 in -> gnd step from 0V to ${v}`, 'resistor R1 in -> out 1k', 'capacitor C1 out -> gnd 1uF', 'watch node out', 'span 20ms'];
  it('a capacitor charged to 121 V is flagged, 119 V is not', () => {
    const c = cautions(run(rc('121V'))).find((x) => x.id === 'elv-dc');
    expect(c?.severity).toBe('danger');
    expect(c?.parts).toContain('C1');
    expect(c?.parts).toContain('V1');
    expect(c?.source).toMatch(/IEC 61140/);
    expect(c?.detail).toContain('121.0 V');
    expect(ids(rc('119V'))).not.toContain('elv-dc');
  });
  it('a 50 Hz sine of 51 V RMS is flagged over its last period, 49 V RMS is not', () => {
    const ac = (rms: string) => [`voltage-source V1 a -> gnd sine rms ${rms} freq 50Hz`, 'resistor R1 a -> gnd 1k', 'watch node a', 'span 45ms'];
    const c = cautions(run(ac('51V'))).find((x) => x.id === 'elv-ac');
    expect(c?.severity).toBe('danger');
    expect(c?.detail).toContain('51.00 V RMS');
    expect(c?.source).toMatch(/50 V AC RMS/);
    const quiet = ids(ac('49V'));
    expect(quiet).not.toContain('elv-ac');
    // 49 V RMS is 69.3 V peak: below the DC limit too
    expect(quiet).not.toContain('elv-dc');
  });
  it('RMS of a sine over whole periods is amplitude/√2 (exact integral)', () => {
    const r = run(['voltage-source V1 a -> gnd sine amplitude 10V freq 1kHz', 'resistor R1 a -> gnd 1k', 'watch node a', 'span 3ms']);
    const v = r.parts!.find((p) => p.part === 'V1')!.voltage;
    expect(Math.abs(rmsOver(v, 1e-3, 3e-3) - 10 / Math.SQRT2)).toBeLessThan(1e-9 * 10);
  });
});

describe('stored energy and charge left (IEC 61010-1 350 mJ, from memory; 60 V DC, common practice)', () => {
  // 100 µF: ½·C·v² = 0.35 J at v = √(2·0.35/100 µF) = 83.67 V
  const bank = (v: string) => [`voltage-source V1 in -> gnd step from 0V to ${v}`, 'resistor R1 in -> out 10ohm', 'capacitor C1 out -> gnd 100uF', 'watch node out', 'span 50ms'];
  it('84 V on 100 µF (0.3528 J) is flagged, 83.5 V (0.3486 J) is not', () => {
    const c = cautions(run(bank('84V'))).find((x) => x.id === 'stored-energy');
    expect(c?.severity).toBe('danger');
    expect(c?.parts).toEqual(['C1']);
    expect(c?.detail).toContain('352.8 mJ');
    expect(ids(bank('83.5V'))).not.toContain('stored-energy');
  });
  it('above 350 mJ but below 60 V (1 mF at 48 V: 1.152 J) is a warning, not a danger', () => {
    const low = [`voltage-source V1 in -> gnd 48V`, 'resistor R1 in -> out 1ohm', 'capacitor C1 out -> gnd 1mF', 'watch node out', 'span 10ms'];
    const c = cautions(run(low)).find((x) => x.id === 'stored-energy');
    expect(c?.severity).toBe('warning');
    expect(c?.detail).toContain('1.152 J');
  });
  it('a capacitor held at 61 V at the end of the span is flagged, 59 V is not', () => {
    const held = (v: string) => [`voltage-source V1 in -> gnd ${v}`, 'resistor R1 in -> out 1k', 'capacitor C1 out -> gnd 1uF', 'watch node out', 'span 1ms'];
    const c = cautions(run(held('61V'))).find((x) => x.id === 'charged-at-end');
    expect(c?.severity).toBe('warning');
    expect(c?.detail).toContain('61.00 V');
    expect(ids(held('59V'))).not.toContain('charged-at-end');
  });
});

describe('discharge after the sources are removed (1 s and 5 s, common practice)', () => {
  const base = ['voltage-source V1 in -> gnd 400V', 'resistor R1 in -> out 1k', 'capacitor C1 out -> gnd 100uF', 'watch node out', 'span 1s'];
  // a bleeder R across C from 400 V reaches 60 V after R·C·ln(400/60) (exponential decay)
  const info = (R: number): DischargeInfo => ({ part: 'C1', from: 400, safeVoltage: 60, time: R * 100e-6 * Math.log(400 / 60) });
  const rFor = (t: number) => t / (100e-6 * Math.log(400 / 60));
  it('just over 1 s is a warning, just under is silent', () => {
    const over = cautions(run(base), { discharge: [info(rFor(1.01))] }).find((c) => c.id === 'slow-discharge');
    expect(over?.severity).toBe('warning');
    expect(over?.source).toMatch(/common practice/);
    expect(ids(base, { discharge: [info(rFor(0.99))] })).not.toContain('slow-discharge');
  });
  it('just over 5 s is a danger, just under a warning', () => {
    expect(cautions(run(base), { discharge: [info(rFor(5.01))] }).find((c) => c.id === 'slow-discharge')?.severity).toBe('danger');
    expect(cautions(run(base), { discharge: [info(rFor(4.99))] }).find((c) => c.id === 'slow-discharge')?.severity).toBe('warning');
  });
  it('no discharge path (a missing bleeder) is a danger', () => {
    const c = cautions(run(base), { discharge: [{ part: 'C1', from: 400, safeVoltage: 60, time: null }] }).find((x) => x.id === 'no-discharge-path');
    expect(c?.severity).toBe('danger');
    expect(c?.detail).toMatch(/bleeder/);
  });
});

describe('interrupted inductor current (physics: v = L·di/dt)', () => {
  it('opening the only path of a 1 mH inductor carrying 10 V / (9.99 Ω + 10 mΩ) = 1 A loses ½·L·i² = 500 µJ', () => {
    const r = run(['voltage-source V1 a -> gnd 10V', 'resistor R1 a -> b 9.99ohm', 'inductor L1 b -> c 1mH', 'switch S1 c -> gnd on 10mohm off open opens 1ms', 'watch current L1', 'span 2ms']);
    const c = cautions(r).find((x) => x.id === 'interrupted-inductor');
    expect(c?.severity).toBe('danger');
    expect(c?.parts).toEqual(['L1']);
    expect(c?.detail).toContain('500.0 µJ');
    expect(c?.detail).toMatch(/freewheel path or a snubber/);
  });
  it('with a freewheel resistor across the coil the current continues: silent', () => {
    expect(ids(['voltage-source V1 a -> gnd 10V', 'resistor R1 a -> b 10ohm', 'inductor L1 b -> c 1mH', 'resistor Rfw b -> c 100ohm', 'switch S1 c -> gnd on 10mohm off open opens 1ms', 'watch current L1', 'span 2ms'])).not.toContain('interrupted-inductor');
  });
});

describe('very fast edges (1 V/ns, common practice)', () => {
  const edge = (rise: string) => [`voltage-source V1 a -> gnd step from 0V to 1V at 1ns rise ${rise}`, 'resistor R1 a -> b 1k', 'capacitor C1 b -> gnd 1pF', 'watch node a', 'span 10ns'];
  it('1 V in 0.99 ns (1.0101 V/ns) is flagged, 1 V in 1.01 ns is not', () => {
    const c = cautions(run(edge('0.99ns'))).find((x) => x.id === 'fast-edge');
    expect(c?.severity).toBe('warning');
    expect(c?.detail).toContain('1.010 V/ns');
    expect(ids(edge('1.01ns'))).not.toContain('fast-edge');
  });
  it('the steepest slope of an RC charge is V/τ at the start (exact derivative)', () => {
    const r = run(['voltage-source V1 a -> gnd step from 0V to 5V', 'resistor R1 a -> b 1k', 'capacitor C1 b -> gnd 1nF', 'watch node b', 'span 5us']);
    const s = maxSlope(r, r.traces[0]!.pieces)!;
    expect(Math.abs(s.rate - 5 / 1e-6) / (5 / 1e-6)).toBeLessThan(1e-9);
    expect(LIMITS.fastEdge.value).toBe(1e9);
  });
});
