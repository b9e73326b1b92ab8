import type { Diagnostic } from '../diagnostics.js';
import type { RunResult } from '../simulate/result.js';
import { pathTransfers } from '../lti/transfer.js';
import { traceTimeAbove } from '../measure/above.js';
import { runCautions } from '../measure/cautions.js';
import { cautionsSection } from './cautions.js';
import { crossCheckLines } from './crosscheck.js';
import { dischargeSection } from './discharge.js';
import { energySection } from './energy.js';
import { eventsSection } from './events.js';
import { modesSection } from './modes.js';
import { periodicSection } from './periodic.js';
import { SAFETY_NOTICE } from './safety.js';
import { formatPlain, formatSI, formatSIExact } from './si.js';
import { signalSection } from './signal.js';
import { ratingsSection, ratingsVerdict, stressSection } from './stress.js';
import { circuitSection } from './summary.js';
import { heading } from './table.js';
import { formatTransfers } from './transfer.js';
import { wrapWords } from './wrap.js';

export interface TextReportOptions {
  /** Draw a chart for each watched signal (default true). */
  chart?: boolean;
  /** ANSI colors (default false). */
  color?: boolean;
  /** Chart width in columns (default 80). */
  width?: number;
}

/** A warning as one line: `line 4: message (hint)`. */
export function warningLine(d: Diagnostic): string {
  const where = d.loc ? `line ${d.loc.line}: ` : '';
  return `${where}${d.message}${d.hint ? ` (${d.hint})` : ''}`;
}

/** "Transfer functions": every source → watch H(s), long lines wrapped at the terms. */
function transferLines(result: RunResult): string[] {
  const lines = formatTransfers(pathTransfers(result, { allConfigurations: true }), result.circuit);
  return lines.flatMap((l, i) => (i < 2 ? [l] : wrapWords(l, 80, '      ')));
}

/** The full human-readable report of a run. */
export function formatTextReport(result: RunResult, options: TextReportOptions = {}): string {
  const opts = { chart: options.chart ?? true, color: options.color ?? false, width: options.width ?? 80 };
  const { circuit } = result;
  const titleLines = wrapWords(`ringdown report: ${circuit.title ?? circuit.file}`, 80, '  ');
  const out: string[] = [...titleLines, '═'.repeat(Math.max(...titleLines.map((l) => [...l].length))), ''];

  out.push(...crossCheckLines(result.crossCheck, opts.color));
  out.push(...ratingsVerdict(result, opts.color), '');
  out.push(...circuitSection(circuit, result.states), '');

  const spanText = `${formatSI(result.span, 's')}${result.spanChosen ? ' (chosen from the slowest mode)' : ''}`;
  out.push(...heading('Analysis'));
  out.push(`  step response from t = 0 to ${spanText}, ${result.times.length} samples`);
  const a = circuit.analysis;
  if (a.start !== undefined) {
    // what the run used: a settled start falls back to rest when there is no operating point
    const used = result.start ?? a.start;
    const fellBack = a.start === 'settled' && used === 'rest';
    out.push(`  before t = 0: ${used === 'rest' ? `every capacitor and inductor at zero${fellBack ? ' (no DC operating point)' : ''}` : 'settled at the DC operating point'}`);
  }
  const units = [...new Set(circuit.watches.map((w) => w.unit))];
  const band =
    a.settle.kind === 'relative'
      ? `±${formatPlain(a.settle.fraction * 100, 4)} % of each signal's transition`
      : `±${units.length === 1 ? formatSIExact(a.settle.value, units[0]!) : formatPlain(a.settle.value, 6)} around each signal's final value`;
  out.push(`  settling band: ${band}`);
  out.push('');

  const configs = result.configurations ?? [];
  if (configs.length > 1) {
    // one table per switch configuration, in order of first use
    for (const c of configs) {
      const closed = c.closed.length > 0 ? `${c.closed.join(', ')} closed` : 'all switches open';
      out.push(...modesSection(c.modes, `Natural modes from t = ${formatSI(c.from, 's', { digits: 4, trim: true })} (${closed})`), '');
    }
  } else {
    out.push(...modesSection(result.modes), '');
  }
  const transfers = transferLines(result);
  if (transfers.length > 0) out.push(...transfers, '');
  const events = eventsSection(result);
  if (events.length > 0) out.push(...events, '');

  for (const [i, trace] of result.traces.entries()) {
    const measured = { ...trace, metrics: { ...trace.metrics, timeAbove: traceTimeAbove(result, i) } };
    out.push(...signalSection(measured, circuit, result.times, result.span, opts, result.modes), '');
  }

  const periodic = periodicSection(result);
  if (periodic.length > 0) out.push(...periodic, '');
  const discharge = dischargeSection(result);
  if (discharge.length > 0) out.push(...discharge, '');

  const energy = energySection(result);
  if (energy.length > 0) out.push(...energy, '');

  const stress = stressSection(result);
  if (stress.length > 0) out.push(...stress, '');
  const ratings = ratingsSection(result, opts.color);
  if (ratings.length > 0) out.push(...ratings, '');

  out.push(...cautionsSection(runCautions(result), opts.color), '');

  const warnings = circuit.warnings ?? [];
  if (warnings.length + result.notices.length > 0) {
    out.push(...heading('Notices'));
    for (const w of warnings) out.push(...wrapWords(`  - warning: ${warningLine(w)}`, 80, '    '));
    for (const n of result.notices) out.push(...wrapWords(`  - ${n}`, 80, '    '));
    out.push('');
  }

  if (!result.crossCheck.passed) out.push(...crossCheckLines(result.crossCheck, opts.color), '');
  out.push(...SAFETY_NOTICE);
  return out.join('\n') + '\n';
}
