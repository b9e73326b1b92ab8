import { mkdtempSync, mkdirSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { rmSync } from 'node:fs';
import { loadCircuit } from '../../src/circuit/load.js';
import { InputError, type Diagnostic } from '../../src/diagnostics.js';
import { formatDiagnostic } from '../../src/netlist/format.js';
import { lines } from './helpers.js';

const dir = mkdtempSync(join(tmpdir(), 'ringdown-table-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));
mkdirSync(join(dir, 'data'));

/** Writes `csv` as data/NAME next to a circuit file that uses it; returns the circuit's path and text. */
function setup(name: string, csv: string, kind: 'voltage-source' | 'current-source' = 'voltage-source') {
  writeFileSync(join(dir, 'data', name), csv);
  const file = join(dir, 'c.rdn');
  const text = lines(`${kind} S x -> gnd table file "data/${name}"`, 'resistor R x -> gnd 1k', 'watch node x');
  return { file, text };
}
const points = (name: string, csv: string) => {
  const { file, text } = setup(name, csv);
  return (loadCircuit(text, file).parts[0]!.waveform!.terms[0] as { points: unknown }).points;
};
function problems(name: string, csv: string): Diagnostic[] {
  const { file, text } = setup(name, csv);
  try {
    loadCircuit(text, file);
  } catch (e) {
    if (e instanceof InputError) return e.diagnostics;
    throw e;
  }
  throw new Error('expected an error');
}

describe('table file', () => {
  it('reads comma-separated rows relative to the circuit file, with a header', () => {
    expect(points('a.csv', 'time,volts\n0,0\n1e-3,5\n2.5E-3,-1.5\n')).toEqual([
      { t: 0, v: 0 },
      { t: 1e-3, v: 5 },
      { t: 2.5e-3, v: -1.5 },
    ]);
  });

  it('reads semicolons, white space, CRLF, blank and # lines, no header', () => {
    expect(points('b.csv', '0;1\r\n0.5; 2\r\n')).toEqual([{ t: 0, v: 1 }, { t: 0.5, v: 2 }]);
    expect(points('c.txt', '# from the bench\n\n  0   1\n\t.5\t+2e0\n')).toEqual([{ t: 0, v: 1 }, { t: 0.5, v: 2 }]);
  });

  it('adds delay to every time', () => {
    const { file } = setup('d.csv', '0,0\n1,1\n');
    const text = lines('voltage-source S x -> gnd table file "data/d.csv" delay 2ms', 'resistor R x -> gnd 1k', 'watch node x');
    expect((loadCircuit(text, file).parts[0]!.waveform!.terms[0] as { points: unknown }).points).toEqual([{ t: 2e-3, v: 0 }, { t: 1 + 2e-3, v: 1 }]);
  });

  it('points at the bad field in the CSV file', () => {
    const csvPath = join(dir, 'data', 'e.csv');
    const ds = problems('e.csv', 't,v\n0,0\n1e-3,5x\n');
    expect(ds).toHaveLength(1);
    expect(ds[0]).toMatchObject({ message: "'5x' is not a number", loc: { file: csvPath, line: 3, col: 6, length: 2 } });
    // The printout quotes the CSV line, not the circuit's.
    expect(formatDiagnostic(ds[0]!, 'not this', false)).toContain('3 | 1e-3,5x');
  });

  it('checks column counts and increasing times', () => {
    const csvPath = join(dir, 'data', 'f.csv');
    expect(problems('f.csv', '0,0\n1,1,1\n').map((d) => [d.loc!.file, d.loc!.line, d.loc!.col, d.message])).toEqual([
      [csvPath, 2, 1, 'expected two columns (time and value), found 3'],
    ]);
    expect(problems('g.csv', '0 0\n2 1\n 1 1\n').map((d) => [d.loc!.line, d.loc!.col, d.message])).toEqual([
      [3, 2, 'table times must increase: 1 s does not come after 2 s (line 2)'],
    ]);
  });

  it('needs two rows, and an existing file', () => {
    expect(problems('h.csv', 'time,value\n0,1\n')[0]).toMatchObject({ loc: { line: 1, col: 38 }, message: expect.stringMatching(/needs at least two rows of time and value, found 1$/) });
    const text = lines('voltage-source S x -> gnd table file "nope.csv"', 'resistor R x -> gnd 1k', 'watch node x');
    let ds: Diagnostic[] = [];
    try {
      loadCircuit(text, join(dir, 'c.rdn'));
    } catch (e) {
      ds = (e as InputError).diagnostics;
    }
    expect(ds[0]).toMatchObject({ message: `cannot read table file '${join(dir, 'nope.csv')}': no such file`, loc: { line: 1, col: 38, length: 10 } });
  });
});
