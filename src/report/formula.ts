import type { Piece, Term } from '../simulate/result.js';
import { formatPlain, formatSI } from './si.js';
import { wrapFormula, wrapWords } from './wrap.js';

/**
 * Closed forms written for people: `12 V − 12 V·e^(−t/1.00 ms)`.
 * Exponentials show their time constant, oscillations their frequency in Hz and phase in degrees,
 * repeated poles a polynomial in t/τ. Coefficients are rounded to 4 significant digits.
 */

/** Formats a coefficient magnitude; `power` is the power of t it multiplies (unit per s^power). */
export type CoefFormat = (magnitude: number, power: number) => string;

/** Coefficients carrying `unit` (V, A, Ω, S …); a power of t adds a per-second unit. */
export function unitCoefs(unit: string): CoefFormat {
  if (unit === '') {
    return (x, power) => formatPlain(x) + (power === 0 ? '' : power === 1 ? '/s' : `/s${superscript(power)}`);
  }
  return (x, power) => formatSI(x, power === 0 ? unit : power === 1 ? `${unit}/s` : `${unit}/s${superscript(power)}`, { digits: 4, trim: true });
}

const SUPERSCRIPT = '⁰¹²³⁴⁵⁶⁷⁸⁹';
export function superscript(n: number): string {
  return String(n)
    .split('')
    .map((d) => SUPERSCRIPT[Number(d)] ?? d)
    .join('');
}

interface Item {
  negative: boolean;
  body: string;
}

const MINUS = '−';
const tauText = (lambda: number) => formatSI(-1 / lambda, 's', { digits: 3 });

/** `e^(−t/1.00 ms)`, with `v` the time variable text. */
function expFactor(lambda: number, v: string): string {
  const num = v === 't' ? 't' : v;
  return lambda < 0 ? `e^(${MINUS}${num}/${tauText(lambda)})` : `e^(${num}/${formatSI(1 / lambda, 's', { digits: 3 })})`;
}

/** Terms smaller than this fraction of the largest one are left out. */
const NEGLIGIBLE = 1e-12;

/** Largest of |c_k|·s^k: a polynomial's size over a time scale s (s = 0: the constant alone). */
function polySize(c: readonly number[], s: number): number {
  let m = 0;
  c.forEach((x, k) => (m = Math.max(m, Math.abs(x) * (k === 0 ? 1 : s ** k))));
  return m;
}

/**
 * Size of a term in the signal's unit, over `timeScale` seconds (for polynomial factors; without
 * one, a decaying term's own time constant): what decides whether a term is rounding noise.
 */
function termScale(term: Term, timeScale: number): number {
  switch (term.kind) {
    case 'exp':
      return Math.abs(term.coef);
    case 'osc':
      return Math.hypot(term.cosCoef, term.sinCoef);
    case 'poly-exp':
      return polySize(term.polyCoefs, timeScale > 0 ? timeScale : term.lambda < 0 ? -1 / term.lambda : 0);
    case 'quasi': {
      const s = timeScale > 0 ? timeScale : term.sigma < 0 ? -1 / term.sigma : 0;
      return Math.max(polySize(term.cosPoly, s), polySize(term.sinPoly, s));
    }
  }
}

/** A polynomial in v with per-second units: `(1 V + 2 kV/s·t)`; null when all zero. */
function polyText(c: readonly number[], v: string, coef: CoefFormat, floor: Floor): string | null {
  const items: Item[] = c
    .map((x, k) => ({ x, k }))
    .filter(({ x, k }) => !negligibleCoef(x, k, floor))
    .map(({ x, k }) => ({
      negative: x < 0,
      body: k === 0 ? coef(Math.abs(x), 0) : `${one(coef(Math.abs(x), k))}${v}${k > 1 ? superscript(k) : ''}`,
    }));
  if (items.length === 0) return null;
  return items.length === 1 && !items[0]!.negative ? items[0]!.body : `(${joinItems(items)})`;
}

/** `12 V·` as a multiplier; a bare 1 disappears. */
const one = (mag: string) => (mag === '1' ? '' : `${mag}·`);

/**
 * What counts as rounding noise: a term or coefficient whose size over `timeScale` seconds stays
 * at or below `value` (units of the signal).
 */
export interface Floor {
  value: number;
  timeScale: number;
}

/** Whether c·τ^k stays within the noise floor over the floor's time scale (k = 0: |c| alone). */
function negligibleCoef(c: number, k: number, floor: Floor): boolean {
  if (c === 0) return true;
  return Math.abs(c) * (k === 0 ? 1 : floor.timeScale ** k) <= floor.value && (k === 0 || floor.timeScale > 0);
}

function termItems(term: Term, v: string, coef: CoefFormat, floor: Floor): Item[] {
  switch (term.kind) {
    case 'exp': {
      const mag = coef(Math.abs(term.coef), 0);
      if (term.lambda === 0) return [{ negative: term.coef < 0, body: mag }];
      return [{ negative: term.coef < 0, body: `${one(mag)}${expFactor(term.lambda, v)}` }];
    }
    case 'osc': {
      const amp = Math.hypot(term.cosCoef, term.sinCoef);
      const phi = Math.atan2(term.sinCoef, term.cosCoef); // c·cos x + s·sin x = amp·cos(x − phi)
      const deg = (-phi * 180) / Math.PI;
      const phase = Math.abs(deg) < 0.05 ? '' : ` ${deg < 0 ? MINUS : '+'} ${formatPlain(Math.abs(deg), 4)}°`;
      const f = formatSI(term.omega / (2 * Math.PI), 'Hz', { digits: 4 });
      const mag = coef(amp, 0);
      const factors = [mag === '1' ? '' : mag, term.sigma === 0 ? '' : expFactor(term.sigma, v), `cos(2π·${f}·${v}${phase})`];
      return [{ negative: false, body: factors.filter((x) => x !== '').join('·') }];
    }
    case 'quasi': {
      const f = formatSI(term.omega / (2 * Math.PI), 'Hz', { digits: 4 });
      const env = term.sigma === 0 ? '' : expFactor(term.sigma, v);
      const parts: string[] = [];
      const cp = polyText(term.cosPoly, v, coef, floor);
      const sp = polyText(term.sinPoly, v, coef, floor);
      if (cp !== null) parts.push(term.omega === 0 ? cp : `${cp}·cos(2π·${f}·${v})`);
      if (sp !== null && term.omega !== 0) parts.push(`${sp}·sin(2π·${f}·${v})`);
      if (parts.length === 0) return [];
      const inner = parts.length === 1 ? parts[0]! : `[${parts.join(' + ')}]`;
      return [{ negative: false, body: env === '' ? inner : `${env}·${inner}` }];
    }
    case 'poly-exp': {
      if (term.lambda === 0) {
        return term.polyCoefs
          .map((c, k) => ({ c, k }))
          .filter(({ c, k }) => !negligibleCoef(c, k, floor))
          .map(({ c, k }) => ({
            negative: c < 0,
            body: k === 0 ? coef(Math.abs(c), 0) : `${one(coef(Math.abs(c), k))}${v}${k > 1 ? superscript(k) : ''}`,
          }));
      }
      const tau = -1 / term.lambda;
      const tauS = formatSI(tau, 's', { digits: 3 });
      const ratio = `(${v}/${tauS})`;
      const inner: Item[] = term.polyCoefs
        .map((c, k) => ({ a: c * tau ** k, k, c }))
        .filter(({ c, k }) => !negligibleCoef(c, k, floor.timeScale > 0 ? floor : { value: floor.value, timeScale: tau }))
        .map(({ a, k }) => ({
          negative: a < 0,
          body: k === 0 ? coef(Math.abs(a), 0) : `${one(coef(Math.abs(a), 0))}${ratio}${k > 1 ? superscript(k) : ''}`,
        }));
      if (inner.length === 0) return [];
      if (inner.length === 1) return [{ negative: inner[0]!.negative, body: `${inner[0]!.body}·${expFactor(term.lambda, v)}` }];
      return [{ negative: false, body: `(${joinItems(inner)})·${expFactor(term.lambda, v)}` }];
    }
  }
}

function joinItems(items: Item[]): string {
  return items
    .map((it, i) => (i === 0 ? (it.negative ? MINUS : '') + it.body : ` ${it.negative ? MINUS : '+'} ${it.body}`))
    .join('');
}

/**
 * A sum of terms in the time variable text `v` (`t` or `(t − 1.00 ms)`); an empty sum prints as zero.
 * Terms below 1e-12 of the largest one, or within the absolute `floor`, are rounding noise and left out.
 */
export function formatTerms(terms: readonly Term[], v: string, coef: CoefFormat, extra: Item[] = [], floor: Floor = { value: 0, timeScale: 0 }): string {
  const size = (t: Term) => termScale(t, floor.timeScale);
  const scale = Math.max(0, ...terms.map(size));
  // inside a kept term, coefficients below this are noise as well
  const inner: Floor = { value: Math.max(floor.value, NEGLIGIBLE * scale), timeScale: floor.timeScale };
  const keep = (t: Term) => size(t) > inner.value;
  const items = terms.filter(keep).flatMap((t) => termItems(t, v, coef, inner));
  items.push(...extra);
  return items.length === 0 ? coef(0, 0) : joinItems(items);
}

/** The time variable of a piece starting at t0. */
export function timeVariable(t0: number, digits = 4): string {
  return t0 === 0 ? 't' : `(t ${t0 < 0 ? '+' : MINUS} ${formatSI(Math.abs(t0), 's', { digits, trim: true })})`;
}

/**
 * Significant digits (at least 4, at most 15) that write every one of these times as a different
 * text: boundaries 1 µs apart near 990 µs need more than four.
 */
export function distinctDigits(times: readonly number[]): number {
  const uniq = [...new Set(times)];
  for (let d = 4; d < 15; d++) {
    const texts = new Set(uniq.map((t) => formatSI(t, 's', { digits: d, trim: true })));
    if (texts.size === uniq.length) return d;
  }
  return 15;
}

/** `δ(t − 1 ms)` with an area. */
export function impulseItem(area: number, t0: number, unit: string, digits = 4): Item {
  const v = t0 === 0 ? 't' : timeVariable(t0, digits).slice(1, -1);
  return { negative: area < 0, body: `${formatSI(Math.abs(area), unit === '' ? 's' : `${unit}·s`, { digits: 4, trim: true })}·δ(${v})` };
}

/** Intervals shown at the start and at the end of a long list (the JSON keeps them all). */
export const FIRST_INTERVALS = 3;
export const LAST_INTERVALS = 2;

/**
 * The closed form of a signal, one line per piece inside [0, span]:
 *   v(out) = 12 V − 12 V·e^(−t/1.00 ms)                       (a single piece from 0)
 *   v(out) = … for 1.000 ms ≤ t < 2.000 ms                     (several pieces)
 * With more than five intervals, the first three and the last two are written, and a line says
 * how many were left out. Interval times carry the digits that keep neighbouring boundaries apart.
 */
export function formatPieces(label: string, unit: string, pieces: readonly Piece[], span: number, noise = 0, width = Infinity): string[] {
  const coef = unitCoefs(unit);
  const shown = pieces.filter((p, i) => p.t0 < span || i === 0);
  if (shown.length === 0) return [`${label} = ${coef(0, 0)}`];
  const digits = distinctDigits(shown.flatMap((p, i) => (i === shown.length - 1 ? [p.t0] : [p.t0, p.t1])));
  const at = (t: number) => formatSI(t, 's', { digits, trim: true });
  const one = (p: Piece, i: number): string[] => {
    const extra = p.impulseArea !== 0 ? [impulseItem(p.impulseArea, p.t0, unit, digits)] : [];
    const floor = { value: noise, timeScale: Math.max(0, Math.min(p.t1, span) - p.t0) };
    const body = formatTerms(p.terms, timeVariable(p.t0, digits), coef, extra, floor);
    if (shown.length === 1 && p.t0 <= 0) return wrapFormula(`${label} = `, body, width);
    const last = i === shown.length - 1;
    const range = last ? `t ≥ ${at(p.t0)}` : `${at(p.t0)} ≤ t < ${at(p.t1)}`;
    return [`for ${range}:`, ...wrapFormula(`  ${label} = `, body, width - 2)];
  };
  if (shown.length <= FIRST_INTERVALS + LAST_INTERVALS) return shown.flatMap(one);
  const head = shown.slice(0, FIRST_INTERVALS).flatMap((p, i) => one(p, i));
  const tailStart = shown.length - LAST_INTERVALS;
  const tail = shown.slice(tailStart).flatMap((p, i) => one(p, tailStart + i));
  const left = tailStart - FIRST_INTERVALS;
  const from = shown[FIRST_INTERVALS]!;
  const to = shown[tailStart - 1]!;
  const gap = `… ${left} more interval${left === 1 ? '' : 's'} left out (${at(from.t0)} ≤ t < ${at(to.t1)}; the JSON output has every interval)`;
  return [...head, ...(Number.isFinite(width) ? wrapWords(gap, width, '  ') : [gap]), ...tail];
}
