/**
 * Input-size limits (src/circuit/limits.ts): each is refused with an InputError that names the
 * limit and points at the place, and a circuit just inside each limit is still read. The numbers
 * are our own choice (common practice: refuse early and say why, rather than run out of memory).
 */
import { describe, expect, it } from 'vitest';
import { MAX_SAMPLES as ANALYSIS_MAX_SAMPLES } from '../../src/circuit/analysis.js';
import { loadCircuit } from '../../src/circuit/load.js';
import {
  MAX_EXPRESSION_CHARS,
  MAX_EXPRESSION_NESTING,
  MAX_FILE_BYTES,
  MAX_LINE_CHARS,
  MAX_NODES,
  MAX_PARTS,
  MAX_SAMPLES,
} from '../../src/circuit/limits.js';
import { InputError } from '../../src/diagnostics.js';

const RC = 'voltage-source V1 in -> gnd step to 1V\nresistor R1 in -> a 1k\ncapacitor C1 a -> gnd 1uF\nwatch node a\n';

function refusal(text: string): InputError {
  try {
    loadCircuit(text, 'limits.rdn');
  } catch (e) {
    if (e instanceof InputError) return e;
    throw e;
  }
  throw new Error('the circuit was accepted');
}

describe('input-size limits', () => {
  it('a file larger than MAX_FILE_BYTES is refused before parsing', () => {
    // multi-byte characters in a comment: the limit counts UTF-8 bytes, not characters
    const filler = ('# ' + 'Ω'.repeat(1000) + '\n').repeat(Math.ceil(MAX_FILE_BYTES / 2000) + 1);
    const e = refusal(RC + filler);
    expect(e.diagnostics).toHaveLength(1);
    expect(e.diagnostics[0]!.message).toMatch(/^limits\.rdn is 5\.\d MB, more than the 5 MB a circuit file may have$/);
    expect(e.diagnostics[0]!.loc).toMatchObject({ line: 1, col: 1 });
  });

  it('a line longer than MAX_LINE_CHARS is refused at that line; one at the limit is read', () => {
    const long = '# ' + 'x'.repeat(MAX_LINE_CHARS - 2);
    expect(() => loadCircuit(RC + long + '\n', 'limits.rdn')).not.toThrow();
    const e = refusal(RC + long + 'x\n');
    expect(e.diagnostics[0]).toMatchObject({ message: `this line has ${MAX_LINE_CHARS + 1} characters, more than the ${MAX_LINE_CHARS} allowed`, loc: { line: 5 } });
  });

  it('an expression longer than MAX_EXPRESSION_CHARS or nested deeper than MAX_EXPRESSION_NESTING is refused', () => {
    const sum = (n: number): string => '1' + '+1'.repeat(n);
    const chars = (n: number): string => sum((n - 1) / 2); // n odd: "1+1+...+1" of n characters
    expect(() => loadCircuit(RC + `param p = (${chars(MAX_EXPRESSION_CHARS - 1)})\n`, 'limits.rdn')).not.toThrow();
    expect(refusal(RC + `param p = (${chars(MAX_EXPRESSION_CHARS + 1)})\n`).diagnostics[0]).toMatchObject({
      message: `this expression has ${MAX_EXPRESSION_CHARS + 1} characters, more than the ${MAX_EXPRESSION_CHARS} allowed`,
      loc: { line: 5, col: 11 },
    });
    const nested = (d: number): string => '('.repeat(d) + '1' + ')'.repeat(d);
    expect(() => loadCircuit(RC + `param p = ${nested(MAX_EXPRESSION_NESTING)}\n`, 'limits.rdn')).not.toThrow();
    expect(refusal(RC + `param p = ${nested(MAX_EXPRESSION_NESTING + 1)}\n`).diagnostics[0]!.message).toBe(
      `this expression nests parentheses ${MAX_EXPRESSION_NESTING + 1} deep, more than the ${MAX_EXPRESSION_NESTING} allowed`,
    );
  });

  it('a source expression is held to the same limits', () => {
    const e = refusal(RC + `current-source I1 gnd -> a expression "${'sin('.repeat(MAX_EXPRESSION_NESTING + 1)}t${')'.repeat(MAX_EXPRESSION_NESTING + 1)}"\n`);
    expect(e.diagnostics[0]).toMatchObject({ message: `this expression nests parentheses ${MAX_EXPRESSION_NESTING + 1} deep, more than the ${MAX_EXPRESSION_NESTING} allowed`, loc: { line: 5, col: 39 } });
  });

  it('more than MAX_PARTS parts are refused at the first part past the limit', () => {
    // a resistor ladder a0 - a1 - a2 ... with every rung to gnd: parts grow twice as fast as nodes
    const ladder = (parts: number): string => {
      const lines = ['voltage-source V1 a0 -> gnd step to 1V'];
      for (let k = 1; lines.length < parts; k++) {
        lines.push(`resistor Rs${k} a${k - 1} -> a${k} 1k`);
        if (lines.length < parts) lines.push(`resistor Rp${k} a${k} -> gnd 1k`);
      }
      return lines.join('\n') + '\nwatch node a1\n';
    };
    expect(loadCircuit(ladder(MAX_PARTS), 'limits.rdn').parts).toHaveLength(MAX_PARTS);
    const e = refusal(ladder(MAX_PARTS + 1));
    expect(e.diagnostics).toHaveLength(1);
    expect(e.diagnostics[0]).toMatchObject({ message: `more than ${MAX_PARTS} parts: this is part ${MAX_PARTS + 1}`, loc: { line: MAX_PARTS + 1 } });
  });

  it('more than MAX_NODES nodes are refused at the first new node past the limit', () => {
    // pairs of new nodes on each line (a file with islands, which topology would refuse later): the
    // node limit is passed long before the part limit
    const pairs = (nodes: number): string => {
      const lines: string[] = [];
      for (let k = 1; 2 * lines.length < nodes; k++) lines.push(`resistor R${k} x${k} -> y${k} 1k`);
      if (nodes % 2 === 1) lines[lines.length - 1] = lines[lines.length - 1]!.replace(/ y\d+ /, ' gnd ');
      return lines.join('\n') + '\nwatch node x1\n';
    };
    // at the limit: read on to the topology check, which refuses the islands (not the size)
    expect(refusal(pairs(MAX_NODES)).diagnostics.every((d) => !d.message.startsWith('more than'))).toBe(true);
    const e = refusal(pairs(MAX_NODES + 1));
    expect(e.diagnostics).toHaveLength(1);
    expect(e.diagnostics[0]).toMatchObject({ message: `more than ${MAX_NODES} nodes: 'x${MAX_NODES / 2 + 1}' is node ${MAX_NODES + 1}`, loc: { line: MAX_NODES / 2 + 1, col: 16 } });
  });

  it('the sample limit in limits.ts is the one analysis.ts enforces', () => {
    expect(MAX_SAMPLES).toBe(ANALYSIS_MAX_SAMPLES);
    expect(() => loadCircuit(RC + `samples ${MAX_SAMPLES}\n`, 'limits.rdn')).not.toThrow();
    expect(refusal(RC + `samples ${MAX_SAMPLES + 1}\n`).diagnostics[0]!.message).toContain(`from 2 to ${MAX_SAMPLES}`);
  });

  it('a span that is not a finite number is refused', () => {
    expect(refusal(RC + 'span 1e999s\n').diagnostics[0]!.loc).toMatchObject({ line: 5 });
    expect(refusal(RC + 'span (1e308*10)\n').diagnostics[0]!.message).toContain('finite');
    expect(refusal(RC + 'span (0/0)\n').diagnostics[0]!.message).toContain('finite');
  });
});
