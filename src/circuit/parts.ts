import type { Statement } from '../netlist/ast.js';
import { raise } from '../netlist/errors.js';
import { GROUND, type Part } from './circuit.js';
import { evaluateFor, type EvalContext } from './evaluate.js';
import { elaborateRatings } from './ratings.js';
import { PLACES } from './units.js';
import { elaborateSwitch } from './switch.js';
import { elaborateWaveform } from './waveform.js';
import { MAX_PART_VALUE, MIN_PART_VALUE } from './limits.js';

const UNIT_OF: Record<string, string> = { resistor: 'Ω', capacitor: 'F', inductor: 'H' };

type PartStatement = Extract<Statement, { kind: 'part' }>;

const VALUE_PLACE = {
  resistor: PLACES.resistance,
  capacitor: PLACES.capacitance,
  inductor: PLACES.inductance,
} as const;

/**
 * Checks one part statement against the parts seen so far and converts it. Returns undefined when
 * the part is unusable; errors are already raised.
 */
export function elaboratePart(st: PartStatement, earlier: ReadonlyMap<string, Part>, ctx: EvalContext): Part | undefined {
  const name = st.name.name;
  let ok = true;
  const first = earlier.get(name);
  if (first) {
    raise(ctx.sink, 'error', st.name.loc, `designator '${name}' is already used by the ${first.kind} on line ${first.loc.line}`, {
      hint: `line ${first.loc.line}, column ${first.loc.col} declares ${name} first; give one of them another name`,
    });
    ok = false;
  }
  if (st.a.name === st.b.name) {
    const where = st.a.name === GROUND ? 'ground' : `node '${st.a.name}'`;
    raise(ctx.sink, 'error', { ...st.a.loc, length: st.b.loc.col + st.b.loc.length - st.a.loc.col }, `both terminals of ${name} are on ${where}`, {
      hint: 'a part must connect two different nodes',
    });
    ok = false;
  }

  const part: Part = { kind: st.part, name, a: st.a.name, b: st.b.name, value: 0, loc: st.loc };
  if (st.rated) {
    const ratings = elaborateRatings(st.rated, st.part, name, ctx);
    if (ratings) part.ratings = ratings;
    else ok = false;
  }
  if (st.part === 'voltage-source' || st.part === 'current-source') {
    const waveform = st.waveform && elaborateWaveform(st.waveform, st.part, name, ctx);
    if (!waveform) return undefined;
    part.waveform = waveform;
  } else if (st.part === 'switch') {
    const switching = st.switching && elaborateSwitch(st.switching, name, ctx);
    if (!switching) return undefined;
    part.switching = switching;
    part.value = switching.onResistance;
  } else if (st.value) {
    const value = evaluateFor(st.value, VALUE_PLACE[st.part], `the value of ${name}`, ctx);
    if (value === undefined) ok = false;
    else if (!(value > 0)) {
      raise(ctx.sink, 'error', st.value.loc, `the value of ${st.part} ${name} must be positive, got ${value}`, {
        expected: `${VALUE_PLACE[st.part].what} greater than zero, such as ${VALUE_PLACE[st.part].example}`,
      });
      ok = false;
    } else if (!(value >= MIN_PART_VALUE && value <= MAX_PART_VALUE)) {
      raise(ctx.sink, 'error', st.value.loc, `the value of ${st.part} ${name}, ${value} ${UNIT_OF[st.part]}, is outside the range ringdown computes with (${MIN_PART_VALUE} to ${MAX_PART_VALUE} ${UNIT_OF[st.part]})`, {
        expected: `${VALUE_PLACE[st.part].what} such as ${VALUE_PLACE[st.part].example}`,
        hint: 'check the exponent and the prefix',
      });
      ok = false;
    } else part.value = value;
    if (st.initial) {
      const place = st.part === 'capacitor' ? PLACES.voltage : PLACES.current;
      const initial = evaluateFor(st.initial, place, `the initial ${place.what.replace(/^an? /, '')} of ${name}`, ctx);
      if (initial === undefined) ok = false;
      else if (!(Math.abs(initial) <= MAX_PART_VALUE)) {
        const unit = st.part === 'capacitor' ? 'V' : 'A';
        raise(ctx.sink, 'error', st.initial.loc, `the initial value of ${name}, ${initial} ${unit}, is larger than ringdown computes with (at most ${MAX_PART_VALUE} ${unit} in size)`, { hint: 'check the exponent and the prefix' });
        ok = false;
      } else part.initial = initial;
    }
  }
  return ok ? part : undefined;
}
