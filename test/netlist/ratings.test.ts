import { describe, expect, it } from 'vitest';
import { loadCircuit } from '../../src/circuit/load.js';
import { parseQuantity } from '../../src/netlist/quantity.js';
import { errors, lines, RC } from './helpers.js';

/** The frame with `extra` lines added at line 5 on. */
const circuit = (...extra: string[]) => lines(...RC, ...extra);
const part = (line: string, name: string) => loadCircuit(circuit(line), 'r.rdn').parts.find((p) => p.name === name)!;
/** Errors as [line, col, message]. */
const wrong = (...extra: string[]) => errors(circuit(...extra)).map((d) => [d.loc?.line, d.loc?.col, d.message]);
const col = (line: string, piece: string) => line.indexOf(piece) + 1;
const lastCol = (line: string, piece: string) => line.lastIndexOf(piece) + 1;

describe('W and J units', () => {
  it.each([
    ['250mW', 0.25, 'W'],
    ['2W', 2, 'W'],
    ['1.5kW', 1500, 'W'],
    ['3J', 3, 'J'],
    ['1.5J', 1.5, 'J'],
    ['470uJ', 4.7e-4, 'J'],
    ['10mJ', 0.01, 'J'],
  ])('%s', (text, value, unit) => {
    expect(parseQuantity(text)).toEqual({ value, unit });
  });
});

describe('rated', () => {
  it('reads each rating by its unit, in SI', () => {
    expect(part('capacitor C2 out -> gnd 470uF rated 35V', 'C2').ratings).toEqual({ voltage: 35 });
    expect(part('resistor R2 out -> gnd 10ohm rated 250mW 3J', 'R2').ratings).toEqual({ power: 0.25, pulseEnergy: 3 });
    expect(part('inductor L2 out -> gnd 10uH rated 6A', 'L2').ratings).toEqual({ current: 6 });
    expect(part('resistor R2 out -> gnd 1k rated 1.5J 200V 500mA 600mW', 'R2').ratings).toEqual({ voltage: 200, current: 0.5, power: 0.6, pulseEnergy: 1.5 });
  });

  it('leaves ratings out when none are given', () => {
    expect(part('resistor R2 out -> gnd 1k', 'R2')).not.toHaveProperty('ratings');
  });

  it('takes the ratings of a switch among its keywords', () => {
    const sw = part('switch S1 out -> gnd on 10mohm rated 30V 20A closes 1ms', 'S1');
    expect(sw.ratings).toEqual({ voltage: 30, current: 20 });
    expect(sw.switching).toEqual({ onResistance: 0.01, offResistance: Infinity, initiallyClosed: false, events: [{ t: 1e-3, closed: true }] });
    expect(part('switch S1 out -> gnd rated 2W on 1ohm', 'S1').ratings).toEqual({ power: 2 });
    expect(part('switch S1 out -> gnd on 1ohm closes 1ms rated 5mJ', 'S1').ratings).toEqual({ pulseEnergy: 0.005 });
  });

  it('puts initial and rated in either order', () => {
    expect(part('capacitor C2 out -> gnd 1uF initial 2V rated 16V', 'C2')).toMatchObject({ initial: 2, ratings: { voltage: 16 } });
    expect(part('capacitor C2 out -> gnd 1uF rated 16V initial 2V', 'C2')).toMatchObject({ initial: 2, ratings: { voltage: 16 } });
    expect(part('inductor L2 out -> gnd 1mH rated 3A initial 1A', 'L2')).toMatchObject({ initial: 1, ratings: { current: 3 } });
  });

  it('rates sources after their whole waveform', () => {
    expect(part('current-source I2 gnd -> out 1mA rated 30V', 'I2').ratings).toEqual({ voltage: 30 });
    const v = part('voltage-source V2 x -> gnd step to 5V at 1ms + sine amplitude 1V freq 1kHz rated 2A', 'V2');
    expect(v.ratings).toEqual({ current: 2 });
    expect(v.waveform!.terms).toHaveLength(2);
    const c = loadCircuit(circuit('param Vs = 12V', 'voltage-source V2 x -> gnd Vs rated 3A', 'resistor R9 x -> gnd 1k'), 'r.rdn');
    expect(c.parts.find((p) => p.name === 'V2')).toMatchObject({ waveform: { terms: [{ kind: 'constant', value: 12 }] }, ratings: { current: 3 } });
    expect(part('current-source I2 gnd -> out table 0 0A, 1ms 1mA rated 40V', 'I2').ratings).toEqual({ voltage: 40 });
  });

  it('reads parameters declared with a rating unit', () => {
    const c = loadCircuit(circuit('param Vmax = 50V', 'param Pmax = 125mW', 'resistor R2 out -> gnd 1k rated Vmax Pmax'), 'r.rdn');
    expect(c.parts.find((p) => p.name === 'R2')!.ratings).toEqual({ voltage: 50, power: 0.125 });
  });

  it('refuses units that are no rating', () => {
    const h = 'capacitor C2 out -> gnd 1uF rated 5H';
    expect(wrong(h)).toEqual([[5, col(h, '5H'), 'C2 cannot be rated in henries (H)']]);
    const s = 'resistor R2 out -> gnd 1k rated 1ms';
    expect(wrong(s)).toEqual([[5, col(s, '1ms'), 'R2 cannot be rated in seconds (s)']]);
    const bare = 'resistor R2 out -> gnd 1k rated 35';
    expect(wrong(bare)).toEqual([[5, col(bare, '35'), 'a rating of R2 needs a unit, which tells which rating it is']]);
    const expr = 'resistor R2 out -> gnd 1k rated (2*3)';
    expect(errors(circuit(expr))[0]).toMatchObject({ loc: { line: 5, col: col(expr, '(') }, hint: expect.stringMatching(/an expression has no unit/) });
  });

  it('refuses power and pulse energy on parts that do not dissipate', () => {
    const c = 'capacitor C2 out -> gnd 1uF rated 35V 1W';
    expect(wrong(c)).toEqual([[5, col(c, '1W'), 'a capacitor has no power rating']]);
    const l = 'inductor L2 out -> gnd 1mH rated 2J';
    expect(wrong(l)).toEqual([[5, col(l, '2J'), 'an inductor has no pulse energy rating']]);
    const v = 'voltage-source V2 x -> gnd 5V rated 10W';
    expect(wrong(v, 'resistor R9 x -> gnd 1k')).toEqual([[5, col(v, '10W'), 'a voltage-source has no power rating']]);
  });

  it('refuses a rating given twice, and a second rated', () => {
    const twice = 'resistor R2 out -> gnd 1k rated 50V 1W 60V';
    expect(errors(circuit(twice))).toEqual([
      expect.objectContaining({ message: 'the voltage rating of R2 is given twice', loc: expect.objectContaining({ line: 5, col: col(twice, '60V') }), hint: `the first one is at column ${col(twice, '50V')}` }),
    ]);
    const two = 'capacitor C2 out -> gnd 1uF rated 35V initial 1V rated 2A';
    expect(wrong(two)).toEqual([[5, lastCol(two, 'rated'), "'rated' is given twice"]]);
    const sw = 'switch S1 out -> gnd rated 30V on 1ohm rated 2A';
    expect(wrong(sw)).toEqual([[5, lastCol(sw, 'rated'), "'rated' is given twice"]]);
  });

  it('refuses non-positive ratings', () => {
    const zero = 'resistor R2 out -> gnd 1k rated 0W';
    expect(wrong(zero)).toEqual([[5, col(zero, '0W'), 'the power rating of R2 must be positive, got 0 W']]);
    const neg = 'capacitor C2 out -> gnd 1uF rated -16V';
    expect(wrong(neg)).toEqual([[5, col(neg, '-16V'), 'the voltage rating of C2 must be positive, got -16 V']]);
  });

  it('needs at least one rating after rated', () => {
    const end = 'resistor R2 out -> gnd 1k rated';
    expect(wrong(end)).toEqual([[5, end.length + 1, "missing a rating after 'rated'"]]);
    const sw = 'switch S1 out -> gnd on 1ohm rated closes 1ms';
    expect(wrong(sw)).toEqual([[5, col(sw, 'closes'), "missing a rating after 'rated'"]]);
    const onMissing = 'switch S1 out -> gnd on rated 30V';
    expect(wrong(onMissing)).toEqual([[5, col(onMissing, 'rated'), "missing a value after 'on'"]]);
  });

  it('suggests rated and the keywords around it', () => {
    expect(errors(circuit('resistor R2 out -> gnd 1k rate 2W'))[0]).toMatchObject({ message: "unknown keyword 'rate'", hint: "did you mean 'rated'?", loc: { line: 5, col: 27 } });
    expect(errors(circuit('switch S1 out -> gnd on 1ohm raetd 2W'))[0]).toMatchObject({ message: "unknown switch keyword 'raetd'", hint: "did you mean 'rated'?" });
    const sw = 'switch S1 out -> gnd on 1ohm rated 30V closse 1ms';
    expect(errors(circuit(sw))[0]).toMatchObject({ message: "unknown keyword 'closse'", hint: "did you mean 'closes'?", loc: { line: 5, col: col(sw, 'closse') } });
    expect(errors(circuit('current-source I2 gnd -> out 1mA rted 30V'))[0]).toMatchObject({ hint: "did you mean 'rated'?" });
    const cap = 'capacitor C2 out -> gnd 10uF rating 6.3V';
    expect(errors(circuit(cap))[0]).toMatchObject({ message: "unknown keyword 'rating'", hint: "did you mean 'rated'?", loc: { line: 5, col: col(cap, 'rating') } });
    expect(errors(circuit('inductor L2 out -> gnd 1uH ratings 3A'))[0]).toMatchObject({ hint: "did you mean 'rated'?" });
  });

  it('reports rating errors together with the part’s other errors', () => {
    const line = 'resistor R2 out -> gnd 1uF rated 5H';
    expect(wrong(line).map((e) => e[1])).toEqual([col(line, '1uF'), col(line, '5H')]);
  });
});

describe('derate', () => {
  it('defaults to 80% and reads a percentage as a fraction', () => {
    expect(loadCircuit(circuit(), 'd.rdn').analysis.derating).toBe(0.8);
    expect(loadCircuit(circuit('derate 60%'), 'd.rdn').analysis.derating).toBe(0.6);
    expect(loadCircuit(circuit('derate 100%'), 'd.rdn').analysis.derating).toBe(1);
    expect(loadCircuit(circuit('derate 7%'), 'd.rdn').analysis.derating).toBe(0.07);
    expect(loadCircuit(circuit('param d = 75%', 'derate d'), 'd.rdn').analysis.derating).toBe(0.75);
  });

  it('needs the % sign and a fraction in (0, 100%]', () => {
    expect(errors(circuit('derate 0.8'))[0]).toMatchObject({ message: 'derate needs the % sign', hint: 'for 0.8 of the rating write 80%', loc: { line: 5, col: 8, length: 3 } });
    expect(wrong('derate 80')).toEqual([[5, 8, 'derate needs the % sign']]);
    expect(wrong('derate 80V')).toEqual([[5, 8, 'derate cannot be given in volts (V)']]);
    expect(wrong('derate 0%')).toEqual([[5, 8, 'derate must be more than 0% and at most 100%, got 0%']]);
    expect(wrong('derate 120%')).toEqual([[5, 8, 'derate must be more than 0% and at most 100%, got 120%']]);
    expect(wrong('derate -10%')).toEqual([[5, 8, 'derate must be more than 0% and at most 100%, got -10%']]);
  });

  it('is given at most once', () => {
    expect(errors(circuit('derate 80%', 'derate 70%'))[0]).toMatchObject({ message: "'derate' is given twice", hint: 'the first \'derate\' is on line 5', loc: { line: 6, col: 1 } });
  });

  it('is suggested for a misspelling', () => {
    expect(errors(circuit('derat 80%'))[0]).toMatchObject({ message: "unknown statement 'derat'", hint: "did you mean 'derate'?" });
  });
});
