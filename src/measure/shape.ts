import type { Piece, Term } from '../simulate/result.js';
import { firstReach } from './crossing.js';
import { derivativeTerm, pieceIndexAt, termValue } from './evaluate.js';
import { integrateProduct, integrateTerms } from '../lti/integrate.js';
import { clipPieces, peakMagnitude, termsOmega, termsRate } from './peak.js';
import type { Track } from './track.js';

/**
 * Further measurements of one signal, located on the exact closed form (roots and integrals of
 * its terms), not on the sample grid. They extend `Metrics` (src/simulate/result.ts) as optional
 * fields, declared here so that the measurement code owns them; `null` where a figure is undefined.
 */
declare module '../simulate/result.js' {
  interface Metrics {
    /** s: first time the signal reaches 50 % of the transition initial → final; null without one */
    delay50?: number | null;
    /** Hz: ωd/2π of the slowest-decaying oscillatory term in force at the end of the span; null without one */
    ringingHz?: number | null;
    /** logarithmic decrement of that term, δ = 2π·|σ|/ωd; null without one */
    logDecrement?: number | null;
    /** largest |dy/dt| inside the closed-form pieces (V/s or A/s) and where; null without pieces */
    maxSlope?: { value: number; time: number } | null;
    /** (1/T)·∫y dt over the span (impulse areas included); null without pieces */
    average?: number | null;
    /** √((1/T)·∫y² dt) over the span; Infinity when a Dirac impulse lies in the span; null without pieces */
    rms?: number | null;
  }
}

/** Terms below this fraction of the signal's excursion count as absent (rounding or negligible weight). */
export const WEIGHT_FLOOR = 1e-3;

/** 50 % reference-level instant of the transition initial → final, measured from the start of the span. */
export function delay50(track: Track, initial: number, final: number): number | null {
  const delta = final - initial;
  if (!(delta !== 0) || !Number.isFinite(delta)) return null;
  const t = firstReach(track, initial + 0.5 * delta, delta > 0 ? 1 : -1);
  return t === null ? null : t - track.start;
}

/** Size of a term at τ: |coef|·e^(λτ), the envelope of an oscillation, the polynomial weight. */
export function termWeight(t: Term, tau: number): number {
  const poly = (c: readonly number[]) => {
    let p = 0;
    for (let k = c.length - 1; k >= 0; k--) p = p * tau + c[k]!;
    return p;
  };
  switch (t.kind) {
    case 'exp':
      return Math.abs(t.coef) * Math.exp(t.lambda * tau);
    case 'poly-exp':
      return Math.abs(poly(t.polyCoefs)) * Math.exp(t.lambda * tau);
    case 'osc':
      return Math.hypot(t.cosCoef, t.sinCoef) * Math.exp(t.sigma * tau);
    case 'quasi':
      return Math.hypot(poly(t.cosPoly), poly(t.sinPoly)) * Math.exp(t.sigma * tau);
  }
}

/** A term of the last interval with its weight at the start of that interval (inside the span). */
export interface WeightedTerm {
  term: Term;
  /** |λ| or |σ| (1/s) */
  rate: number;
  /** rad/s; 0 for a non-oscillating term */
  omega: number;
  weight: number;
}

/**
 * The non-constant terms of the piece in force at `end`, with their weights at the start of that
 * interval (or at `start` when the interval began before it), those below `floor` left out.
 * Sorted slowest first (smallest decay rate), then heaviest first.
 */
export function lastIntervalTerms(pieces: readonly Piece[], start: number, end: number, floor: number): WeightedTerm[] {
  if (pieces.length === 0) return [];
  const piece = pieces[pieceIndexAt(pieces, end)]!;
  const tau = Math.max(piece.t0, start) - piece.t0;
  const out: WeightedTerm[] = [];
  for (const term of piece.terms) {
    const oscillating = (term.kind === 'osc' || term.kind === 'quasi') && term.omega !== 0;
    const rate = Math.abs(term.kind === 'exp' || term.kind === 'poly-exp' ? term.lambda : term.sigma);
    const constant = !oscillating && rate === 0 && (term.kind === 'exp' || (term.kind === 'poly-exp' && term.polyCoefs.length <= 1));
    if (constant) continue;
    const weight = termWeight(term, tau);
    if (!(weight > floor)) continue;
    out.push({ term, rate, omega: oscillating ? Math.abs((term as { omega: number }).omega) : 0, weight });
  }
  out.sort((a, b) => a.rate - b.rate || b.weight - a.weight);
  return out;
}

/**
 * Ringing frequency and logarithmic decrement from the dominant oscillatory mode of the last
 * interval: the decaying oscillation (σ < 0) that lasts longest among those of non-negligible
 * weight. f = ωd/2π, δ = 2π·|σ|/ωd (the natural log of the ratio of successive peaks of that
 * mode's envelope). An undamped oscillation (σ = 0) is not counted: in the closed form it cannot
 * be told from a sinusoidal drive; the modes table lists an undamped mode's frequency.
 */
export function ringing(pieces: readonly Piece[], start: number, end: number, floor: number): { hz: number; logDecrement: number } | null {
  const osc = lastIntervalTerms(pieces, start, end, floor).find((w) => w.omega > 0 && w.rate > 0 && (w.term as { sigma: number }).sigma < 0);
  if (!osc) return null;
  return { hz: osc.omega / (2 * Math.PI), logDecrement: (2 * Math.PI * osc.rate) / osc.omega };
}

/**
 * Largest |dy/dt| over the span inside the pieces: per piece, the ends and every root of the second
 * derivative, bracketed on a grid and refined by Brent's method. A jump between pieces (an ideal
 * step passed straight through) is not a slope and is left out. null without pieces.
 */
export function maxSlope(pieces: readonly Piece[], start: number, end: number, extra?: ArrayLike<number>): { value: number; time: number } | null {
  let best: { value: number; time: number } | null = null;
  for (const { piece, lo, hi } of clipPieces(pieces, start, end)) {
    const d1 = piece.terms.map(derivativeTerm);
    const d2 = d1.map(derivativeTerm);
    const sum = (terms: Term[]) => (t: number) => {
      let s = 0;
      for (const term of terms) s += termValue(term, t - piece.t0);
      return s;
    };
    const p = peakMagnitude({ f: sum(d1), df: sum(d2), lo, hi, omega: termsOmega(piece.terms), rate: termsRate(piece.terms), extra });
    if (best === null || p.value > best.value * (1 + 1e-12)) best = { value: p.value, time: p.time };
  }
  if (best && Math.abs(best.time - start) <= 1e-12 * (end - start)) best.time = start;
  return best;
}

/**
 * Average and RMS over [start, end]: exact integrals of each piece's terms (and of their square),
 * divided by the span. A Dirac impulse inside the span adds its area to the average and makes the
 * RMS unbounded (Infinity). null without pieces or with an empty span.
 */
export function averageAndRms(pieces: readonly Piece[], start: number, end: number): { average: number; rms: number } | null {
  const T = end - start;
  if (pieces.length === 0 || !(T > 0)) return null;
  let sum = 0;
  let sq = 0;
  let impulse = false;
  for (const { piece, lo, hi } of clipPieces(pieces, start, end)) {
    const a = lo - piece.t0;
    const b = hi - piece.t0;
    const terms = piece.terms;
    sum += integrateTerms(terms, b) - (a > 0 ? integrateTerms(terms, a) : 0);
    sq += integrateProduct(terms, terms, b) - (a > 0 ? integrateProduct(terms, terms, a) : 0);
    if (piece.impulseArea !== 0 && piece.t0 >= start && piece.t0 < end) {
      sum += piece.impulseArea;
      impulse = true;
    }
  }
  return { average: sum / T, rms: impulse ? Infinity : Math.sqrt(Math.max(0, sq) / T) };
}
