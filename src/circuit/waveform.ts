import type { KeyArg, TermNode, WaveformNode } from '../netlist/ast.js';
import { raise } from '../netlist/errors.js';
import type { Waveform, WaveTerm } from './circuit.js';
import { compileTimeFunction, evaluateFor, type EvalContext } from './evaluate.js';
import { readTableFile } from './table-file.js';
import { PLACES, type Place } from './units.js';

type Source = 'voltage-source' | 'current-source';

/** Turns a source's waveform syntax into SI terms; level units follow the source kind. */
export function elaborateWaveform(node: WaveformNode, source: Source, designator: string, ctx: EvalContext): Waveform | undefined {
  const terms: WaveTerm[] = [];
  let ok = true;
  for (const t of node.terms) {
    const term = elaborateTerm(t, source, designator, ctx);
    if (term) terms.push(term);
    else ok = false;
  }
  return ok ? { terms } : undefined;
}

/** Reads a term's keyword arguments; any problem is raised and remembered in `ok`. */
class Args {
  ok = true;
  constructor(
    private readonly args: readonly KeyArg[],
    /** "V1's step", for messages. */
    private readonly whose: string,
    private readonly ctx: EvalContext,
  ) {}

  find(key: string): KeyArg | undefined {
    return this.args.find((a) => a.key === key);
  }

  /** The argument's SI value, `fallback` when absent, NaN (with `ok` cleared) when wrong. */
  num(key: string, place: Place, fallback: number, check?: Check): number {
    const arg = this.find(key);
    if (!arg) return fallback;
    const v = evaluateFor(arg.value, place, `'${key}' of ${this.whose}`, this.ctx);
    if (v === undefined) return this.bad();
    const problem = check?.(v, key);
    if (problem) return this.bad(arg.value.loc, problem, place);
    return v;
  }

  bad(loc?: KeyArg['keyLoc'], message?: string, place?: Place): number {
    if (loc && message) raise(this.ctx.sink, 'error', loc, message, place ? { expected: `${place.what} such as ${place.example}` } : {});
    this.ok = false;
    return NaN;
  }
}

/** Returns a message when the value is out of range. */
type Check = (v: number, key: string) => string | undefined;

const notNegative: Check = (v, key) => (v < 0 ? `'${key}' cannot be negative (got ${v} s)` : undefined);
const positive =
  (unit: string): Check =>
  (v, key) =>
    v > 0 ? undefined : `'${key}' must be greater than zero (got ${v}${unit ? ' ' + unit : ''})`;

function elaborateTerm(t: TermNode, source: Source, designator: string, ctx: EvalContext): WaveTerm | undefined {
  const volts = source === 'voltage-source';
  const level = volts ? PLACES.voltage : PLACES.current;
  if (t.kind === 'constant') {
    const value = evaluateFor(t.value, level, `the level of ${designator}`, ctx);
    return value === undefined ? undefined : { kind: 'constant', value };
  }

  const a = new Args(t.args, `${designator}'s ${t.kind}`, ctx);
  const time = PLACES.time;
  const delay = a.num('delay', time, 0, notNegative);
  let term: WaveTerm | undefined;
  switch (t.kind) {
    case 'step': {
      const from = a.num('from', level, 0);
      const to = a.num('to', level, 0);
      const at = a.num('at', time, 0, notNegative);
      const rise = a.num('rise', time, 0, notNegative);
      term = { kind: 'step', from, to, at: at + delay, rise };
      break;
    }
    case 'impulse': {
      const area = evaluateFor(t.area, volts ? PLACES.voltageArea : PLACES.currentArea, `the area of ${designator}'s impulse`, ctx);
      const at = a.num('at', time, 0, (v) => (v < 0 ? `an impulse cannot come before t = 0 (got ${v} s)` : undefined));
      if (area === undefined) a.bad();
      term = { kind: 'impulse', area: area ?? NaN, at: at + delay };
      break;
    }
    case 'ramp': {
      const at = a.num('at', time, 0, notNegative);
      const slope = a.num('rate', volts ? PLACES.voltageRate : PLACES.currentRate, 0);
      const until = a.num('until', time, Infinity, (v) => (v > at ? undefined : `the ramp must end after it starts at ${at} s (got 'until' ${v} s)`));
      term = { kind: 'ramp', at: at + delay, slope, until: until + delay };
      break;
    }
    case 'approach': {
      const from = a.num('from', level, 0);
      const to = a.num('to', level, 0);
      const at = a.num('at', time, 0, notNegative);
      const tau = a.num('tau', time, 0, positive('s'));
      term = { kind: 'approach', from, to, at: at + delay, tau };
      break;
    }
    case 'sine':
      term = sine(a, level, delay, ctx);
      break;
    case 'pulse':
      term = pulse(a, t.loc, level, delay, ctx);
      break;
    case 'table': {
      const points = t.file ? readTableFile(t.file.path, t.file.loc, ctx) : inlineTable(t.points, level, designator, ctx);
      if (!points) a.bad();
      term = { kind: 'table', points: (points ?? []).map((p) => ({ t: p.t + delay, v: p.v })) };
      break;
    }
    case 'expression': {
      const fn = compileTimeFunction(t.text, t.textLoc, ctx);
      if (!fn) a.bad();
      term = { kind: 'expression', text: t.text, fn: delay === 0 || !fn ? (fn ?? (() => NaN)) : (time) => fn(time - delay) };
      break;
    }
  }
  return a.ok ? term : undefined;
}

function sine(a: Args, level: Place, delay: number, ctx: EvalContext): WaveTerm {
  const amplitude = a.find('rms') ? a.num('rms', level, 0) * Math.SQRT2 : a.num('amplitude', level, 0);
  const freq = a.find('period') ? 1 / a.num('period', PLACES.time, 1, positive('s')) : a.num('freq', PLACES.frequency, 1, positive('Hz'));
  const phaseArg = a.find('phase');
  // A bare number here would silently mean radians; make the unit explicit.
  if (phaseArg?.value.kind === 'literal' && phaseArg.value.unit === null && phaseArg.value.value !== 0) {
    raise(ctx.sink, 'error', phaseArg.value.loc, 'a phase needs its unit: deg or rad', {
      expected: `a phase such as ${phaseArg.value.text}deg or ${phaseArg.value.text}rad`,
    });
    a.bad();
  }
  const phase = a.num('phase', PLACES.phase, 0);
  const at = a.num('at', PLACES.time, 0, notNegative);
  const decay = a.num('decay', PLACES.time, Infinity, positive('s'));
  return { kind: 'sine', amplitude, freq, phase, at: at + delay, decay };
}

function pulse(a: Args, loc: KeyArg['keyLoc'], level: Place, delay: number, ctx: EvalContext): WaveTerm {
  const time = PLACES.time;
  const low = a.num('from', level, 0);
  const high = a.num('to', level, 0);
  const period = a.find('freq') ? 1 / a.num('freq', PLACES.frequency, 1, positive('Hz')) : a.num('period', time, 1, positive('s'));
  const width = a.find('duty')
    ? a.num('duty', PLACES.duty, 0, (v) =>
        v > 0 && v <= 1 ? undefined : `the duty cycle must be more than 0% and at most 100% (got ${+(v * 100).toPrecision(12)}%)`,
      ) * period
    : a.num('width', time, 0, notNegative);
  const rise = a.num('rise', time, 0, notNegative);
  const fall = a.num('fall', time, 0, notNegative);
  const start = a.num('start', time, 0, notNegative);
  const cycles = a.num('cycles', PLACES.count, Infinity, (v) => (Number.isInteger(v) && v > 0 ? undefined : `'cycles' must be a whole number of at least 1 (got ${v})`));
  if (a.ok) {
    const busy = rise + width + fall;
    if (busy === 0) {
      raise(ctx.sink, 'error', loc, 'this pulse has no length: its width, rise and fall are all zero', { expected: 'pulse to 5V period 1ms width 200us' });
      a.bad();
    } else if (busy > period * (1 + 1e-12)) {
      raise(ctx.sink, 'error', loc, `rise + width + fall (${busy} s) is longer than the period (${period} s)`, {
        hint: 'shorten the width or the edges, or lengthen the period',
      });
      a.bad();
    }
  }
  return { kind: 'pulse', low, high, period, width, rise, fall, start: start + delay, cycles };
}

function inlineTable(points: Extract<TermNode, { kind: 'table' }>['points'], level: Place, designator: string, ctx: EvalContext): { t: number; v: number }[] | undefined {
  const out: { t: number; v: number }[] = [];
  let ok = true;
  for (const p of points) {
    const t = evaluateFor(p.t, PLACES.time, `a time in ${designator}'s table`, ctx);
    const v = evaluateFor(p.v, level, `a value in ${designator}'s table`, ctx);
    if (t === undefined || v === undefined) {
      ok = false;
      continue;
    }
    const prev = out[out.length - 1];
    if (prev && !(t > prev.t)) {
      raise(ctx.sink, 'error', p.t.loc, `table times must increase: ${t} s does not come after ${prev.t} s`);
      ok = false;
      continue;
    }
    out.push({ t, v });
  }
  if (ok && out.length < 2) {
    raise(ctx.sink, 'error', points[0]!.t.loc, 'a table needs at least two points', { expected: 'table 0 0V, 1ms 5V', hint: 'for a constant level write the value alone' });
    ok = false;
  }
  return ok ? out : undefined;
}
