import { describe, expect, it } from 'vitest';
import { errors, lines, RC } from './helpers.js';

describe('diagnostic locations', () => {
  it('points at the exact literal with a wrong unit', () => {
    const [e] = errors(lines(...RC, '  capacitor   C2 out -> gnd   10mH'));
    expect(e!.loc).toEqual({ file: 'test.rdn', line: 5, col: 31, length: 4 });
  });

  it('points at a misspelled statement keyword', () => {
    const [e] = errors(lines('# header', ...RC, '\tresitor R2 out -> gnd 1k'));
    expect(e!.loc).toEqual({ file: 'test.rdn', line: 6, col: 2, length: 7 });
  });

  it('points inside an expression at the unknown name', () => {
    const [e] = errors(lines('param Rload = 1k', ...RC, 'resistor R2 out -> gnd (2*Rlaod + 1)'));
    expect(e!.message).toBe("unknown parameter 'Rlaod'");
    expect(e!.loc).toMatchObject({ line: 6, col: 27, length: 5 });
  });

  it('points just past the end of a statement that stops too early', () => {
    const [e] = errors(lines(...RC, 'resistor R2 out -> gnd   # value forgotten'));
    expect(e!.message).toMatch(/missing the resistor's value/);
    expect(e!.loc).toMatchObject({ line: 5, col: 23, length: 1 });
  });

  it('spans extra tokens after a complete statement', () => {
    const [e] = errors(lines(...RC, 'span 1ms 2ms 3ms'));
    expect(e!.loc).toMatchObject({ line: 5, col: 10, length: 7 });
  });

  it('points at the second of two duplicate designators and names the first', () => {
    const [e] = errors(lines(...RC, 'resistor R1 out -> gnd 2k'));
    expect(e!.loc).toMatchObject({ line: 5, col: 10, length: 2 });
    expect(e!.message).toBe("designator 'R1' is already used by the resistor on line 2");
    expect(e!.hint).toMatch(/line 2, column 1/);
  });

  it('marks both node names of a part shorted onto one node', () => {
    const [e] = errors(lines(...RC, 'resistor R2 out -> out 1k'));
    expect(e!.message).toBe("both terminals of R2 are on node 'out'");
    expect(e!.loc).toMatchObject({ line: 5, col: 13, length: 10 });
  });

  it('points at the watched node that does not exist', () => {
    const [e] = errors(lines(...RC, 'watch between out and ni'));
    expect(e!.loc).toMatchObject({ line: 5, col: 23, length: 2 });
  });
});

describe('file encodings', () => {
  it('accepts CRLF line ends and a leading byte-order mark with unchanged columns', () => {
    const text = '\uFEFF' + [...RC, 'capacitor C2 out -> gnd 10mH'].join('\r\n') + '\r\n';
    const [e] = errors(text);
    expect(e!.loc).toMatchObject({ line: 5, col: 25, length: 4 });
  });
});
