import type { RunResult } from '../simulate/result.js';
import { formatPlain, formatSI } from './si.js';
import { heading } from './table.js';
import { wrapWords } from './wrap.js';

const WIDTH = 80;

/**
 * "Periodic steady state": when the sources repeat from some time on, the state the circuit
 * settles into, one period of it per watch (min, max, mean, RMS, peak-to-peak ripple), and how many
 * periods each signal takes to stay within its settling band. Empty without a periodic result.
 */
export function periodicSection(result: RunResult): string[] {
  const p = result.periodic;
  if (!p) return [];
  const out = heading('Periodic steady state');
  out.push(
    ...wrapWords(
      `  the sources repeat every ${formatSI(p.period, 's')} from t = ${formatSI(p.from, 's')}; over one period of the steady state:`,
      WIDTH,
      '    ',
    ),
  );
  const band = result.circuit.analysis.settle;
  const bandText = band.kind === 'relative' ? `±${formatPlain(band.fraction * 100, 4)} %` : `±${formatPlain(band.value, 6)}`;
  for (const w of p.watches) {
    const unit = result.traces.find((t) => t.label === w.label)?.unit ?? '';
    const f = (x: number) => formatSI(x, unit);
    const settle =
      w.settledAfterPeriods === null
        ? `does not settle within the ${bandText} band`
        : `within the ${bandText} settling band after ${w.settledAfterPeriods} period${w.settledAfterPeriods === 1 ? '' : 's'}`;
    out.push(
      ...wrapWords(
        `  ${w.label}: min ${f(w.min)}, max ${f(w.max)}, mean ${f(w.mean)}, RMS ${f(w.rms)}, ripple ${f(w.max - w.min)} peak to peak; ${settle}`,
        WIDTH,
        '    ',
      ),
    );
  }
  return out;
}
