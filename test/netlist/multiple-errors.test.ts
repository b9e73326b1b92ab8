import { describe, expect, it } from 'vitest';
import { problems, lines } from './helpers.js';

describe('collecting several problems', () => {
  it('reports every bad line, in reading order, and keeps going after each', () => {
    const ds = problems(
      lines(
        'voltage-source V1 in -> gnd 5A', // unit
        'resistor R1 in -> out 1k',
        'capacitor C1 out -> gnd', // missing value
        'resistr R2 out -> gnd 1k', // keyword
        'watch node out',
        'samples 0', // range
        'title "unterminated', // tokenizer
        'settle 2% 3%', // extra token
      ),
    );
    expect(ds.map((d) => [d.severity, d.loc?.line])).toEqual([
      ['error', 1],
      ['error', 3],
      ['error', 4],
      ['error', 6],
      ['error', 7],
      ['error', 8],
    ]);
  });

  it('reports several errors on one line when they are independent', () => {
    const ds = problems(lines('voltage-source V1 in -> gnd step from 1A to 2A at 1V', 'resistor R1 in -> gnd 1k', 'watch node in'));
    expect(ds.map((d) => d.loc!.col)).toEqual([39, 45, 51]);
  });

  it('reports whole-file problems without a location, after the located ones', () => {
    const ds = problems(lines('# nothing here', 'span 1ms 1ms'));
    expect(ds.map((d) => [d.loc?.line, d.message])).toEqual([
      [2, "unexpected '1ms' after the end of the statement"],
      [undefined, 'test.rdn describes no parts'],
      [undefined, 'test.rdn has nothing to watch, so there would be nothing to report'],
    ]);
  });

  it('asks for a watch with a concrete suggestion', () => {
    const ds = problems(lines('voltage-source V1 in -> gnd 5V', 'resistor R1 in -> out 1k', 'capacitor C1 out -> gnd 1u'));
    expect(ds).toHaveLength(1);
    expect(ds[0]!.hint).toBe('add a line such as: watch node out');
  });

  it('does not run topology checks when a part line is broken (they would mislead)', () => {
    const ds = problems(lines('voltage-source V1 in -> gnd 5V', 'resistor R1 in -> out', 'capacitor C1 out -> gnd 1u', 'watch node out'));
    expect(ds).toHaveLength(1);
    expect(ds[0]!.message).toMatch(/missing/);
  });

  it('uses a parameter only after its declaration', () => {
    const ds = problems(lines('resistor R1 in -> gnd Rx', 'param Rx = 1k', 'current-source I1 gnd -> in 1m', 'watch node in'));
    expect(ds[0]!.message).toBe("parameter 'Rx' is used before its declaration on line 2");
  });

  it('rejects a parameter declared twice and gnd as a designator', () => {
    const ds = problems(lines('param a = 1', 'param a = 2', 'resistor gnd in -> gnd 1k', 'watch node in'));
    expect(ds.map((d) => d.message)).toEqual([
      "parameter 'a' is declared twice",
      "'gnd' is the ground node and cannot name a part",
    ]);
  });
});
