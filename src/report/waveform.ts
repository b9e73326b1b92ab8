import type { Part, Waveform } from '../circuit/circuit.js';
import { formatSIExact } from './si.js';

/** Unit of a part's value or of a source's waveform. */
export function partUnit(part: Part): string {
  switch (part.kind) {
    case 'resistor':
      return 'Ω';
    case 'capacitor':
      return 'F';
    case 'inductor':
      return 'H';
    case 'voltage-source':
      return 'V';
    case 'current-source':
      return 'A';
  }
}

/** Plain-words name of a part kind. */
export function kindName(part: Part): string {
  return part.kind.replace('-', ' ');
}

/** A source waveform in words: `5 V + step 0 V → 7 V at 2 ms`. */
export function describeWaveform(w: Waveform | undefined, unit: string): string {
  if (!w || w.terms.length === 0) return `0 ${unit}`;
  const s = (x: number, u: string) => formatSIExact(x, u);
  return w.terms
    .map((term) => {
      switch (term.kind) {
        case 'constant':
          return s(term.value, unit);
        case 'step':
          return `step ${s(term.from, unit)} → ${s(term.to, unit)} at ${s(term.at, 's')}${term.rise > 0 ? ` over ${s(term.rise, 's')}` : ''}`;
        case 'impulse':
          return `impulse ${s(term.area, `${unit}·s`)} at ${s(term.at, 's')}`;
      }
    })
    .join(' + ');
}

/** Value text of a part: its value for passives (with the initial state), its waveform for sources. */
export function describePartValue(part: Part): string {
  const unit = partUnit(part);
  if (part.kind === 'voltage-source' || part.kind === 'current-source') return describeWaveform(part.waveform, unit);
  let text = formatSIExact(part.value, unit);
  if (part.initial !== undefined) text += `, initial ${formatSIExact(part.initial, part.kind === 'capacitor' ? 'V' : 'A')}`;
  return text;
}
