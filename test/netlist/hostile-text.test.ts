/**
 * Hostile circuit text, as a reviewer would throw it at the command line: binary files, UTF-16,
 * classic Mac line ends, invisible and look-alike characters, escape sequences and megabyte lines.
 * Each must end in one located input error (exit 2, file:line:col, the line quoted, what was
 * expected, a hint) or a result, never a stack trace, and the quoted line must neither flood the
 * terminal nor carry control characters to it. What "helpful" means here is common practice for
 * compiler diagnostics (point at the character, name it, say what to type instead).
 */
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { main } from '../../src/cli/main.js';
import { decodeText } from '../../src/cli/input.js';
import { loadCircuit } from '../../src/circuit/load.js';
import { formatDiagnostic } from '../../src/netlist/format.js';
import { displayLine, splitLines } from '../../src/netlist/text.js';
import { capture } from '../helpers/capture.js';
import { errors, lines, RC } from './helpers.js';

const CIRCUIT = lines(...RC);
let dir = '';
beforeAll(() => {
  dir = mkdtempSync(join(tmpdir(), 'ringdown-hostile-'));
});
afterAll(() => rmSync(dir, { recursive: true, force: true }));

const argv = (...args: string[]) => ['node', 'ringdown', ...args];

/** Runs `ringdown <cmd> <file>` in-process on the given bytes; code, stdout and stderr. */
async function cli(cmd: 'run' | 'check', name: string, bytes: Buffer | string) {
  const file = join(dir, name);
  writeFileSync(file, bytes);
  const io = capture();
  const code = await main(argv(cmd, file, ...(cmd === 'run' ? ['--no-chart', '--format', 'numbers'] : [])), io);
  return { code, out: io.out(), err: io.err(), file };
}

/** No stack trace and no terminal control sequence in what the CLI printed. */
function clean(text: string): void {
  expect(text).not.toMatch(/^\s+at .*:\d+:\d+\)?$/m);
  expect(text).not.toMatch(/internal error/);
  // eslint-disable-next-line no-control-regex
  expect(text).not.toMatch(/[\u0000-\u0008\u000b-\u001f\u007f-\u009f]/);
}

describe('files that are not circuit text', () => {
  it('random bytes with NULs: one error for the whole file, located, with a hint', async () => {
    const bytes = Buffer.alloc(4096);
    for (let i = 0; i < bytes.length; i++) bytes[i] = (i * 7919 + 13) % 256;
    for (const cmd of ['run', 'check'] as const) {
      const r = await cli(cmd, 'random.rdn', bytes);
      expect(r.code).toBe(2);
      clean(r.err);
      expect(r.err).toMatch(/random\.rdn:\d+:\d+: error: .*random\.rdn contains binary data \(a NUL byte\), not circuit text/);
      expect(r.err).toContain('expected: plain text in UTF-8');
      expect(r.err).toContain('ringdown: 1 error in the input');
      // the quoted line is cut to a window: no flood of garbage
      expect(r.err.length).toBeLessThan(1200);
    }
  });

  it('bytes that are not UTF-8 throughout (no NUL): one error, not one per line', async () => {
    const garbage = Buffer.from(Array.from({ length: 3000 }, (_, i) => (i % 37 === 36 ? 10 : 0x80 + (i % 64))));
    const r = await cli('check', 'latin.rdn', garbage);
    expect(r.code).toBe(2);
    clean(r.err);
    expect(r.err).toMatch(/latin\.rdn:1:1: error: .* does not look like circuit text/);
    expect(r.err).toContain('ringdown: 1 error in the input');
  });

  it('a circuit saved as UTF-16 (with its byte-order mark, either byte order) is read', async () => {
    const le = Buffer.concat([Buffer.from([0xff, 0xfe]), Buffer.from(CIRCUIT, 'utf16le')]);
    expect(decodeText(le)).toBe(CIRCUIT);
    const be = Buffer.concat([Buffer.from([0xfe, 0xff]), Buffer.from(CIRCUIT, 'utf16le').swap16()]);
    expect(decodeText(be)).toBe(CIRCUIT);
    const r = await cli('run', 'utf16.rdn', le);
    expect(r.err).toBe('');
    expect(r.code).toBe(0);
  });

  it('UTF-16 without a byte-order mark gets the hint to save as UTF-8', async () => {
    const r = await cli('check', 'utf16-nobom.rdn', Buffer.from(CIRCUIT, 'utf16le'));
    expect(r.code).toBe(2);
    clean(r.err);
    expect(r.err).toContain('hint: it looks like UTF-16 text: save it as UTF-8');
  });

  it('a single stray invalid byte stays an error on its own line, naming the encoding', () => {
    const [d] = errors(lines('voltage-source V1 in -> gnd 5V', 'resistor R1 in -> out 1k\uFFFD', 'capacitor C1 out -> gnd 1uF', 'watch node out'));
    expect(d).toMatchObject({ message: 'unexpected character U+FFFD (replacement character: bytes that are not valid UTF-8)', loc: { line: 2, col: 25 } });
    expect(d!.hint).toBe('the file has bytes that are not UTF-8 here: save it as UTF-8');
  });
});

describe('line ends', () => {
  it('classic Mac line ends (a lone CR) end lines like LF and CR LF', () => {
    const cr = loadCircuit(RC.join('\r') + '\r', 'cr.rdn');
    const crlf = loadCircuit(RC.join('\r\n') + '\r\n', 'crlf.rdn');
    const lf = loadCircuit(CIRCUIT, 'lf.rdn');
    for (const c of [cr, crlf]) {
      expect(c.parts.map((p) => [p.name, p.loc.line])).toEqual(lf.parts.map((p) => [p.name, p.loc.line]));
    }
  });

  it('an error in a CR-only file quotes its own line, not the whole file', () => {
    const text = ['voltage-source V1 in -> gnd 5V', 'resistor R1 in -> out 1uH', 'capacitor C1 out -> gnd 1uF', 'watch node out'].join('\r');
    const [d] = errors(text);
    expect(d!.loc).toMatchObject({ line: 2, col: 23 });
    expect(formatDiagnostic(d!, text, false).split('\n')[1]).toBe('  2 | resistor R1 in -> out 1uH');
    expect(splitLines('a\rb\r\nc\nd')).toEqual(['a', 'b', 'c', 'd']);
  });
});

describe('characters that are not what they look like', () => {
  it('a Unicode minus in the arrow: named, with the ASCII to type', () => {
    const [d] = errors(lines('voltage-source V1 in \u2212> gnd 5V', ...RC.slice(1)));
    expect(d).toMatchObject({ message: "unexpected character '\u2212' (U+2212)", loc: { line: 1, col: 22 } });
    expect(d!.expected).toContain('names of ASCII letters');
    expect(d!.hint).toContain("it looks like '-' but is not: type '-' instead");
  });

  it('a no-break space between words', () => {
    const [d] = errors(lines('voltage-source V1 in -> gnd 5V', 'resistor R1 in\u00a0-> out 1k', ...RC.slice(2)));
    expect(d!.message).toBe("unexpected character '\u00a0' (U+00A0, no-break space)");
    expect(d!.hint).toContain('it looks like a space but is not');
  });

  it('zero-width and direction-override characters are named by code point, and the quote shows a visible mark instead', () => {
    const text = lines('voltage-source V1 in -> gnd 5V', 'resistor R1 in -> out\u200b 1k', 'capacitor C1 out -> gnd 1uF\u202e', 'watch node out');
    const ds = errors(text);
    expect(ds.map((d) => [d.message, d.loc?.line, d.loc?.col])).toEqual([
      ['unexpected invisible character U+200B (zero-width space)', 2, 22],
      ['unexpected invisible character U+202E (right-to-left override)', 3, 28],
    ]);
    const shown = formatDiagnostic(ds[1]!, text, false).split('\n');
    expect(shown[1]).toBe('  3 | capacitor C1 out -> gnd 1uF\u00bf');
    // the caret under the mark
    expect(shown[2]!.indexOf('^')).toBe(shown[1]!.indexOf('\u00bf'));
  });

  it('a Greek letter in a name: the hint says names are ASCII', () => {
    const [d] = errors(lines('voltage-source V1 in -> gnd 5V', 'resistor R\u03b1 in -> out 1k', ...RC.slice(2)));
    expect(d!.message).toBe("unexpected character '\u03b1' (U+03B1)");
    expect(d!.hint).toContain('ASCII letters, digits and _');
  });

  it('an escape sequence in the file never reaches the terminal', async () => {
    const r = await cli('check', 'escape.rdn', lines('voltage-source V1 in -> gnd 5V', 'resistor R1 in -> out 1k \u001b[2J\u001b]0;pwned\u0007', ...RC.slice(2)));
    expect(r.code).toBe(2);
    clean(r.err);
    expect(r.err).toContain('unexpected invisible character U+001B (escape)');
    expect(r.err).toContain('  2 | resistor R1 in -> out 1k \u00bf[2J\u00bf]0;pwned\u00bf');
  });
});

describe('quoted text', () => {
  it('an escape sequence in a title never reaches the report: a located error at the character', async () => {
    const r = await cli('check', 'title.rdn', lines('title "evil \u001b[2J\u001b]0;pwned\u0007"', ...RC));
    expect(r.code).toBe(2);
    clean(r.err);
    clean(r.out);
    expect(r.err).toContain('title.rdn:1:13: error: unexpected invisible character U+001B (escape) inside quoted text');
    expect(r.err).toContain('expected: printable text between the quotes');
  });

  it('a direction override in a label is refused; ordinary Unicode in labels and titles is kept', () => {
    const [d] = errors(lines(...RC.slice(0, 3), 'watch node out as "out\u202eput"'));
    expect(d).toMatchObject({ message: 'unexpected invisible character U+202E (right-to-left override) inside quoted text', loc: { line: 4, col: 23 } });
    const c = loadCircuit(lines('title "Ünïcödé ☃ 电路, 10 µF"', ...RC.slice(0, 3), 'watch node out as "Ausgang Ω"'), 'u.rdn');
    expect(c.title).toBe('Ünïcödé ☃ 电路, 10 µF');
    expect(c.watches[0]!.label).toBe('Ausgang Ω');
  });
});

describe('long lines', () => {
  it('a 1 MB line is refused at the limit and quoted as a window around the caret, not whole', async () => {
    const r = await cli('run', 'long.rdn', CIRCUIT + 'title "' + 'y'.repeat(1 << 20) + '"\n');
    expect(r.code).toBe(2);
    clean(r.err);
    expect(r.err).toMatch(/long\.rdn:5:100001: error: this line has 1048584 characters, more than the 100000 allowed/);
    expect(r.err.length).toBeLessThan(800);
    const quoted = r.err.split('\n')[1]!;
    const caret = r.err.split('\n')[2]!;
    expect(quoted).toMatch(/^ {2}5 \| …y+…$/);
    expect(caret).toMatch(/^ {2} {2}\| {1,}\^$/);
  });

  it('the window keeps the caret under its character', () => {
    const line = 'a'.repeat(500) + 'X' + 'b'.repeat(500);
    const w = displayLine(line, 501, 1);
    expect(w.text[w.col - 1]).toBe('X');
    expect(w.text.length).toBeLessThanOrEqual(162);
    // short lines are left alone
    expect(displayLine('resistor R1 a -> b 1k', 10, 2)).toEqual({ text: 'resistor R1 a -> b 1k', col: 10, length: 2 });
  });
});

describe('a wholly wrong file', () => {
  it('4000 bad lines: the first 50 problems are printed and the rest counted, not 940 KB of them', async () => {
    const text = lines('voltage-source V1 in -> gnd 5V', 'capacitor C1 in -> a 1uF', 'watch node a', ...Array.from({ length: 4000 }, (_, k) => `resistor R${k} in -> a 1uH`));
    const r = await cli('run', 'wrong.rdn', text);
    expect(r.code).toBe(2);
    expect(r.err.match(/: error: /g)).toHaveLength(50);
    expect(r.err).toContain('… and 3950 more problems not shown (fix the ones above first)');
    expect(r.err.trimEnd().endsWith('ringdown: 4000 errors in the input; nothing was computed')).toBe(true);
    expect(r.err.length).toBeLessThan(20_000);
  });
});
