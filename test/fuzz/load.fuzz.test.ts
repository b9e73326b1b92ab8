/**
 * Robustness of the front end: whatever bytes or token soup loadCircuit is given, it either returns a
 * circuit or throws InputError (src/diagnostics.ts) — never another exception, never a hang.
 * Property-based with fast-check; bounded runs on short inputs, fixed seeds so failures reproduce.
 */
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { loadCircuit } from '../../src/circuit/load.js';
import { InputError } from '../../src/diagnostics.js';

function outcome(text: string): 'ok' | 'input-error' {
  try {
    loadCircuit(text, 'fuzz.rdn');
    return 'ok';
  } catch (e) {
    if (e instanceof InputError) return 'input-error';
    throw new Error(`loadCircuit threw ${e instanceof Error ? `${e.name}: ${e.message}` : String(e)} for ${JSON.stringify(text)}`);
  }
}

const WORDS = [
  'title', 'param', 'resistor', 'capacitor', 'inductor', 'voltage-source', 'current-source', 'watch', 'node',
  'between', 'and', 'voltage', 'current', 'as', 'span', 'samples', 'settle', 'initial', 'step', 'from', 'to',
  'at', 'rise', 'impulse', 'gnd', 'R1', 'C1', 'L1', 'V1', 'I1', 'a', 'b', 'out', 'in', 'x', 'pi', 'e', '->',
  '-', '>', '<-', '=', '+', '*', '/', '^', '(', ')', ',', '"', '"label"', '"', '#', '#c', '12V', '1k', '4k7',
  '470uF', '470µF', '1.5mH', '2R2', 'R47', '10ohm', '2.2kΩ', '-5V', '1e-3', '1e999', '0', '-0', 'NaN',
  'Infinity', '2%', '50mV', '10mA', '2mVs', '1As', '1V*s', '1ms', '10us', '1001', '2', '1.', '.5', 'sqrt(',
  '(2*x+1k)', '(1/0)', '(0/0)', 'log(-1)', 'max(1)', '1Hz', '3s', '\t', '\r\n', '\n', '\uFEFF', '\u0000', '∞',
];

const token = fc.constantFrom(...WORDS);
const line = fc.array(token, { minLength: 0, maxLength: 10 }).map((ts) => ts.join(' '));
const soup = fc.array(line, { minLength: 0, maxLength: 8 }).map((ls) => ls.join('\n'));

/** A valid small circuit with one line replaced or mutated, so the deeper stages get exercised too. */
const VALID = [
  'param Rv = 1k',
  'voltage-source V1 in -> gnd step to 12V at 1ms rise 10us',
  'resistor R1 in -> out Rv',
  'capacitor C1 out -> gnd 1uF initial 1V',
  'inductor L1 out -> x 1mH initial 0A',
  'resistor R2 x -> gnd 10',
  'watch node out as "out"',
  'watch current L1',
  'span 5ms',
  'samples 101',
];
const mutated = fc
  .tuple(fc.integer({ min: 0, max: VALID.length - 1 }), line, fc.boolean())
  .map(([i, l, replace]) => {
    const ls = [...VALID];
    if (replace) ls[i] = l;
    else ls.splice(i, 0, l);
    return ls.join('\n');
  });

const PARAMS = { numRuns: Number(process.env.FUZZ_RUNS ?? 300), seed: Number(process.env.FUZZ_SEED ?? 20240611), endOnFailure: true } as const;

describe('fuzz: loadCircuit returns or throws InputError only', () => {
  it('random bytes (decoded as UTF-8, invalid sequences replaced)', () => {
    const dec = new TextDecoder('utf-8');
    fc.assert(
      fc.property(fc.uint8Array({ maxLength: 200 }), (bytes) => {
        expect(['ok', 'input-error']).toContain(outcome(dec.decode(bytes)));
      }),
      PARAMS,
    );
  });
  it('random strings of any code points', () => {
    fc.assert(
      fc.property(fc.string({ maxLength: 120, unit: 'binary' }), (s) => {
        expect(['ok', 'input-error']).toContain(outcome(s));
      }),
      PARAMS,
    );
  });
  it('random token sequences from the language vocabulary', () => {
    fc.assert(
      fc.property(soup, (s) => {
        expect(['ok', 'input-error']).toContain(outcome(s));
      }),
      PARAMS,
    );
  });
  it('a valid circuit with one line replaced by or preceded by token soup', () => {
    expect(outcome(VALID.join('\n'))).toBe('ok');
    fc.assert(
      fc.property(mutated, (s) => {
        expect(['ok', 'input-error']).toContain(outcome(s));
      }),
      PARAMS,
    );
  });
});
