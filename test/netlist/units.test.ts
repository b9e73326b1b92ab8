// Unit symbols: SI (BIPM SI brochure, from memory); Ω for resistance, F, H, V, A, s, Hz, W, J.
import { describe, expect, it } from 'vitest';
import { loadCircuit } from '../../src/circuit/load.js';
import { errors, lines, RC } from './helpers.js';

/** The single error produced by putting `line` into an otherwise valid RC circuit. */
function errorFor(line: string) {
  const es = errors(lines('voltage-source V1 in -> gnd 5V', 'resistor R1 in -> out 1k', 'capacitor C1 out -> gnd 1uF', line, 'watch node out'));
  expect(es).toHaveLength(1);
  return es[0]!;
}

describe('unit checking per place', () => {
  it.each([
    ['capacitor C2 out -> gnd 10mH', /value of C2 is given in henries \(H\), but needs a capacitance in farads \(F\)/],
    ['resistor R2 out -> gnd 10uF', /needs a resistance in ohms/],
    ['inductor L2 out -> gnd 1kΩ', /needs an inductance in henries/],
    ['voltage-source V2 out -> gnd 5A', /level of V2 is given in amperes \(A\), but needs a voltage/],
    ['current-source I2 out -> gnd 5V', /needs a current in amperes/],
    ['current-source I2 out -> gnd step to 1mA at 5V', /'at' of I2's step is given in volts/],
    ['voltage-source V2 out -> gnd step to 1V rise 1mH', /'rise' of V2's step .* needs a time in seconds/],
    ['voltage-source V2 out -> gnd impulse 1mAs', /needs a voltage impulse area in volt-seconds/],
    ['current-source I2 out -> gnd impulse 1mVs', /needs a current impulse area in ampere-seconds/],
    ['inductor L2 out -> gnd 1mH initial 2V', /initial current of L2 is given in volts/],
    ['capacitor C2 out -> gnd 1uF initial 2mA', /initial voltage of C2 is given in amperes/],
    ['span 5V', /span is given in volts/],
    ['samples 100V', /samples .* needs a plain number without a unit/],
    ['settle 2s', /settle cannot be given in s/],
    ['settle 0.02', /settle needs a unit/],
    ['resistor R2 out -> gnd 2%', /given in percent/],
  ])('%s', (line, message) => {
    expect(errorFor(line).message).toMatch(message);
  });

  it('checks the unit a parameter was declared with where it is used', () => {
    expect(errorFor('param Vb = 5V\ncapacitor C2 out -> gnd Vb').message).toMatch(/capacitance/);
  });

  it('does not check units inside expressions, only converts them', () => {
    const c = loadCircuit(lines(...RC, 'capacitor C2 out -> gnd (10mH)'), 'x.rdn');
    expect(c.parts.find((p) => p.name === 'C2')!.value).toBe(0.01);
  });

  it('rejects non-positive passive values', () => {
    expect(errorFor('resistor R2 out -> gnd 0').message).toMatch(/must be positive, got 0/);
    expect(errorFor('capacitor C2 out -> gnd -1uF').message).toMatch(/must be positive/);
  });

  it('bounds samples', () => {
    expect(errorFor('samples 1').message).toMatch(/from 2 to 1000000/);
    expect(errorFor('samples 1000001').message).toMatch(/got 1000001/);
    expect(errorFor('samples 10.5').message).toMatch(/whole number/);
  });

  it('rejects negative step and impulse times', () => {
    expect(errorFor('voltage-source V2 out -> gnd step to 1V at -1ms').message).toMatch(/'at' cannot be negative/);
    expect(errorFor('voltage-source V2 out -> gnd impulse 1mVs at -1ms').message).toMatch(/before t = 0/);
  });
});
