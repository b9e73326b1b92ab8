import type { RunResult } from '../simulate/result.js';
import { formatSI } from './si.js';
import { heading } from './table.js';
import { wrapWords } from './wrap.js';

const WIDTH = 80;

/**
 * "Discharge after the sources are removed": per capacitor, how long it takes to fall below the
 * safe voltage once every source is taken away at the end of the span (switches staying as they
 * are), or that nothing discharges it. Empty when the circuit has no capacitor.
 */
export function dischargeSection(result: RunResult): string[] {
  const list = result.discharge ?? [];
  if (list.length === 0) return [];
  const out = heading('Discharge after the sources are removed');
  const safe = formatSI(list[0]!.safeVoltage, 'V', { trim: true });
  out.push(...wrapWords(`  the sources are taken away at the end of the span (switches stay as they are); time until each capacitor stays below ${safe}:`, WIDTH, '    '));
  if (list.every((d) => d.time === 0)) {
    out.push(`  every capacitor is already below ${safe} then.`);
    return out;
  }
  for (const d of list) {
    const from = formatSI(d.from, 'V');
    const text =
      d.time === null && Math.abs(d.from) < d.safeVoltage
        ? `${d.part}: ${from}, below ${formatSI(d.safeVoltage, 'V', { trim: true })}, but nothing discharges it (it keeps its charge)`
        : d.time === null
        ? `${d.part}: from ${from}, no discharge path (it never falls below ${formatSI(d.safeVoltage, 'V', { trim: true })})`
        : d.time === 0
          ? `${d.part}: ${from}, already below ${formatSI(d.safeVoltage, 'V', { trim: true })}`
          : `${d.part}: from ${from}, below ${formatSI(d.safeVoltage, 'V', { trim: true })} after ${formatSI(d.time, 's')}`;
    out.push(...wrapWords(`  ${text}`, WIDTH, '    '));
  }
  return out;
}
