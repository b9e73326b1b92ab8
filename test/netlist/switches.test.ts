import { describe, expect, it } from 'vitest';
import { loadCircuit } from '../../src/circuit/load.js';
import { errors, lines, RC } from './helpers.js';

const circuit = (sw: string) => lines(...RC, sw);
const switching = (sw: string) => loadCircuit(circuit(sw), 's.rdn').parts.find((p) => p.kind === 'switch')!;
/** Errors of a switch on line 5, as [line, col, message]. */
const wrong = (sw: string) => errors(circuit(sw)).map((d) => [d.loc?.line, d.loc?.col, d.message]);
const col = (sw: string, part: string) => sw.indexOf(part) + 1;

describe('switch', () => {
  it('reads on and off resistances in SI, with off open by default', () => {
    const p = switching('switch S1 out -> gnd on 10mohm off 10Mohm closes 1ms');
    expect(p).toMatchObject({ kind: 'switch', name: 'S1', a: 'out', b: 'gnd', value: 0.01 });
    expect(p.switching).toEqual({ onResistance: 0.01, offResistance: 1e7, initiallyClosed: false, events: [{ t: 1e-3, closed: true }] });
    expect(switching('switch S1 out -> gnd on 1ohm').switching).toEqual({ onResistance: 1, offResistance: Infinity, initiallyClosed: false, events: [] });
    expect(switching('switch S1 out -> gnd on 1ohm off open closes 1ms').switching!.offResistance).toBe(Infinity);
  });

  it('starts open when it first closes, closed when it first opens', () => {
    expect(switching('switch S1 out -> gnd opens 2ms on 1ohm').switching).toMatchObject({ initiallyClosed: true, events: [{ t: 2e-3, closed: false }] });
    expect(switching('switch S1 out -> gnd on 1ohm opens 5ms closes 1ms').switching).toMatchObject({
      initiallyClosed: false,
      events: [{ t: 1e-3, closed: true }, { t: 5e-3, closed: false }],
    });
    expect(switching('switch S1 out -> gnd on 1ohm opens 1ms closes 5ms').switching).toMatchObject({
      initiallyClosed: true,
      events: [{ t: 1e-3, closed: false }, { t: 5e-3, closed: true }],
    });
  });

  it('lets an explicit starts decide, and toggles flip from it', () => {
    expect(switching('switch S1 out -> gnd on 1ohm starts closed').switching).toMatchObject({ initiallyClosed: true, events: [] });
    expect(switching('switch S1 out -> gnd on 1ohm toggles 1ms, 2ms, 3ms').switching).toMatchObject({
      initiallyClosed: false,
      events: [{ t: 1e-3, closed: true }, { t: 2e-3, closed: false }, { t: 3e-3, closed: true }],
    });
    expect(switching('switch S1 out -> gnd on 1ohm starts closed toggles 1ms,2ms').switching).toMatchObject({
      initiallyClosed: true,
      events: [{ t: 1e-3, closed: false }, { t: 2e-3, closed: true }],
    });
  });

  it('refuses events that change nothing or coincide', () => {
    const same = 'switch S1 out -> gnd on 1ohm starts closed closes 1ms';
    expect(wrong(same)).toEqual([[5, col(same, '1ms'), "S1 is already closed at 0.001 s, so 'closes' changes nothing"]]);
    const twice = 'switch S1 out -> gnd on 1ohm closes 1ms opens 1ms';
    expect(wrong(twice)).toEqual([[5, twice.lastIndexOf('1ms') + 1, 'S1 has two changes at the same time (0.001 s)']]);
  });

  it('refuses bad times, resistances and combinations', () => {
    const zero = 'switch S1 out -> gnd on 1ohm closes 0s';
    expect(wrong(zero)).toEqual([[5, col(zero, '0s'), 'a switch can change only after t = 0 (got 0 s)']]);
    const order = 'switch S1 out -> gnd on 1ohm toggles 2ms, 1ms';
    expect(wrong(order)).toEqual([[5, col(order, '1ms'), 'toggle times must increase: 0.001 s does not come after 0.002 s']]);
    const mixed = 'switch S1 out -> gnd on 1ohm toggles 2ms closes 1ms';
    expect(wrong(mixed)).toEqual([[5, col(mixed, 'toggles'), "'toggles' cannot be combined with 'closes' or 'opens'"]]);
    const off = 'switch S1 out -> gnd on 1k off 10ohm';
    expect(wrong(off)).toEqual([[5, col(off, '10ohm'), "the 'off' resistance of S1 (10 Ω) must be larger than its 'on' resistance (1000 Ω)"]]);
    const unit = 'switch S1 out -> gnd on 1uF';
    expect(wrong(unit)[0]![2]).toMatch(/the 'on' resistance of S1 is given in farads \(F\), but needs a resistance in ohms/);
    const time = 'switch S1 out -> gnd on 1ohm closes 1V';
    expect(wrong(time)[0]![2]).toMatch(/'closes' of S1 is given in volts/);
  });

  it('needs on, and a known state after starts', () => {
    const bare = 'switch S1 out -> gnd';
    expect(wrong(bare)).toEqual([[5, bare.length + 1, "a switch needs 'on' and its resistance while closed"]]);
    const noOn = 'switch S1 out -> gnd closes 1ms';
    expect(wrong(noOn)).toEqual([[5, col(noOn, 'S1'), "a switch needs 'on'"]]);
    const state = 'switch S1 out -> gnd on 1ohm starts cloesd';
    const es = errors(circuit(state));
    expect(es[0]).toMatchObject({ message: "a switch starts either closed or open, not 'cloesd'", hint: "did you mean 'closed'?", loc: { line: 5, col: col(state, 'cloesd') } });
  });

  it('suggests switch keywords and the statement itself', () => {
    expect(errors(circuit('switch S1 out -> gnd on 1ohm closse 1ms'))[0]).toMatchObject({ message: "unknown switch keyword 'closse'", hint: "did you mean 'closes'?" });
    expect(errors(circuit('swtich S1 out -> gnd on 1ohm'))[0]!.hint).toBe("did you mean 'switch'?");
  });

  it('counts as a connection for floating-node checks', () => {
    const c = loadCircuit(lines(...RC, 'switch S1 out -> far on 1ohm closes 1ms', 'resistor R9 far -> gnd 1k'), 's.rdn');
    expect(c.parts.map((p) => p.name)).toContain('S1');
    const floating = errors(lines(...RC, 'switch S1 x -> y on 1ohm', 'resistor R9 y -> x 1k'));
    expect(floating[0]!.message).toMatch(/nodes 'x', 'y' \('S1', 'R9'\) have no connection to gnd/);
  });
});

describe('start', () => {
  it('defaults to settled and reads rest', () => {
    expect(loadCircuit(lines(...RC), 'a.rdn').analysis.start).toBe('settled');
    expect(loadCircuit(lines(...RC, 'start rest'), 'a.rdn').analysis.start).toBe('rest');
    expect(loadCircuit(lines(...RC, 'start settled'), 'a.rdn').analysis.start).toBe('settled');
  });
  it('refuses other words and a second start', () => {
    expect(errors(lines(...RC, 'start rset'))[0]).toMatchObject({ message: "unknown start 'rset'", hint: "did you mean 'rest'?", loc: { line: 5, col: 7 } });
    expect(errors(lines(...RC, 'start rest', 'start settled'))[0]).toMatchObject({ message: "'start' is given twice", loc: { line: 6, col: 1 } });
  });
});
