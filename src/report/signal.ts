import type { Circuit } from '../circuit/circuit.js';
import { evaluatePieces } from '../measure/evaluate.js';
import { steadyStateLimit } from '../measure/limit.js';
import { isPeriodicSignal } from '../measure/metrics.js';
import type { Mode, PathResponse, Trace } from '../simulate/result.js';
import { renderChart } from './chart.js';
import { formatPieces, formatTerms, impulseItem, unitCoefs } from './formula.js';
import { metricsLines } from './metrics.js';
import { formatPlain, formatSI } from './si.js';
import { heading } from './table.js';
import { wrapFormula, wrapWords } from './wrap.js';
import { termLevels } from './waveform.js';
import { explainSignal } from './why.js';

export interface SignalSectionOptions {
  chart: boolean;
  color: boolean;
  width: number;
}

/** Unit of (output per unit of source): V/V and A/A are plain ratios, A/V is S, V/A is Ω. */
export function gainUnit(out: 'V' | 'A', source: 'V' | 'A'): { coef: string; label: string } {
  if (out === source) return { coef: '', label: `${out}/${source}` };
  return out === 'A' ? { coef: 'S', label: 'S' } : { coef: 'Ω', label: 'Ω' };
}

/** Relative size below which a coefficient counts as rounding noise. */
const NOISE = 1e-12;

/** Largest magnitude a source's waveform reaches (its levels and impulse areas); 0 when unknown. */
function sourceAmplitude(circuit: Circuit, name: string): number {
  const part = circuit.parts.find((p) => p.name === name);
  let amp = 0;
  for (const term of part?.waveform?.terms ?? []) for (const x of termLevels(term)) if (Number.isFinite(x)) amp += Math.abs(x);
  return amp;
}

function maxAbs(values: Float64Array): number {
  let m = 0;
  for (const x of values) if (Number.isFinite(x) && Math.abs(x) > m) m = Math.abs(x);
  return m;
}

function sourceUnit(circuit: Circuit, name: string): 'V' | 'A' {
  const part = circuit.parts.find((p) => p.name === name);
  return part?.kind === 'current-source' ? 'A' : 'V';
}

function pathLines(trace: Trace, path: PathResponse, circuit: Circuit, span: number): string[] {
  const su = sourceUnit(circuit, path.source);
  const g = gainUnit(trace.unit, su);
  const extra = path.step.stepImpulseArea !== 0 ? [impulseItem(path.step.stepImpulseArea, 0, g.coef)] : [];
  // A path coefficient times the source's size that is far below the signal itself is noise.
  const amp = sourceAmplitude(circuit, path.source);
  const floor = { value: amp > 0 ? (NOISE * maxAbs(trace.values)) / amp : 0, timeScale: span };
  const formula = formatTerms(path.step.terms, 't', unitCoefs(g.coef), extra, floor);
  const dcGain = Math.abs(path.dcGain) <= floor.value ? 0 : path.dcGain;
  const dc = Number.isFinite(dcGain)
    ? g.coef === ''
      ? `${formatPlain(dcGain, 4)} ${g.label}`
      : formatSI(dcGain, g.coef, { digits: 4, trim: true })
    : 'unbounded (the path integrates)';
  return [`    from ${path.source} (per 1 ${su} step, t > 0), DC gain ${dc}:`, ...wrapFormula('      s(t) = ', formula, 80)];
}

/** Everything about one watched signal: closed form, per-source step responses, metrics, chart. */
export function signalSection(
  trace: Trace,
  circuit: Circuit,
  times: Float64Array,
  span: number,
  opts: SignalSectionOptions,
  modes: readonly Mode[] = [],
): string[] {
  const lines = heading(`Signal ${trace.label} (${trace.unit})`);
  lines.push('  closed form:');
  if (trace.pieces.length === 0) lines.push('    not available for this signal (samples only)');
  else for (const l of formatPieces(trace.label, trace.unit, trace.pieces, span, NOISE * maxAbs(trace.values), 76)) lines.push(`    ${l}`);
  if (trace.paths.length > 0) {
    lines.push('  step response from each source (that source alone, stepping from 0 at t = 0):');
    for (const p of trace.paths) lines.push(...pathLines(trace, p, circuit, span));
  }
  lines.push('  measurements:');
  const periodic = isPeriodicSignal(times, trace.values, trace.pieces, circuit.analysis.settle);
  lines.push(...metricsLines(trace.metrics, trace.unit, circuit.analysis.settle, steadyStateLimit(trace.pieces), periodic));
  if (times.length > 0) {
    lines.push(...wrapWords(`  why: ${explainSignal(trace, modes, times[0]!, times[times.length - 1]!)}`, 80, '       '));
  }
  if (opts.chart && times.length > 1) {
    const sample = trace.pieces.length > 0 ? (t: number) => evaluatePieces(trace.pieces, t) : interpolate(times, trace.values);
    const start = times[0]!;
    const end = times[times.length - 1]!;
    lines.push('');
    const chart = renderChart([{ label: trace.label, sample }], { start, end, unit: trace.unit, color: opts.color, width: opts.width });
    lines.push(...chart.split('\n'));
  }
  return lines;
}

/** Linear interpolation of samples (for traces without a closed form). */
export function interpolate(times: Float64Array, values: Float64Array): (t: number) => number {
  return (t) => {
    const n = times.length;
    if (t <= times[0]!) return values[0]!;
    if (t >= times[n - 1]!) return values[n - 1]!;
    let lo = 0;
    let hi = n - 1;
    while (hi - lo > 1) {
      const mid = (lo + hi) >> 1;
      if (times[mid]! <= t) lo = mid;
      else hi = mid;
    }
    const u = (t - times[lo]!) / (times[hi]! - times[lo]!);
    return values[lo]! + u * (values[hi]! - values[lo]!);
  };
}
