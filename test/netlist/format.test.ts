import { describe, expect, it } from 'vitest';
import type { Diagnostic } from '../../src/diagnostics.js';
import { formatDiagnostic } from '../../src/netlist/format.js';

const source = 'resistor R1 in -> out 1k\ncapacitor C1 out -> gnd 10mH\n';
const d: Diagnostic = {
  severity: 'error',
  message: 'the value of C1 is given in henries (H), but needs a capacitance in farads (F)',
  loc: { file: 'demo.rdn', line: 2, col: 25, length: 4 },
  expected: 'a capacitance such as 470nF',
  hint: 'a capacitor value ends in F',
};

describe('formatDiagnostic', () => {
  it('prints place, quoted line, marker, expected and hint', () => {
    expect(formatDiagnostic(d, source, false)).toBe(
      [
        'demo.rdn:2:25: error: the value of C1 is given in henries (H), but needs a capacitance in farads (F)',
        '  2 | capacitor C1 out -> gnd 10mH',
        '    |                         ^^^^',
        '  expected: a capacitance such as 470nF',
        '  hint: a capacitor value ends in F',
      ].join('\n'),
    );
  });

  it('keeps tabs so the marker lines up', () => {
    const out = formatDiagnostic({ severity: 'warning', message: 'w', loc: { file: 'f', line: 1, col: 3, length: 2 } }, '\tx ab', false);
    expect(out.split('\n')[2]).toBe('    | \t ^^');
    expect(out).toMatch(/^f:1:3: warning: w/);
  });

  it('prints whole-file problems as a single line', () => {
    expect(formatDiagnostic({ severity: 'error', message: 'no parts' }, '', false)).toBe('error: no parts');
  });

  it('colors only when asked', () => {
    expect(formatDiagnostic(d, source, false)).not.toMatch(/\x1b\[/);
    expect(formatDiagnostic(d, source, true)).toMatch(/\x1b\[31m/);
  });
});
