import { describe, expect, it } from 'vitest';
import { loadCircuit } from '../../src/circuit/load.js';
import { lines } from './helpers.js';

describe('loadCircuit: a full circuit', () => {
  const text = lines(
    'title "Series RLC ringing"',
    '# a comment line',
    'param Rs = 4k7',
    'param Lv = 1.5mH',
    'param fc = 1kHz',
    'param Cf = (1/(2*pi*fc*Rs))',
    '',
    'voltage-source Vin in -> gnd 5V + step from 0V to 12V at 1ms rise 10us + impulse 2mV*s at 2ms',
    'resistor  Rser  in -> mid  (2*Rs + 100)   # trailing comment',
    'inductor  L1    mid -> out Lv initial 2mA',
    'capacitor Cload out -> gnd 470µF initial -1V',
    'resistor  Rb    out -> gnd R47',
    'current-source Ileak gnd -> out step to 10uA rise 1ms at 3ms',
    '',
    'watch node out',
    'watch between in and out as "across"',
    'watch voltage Cload',
    'watch current L1',
    'span 20ms',
    'samples 2001',
    'settle 10mV',
  );
  const c = loadCircuit(text, 'rlc.rdn');

  it('keeps title, file and node order of first appearance', () => {
    expect(c.title).toBe('Series RLC ringing');
    expect(c.file).toBe('rlc.rdn');
    expect(c.nodes).toEqual(['in', 'mid', 'out']);
  });

  it('resolves parameters to SI numbers', () => {
    expect(c.params.Rs).toBe(4700);
    expect(c.params.Lv).toBe(1.5e-3);
    expect(c.params.fc).toBe(1000);
    expect(c.params.Cf).toBeCloseTo(1 / (2 * Math.PI * 1000 * 4700), 20);
  });

  it('converts every part to exact SI values', () => {
    const byName = Object.fromEntries(c.parts.map((p) => [p.name, p]));
    expect(byName.Rser).toMatchObject({ kind: 'resistor', a: 'in', b: 'mid', value: 9500 });
    expect(byName.L1).toMatchObject({ kind: 'inductor', a: 'mid', b: 'out', value: 1.5e-3, initial: 2e-3 });
    expect(byName.Cload).toMatchObject({ kind: 'capacitor', value: 4.7e-4, initial: -1 });
    expect(byName.Rb).toMatchObject({ kind: 'resistor', a: 'out', b: 'gnd', value: 0.47 });
    expect(byName.Vin!.waveform!.terms).toEqual([
      { kind: 'constant', value: 5 },
      { kind: 'step', from: 0, to: 12, at: 1e-3, rise: 1e-5 },
      { kind: 'impulse', area: 2e-3, at: 2e-3 },
    ]);
    expect(byName.Vin!.value).toBe(0);
    expect(byName.Ileak!.waveform!.terms).toEqual([{ kind: 'step', from: 0, to: 1e-5, at: 3e-3, rise: 1e-3 }]);
  });

  it('records where each part was written', () => {
    expect(c.parts[1]!.loc).toEqual({ file: 'rlc.rdn', line: 9, col: 1, length: 'resistor  Rser  in -> mid  (2*Rs + 100)'.length });
  });

  it('builds watches with default and custom labels', () => {
    expect(c.watches.map((w) => [w.target, w.label, w.unit])).toEqual([
      [{ kind: 'node', node: 'out' }, 'v(out)', 'V'],
      [{ kind: 'between', a: 'in', b: 'out' }, 'across', 'V'],
      [{ kind: 'part-voltage', part: 'Cload' }, 'v(Cload)', 'V'],
      [{ kind: 'part-current', part: 'L1' }, 'i(L1)', 'A'],
    ]);
  });

  it('reads the analysis settings', () => {
    expect(c.analysis).toEqual({ span: 0.02, samples: 2001, settle: { kind: 'absolute', value: 0.01 }, start: 'settled', derating: 0.8 });
    expect(c.warnings).toBeUndefined();
  });

  it('fills analysis defaults', () => {
    const d = loadCircuit(lines('resistor R1 a -> gnd 1k', 'current-source I1 gnd -> a 1mA', 'watch node a'), 'x.rdn');
    expect(d.analysis).toEqual({ samples: 1001, settle: { kind: 'relative', fraction: 0.02 }, start: 'settled', derating: 0.8 });
    expect(d.title).toBeUndefined();
  });

  it('accepts capacitor loops and inductor cut-sets', () => {
    const loop = lines(
      'voltage-source V1 a -> gnd step to 1V',
      'capacitor C1 a -> b 1u',
      'capacitor C2 b -> gnd 1u',
      'capacitor C3 a -> gnd 1u',
      'current-source I1 gnd -> c 1mA',
      'inductor L1 c -> d 1m',
      'inductor L2 d -> gnd 1m',
      'watch node b',
    );
    expect(() => loadCircuit(loop, 'ok.rdn')).not.toThrow();
  });

  it('lets a parameter named like an IEC code shadow the code', () => {
    const c2 = loadCircuit(lines('param R47 = 10', 'resistor R1 a -> gnd R47', 'current-source I1 gnd -> a 1mA', 'watch node a'), 'p.rdn');
    expect(c2.parts[0]!.value).toBe(10);
  });
});
