import asciichart from 'asciichart';
import { paint, visibleWidth } from './color.js';
import { formatSI } from './si.js';
import { niceTicks } from './ticks.js';

/**
 * Terminal line chart of one or more signals against time: SI-labelled value axis on the left, a
 * time axis with SI-labelled ticks below, a legend, at most `width` columns (default 80).
 */
export interface ChartTrace {
  label: string;
  /** The signal at time t (seconds). */
  sample: (t: number) => number;
}

export interface ChartOptions {
  start: number;
  end: number;
  /** Unit of the value axis ('V', 'A' or '' when traces mix units). */
  unit: string;
  /** Total width in columns (default 80). */
  width?: number;
  /** Number of rows between the lowest and highest label (default 12). */
  height?: number;
  color?: boolean;
}

const TRACE_COLORS = [asciichart.cyan, asciichart.magenta, asciichart.yellow, asciichart.green, asciichart.blue, asciichart.red];
const LINE = '───';

export function renderChart(traces: readonly ChartTrace[], options: ChartOptions): string {
  const totalWidth = options.width ?? 80;
  const height = options.height ?? 12;
  const color = options.color ?? false;
  const { start, end, unit } = options;
  if (traces.length === 0) return '';

  // Sample, size the value labels, and narrow the plot until labels and plot fit the width.
  let cols = Math.max(8, totalWidth - 12);
  let data: number[][] = [];
  let lo = Infinity;
  let hi = -Infinity;
  let flat = true;
  let labelW = 0;
  const labelAt = (x: number) => {
    const v = flat ? lo : lo + (x / height) * (hi - lo);
    // a label within rounding noise of zero is zero
    return formatSI(Math.abs(v) <= 1e-9 * Math.max(Math.abs(lo), Math.abs(hi)) ? 0 : v, unit, { digits: 3 });
  };
  for (let attempt = 0; attempt < 4; attempt++) {
    data = sampleAll(traces, start, end, cols);
    lo = Math.min(...data.map((r) => Math.min(...r)));
    hi = Math.max(...data.map((r) => Math.max(...r)));
    flat = !(hi > lo) || hi - lo <= 1e-12 * Math.max(Math.abs(hi), Math.abs(lo));
    labelW = 0;
    for (let x = 0; x <= height; x++) labelW = Math.max(labelW, labelAt(x).length);
    const fit = Math.max(8, totalWidth - labelW - 2);
    if (fit >= cols) break;
    cols = fit;
  }

  const norm = data.map((row) => row.map((v) => (flat ? 0 : ((v - lo) / (hi - lo)) * height)));
  const plot = asciichart.plot(norm, {
    min: 0,
    max: flat ? 0 : height,
    height: flat ? 0 : height,
    offset: 3,
    colors: color ? traces.map((_, i) => TRACE_COLORS[i % TRACE_COLORS.length]!) : undefined,
    format: (x: number) => labelAt(x).padStart(labelW),
  });

  const lines = plot.split('\n').map((l) => l.trimEnd());
  const axisCol = labelW + 1; // label, one space, axis
  lines.push(...timeAxis(start, end, cols, axisCol, totalWidth));
  lines.push(legend(traces, axisCol, color));
  return lines.map((l) => l.trimEnd()).join('\n');
}

/** Finer samples looked at per chart column, so that a peak between columns still shows. */
const OVERSAMPLE = 16;

/**
 * One value per column for every trace, over [start, end]. Each column stands for a window of
 * time; a peak or dip inside the window is drawn at its extreme value, a monotone stretch by the
 * value at the column's centre. Non-finite values are patched from their neighbours.
 */
function sampleAll(traces: readonly ChartTrace[], start: number, end: number, n: number): number[][] {
  const h = n > 1 ? (end - start) / (n - 1) : 0;
  return traces.map((tr) => {
    const row: number[] = [];
    for (let k = 0; k < n; k++) {
      const tc = start + h * k;
      const center = tr.sample(tc);
      if (h === 0) {
        row.push(center);
        continue;
      }
      const t0 = Math.max(start, tc - h / 2);
      const t1 = Math.min(end, tc + h / 2);
      const a = tr.sample(t0);
      const b = tr.sample(t1);
      let lo = Math.min(a, b, center);
      let hi = Math.max(a, b, center);
      for (let j = 1; j < OVERSAMPLE; j++) {
        const v = tr.sample(t0 + ((t1 - t0) * j) / OVERSAMPLE);
        if (v < lo) lo = v;
        if (v > hi) hi = v;
      }
      const above = hi - Math.max(a, b);
      const below = Math.min(a, b) - lo;
      const tiny = 1e-9 * (Math.abs(hi) + Math.abs(lo));
      row.push(above <= tiny && below <= tiny ? center : above >= below ? hi : lo);
    }
    patchNonFinite(row);
    return row;
  });
}

function patchNonFinite(row: number[]): void {
  let last = NaN;
  for (let k = 0; k < row.length; k++) {
    if (Number.isFinite(row[k]!)) last = row[k]!;
    else row[k] = last;
  }
  let next = NaN;
  for (let k = row.length - 1; k >= 0; k--) {
    if (Number.isFinite(row[k]!)) next = row[k]!;
    else row[k] = next;
  }
  for (let k = 0; k < row.length; k++) if (!Number.isFinite(row[k]!)) row[k] = 0;
}

/** The time axis: a rule with tick marks, then the tick labels centred under the marks. */
function timeAxis(start: number, end: number, cols: number, axisCol: number, totalWidth: number): string[] {
  const rule = [...' '.repeat(axisCol) + '└' + '─'.repeat(cols - 1)];
  const labels = [...' '.repeat(totalWidth)];
  const span = end - start;
  const ticks = span > 0 ? niceTicks(start, end, Math.max(1, Math.floor(cols / 11))) : [start];
  let freeFrom = 0;
  for (const t of ticks) {
    const k = span > 0 ? Math.round(((t - start) / span) * (cols - 1)) : 0;
    const col = axisCol + k;
    if (k > 0) rule[col] = '┬';
    const text = formatSI(t, 's', { digits: 3, trim: true });
    let at = col - Math.floor(text.length / 2);
    at = Math.min(Math.max(at, 0), totalWidth - text.length);
    if (at < freeFrom) continue;
    for (let i = 0; i < text.length; i++) labels[at + i] = text[i]!;
    freeFrom = at + text.length + 1;
  }
  return [rule.join(''), labels.join('')];
}

function legend(traces: readonly ChartTrace[], indent: number, color: boolean): string {
  const items = traces.map((tr, i) => `${paint(LINE, TRACE_COLORS[i % TRACE_COLORS.length]!, color)} ${tr.label}`);
  return ' '.repeat(indent) + items.join('   ');
}

/** Widest line of a chart as shown on a terminal. */
export function chartWidth(chart: string): number {
  return Math.max(0, ...chart.split('\n').map(visibleWidth));
}
