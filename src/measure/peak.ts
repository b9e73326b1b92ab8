import type { Piece, Term } from '../simulate/result.js';
import { findRoot } from './root.js';

/**
 * The largest magnitude of a smooth function on a closed interval [lo, hi], located exactly: the
 * candidates are the two ends and every root of the derivative inside, each bracketed on a grid
 * and refined by Brent's method. The grid is uniform (at least 64 steps, at most π/4 of the fastest
 * oscillation per step), plus steps that shrink geometrically towards `lo`, where the fast
 * decaying terms of a piece live, plus any `extra` times.
 */
export interface MagnitudePeak {
  /** max |f| (≥ 0) */
  value: number;
  /** where it is reached (the earliest time on a tie, values within 1e-12 relative) */
  time: number;
}

/** Values this close (relative) are a tie: the earlier time stays. */
export const TIE = 1e-12;
const MIN_INTERVALS = 64;
const PHASE_STEP = Math.PI / 4;
const MAX_INTERVALS = 200_000;

export interface PeakSearch {
  f: (t: number) => number;
  df: (t: number) => number;
  lo: number;
  hi: number;
  /** fastest angular frequency in f (rad/s) */
  omega: number;
  /** fastest decay or growth rate in f (1/s) */
  rate: number;
  /** sorted times to add to the grid (sample times); those outside (lo, hi) are ignored */
  extra?: ArrayLike<number>;
}

export function peakMagnitude(s: PeakSearch): MagnitudePeak {
  const { f, df, lo, hi } = s;
  const best: MagnitudePeak = { value: Math.abs(f(lo)), time: lo };
  const consider = (t: number) => {
    const y = Math.abs(f(t));
    if (y > best.value * (1 + TIE) || (Number.isNaN(best.value) && !Number.isNaN(y))) {
      best.value = y;
      best.time = t;
    }
  };
  if (!(hi > lo)) return best;
  walkDerivative(searchGrid(s), df, consider, (t, d, last) => {
    if (d === 0 && !last) consider(t);
  });
  consider(hi);
  return best;
}

/**
 * Walk a sorted grid (repeated times skipped), reporting every grid point with the derivative
 * there, and every root of the derivative between two points where it changes sign (located by
 * root finding to 1e-14): the extrema of the signal.
 */
export function walkDerivative(
  grid: readonly number[],
  df: (t: number) => number,
  onRoot: (t: number) => void,
  onPoint: (t: number, d: number, last: boolean) => void,
): void {
  let prevT = grid[0]!;
  let prevD = df(prevT);
  onPoint(prevT, prevD, grid.length === 1);
  for (let k = 1; k < grid.length; k++) {
    const t = grid[k]!;
    if (t === prevT) continue;
    const d = df(t);
    if (prevD !== 0 && d !== 0 && Math.sign(prevD) !== Math.sign(d)) {
      const r = findRoot(df, prevT, t, 1e-14, prevD, d);
      // a root on a grid point (to rounding) comes back as that end: it is a candidate all the same
      onRoot(Math.min(Math.max(r, prevT), t));
    }
    onPoint(t, d, k === grid.length - 1);
    prevT = t;
    prevD = d;
  }
}

/** The search grid of peakMagnitude (sorted; may hold repeated times). */
export function searchGrid(s: Pick<PeakSearch, 'lo' | 'hi' | 'omega' | 'rate' | 'extra'> & { minIntervals?: number }): number[] {
  const { lo, hi } = s;
  const width = hi - lo;
  const floorCount = gridFloor(width, s.rate, s.minIntervals);
  const m = uniformIntervals(width, s.omega, floorCount);
  const grid: number[] = [];
  for (let k = 0; k <= m; k++) grid.push(k === m ? hi : lo + (width * k) / m);
  geometricSteps(lo, width, s.rate, grid);
  if (s.extra) {
    const e = s.extra;
    let a = 0;
    let b = e.length;
    while (a < b) {
      const mid = (a + b) >> 1;
      if (e[mid]! <= lo) a = mid + 1;
      else b = mid;
    }
    for (let k = a; k < e.length && e[k]! < hi; k++) grid.push(e[k]!);
  }
  grid.sort((x, y) => x - y);
  return grid;
}

/** Fewest uniform intervals of the search grid over a stretch of this width. */
export function gridFloor(width: number, rate: number, minIntervals?: number): number {
  // a piece much shorter than its fastest time constant (the cycles of a long pulse train) is
  // nearly a low-order polynomial there: 8 intervals bracket its few extrema
  return minIntervals ?? (rate > 0 && Number.isFinite(rate) && width * rate < 1 ? 8 : MIN_INTERVALS);
}

/** Uniform intervals of the search grid: at most π/4 of the fastest oscillation each, at least `floorCount`. */
export function uniformIntervals(width: number, omega: number, floorCount: number): number {
  return Math.min(MAX_INTERVALS, Math.max(floorCount, Math.ceil((width * omega) / PHASE_STEP)));
}

/** Geometric steps towards lo, down to a hundredth of the fastest time constant (unsorted, appended to `out`). */
export function geometricSteps(lo: number, width: number, rate: number, out: number[]): void {
  if (rate > 0 && Number.isFinite(rate)) {
    const floor = 0.01 / rate;
    for (let h = width / 2; h > floor && h > width * 1e-15; h /= 2) {
      out.push(lo + h, lo + 0.75 * h);
    }
  }
}

/** Fastest angular frequency among a piece's terms. */
export function termsOmega(terms: readonly Term[]): number {
  let w = 0;
  for (const t of terms) if (t.kind === 'osc' || t.kind === 'quasi') w = Math.max(w, Math.abs(t.omega));
  return w;
}

/** Fastest exponential rate |λ| or |σ| among a piece's terms. */
export function termsRate(terms: readonly Term[]): number {
  let r = 0;
  for (const t of terms) r = Math.max(r, Math.abs(t.kind === 'exp' || t.kind === 'poly-exp' ? t.lambda : t.sigma));
  return r;
}

/**
 * Each piece clipped to [start, end]: the interval it governs (up to the next piece's start), as
 * [lo, hi] with lo < hi, or a single instant when the span itself is one. Pieces wholly outside
 * the span are left out.
 */
export function clipPieces(pieces: readonly Piece[], start: number, end: number): { piece: Piece; index: number; lo: number; hi: number }[] {
  const out: { piece: Piece; index: number; lo: number; hi: number }[] = [];
  for (let i = 0; i < pieces.length; i++) {
    const piece = pieces[i]!;
    const next = pieces[i + 1];
    const lo = Math.max(piece.t0, start);
    const hi = Math.min(next ? next.t0 : Math.max(piece.t1, end), end);
    if (hi < lo || (hi === lo && out.length > 0)) continue;
    out.push({ piece, index: i, lo, hi });
  }
  if (out.length === 0 && pieces.length > 0) out.push({ piece: pieces[pieces.length - 1]!, index: pieces.length - 1, lo: start, hi: end });
  return out;
}

