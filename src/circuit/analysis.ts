import type { Statement } from '../netlist/ast.js';
import { raise } from '../netlist/errors.js';
import type { Analysis } from './circuit.js';
import { evaluateFor, evaluateValue, type EvalContext } from './evaluate.js';
import { UNIT_NAMES } from '../netlist/quantity.js';
import { PLACES } from './units.js';
import { MIN_SPAN } from './limits.js';

type AnalysisStatement = Extract<Statement, { kind: 'span' | 'samples' | 'settle' | 'derate' | 'start' }>;

export const DEFAULT_SAMPLES = 1001;
export const MIN_SAMPLES = 2;
export const MAX_SAMPLES = 1_000_000;
export const DEFAULT_SETTLE_FRACTION = 0.02;
/** Fraction of a rating a part may use before the report flags it. */
export const DEFAULT_DERATING = 0.8;

/** Applies span / samples / settle / derate / start statements (each at most once) over the defaults. */
export function elaborateAnalysis(statements: readonly AnalysisStatement[], ctx: EvalContext): Analysis {
  const analysis: Analysis = { samples: DEFAULT_SAMPLES, settle: { kind: 'relative', fraction: DEFAULT_SETTLE_FRACTION }, start: 'settled', derating: DEFAULT_DERATING };
  const seen = new Map<string, AnalysisStatement>();
  for (const st of statements) {
    const first = seen.get(st.kind);
    if (first) {
      raise(ctx.sink, 'error', st.loc, `'${st.kind}' is given twice`, { hint: `the first '${st.kind}' is on line ${first.loc.line}` });
      continue;
    }
    seen.set(st.kind, st);
    if (st.kind === 'span') {
      const span = evaluateFor(st.value, PLACES.time, 'span', ctx);
      if (span === undefined) continue;
      if (!(span > 0)) raise(ctx.sink, 'error', st.value.loc, `span must be a positive time, got ${span} s`, { expected: 'a time such as 10ms' });
      else if (span < MIN_SPAN) raise(ctx.sink, 'error', st.value.loc, `span must be at least ${MIN_SPAN} s, got ${span} s`, { expected: 'a time such as 10ms' });
      else analysis.span = span;
    } else if (st.kind === 'samples') {
      const n = evaluateFor(st.value, PLACES.count, 'samples', ctx);
      if (n === undefined) continue;
      if (!Number.isInteger(n) || n < MIN_SAMPLES || n > MAX_SAMPLES) {
        raise(ctx.sink, 'error', st.value.loc, `samples must be a whole number from ${MIN_SAMPLES} to ${MAX_SAMPLES}, got ${n}`, {
          expected: `a whole number such as ${DEFAULT_SAMPLES}`,
        });
      } else analysis.samples = n;
    } else if (st.kind === 'derate') {
      const derating = deratingOf(st, ctx);
      if (derating !== undefined) analysis.derating = derating;
    } else if (st.kind === 'start') {
      analysis.start = st.mode;
    } else {
      const band = settleBand(st, ctx);
      if (band) analysis.settle = band;
    }
  }
  return analysis;
}

/** `2%` is relative to the final transition; `50mV` / `10mA` is absolute. A bare number is ambiguous. */
function settleBand(st: Extract<AnalysisStatement, { kind: 'settle' }>, ctx: EvalContext): Analysis['settle'] | undefined {
  const q = evaluateValue(st.value, ctx);
  if (!q) return undefined;
  const expected = 'a percentage such as 2%, or an absolute band such as 50mV or 10mA';
  if (q.unit === null || !PLACES.band.units.includes(q.unit)) {
    raise(ctx.sink, 'error', st.value.loc, q.unit === null ? 'settle needs a unit: % for a relative band, V or A for an absolute one' : `settle cannot be given in ${q.unit}`, { expected });
    return undefined;
  }
  if (!(q.value > 0)) {
    raise(ctx.sink, 'error', st.value.loc, 'the settling band must be greater than zero', { expected });
    return undefined;
  }
  return q.unit === '%' ? { kind: 'relative', fraction: q.value } : { kind: 'absolute', value: q.value };
}

/** `derate 80%`: the fraction of each rating a part may use, in (0, 100%]; the % is required. */
function deratingOf(st: Extract<AnalysisStatement, { kind: 'derate' }>, ctx: EvalContext): number | undefined {
  const q = evaluateValue(st.value, ctx);
  if (!q) return undefined;
  const expected = 'a percentage of the rating, more than 0% and at most 100%, such as 80%';
  if (q.unit !== '%') {
    raise(ctx.sink, 'error', st.value.loc, q.unit === null ? 'derate needs the % sign' : `derate cannot be given in ${UNIT_NAMES[q.unit]}`, {
      expected,
      hint: q.unit === null && q.value > 0 && q.value <= 1 ? `for ${q.value} of the rating write ${formatPercent(q.value)}` : undefined,
    });
    return undefined;
  }
  if (!(q.value > 0 && q.value <= 1)) {
    raise(ctx.sink, 'error', st.value.loc, `derate must be more than 0% and at most 100%, got ${formatPercent(q.value)}`, { expected });
    return undefined;
  }
  return q.value;
}

/** 0.8 → "80%", without binary noise (0.07 → "7%", not "7.000000000000001%"). */
function formatPercent(fraction: number): string {
  return `${Number((fraction * 100).toPrecision(12))}%`;
}
