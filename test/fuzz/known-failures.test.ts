/**
 * Failures the random-circuit property (circuits.fuzz.test.ts) found, shrunk by fast-check to small
 * circuits, each written as the property it once broke (all fixed now; they stay as regression tests).
 * Source of the expectations: the same properties as circuits.fuzz.test.ts (a result or an
 * InputError; the in-run cross-check; Tellegen's energy balance, a textbook result from memory).
 */
import { describe, expect, it } from 'vitest';
import { InputError } from '../../src/diagnostics.js';
import { energyBalance } from '../../src/measure/energy.js';
import { analyzeText } from '../../src/pipeline.js';

const run = (text: string) => {
  try {
    return analyzeText(text, 'known.rdn');
  } catch (e) {
    if (e instanceof InputError) return undefined;
    throw e;
  }
};

describe('known failures found by the circuit fuzzer', () => {
  it('a current source stepping from 0 A to 0 A beside two inductors to gnd: a result', () => {
    const text = `capacitor C1 gnd -> n1 1e-3F
resistor R2 gnd -> n2 5.5e4ohm
resistor R3 gnd -> n3 1e0ohm
inductor L4 gnd -> n1 1e0H
resistor R5 n1 -> gnd 1.6e0ohm
inductor L6 gnd -> n2 1e-4H
current-source I1 gnd -> n1 step from 0A to 0A at 1e-3
watch node n1
samples 201
`;
    expect(() => run(text)).not.toThrow();
  });

  it('a sine source of zero amplitude with a switch opening at 1 ms: the cross-check passes', () => {
    const text = `inductor L1 gnd -> n1 1.2e0H
resistor R2 gnd -> n2 1e0ohm
resistor R3 gnd -> n3 1.3e2ohm
capacitor C4 gnd -> n4 7.1e-4F
inductor L5 gnd -> n5 1e0H
resistor R6 gnd -> n6 1e-1ohm
capacitor C7 gnd -> n7 1e-3F
capacitor C8 gnd -> n8 1e-3F
capacitor C9 n1 -> n9 7.5e-5F
resistor R10 gnd -> n1 1.4e0ohm
capacitor C11 gnd -> n1 1e-5F
voltage-source V1 n1 -> n3 sine amplitude 0V freq 1e1Hz phase 0deg at 1e-3
switch S1 n3 -> n4 on 9.9e0ohm opens 1e-3
watch node n1
samples 201
span 1e-2
`;
    expect(run(text)?.crossCheck.passed).toBe(true);
  });

  it('an inductor shorted through a switch and a voltage source: energy balances', () => {
    const text = `inductor L1 gnd -> n1 1e0H
resistor R2 gnd -> n2 1e0ohm
inductor L3 gnd -> n3 4.5e-2H
voltage-source V1 n3 -> gnd -1V
switch S1 gnd -> n3 on 1.3e1ohm opens 1e-3
watch node n1
samples 201
span 2.1e-5
`;
    const r = run(text)!;
    expect(r.crossCheck.passed).toBe(true);
    expect((r.events ?? []).every((e) => e.energyLost === 0)).toBe(true);
    expect(energyBalance(r.circuit, r.parts!).residual).toBeLessThan(1e-6);
  });

  // found by the hostile-text fuzzer (hostile.fuzz.test.ts) and by hand: each ends in an exception
  // that is not an InputError (exit 1 instead of 2)
  const RC = 'voltage-source V1 in -> gnd step to 12V at 1us\nresistor R1 in -> out 1k\ncapacitor C1 out -> gnd 1uF\nwatch node out\nsamples 51\n';
  for (const [what, line] of [
    ['a resistance of 1e-320 ohm (conductance overflows)', 'resistor R2 out -> gnd 1e-320'],
    ['a span of 1e300 s', 'span 1e300'],
    ['a sine at 1e300 Hz', 'current-source I2 gnd -> out sine amplitude 1A freq 1e300Hz'],
    ['a huge but finite source expression', 'current-source I2 gnd -> out expression "1e306"'],
    ['an expression that overflows after t = 0', 'current-source I2 gnd -> out expression "exp(t*1e6)"'],
  ] as const) {
    it(`${what}: a result or an input error, nothing else`, () => {
      expect(() => run(RC + line + '\n')).not.toThrow();
    });
  }
});
