import type { Piece, Term } from '../simulate/result.js';
import { firstReach } from './crossing.js';
import { pieceIndexAt } from './evaluate.js';
import { integrateProduct, integrateTerms, RepeatedIntegrals, sharedGrams } from '../lti/integrate.js';
import { emptyGroups, type Groups, groupsBound, groupTerms, groupsDerivative, groupsValue, termsValue } from '../lti/term.js';
import { geometricSteps, gridFloor, type MagnitudePeak, termsOmega, termsRate, TIE, uniformIntervals } from './peak.js';
import { type Clipped, clipTable, sameEnd } from './repeat.js';
import { findRoot } from './root.js';
import { Sweeper, sharedTables, uniformStep } from './sweep.js';
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
 *
 * Pieces are searched in time order and a later piece wins only when larger by more than 1e-12
 * (relative). A piece whose bound Σ|c_k|·τ^k·e^(Re κ·τ) on |dy/dt| stays below the largest slope at
 * any piece start (divided by that margin twice) can neither win nor block a winner, so it is not
 * searched: a long pulse train searches only the few pieces where the slope can be largest.
 */
export function maxSlope(
  pieces: readonly Piece[],
  start: number,
  end: number,
  extra?: ArrayLike<number>,
  bounds?: Track['slopeBounds'],
  clip: Clipped = clipTable(pieces, start, end),
): { value: number; time: number } | null {
  const count = clip.count;
  if (count === 0) return null;
  const G = emptyGroups();
  const D1 = emptyGroups();
  const D2 = emptyGroups();
  const D3 = emptyGroups();
  // bounds: |y'| at each piece's first instant (a value it reaches) and above it over the piece:
  // the size of y' there, or (shorter pieces) |y'(a)| + |y''(a)|·w + max|y'''|·w²/2 (Taylor);
  // the track of the same pieces over the same span found them already
  const given = bounds && bounds.upper.length === count;
  const upper = given ? bounds.upper : new Float64Array(count);
  let reached = given ? bounds.reached : 0;
  if (!given) {
    for (let i = 0; i < count; i++) {
      const piece = pieces[clip.index[i]!]!;
      groupTerms(piece.terms, G);
      groupsDerivative(G, D1);
      groupsDerivative(D1, D2);
      groupsDerivative(D2, D3);
      const a = clip.lo[i]! - piece.t0;
      const b = clip.hi[i]! - piece.t0;
      const v = Math.abs(groupsValue(D1, a));
      if (v > reached) reached = v;
      const w = b - a;
      upper[i] = a >= 0 ? Math.min(groupsBound(D1, a, b), v + Math.abs(groupsValue(D2, a)) * w + (groupsBound(D3, a, b) * w * w) / 2) : Infinity;
    }
  }
  const sweeper = new Sweeper(sharedTables(extra));
  const extraStep = extra ? uniformStep(extra) : NaN;
  const cut = reached / (1 + TIE) ** 2;
  let best: { value: number; time: number } | null = null;
  // a piece with the same term array over the same τ range (repeat.ts) as one searched before has
  // the same largest slope (to rounding), which cannot beat the best by 1e-12 then: not searched again
  const searched = new Uint8Array(count);
  const { rep, lo: los, hi: his } = clip;
  for (let i = 0; i < count; i++) {
    // the bound is NaN when the terms are: search such a piece
    if (upper[i]! < cut) continue;
    const piece = pieces[clip.index[i]!]!;
    const lo = los[i]!;
    const hi = his[i]!;
    const r = rep[i]!;
    if (r !== i && searched[r] === 1) {
      const first = pieces[clip.index[r]!]!;
      if (first.terms === piece.terms && los[r]! - first.t0 === lo - piece.t0 && sameEnd(hi - piece.t0, his[r]! - first.t0, hi)) continue;
    }
    searched[i] = 1;
    const p = pieceSlope(piece, lo, hi, sweeper, extra, extraStep, G, D1, D2);
    if (best === null || p.value > best.value * (1 + 1e-12)) best = { value: p.value, time: p.time };
  }
  const found = best as { value: number; time: number } | null;
  if (found && Math.abs(found.time - start) <= 1e-12 * (end - start)) found.time = start;
  return found;
}

/**
 * max |y'| on one piece [lo, hi] (the search of peak.ts peakMagnitude): the ends, every root of y''
 * between two grid points where it changes sign (Brent's method on the exact y''), and grid points
 * where y'' is exactly 0; the earliest time on a tie (values within 1e-12 relative).
 */
function pieceSlope(piece: Piece, lo: number, hi: number, sweeper: Sweeper, extra: ArrayLike<number> | undefined, extraStep: number, G: Groups, D1: Groups, D2: Groups): MagnitudePeak {
  const t0 = piece.t0;
  groupTerms(piece.terms, G);
  groupsDerivative(G, D1);
  groupsDerivative(D1, D2);
  const f = (t: number) => groupsValue(D1, t - t0);
  const best: MagnitudePeak = { value: Math.abs(f(lo)), time: lo };
  const consider = (t: number) => {
    const y = Math.abs(f(t));
    if (y > best.value * (1 + TIE) || (Number.isNaN(best.value) && !Number.isNaN(y))) {
      best.value = y;
      best.time = t;
    }
  };
  if (!(hi > lo)) return best;
  const width = hi - lo;
  const rate = termsRate(piece.terms);
  const floorCount = gridFloor(width, rate);
  const points: number[] = [];
  geometricSteps(lo, width, rate, points);
  const m = uniformIntervals(width, termsOmega(piece.terms), floorCount);
  const count = sweeper.grid([D2], { t0, lo, hi, m, minIntervals: floorCount, extra, extraStep, points });
  const ts = sweeper.ts;
  const ds = sweeper.vals[0]!;
  let prevT = ts[0]!;
  let prevD = ds[0]!;
  for (let k = 1; k < count; k++) {
    const t = ts[k]!;
    if (t === prevT) continue;
    const d = ds[k]!;
    if (prevD !== 0 && d !== 0 && prevD < 0 !== d < 0) {
      const near = sweeper.near(D2, piece, prevT - t0, t - t0);
      const r = findRoot((u) => near(u - t0), prevT, t, 1e-14, prevD, d);
      // a root on a grid point (to rounding) comes back as that end: it is a candidate all the same
      consider(Math.min(Math.max(r, prevT), t));
    }
    if (d === 0 && k < count - 1) consider(t);
    prevT = t;
    prevD = d;
  }
  consider(hi);
  return best;
}

/**
 * Average and RMS over [start, end]: exact integrals of each piece's terms (and of their square),
 * divided by the span. A Dirac impulse inside the span adds its area to the average and makes the
 * RMS unbounded (Infinity). null without pieces or with an empty span.
 */
export function averageAndRms(
  pieces: readonly Piece[],
  start: number,
  end: number,
  clip: Clipped = clipTable(pieces, start, end),
  share?: object,
): { average: number; rms: number } | null {
  const T = end - start;
  if (pieces.length === 0 || !(T > 0)) return null;
  let sum = 0;
  let sq = 0;
  let impulse = false;
  // the cycles of a pulse train share their integrals (see RepeatedIntegrals); the periods of a
  // steady tail share their term arrays, and a range longer by d adds f(b)·d and f(b)²·d (repeat.ts)
  // (`share`: a run's sample times, under which its watches share their Gram matrices)
  const cycles = new RepeatedIntegrals(sharedGrams(share));
  // per clipped piece whose integrals were found over [0, b]: b, the integrals and y(b) (NaN: none)
  const count = clip.count;
  const { rep } = clip;
  const B = new Float64Array(count).fill(NaN);
  const S = new Float64Array(count);
  const Q = new Float64Array(count);
  const Y = new Float64Array(count);
  for (let i = 0; i < count; i++) {
    const piece = pieces[clip.index[i]!]!;
    const hi = clip.hi[i]!;
    const a = clip.lo[i]! - piece.t0;
    const b = hi - piece.t0;
    const terms = piece.terms;
    const r = rep[i]!;
    if (a > 0) {
      sum += integrateTerms(terms, b) - integrateTerms(terms, a);
      sq += integrateProduct(terms, terms, b) - integrateProduct(terms, terms, a);
    } else if (r !== i && sameEnd(b, B[r]!, hi) && pieces[clip.index[r]!]!.terms === terms) {
      const d = b - B[r]!;
      sum += S[r]! + Y[r]! * d;
      sq += Q[r]! + Y[r]! * Y[r]! * d;
    } else {
      cycles.integrate(terms, b);
      sum += cycles.sum;
      sq += cycles.square;
      if (r === i) {
        B[i] = b;
        S[i] = cycles.sum;
        Q[i] = cycles.square;
        Y[i] = termsValue(terms, b);
      }
    }
    if (piece.impulseArea !== 0 && piece.t0 >= start && piece.t0 < end) {
      sum += piece.impulseArea;
      impulse = true;
    }
  }
  return { average: sum / T, rms: impulse ? Infinity : Math.sqrt(Math.max(0, sq) / T) };
}
