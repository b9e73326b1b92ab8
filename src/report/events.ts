import type { RunResult } from '../simulate/result.js';
import { formatSI } from './si.js';
import { heading } from './table.js';

type RunEvent = NonNullable<RunResult['events']>[number];

function eventLines(e: RunEvent, hasSwitches: boolean): string[] {
  // an instant without switches is the start itself (stored charges shared at t = 0)
  const closed = e.closed.length > 0 ? `closed switches: ${e.closed.join(', ')}` : hasSwitches ? 'all switches open' : 'the start (no switches)';
  const lines = [`  t = ${formatSI(e.t, 's')}: ${closed}`];
  for (const j of e.jumps) {
    const unit = j.kind === 'capacitor-voltage' ? 'V' : 'A';
    const what = j.kind === 'capacitor-voltage' ? `voltage of ${j.part}` : `current of ${j.part}`;
    lines.push(`    ${what} jumps from ${formatSI(j.before, unit)} to ${formatSI(j.after, unit)}`);
  }
  if (e.energyLost !== 0) lines.push(`    energy lost in the instant: ${formatSI(e.energyLost, 'J')}`);
  return lines;
}

/** Switching instants and state jumps, with the energy lost in each instant; empty when none. */
export function eventsSection(result: RunResult): string[] {
  const events = result.events ?? [];
  if (events.length === 0) return [];
  const hasSwitches = result.circuit.parts.some((p) => p.kind === 'switch');
  return [...heading('Events'), ...events.flatMap((e) => eventLines(e, hasSwitches))];
}
