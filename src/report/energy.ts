import { energyBalance, type EnergyBalance } from '../measure/energy.js';
import type { RunResult } from '../simulate/result.js';
import { formatSI } from './si.js';
import { heading, table } from './table.js';

/**
 * Energy over the span, from the per-part closed forms: delivered by the sources, turned into
 * heat, stored; the balance residual; and each part's absorbed energy. Empty when the run carries
 * no per-part closed forms.
 */
export function energySection(result: RunResult): string[] {
  if (!result.parts || result.parts.length === 0) return [];
  const out = heading('Energy over the span');
  let e: EnergyBalance;
  try {
    e = energyBalance(result.circuit, result.parts);
  } catch (err) {
    return [...out, `  not available: ${err instanceof Error ? err.message : String(err)}`];
  }
  const J = (x: number) => formatSI(Math.abs(x) <= 1e-12 * Math.max(Math.abs(e.delivered), Math.abs(e.dissipated), Math.abs(e.storedChange)) ? 0 : x, 'J');
  out.push(
    ...table([
      ['delivered by the sources', J(e.delivered)],
      ['turned into heat', J(e.dissipated)],
      ['change in stored energy', J(e.storedChange)],
      ['balance residual', e.residual.toExponential(1)],
    ]),
  );
  out.push('  absorbed by each part (negative: delivered):');
  out.push(...table(e.perPart.map((p) => [p.part, J(p.absorbed)]), '    '));
  if (result.events?.some((ev) => ev.energyLost !== 0)) out.push('  (energy lost inside switching instants is listed under Events)');
  return out;
}
