/** `watch … above LEVEL`: parsing, unit check against the watch, located errors (doc/LANGUAGE.md). */
import { describe, expect, it } from 'vitest';
import { loadCircuit } from '../../src/circuit/load.js';
import { errors, lines } from './helpers.js';

const FRAME = ['voltage-source V1 in -> gnd 5V', 'resistor R1 in -> out 1k', 'inductor L1 out -> gnd 1mH'];
const load = (...watch: string[]) => loadCircuit(lines(...FRAME, ...watch), 'test.rdn');

describe('watch … above LEVEL', () => {
  it('keeps the level and the label, in either order', () => {
    const c = load('watch node out above 3V as "out"', 'watch current L1 as "coil" above 2A', 'watch voltage R1 above 250mV');
    expect(c.watches.map((w) => [w.label, w.unit, w.threshold])).toEqual([
      ['out', 'V', 3],
      ['coil', 'A', 2],
      ['v(R1)', 'V', 0.25],
    ]);
  });

  it('takes a bare number in the watch unit, and negative levels', () => {
    const c = load('watch between in and out above 1.5', 'watch current L1 above -20mA');
    expect(c.watches.map((w) => w.threshold)).toEqual([1.5, -0.02]);
  });

  it('leaves the level out when there is none', () => {
    expect(load('watch node out').watches[0]!.threshold).toBeUndefined();
  });
});

describe('located errors', () => {
  it('a level in the wrong unit points at the quantity', () => {
    const [e] = errors(lines(...FRAME, 'watch current L1 above 3V'));
    expect(e!.message).toBe("the threshold '3V' is in V, but this watch measures a current (A)");
    expect(e!.loc).toEqual({ file: 'test.rdn', line: 4, col: 24, length: 2 });
  });

  it('a voltage watch with a level in A', () => {
    const [e] = errors(lines(...FRAME, 'watch node out above 2A as "x"'));
    expect(e!.message).toMatch(/in A, but this watch measures a voltage \(V\)/);
    expect(e!.loc).toMatchObject({ line: 4, col: 22, length: 2 });
  });

  it('a misspelled keyword gets a did-you-mean', () => {
    const [e] = errors(lines(...FRAME, 'watch node out abve 3V'));
    expect(e!.message).toBe("unexpected 'abve' after the watch target");
    expect(e!.hint).toMatch(/above/);
    expect(e!.loc).toMatchObject({ line: 4, col: 16, length: 4 });
  });

  it('a missing level points just past the end of the line', () => {
    const [e] = errors(lines(...FRAME, 'watch node out above   # forgot'));
    expect(e!.message).toMatch(/^missing a threshold level after above/);
    expect(e!.loc).toMatchObject({ line: 4, col: 21, length: 1 });
  });

  it('a word or an expression in place of the level', () => {
    const [e1] = errors(lines(...FRAME, 'watch node out above vmax'));
    expect(e1!.message).toMatch(/expected a threshold level after above/);
    expect(e1!.loc).toMatchObject({ line: 4, col: 22, length: 4 });
    const [e2] = errors(lines(...FRAME, 'watch node out above (2*3)'));
    expect(e2!.loc).toMatchObject({ line: 4, col: 22 });
  });

  it('a clause given twice', () => {
    const [e] = errors(lines(...FRAME, 'watch node out above 1V above 2V'));
    expect(e!.message).toBe("'above' is given twice on this watch line");
    expect(e!.loc).toMatchObject({ line: 4, col: 25, length: 5 });
  });

  it('an unknown word after a complete watch line', () => {
    const [e] = errors(lines(...FRAME, 'watch node out above 1V as "a" extra'));
    expect(e!.message).toBe("unexpected 'extra' after the watch target");
    expect(e!.expected).toBe('end of line');
  });
});
