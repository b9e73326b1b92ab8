import type { Part, WaveTerm, Waveform } from '../circuit/circuit.js';
import { formatPlain, formatSIExact } from './si.js';

/** Unit of a part's value or of a source's waveform. */
export function partUnit(part: Part): string {
  switch (part.kind) {
    case 'resistor':
    case 'switch':
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

export function isSource(part: Part): boolean {
  return part.kind === 'voltage-source' || part.kind === 'current-source';
}

const s = (x: number, u: string) => formatSIExact(x, u);
const deg = (rad: number) => `${formatPlain((rad * 180) / Math.PI, 4)}°`;

/** One waveform term in words. */
export function describeTerm(term: WaveTerm, unit: string): string {
  switch (term.kind) {
    case 'constant':
      return s(term.value, unit);
    case 'step':
      return `step ${s(term.from, unit)} → ${s(term.to, unit)} at ${s(term.at, 's')}${term.rise > 0 ? ` over ${s(term.rise, 's')}` : ''}`;
    case 'impulse':
      return `impulse ${s(term.area, `${unit}·s`)} at ${s(term.at, 's')}`;
    case 'ramp':
      return `ramp ${s(term.slope, `${unit}/s`)} from ${s(term.at, 's')}${Number.isFinite(term.until) ? ` until ${s(term.until, 's')}` : ''}`;
    case 'approach':
      return `approach ${s(term.from, unit)} → ${s(term.to, unit)} from ${s(term.at, 's')}, time constant ${s(term.tau, 's')}`;
    case 'sine': {
      const decay = Number.isFinite(term.decay) ? `, decay time constant ${s(term.decay, 's')}` : '';
      const phase = term.phase !== 0 ? `, phase ${deg(term.phase)}` : '';
      return `sine ${s(term.amplitude, unit)} peak, ${s(term.freq, 'Hz')}${phase}, from ${s(term.at, 's')}${decay}`;
    }
    case 'pulse': {
      const cycles = Number.isFinite(term.cycles) ? `, ${term.cycles} cycle${term.cycles === 1 ? '' : 's'}` : '';
      return (
        `pulses ${s(term.low, unit)} ↔ ${s(term.high, unit)}, period ${s(term.period, 's')}, width ${s(term.width, 's')}, ` +
        `rise ${s(term.rise, 's')}, fall ${s(term.fall, 's')}, from ${s(term.start, 's')}${cycles}`
      );
    }
    case 'table': {
      const n = term.points.length;
      const first = term.points[0];
      const last = term.points[n - 1];
      return first && last ? `table of ${n} points from ${s(first.t, 's')} to ${s(last.t, 's')}` : 'empty table';
    }
    case 'expression':
      return `expression ${term.text}`;
  }
}

/** A source waveform in words: `5 V + step 0 V → 7 V at 2 ms`. */
export function describeWaveform(w: Waveform | undefined, unit: string): string {
  if (!w || w.terms.length === 0) return `0 ${unit}`;
  return w.terms.map((term) => describeTerm(term, unit)).join(' + ');
}

/** Levels a waveform term reaches (for judging sizes); empty when unknown (expressions). */
export function termLevels(term: WaveTerm): number[] {
  switch (term.kind) {
    case 'constant':
      return [term.value];
    case 'step':
    case 'approach':
      return [term.from, term.to];
    case 'impulse':
      return [term.area];
    case 'ramp':
      return Number.isFinite(term.until) ? [term.slope * (term.until - term.at)] : [term.slope];
    case 'sine':
      return [term.amplitude];
    case 'pulse':
      return [term.low, term.high];
    case 'table':
      return term.points.map((p) => p.v);
    case 'expression':
      return [];
  }
}

/** A switch's schedule in words. */
export function describeSwitching(part: Part): string {
  const sw = part.switching;
  if (!sw) return formatSIExact(part.value, 'Ω');
  const open = Number.isFinite(sw.offResistance) ? s(sw.offResistance, 'Ω') : 'open circuit';
  const events = sw.events.map((e) => `${e.closed ? 'closes' : 'opens'} at ${s(e.t, 's')}`);
  return [`${s(sw.onResistance, 'Ω')} when closed, ${open} when open`, `starts ${sw.initiallyClosed ? 'closed' : 'open'}`, ...events].join(', ');
}

/** Value text of a part: its value for passives (with the initial state), its waveform for sources. */
export function describePartValue(part: Part): string {
  const unit = partUnit(part);
  if (isSource(part)) return describeWaveform(part.waveform, unit);
  if (part.kind === 'switch') return describeSwitching(part);
  let text = formatSIExact(part.value, unit);
  if (part.initial !== undefined) text += `, initial ${formatSIExact(part.initial, part.kind === 'capacitor' ? 'V' : 'A')}`;
  return text;
}

/** A part's ratings in words (`rated 50 V, 2 A, 1 W, 5 J per pulse`); '' when none are given. */
export function describeRatings(part: Part): string {
  const r = part.ratings;
  if (!r) return '';
  const items: string[] = [];
  if (r.voltage !== undefined) items.push(formatSIExact(r.voltage, 'V'));
  if (r.current !== undefined) items.push(formatSIExact(r.current, 'A'));
  if (r.power !== undefined) items.push(formatSIExact(r.power, 'W'));
  if (r.pulseEnergy !== undefined) items.push(`${formatSIExact(r.pulseEnergy, 'J')} per pulse`);
  return items.length > 0 ? `rated ${items.join(', ')}` : '';
}
