import { loadCircuit } from '../../src/circuit/load.js';
import { InputError, type Diagnostic } from '../../src/diagnostics.js';

/** Lines joined with newlines, so test circuits read like files. */
export const lines = (...ls: string[]): string => ls.join('\n') + '\n';

/** The diagnostics loadCircuit throws for `text`; fails the test if it loads cleanly. */
export function problems(text: string, file = 'test.rdn'): Diagnostic[] {
  try {
    loadCircuit(text, file);
  } catch (e) {
    if (e instanceof InputError) return e.diagnostics;
    throw e;
  }
  throw new Error('expected the circuit to be rejected');
}

export const errors = (text: string): Diagnostic[] => problems(text).filter((d) => d.severity === 'error');

/** A small valid frame to drop single lines into. */
export const RC = [
  'voltage-source V1 in -> gnd 5V',
  'resistor R1 in -> out 1k',
  'capacitor C1 out -> gnd 1uF',
  'watch node out',
];
