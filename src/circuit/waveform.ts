import type { StepArg, WaveformNode } from '../netlist/ast.js';
import { raise } from '../netlist/errors.js';
import type { Waveform, WaveTerm } from './circuit.js';
import { evaluateFor, type EvalContext } from './evaluate.js';
import { PLACES, type Place } from './units.js';

/** Turns a source's waveform syntax into SI terms; level units follow the source kind. */
export function elaborateWaveform(
  node: WaveformNode,
  source: 'voltage-source' | 'current-source',
  designator: string,
  ctx: EvalContext,
): Waveform | undefined {
  const level = source === 'voltage-source' ? PLACES.voltage : PLACES.current;
  const area = source === 'voltage-source' ? PLACES.voltageArea : PLACES.currentArea;
  const terms: WaveTerm[] = [];
  let ok = true;
  for (const t of node.terms) {
    if (t.kind === 'constant') {
      const value = evaluateFor(t.value, level, `the level of ${designator}`, ctx);
      if (value === undefined) ok = false;
      else terms.push({ kind: 'constant', value });
    } else if (t.kind === 'step') {
      const get = (key: StepArg['key'], place: Place, fallback: number): number | undefined => {
        const arg = t.args.find((a) => a.key === key);
        return arg ? evaluateFor(arg.value, place, `'${key}' of ${designator}'s step`, ctx) : fallback;
      };
      const from = get('from', level, 0);
      const to = get('to', level, 0);
      const at = nonNegativeTime(get('at', PLACES.time, 0), t.args.find((a) => a.key === 'at'), ctx);
      const rise = nonNegativeTime(get('rise', PLACES.time, 0), t.args.find((a) => a.key === 'rise'), ctx);
      if (from === undefined || to === undefined || at === undefined || rise === undefined) ok = false;
      else terms.push({ kind: 'step', from, to, at, rise });
    } else {
      const a = evaluateFor(t.area, area, `the area of ${designator}'s impulse`, ctx);
      let at: number | undefined = 0;
      if (t.at) {
        at = evaluateFor(t.at, PLACES.time, `'at' of ${designator}'s impulse`, ctx);
        if (at !== undefined && at < 0) {
          raise(ctx.sink, 'error', t.at.loc, `an impulse cannot come before t = 0 (got ${at} s)`);
          at = undefined;
        }
      }
      if (a === undefined || at === undefined) ok = false;
      else terms.push({ kind: 'impulse', area: a, at });
    }
  }
  return ok ? { terms } : undefined;
}

/** The analysis starts at t = 0, so step times and rise times cannot be negative. */
function nonNegativeTime(value: number | undefined, arg: StepArg | undefined, ctx: EvalContext): number | undefined {
  if (value === undefined || value >= 0 || !arg) return value;
  raise(ctx.sink, 'error', arg.value.loc, `'${arg.key}' cannot be negative (got ${value} s)`, {
    expected: 'a time of 0 or more, such as 1ms',
  });
  return undefined;
}
