import type { RunResult } from '../simulate/result.js';

/** A CSV field, quoted when it holds a comma, quote or line break. */
export function csvField(text: string): string {
  return /[",\r\n]/.test(text) ? `"${text.replace(/"/g, '""')}"` : text;
}

/** A number with 15 significant digits, shortest form (0.001, 1.2e-7); empty when not finite. */
export function csvNumber(x: number): string {
  if (!Number.isFinite(x)) return '';
  return String(Number(x.toPrecision(15)));
}

/** Samples as CSV: `time_s,<label> (<unit>),…`, one row per sample time, watches in declaration order. */
export function formatCSV(result: RunResult): string {
  const header = ['time_s', ...result.traces.map((t) => csvField(`${t.label} (${t.unit})`))].join(',');
  const lines = [header];
  const n = result.times.length;
  for (let i = 0; i < n; i++) {
    const row = [csvNumber(result.times[i]!)];
    for (const t of result.traces) row.push(csvNumber(t.values[i]!));
    lines.push(row.join(','));
  }
  return lines.join('\n') + '\n';
}
