/**
 * The settled start (the DC operating point before t = 0) of stiff circuits. Source of the
 * expectations: at DC capacitors are open and carry no current, so every node joined to the source
 * through resistors alone sits at the source voltage; a capacitor with no path to discharge has no
 * unique operating point (circuit theory, from memory).
 */
import { describe, expect, it } from 'vitest';
import { analyzeText } from '../../src/pipeline.js';
import { formatTextReport } from '../../src/report/text.js';

const run = (lines: string[]) => analyzeText(lines.join('\n') + '\n', 'stiff.rdn');

describe('settled start of stiff circuits', () => {
  it('a 1 ps RC beside a 10 s RC: both capacitors start at the source voltage, not at rest', () => {
    // time constants R1·C1 = 1 ps and R2·C2 = 10 s: the state matrix's pivots are 1e13 apart
    const r = run(['voltage-source V1 in -> gnd 10V', 'resistor R1 in -> a 1ohm', 'capacitor C1 a -> gnd 1pF', 'resistor R2 a -> b 10Mohm', 'capacitor C2 b -> gnd 1uF', 'watch node a', 'watch node b', 'span 1ms', 'samples 11']);
    expect(r.notices.some((n) => n.includes('no DC operating point'))).toBe(false);
    for (const t of r.traces) for (const v of t.values) expect(Math.abs(v - 10)).toBeLessThan(1e-9 * 10);
    expect(r.crossCheck.passed).toBe(true);
  });

  it('the same with a 1 fs mode beside a 100 s one (pivots 1e17 apart)', () => {
    const r = run(['voltage-source V1 in -> gnd 3V', 'resistor R1 in -> a 1mohm', 'capacitor C1 a -> gnd 1pF', 'resistor R2 a -> b 100Mohm', 'capacitor C2 b -> gnd 1uF', 'watch node b', 'span 1s', 'samples 11']);
    expect(r.notices.some((n) => n.includes('no DC operating point'))).toBe(false);
    for (const v of r.traces[0]!.values) expect(Math.abs(v - 3)).toBeLessThan(1e-9 * 3);
  });

  it('a capacitor fed by a current with no discharge path still has no operating point: rest, and said so', () => {
    const r = run(['current-source I1 gnd -> a 1mA', 'capacitor C1 a -> gnd 1uF', 'resistor R1 a -> b 1k', 'capacitor C2 b -> gnd 1nF', 'watch node a', 'span 1ms', 'samples 11']);
    expect(r.notices.some((n) => n.includes('no DC operating point'))).toBe(true);
    // and the report's analysis line says what was used, not what was asked for
    expect(r.start).toBe('rest');
    const text = formatTextReport(r, { chart: false });
    expect(text).toContain('before t = 0: every capacitor and inductor at zero (no DC operating point)');
    // the notice saying why is wrapped like the rest of the report (80 columns)
    for (const line of text.split('\n')) expect(line.length).toBeLessThanOrEqual(80);
    // from rest, 1 mA into 1.001 µF in all: the voltage of a climbs as I·t/C (textbook)
    expect(Math.abs(r.traces[0]!.values[10]! - 1e-3 * 1e-3 / 1.001e-6)).toBeLessThan(1e-3);
  });
});
