import { MAX_PART_VALUE, MIN_PART_VALUE } from './limits.js';
import type { KeyArg, ValueNode } from '../netlist/ast.js';
import { raise } from '../netlist/errors.js';
import type { SourceLocation } from '../netlist/location.js';
import type { Switching } from './circuit.js';
import { evaluateFor, type EvalContext } from './evaluate.js';
import { PLACES } from './units.js';

/**
 * `switch S1 a -> b on R [off R | off open] [starts closed|open] [closes T] [opens T] [toggles T, …]`.
 * Without `starts`, a switch whose first scheduled change is `closes` starts open, one whose
 * first change is `opens` starts closed, and any other starts open.
 */
export function elaborateSwitch(args: readonly KeyArg[], name: string, ctx: EvalContext): Switching | undefined {
  const find = (key: string): KeyArg | undefined => args.find((a) => a.key === key);
  let ok = true;
  const fail = (loc: SourceLocation, message: string, hint?: string): undefined => {
    raise(ctx.sink, 'error', loc, message, { hint });
    ok = false;
    return undefined;
  };
  const resistance = (arg: KeyArg): number | undefined => {
    const r = evaluateFor(arg.value, PLACES.resistance, `the '${arg.key}' resistance of ${name}`, ctx);
    if (r === undefined) ok = false;
    else if (!(r > 0)) return fail(arg.value.loc, `the '${arg.key}' resistance of switch ${name} must be positive, got ${r}`);
    else if (!(r >= MIN_PART_VALUE && r <= MAX_PART_VALUE)) {
      return fail(arg.value.loc, `the '${arg.key}' resistance of switch ${name}, ${r} Ω, is outside the range ringdown computes with (${MIN_PART_VALUE} to ${MAX_PART_VALUE} Ω)`, arg.key === 'off' ? "for a switch that carries nothing when open, write 'off open'" : 'check the exponent and the prefix');
    }
    return r;
  };
  const eventTime = (arg: KeyArg, node: ValueNode): number | undefined => {
    const t = evaluateFor(node, PLACES.time, `'${arg.key}' of ${name}`, ctx);
    if (t === undefined) ok = false;
    else if (!(t > 0)) {
      return fail(node.loc, `a switch can change only after t = 0 (got ${t} s)`, "for the state before t = 0 write 'starts closed' or 'starts open'");
    }
    return t;
  };

  const on = resistance(find('on')!);
  const offArg = find('off');
  let off: number | undefined = Infinity;
  if (offArg) {
    const isOpen = offArg.value.kind === 'ref' && offArg.value.name === 'open' && !ctx.params.has('open');
    off = isOpen ? Infinity : resistance(offArg);
    if (on !== undefined && off !== undefined && !(off > on)) {
      fail(offArg.value.loc, `the 'off' resistance of ${name} (${off} Ω) must be larger than its 'on' resistance (${on} Ω)`);
    }
  }

  // Scheduled changes, each with where it was written.
  const toggles = find('toggles');
  const closes = find('closes');
  const opens = find('opens');
  const changes: { t: number; closed?: boolean; loc: SourceLocation; key: string }[] = [];
  if (toggles && (closes || opens)) {
    fail(toggles.keyLoc, "'toggles' cannot be combined with 'closes' or 'opens'", 'give the whole schedule as toggles, or use closes and opens');
  }
  for (const arg of [closes, opens]) {
    if (!arg) continue;
    const t = eventTime(arg, arg.value);
    if (t !== undefined) changes.push({ t, closed: arg.key === 'closes', loc: arg.value.loc, key: arg.key });
  }
  if (toggles) {
    let previous: number | undefined;
    for (const node of toggles.list ?? [toggles.value]) {
      const t = eventTime(toggles, node);
      if (t === undefined) continue;
      if (previous !== undefined && !(t > previous)) {
        fail(node.loc, `toggle times must increase: ${t} s does not come after ${previous} s`);
        continue;
      }
      previous = t;
      changes.push({ t, loc: node.loc, key: 'toggles' });
    }
  }
  changes.sort((x, y) => x.t - y.t);

  const starts = find('starts');
  const first = changes[0];
  const initiallyClosed = starts
    ? starts.value.kind === 'ref' && starts.value.name === 'closed'
    : first?.closed !== undefined
      ? !first.closed
      : false;

  const events: Switching['events'] = [];
  let state = initiallyClosed;
  for (const [i, c] of changes.entries()) {
    const prev = changes[i - 1];
    if (prev && prev.t === c.t) {
      fail(c.loc, `${name} has two changes at the same time (${c.t} s)`, `'${prev.key}' is also at ${prev.t} s`);
      continue;
    }
    const closed = c.closed ?? !state;
    if (closed === state) {
      fail(c.loc, `${name} is already ${state ? 'closed' : 'open'} at ${c.t} s, so '${c.key}' changes nothing`, starts ? `it ${state ? 'starts closed' : 'starts open'} (see 'starts')` : undefined);
      continue;
    }
    events.push({ t: c.t, closed });
    state = closed;
  }

  if (!ok || on === undefined || off === undefined) return undefined;
  return { onResistance: on, offResistance: off, initiallyClosed, events };
}
