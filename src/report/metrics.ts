import type { SettleBand } from '../circuit/circuit.js';
import type { Metrics } from '../simulate/result.js';
import { formatPlain, formatSI } from './si.js';
import { table } from './table.js';

/** A percentage with 4 significant digits (16.30, 0.5000), whole numbers from 10 000 on. */
function percent(x: number): string {
  if (x === 0) return '0';
  return Math.abs(x) >= 1e-3 && Math.abs(x) < 1e4 ? x.toPrecision(4) : formatPlain(x, 4);
}

/**
 * The metrics of one signal as a two-column block. `periodic`: the signal keeps swinging to the
 * end of the span, so overshoot, rise and settling give way to one line saying so.
 */
export function metricsLines(m: Metrics, unit: string, band: SettleBand, limit: number | null = null, periodic = false): string[] {
  // Values this far below the signal's size are rounding noise: show them as 0.
  const scale = Math.max(Math.abs(m.peak.value), Math.abs(m.valley.value), Math.abs(m.initial), Math.abs(m.final));
  const v = (x: number) => formatSI(Math.abs(x) <= 1e-12 * scale ? 0 : x, unit);
  const t = (x: number) => formatSI(x, 's');
  const none = 'none (no transition)';
  const bandText = band.kind === 'relative' ? `±${formatPlain(band.fraction * 100, 4)} %` : `±${formatSI(band.value, unit, { digits: 4, trim: true })}`;
  const rows: string[][] = [
    ['initial (t = 0+)', v(m.initial)],
    [m.finalIsLimit ? 'final (steady state)' : 'final (end of span)', v(m.final)],
    ...(limit !== null && !m.finalIsLimit ? [['steady state (t → ∞)', v(limit)]] : []),
    ['peak', `${v(m.peak.value)} at t = ${t(m.peak.time)}`],
    ['valley', `${v(m.valley.value)} at t = ${t(m.valley.time)}`],
    ['overshoot', m.overshootPct === null ? none : `${percent(m.overshootPct)} %`],
    ...(m.undershootPct === undefined ? [] : [['undershoot (before 50 %)', m.undershootPct === null ? none : `${percent(m.undershootPct)} %`]]),
    [m.final < m.initial ? 'fall time (90 → 10 %)' : 'rise time (10 → 90 %)', m.riseTime === null ? none : t(m.riseTime)],
    ...(m.delay50 === undefined ? [] : [['50 % delay', m.delay50 === null ? none : t(m.delay50)]]),
    [`settling time (${bandText})`, m.settlingTime === null ? none : `t = ${t(m.settlingTime)}`],
  ];
  if (periodic) {
    const n = 3 + (m.delay50 === undefined ? 0 : 1) + (m.undershootPct === undefined ? 0 : 1);
    rows.splice(rows.length - n, n, ['overshoot, rise, delay, settling', 'no single transition (periodic)']);
  }
  rows.push(...shapeRows(m, unit, v, t));
  const lines = table(rows, '    ');
  lines.push(...eventLines(m, v, t));
  if (periodic) return lines;
  if (limit !== null && !m.finalIsLimit) {
    const half = band.kind === 'relative' ? band.fraction * Math.abs(m.final - m.initial) : band.value;
    if (Math.abs(limit - m.final) > Math.max(half, 1e-9 * scale)) {
      lines.push(
        '    note: the span ends before the signal has settled; the measurements above',
        '    take the end-of-span value as final. A longer span (--span) shows more.',
      );
    }
  }
  return lines;
}

/**
 * The closed-form shape measurements (when the run has them): ringing from the dominant mode,
 * the steepest slope, average and RMS over the span, and the time above the watch's threshold.
 */
function shapeRows(m: Metrics, unit: string, v: (x: number) => string, t: (x: number) => string): string[][] {
  const rows: string[][] = [];
  if (m.ringingHz !== undefined) {
    rows.push([
      'ringing (from its mode)',
      m.ringingHz === null || m.logDecrement === null || m.logDecrement === undefined
        ? 'none'
        : `${formatSI(m.ringingHz, 'Hz')}, log decrement ${formatPlain(m.logDecrement, 4)}`,
    ]);
  }
  if (m.maxSlope !== undefined) {
    rows.push(['steepest slope |dy/dt|', m.maxSlope === null ? 'n/a (no closed form)' : `${formatSI(m.maxSlope.value, `${unit}/s`)} at t = ${t(m.maxSlope.time)}`]);
  }
  if (m.average !== undefined && m.rms !== undefined) {
    rows.push(['average, RMS (span)', m.average === null || m.rms === null ? 'n/a (no closed form)' : `${v(m.average)}, ${m.rms === Infinity ? 'unbounded (impulse)' : v(m.rms)}`]);
  }
  if (m.timeAbove) {
    const a = m.timeAbove;
    const crossings = a.first === null || a.last === null ? 'no crossing' : a.first === a.last ? `crosses at t = ${t(a.first)}` : `crossings from t = ${t(a.first)} to ${t(a.last)}`;
    rows.push([`time above ${formatSI(a.threshold, unit, { digits: 4, trim: true })}`, `${t(a.total)}, ${crossings}`]);
  }
  return rows;
}

/** Events listed in the text report; the rest are counted. */
export const TEXT_EVENTS = 8;

/**
 * Per-event overshoot and undershoot as a compact table (see `Metrics.events`): only for a
 * signal with two or more events (one event is the whole-signal overshoot above), the first
 * `TEXT_EVENTS` of them, and a line counting the rest.
 */
function eventLines(m: Metrics, v: (x: number) => string, t: (x: number) => string): string[] {
  const events = m.events ?? [];
  if (events.length < 2) return [];
  const rows = [
    ['event at', 'from', 'to', 'overshoot', 'undershoot'],
    ...events.slice(0, TEXT_EVENTS).map((e) => [`t = ${t(e.t)}`, v(e.from), v(e.to), `${percent(e.overshootPct)} %`, `${percent(e.undershootPct)} %`]),
  ];
  const lines = ['    per event (transition to the value before the next event):', ...table(rows, '      ')];
  const more = events.length - TEXT_EVENTS;
  if (more > 0) lines.push(`      … and ${more} more event${more === 1 ? '' : 's'} (all in --format json and numbers)`);
  return lines;
}
