/**
 * describeStructure (src/circuit/structure.ts) on small circuits whose answers are known by hand:
 * the order of complexity of an RLC network is #C + #L minus the independent loops of capacitors
 * (and voltage sources) minus the independent cut-sets of inductors (and current sources) — a
 * textbook result, from memory. The predicted count is also held against the number of states the
 * solver actually carries (analyzeText(...).states.length, src/pipeline.ts), an independent method:
 * the solver finds its states by rank decisions on the MNA matrices, never by walking the graph.
 */
import { describe, expect, it } from 'vitest';
import { loadCircuit } from '../../src/circuit/load.js';
import { describeStructure } from '../../src/circuit/structure.js';
import { analyzeText } from '../../src/pipeline.js';

const TAIL = 'watch node a\nspan 1ms\nsamples 21\n';
const load = (body: string) => loadCircuit(body + TAIL, 'structure.rdn');

const CIRCUITS: Record<string, { body: string; states: number; loops: string[][]; cutSets: string[][] }> = {
  'RC low-pass': {
    body: 'voltage-source V1 in -> gnd step to 1V\nresistor R1 in -> a 1k\ncapacitor C1 a -> gnd 1uF\n',
    states: 1, loops: [], cutSets: [],
  },
  'series RLC': {
    body: 'voltage-source V1 in -> gnd step to 12V\nresistor R1 in -> b 10\ninductor L1 b -> a 1mH\ncapacitor C1 a -> gnd 10uF\n',
    states: 2, loops: [], cutSets: [],
  },
  'two capacitors in parallel': {
    body: 'voltage-source V1 in -> gnd step to 1V\nresistor R1 in -> a 1k\ncapacitor C1 a -> gnd 1uF\ncapacitor C2 a -> gnd 2uF\n',
    states: 1, loops: [['C1', 'C2']], cutSets: [],
  },
  'capacitor straight across a voltage source': {
    body: 'voltage-source V1 a -> gnd step to 1V rise 1us\ncapacitor C1 a -> gnd 1uF\nresistor R1 a -> b 1k\ncapacitor C2 b -> gnd 1uF\n',
    states: 1, loops: [['V1', 'C1']], cutSets: [],
  },
  'triangle of capacitors': {
    body: 'voltage-source V1 in -> gnd step to 1V\nresistor R1 in -> a 1k\ncapacitor C1 a -> b 1uF\ncapacitor C2 b -> gnd 1uF\ncapacitor C3 a -> gnd 1uF\nresistor R2 b -> gnd 1k\n',
    states: 2, loops: [['C1', 'C2', 'C3']], cutSets: [],
  },
  'voltage source and two capacitors in a loop, inductor beside': {
    body: 'voltage-source V1 in -> gnd step to 1V rise 1us\ncapacitor C1 in -> a 1uF\ncapacitor C2 a -> gnd 1uF\ninductor L1 a -> gnd 1mH\nresistor R1 a -> gnd 1k\n',
    states: 2, loops: [['V1', 'C1', 'C2']], cutSets: [],
  },
  'two inductors in series': {
    body: 'voltage-source V1 in -> gnd step to 1V\nresistor R1 in -> m 1k\ninductor L1 m -> a 1mH\ninductor L2 a -> x 1mH\nresistor R2 x -> gnd 1k\n',
    states: 1, loops: [], cutSets: [['L1', 'L2']],
  },
  'three inductors meeting at one node': {
    body: 'voltage-source V1 in -> gnd step to 1V\nresistor R1 in -> p 1k\ninductor L1 p -> a 1mH\ninductor L2 a -> q 1mH\ninductor L3 a -> r 1mH\nresistor R2 q -> gnd 1k\nresistor R3 r -> gnd 1k\n',
    states: 2, loops: [], cutSets: [['L1', 'L2', 'L3']],
  },
  'inductor in series with a current source': {
    body: 'current-source I1 gnd -> m step to 1mA\ninductor L1 m -> a 1mH\nresistor R1 a -> gnd 1k\ncapacitor C1 a -> gnd 1uF\n',
    states: 1, loops: [], cutSets: [['L1', 'I1']],
  },
  'two capacitors in series (a capacitor cut-set does not lower the order)': {
    body: 'voltage-source V1 in -> gnd step to 1V\nresistor R1 in -> a 1k\ncapacitor C1 a -> m 1uF\ncapacitor C2 m -> gnd 1uF\n',
    states: 2, loops: [], cutSets: [],
  },
  'an inductor loop (does not lower the order either)': {
    body: 'voltage-source V1 in -> gnd step to 1V\nresistor R1 in -> a 1k\ninductor L1 a -> gnd 1mH\ninductor L2 a -> gnd 2mH\n',
    states: 2, loops: [], cutSets: [],
  },
  'both at once: a capacitor loop and an inductor cut-set': {
    body:
      'voltage-source V1 in -> gnd step to 1V\nresistor R1 in -> a 1k\ncapacitor C1 a -> gnd 1uF\ncapacitor C2 a -> gnd 1uF\n' +
      'inductor L1 a -> m 1mH\ninductor L2 m -> x 1mH\nresistor R2 x -> gnd 10\n',
    states: 2, loops: [['C1', 'C2']], cutSets: [['L1', 'L2']],
  },
};

const sorted = (xss: string[][]): string[][] => xss.map((xs) => [...xs].sort()).sort((x, y) => x.join().localeCompare(y.join()));

describe('describeStructure: loops, cut-sets and the state count on circuits known by hand', () => {
  for (const [name, c] of Object.entries(CIRCUITS)) {
    it(name, () => {
      const s = describeStructure(load(c.body));
      expect(sorted(s.capacitorLoops.map((l) => l.parts))).toEqual(sorted(c.loops));
      expect(sorted(s.inductorCutSets.map((k) => k.parts))).toEqual(sorted(c.cutSets));
      expect(s.expectedStates).toBe(c.states);
      expect(s.stateNames).toHaveLength(c.states);
      expect(s.expectedStates).toBe(s.capacitors + s.inductors - s.capacitorLoops.length - s.inductorCutSets.length);
    });
  }

  it('predicts the number of states the solver carries', () => {
    for (const [name, c] of Object.entries(CIRCUITS)) {
      const text = c.body + TAIL;
      expect({ name, states: analyzeText(text, 'structure.rdn').states.length }).toEqual({ name, states: describeStructure(load(c.body)).expectedStates });
    }
  });

  it('explains each loop and cut-set and names the dependent part', () => {
    const s = describeStructure(load(CIRCUITS['both at once: a capacitor loop and an inductor cut-set']!.body));
    expect(s.capacitorLoops[0]!.dependent).toBe('C2');
    expect(s.capacitorLoops[0]!.explanation).toBe('C1 and C2 form a loop of capacitors only: the voltage of C2 is fixed by C1, so the circuit has one state fewer');
    expect(s.inductorCutSets[0]!.dependent).toBe('L1');
    expect(s.inductorCutSets[0]!.side).toEqual(['m']);
    expect(s.inductorCutSets[0]!.explanation).toBe(
      "L1 and L2 form a cut-set of inductors only (node 'm' meets the rest of the circuit only through them): the current of L1 is fixed by L2, so the circuit has one state fewer",
    );
    expect(s.summary).toBe('2 capacitors + 2 inductors − 1 capacitor loop − 1 inductor cut-set = 2 states');
    const v = describeStructure(load(CIRCUITS['capacitor straight across a voltage source']!.body));
    expect(v.capacitorLoops[0]!.explanation).toContain('a loop of capacitors and voltage sources only');
    const i = describeStructure(load(CIRCUITS['inductor in series with a current source']!.body));
    expect(i.inductorCutSets[0]!.explanation).toContain('a cut-set of inductors and current sources only');
  });

  it('lists dangling nodes with the part that touches them', () => {
    const s = describeStructure(
      load('voltage-source V1 in -> gnd step to 1V\nresistor R1 in -> a 1k\ncapacitor C1 a -> gnd 1uF\nresistor R9 a -> nowhere 1k\n'),
    );
    expect(s.danglingNodes).toEqual([{ node: 'nowhere', part: 'R9' }]);
    expect(describeStructure(load(CIRCUITS['RC low-pass']!.body)).danglingNodes).toEqual([]);
  });

  it('takes switches in their position at the chosen time (an opened switch leaves an inductor alone)', () => {
    const body =
      'voltage-source V1 in -> gnd step to 1V\nresistor R1 in -> m 1k\ninductor L1 m -> a 1mH\n' +
      'switch S1 a -> gnd on 1ohm starts closed opens 0.5ms\nresistor R2 m -> gnd 1k\ncapacitor C1 m -> gnd 1uF\n';
    const c = load(body);
    const before = describeStructure(c);
    expect(before.switches).toEqual({ at: 0, closed: ['S1'], open: [], absent: [] });
    expect(before.expectedStates).toBe(2);
    const after = describeStructure(c, { at: Infinity });
    expect(after.switches).toEqual({ at: Infinity, closed: [], open: [], absent: ['S1'] });
    expect(after.inductorCutSets.map((k) => k.parts)).toEqual([['L1']]);
    expect(after.inductorCutSets[0]!.explanation).toBe("L1 alone forms a cut-set (node 'a' meets the rest of the circuit only through L1): its current is held at zero, so the circuit has one state fewer");
    // RunResult.states are those of the configuration in force at the end of the span
    expect(analyzeText(body + TAIL, 'structure.rdn').states.length).toBe(after.expectedStates);
    // with a finite off resistance the open switch is a resistor and nothing is lost
    const leaky = describeStructure(load(body.replace('on 1ohm', 'on 1ohm off 1Mohm')), { at: Infinity });
    expect(leaky.switches.open).toEqual(['S1']);
    expect(leaky.expectedStates).toBe(2);
  });
});
