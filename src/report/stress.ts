import { DEFAULT_DERATING, runRatings, type RatingCheck } from '../measure/ratings.js';
import { runStress, type PartStress } from '../measure/stress.js';
import type { RunResult } from '../simulate/result.js';
import { BOLD, GREEN, RED, YELLOW, paint, visibleWidth } from './color.js';
import { formatPlain, formatSI } from './si.js';
import { heading, table } from './table.js';
import { wrapWords } from './wrap.js';

const WIDTH = 80;
const UNBOUNDED = 'unbounded';

/** A stress figure: SI with 4 digits; Infinity (a Dirac impulse) as "unbounded". */
function amount(x: number, unit: string): string {
  return x === Infinity ? UNBOUNDED : formatSI(x, unit);
}

/** I²t without an SI prefix: "nA²s" would read as (nA)²·s. */
function i2tText(x: number): string {
  return x === Infinity ? UNBOUNDED : `${formatPlain(x, 4)} A²s`;
}

/** A peak with its time, "12.00 V at 0 s"; a peak of zero has no time worth giving. */
function peakText(p: { value: number; time: number }, unit: string): string {
  if (p.value === 0) return formatSI(0, unit);
  return `${amount(p.value, unit)} at ${formatSI(p.time, 's')}`;
}

/** Values far below the largest figure of their column are rounding noise: shown as 0. */
function denoise(values: number[]): (x: number) => number {
  const finite = values.filter((x) => Number.isFinite(x)).map(Math.abs);
  const top = finite.length > 0 ? Math.max(...finite) : 0;
  return (x) => (Number.isFinite(x) && Math.abs(x) <= 1e-12 * top ? 0 : x);
}

/** Lines of a table, or `fallback` when the table would be wider than the page. */
function fitted(rows: string[][], indent: string, fallback: () => string[]): string[] {
  const lines = table(rows, indent);
  return lines.every((l) => visibleWidth(l) <= WIDTH) ? lines : fallback();
}

/**
 * "Part stress": the peaks each part sees (|v|, |i|, |v·i|, with times), then the energy figures
 * (heat in resistors and switches, I²t, peak stored energy). Empty without per-part closed forms.
 */
export function stressSection(result: RunResult): string[] {
  const stress = runStress(result);
  if (stress.length === 0) return [];
  const out = heading('Part stress (peaks over the span, from the closed forms)');
  const pv = denoise(stress.map((s) => s.voltage.value));
  const pi = denoise(stress.map((s) => s.current.value));
  const pp = denoise(stress.map((s) => s.power.value));
  const clean = (p: { value: number; time: number }, f: (x: number) => number) => ({ value: f(p.value), time: p.time });
  const peakRows = stress.map((s) => [s.part, peakText(clean(s.voltage, pv), 'V'), peakText(clean(s.current, pi), 'A'), peakText(clean(s.power, pp), 'W')]);
  out.push(
    ...fitted([['part', 'peak |v|', 'peak |i|', 'peak |v·i|'], ...peakRows], '  ', () =>
      peakRows.flatMap((r) => wrapWords(`  ${r[0]}: |v| ${r[1]}, |i| ${r[2]}, |v·i| ${r[3]}`, WIDTH, '      ')),
    ),
  );

  out.push('');
  const pe = denoise(stress.map((s) => s.energy ?? 0));
  const pt = denoise(stress.map((s) => s.i2t));
  const energyRows = stress.map((s) => [
    s.part,
    s.energy === null ? '' : amount(pe(s.energy), 'J'),
    i2tText(pt(s.i2t)),
    s.storedPeak === null ? '' : amount(s.storedPeak, 'J'),
  ]);
  out.push(
    ...fitted([['part', 'heat', 'I²t', 'peak stored'], ...energyRows], '  ', () =>
      energyRows.flatMap((r) => wrapWords(`  ${r[0]}: ${[r[1] && `heat ${r[1]}`, `I²t ${r[2]}`, r[3] && `peak stored ${r[3]}`].filter(Boolean).join(', ')}`, WIDTH, '      ')),
    ),
  );
  out.push(...stressNotes(stress, result));
  return out;
}

function stressNotes(stress: readonly PartStress[], result: RunResult): string[] {
  const notes: string[] = [];
  notes.push('heat: energy turned into heat over the span (resistors and switches);');
  notes.push('I²t: the integral of i² over the span, for fuse and wire pulse ratings;');
  notes.push('peak stored: ½·C·v² or ½·L·i² at the peak |v| or |i|.');
  const hit = stress.filter((s) => s.unbounded.length > 0).map((s) => s.part);
  if (hit.length > 0) {
    notes.push(
      `unbounded: the ideal model puts a Dirac impulse into ${hit.join(', ')}; a real part sees a large but finite spike set by what the model leaves out (ESR, ESL, wiring), so these figures cannot be given.`,
    );
  }
  if (result.events?.some((e) => e.energyLost !== 0)) notes.push('Energy lost inside switching instants (under Events) is not in these figures.');
  return notes.flatMap((n) => wrapWords(`  ${n}`, WIDTH, '    '));
}

export const RATING_NAMES: Record<RatingCheck['rating'], string> = { voltage: 'voltage', current: 'current', power: 'power', pulseEnergy: 'pulse energy' };

/** The mark of one check: within the derated limit, over the limit, or over the rating itself. */
export function ratingMark(c: RatingCheck, color = false): string {
  if (c.overRating) return paint('OVER RATING', RED + BOLD, color);
  if (c.overLimit) return paint('OVER LIMIT', YELLOW + BOLD, color);
  return paint('PASS', GREEN, color);
}

function percent(x: number): string {
  if (x === Infinity) return '∞ %';
  return `${Math.abs(x) >= 1e-3 && Math.abs(x) < 1e4 ? x.toPrecision(4) : formatPlain(x, 4)} %`;
}

function signed(x: number, unit: string): string {
  if (x === -Infinity) return 'none';
  const text = formatSI(x, unit);
  return x > 0 ? `+${text}` : text;
}

/**
 * "Ratings": each rating against its stress, the derated limit, the margin left, the share of
 * the rating used, and a mark (PASS, OVER LIMIT above the derated limit, OVER RATING above the
 * rating itself). Empty when no part has a rating.
 */
export function ratingsSection(result: RunResult, color = false): string[] {
  if (!result.circuit.parts.some((p) => p.ratings)) return [];
  const r = runRatings(result);
  const pct = formatPlain(r.derating * 100, 4);
  const out = heading('Ratings');
  const setBy = r.derating === DEFAULT_DERATING ? 'the default, a common-practice margin' : 'set by derate';
  out.push(...wrapWords(`  limit: ${pct} % of each rating (${setBy}); margin: limit − stress; used: the stress in % of the rating`, WIDTH, '    '));
  if (r.checks.length === 0) return [...out, '  (no stress figures: the run has no per-part closed forms)'];
  const rows = r.checks.map((c) => [
    c.part,
    formatSI(c.value, c.unit),
    amount(c.stress, c.unit),
    formatSI(c.limit, c.unit),
    signed(c.margin, c.unit),
    percent(c.usedPct),
    ratingMark(c, color),
  ]);
  out.push(
    ...fitted([['part', 'rating', 'stress', 'limit', 'margin', 'used', ''], ...rows], '  ', () =>
      rows.flatMap((x) => wrapWords(`  ${x[0]}: rated ${x[1]}, stress ${x[2]}, limit ${x[3]}, margin ${x[4]}, used ${x[5]}: ${x[6]}`, WIDTH, '      ')),
    ),
  );
  if (r.overLimit > 0) {
    const n = r.overLimit;
    out.push(...wrapWords(`  ${n} rating${n === 1 ? '' : 's'} over the derated limit${r.overRating > 0 ? `, ${r.overRating} over the rating itself` : ''}: the command exits with code 4 (unless a danger caution fired: 5, or the cross-check failed: 3).`, WIDTH, '    '));
  } else {
    out.push('  every stress is within its derated limit.');
  }
  return out;
}

/** One line for the top of the report: the ratings verdict; empty when no part has a rating. */
export function ratingsVerdict(result: RunResult, color = false): string[] {
  if (!result.circuit.parts.some((p) => p.ratings)) return [];
  const r = runRatings(result);
  if (r.checks.length === 0) return [];
  const pct = `${formatPlain(r.derating * 100, 4)} %`;
  if (r.overLimit === 0) return [`Ratings: ${paint('PASS', GREEN, color)}, all ${r.checks.length} within ${pct} of their rating`];
  const over = r.overRating > 0 ? `, ${r.overRating} above the rating itself` : '';
  return wrapWords(`Ratings: ${paint('OVER', RED + BOLD, color)}, ${r.overLimit} of ${r.checks.length} above ${pct} of their rating${over} (see Ratings)`, WIDTH, '  ');
}
