/**
 * Hostile text through the whole run (analyzeText, src/pipeline.ts): very long lines, deeply nested
 * parentheses, huge and subnormal numbers, expressions giving NaN, unicode and NUL bytes spliced into
 * a valid circuit. Every run must end with a result or an InputError — never another exception —
 * and within the test timeout. Property-based (fast-check), fixed seed so a failure reproduces.
 */
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { InputError } from '../../src/diagnostics.js';
import { analyzeText } from '../../src/pipeline.js';

const BASE = [
  'voltage-source V1 in -> gnd step to 12V at 1us',
  'resistor R1 in -> out 1k',
  'capacitor C1 out -> gnd 1uF',
  'watch node out',
  'samples 51',
];

function outcome(text: string): 'result' | 'input-error' {
  try {
    analyzeText(text, 'hostile.rdn');
    return 'result';
  } catch (e) {
    if (e instanceof InputError) return 'input-error';
    throw new Error(`analyzeText threw ${e instanceof Error ? `${e.name}: ${e.message}` : String(e)} for ${JSON.stringify(text.slice(0, 400))}`);
  }
}

const nested = fc.integer({ min: 1, max: 3000 }).map((d) => `(${'('.repeat(d)}1${')'.repeat(d)})`);
const number = fc.constantFrom('1e308', '1e-320', '-1e308', '5e-324', '1e309', '0', '-0', '1e-300', '1e300');
const nanish = fc.constantFrom('(0/0)', '(1/0)', '(sqrt(-1))', '(log(0))', '(1e308*10)', '(asin(2))', '(0*1e309)', '(1e-320/1e-320)');
const junk = fc.string({ unit: 'binary', maxLength: 40 });
const special = fc.constantFrom('\u0000', '\uFEFF', '\u202E', 'Ω', 'µ', '\uD800', '😀', '\r', '\t', '\u00A0');
const value = fc.oneof(nested, number, nanish, junk, special.map((c) => `1k${c}`));
const longLine = fc.integer({ min: 1, max: 200_000 }).map((n) => `title "${'x'.repeat(n)}"`);

const hostileLine = fc.oneof(
  value.map((v) => `resistor R2 out -> gnd ${v}`),
  value.map((v) => `capacitor C2 out -> gnd ${v}`),
  value.map((v) => `inductor L2 out -> gnd ${v}`),
  value.map((v) => `param p = ${v}`),
  value.map((v) => `span ${v}`),
  value.map((v) => `current-source I2 gnd -> out step to ${v} at 1us`),
  value.map((v) => `current-source I2 gnd -> out sine amplitude 1mA freq ${v}`),
  nanish.map((v) => `current-source I2 gnd -> out expression "1m*${v.slice(1, -1)}"`),
  longLine,
  special.map((c) => `resistor R2 out${c} -> gnd 1k`),
);

const spliced = fc.tuple(hostileLine, fc.integer({ min: 0, max: BASE.length })).map(([l, at]) => {
  const ls = [...BASE];
  ls.splice(at, 0, l);
  return ls.join('\n');
});

describe('fuzz: hostile text ends in a result or an InputError', () => {
  it('the base circuit runs', () => expect(outcome(BASE.join('\n'))).toBe('result'));
  it(
    'one hostile line spliced into a valid circuit',
    () => {
      fc.assert(
        fc.property(spliced, (text) => {
          expect(['result', 'input-error']).toContain(outcome(text));
        }),
        { numRuns: Number(process.env.FUZZ_RUNS ?? 200), seed: Number(process.env.FUZZ_SEED ?? 20250302), endOnFailure: true },
      );
    },
    120_000,
  );
});
