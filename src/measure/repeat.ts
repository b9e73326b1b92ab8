import type { Piece } from '../simulate/result.js';

/**
 * Pieces that repeat. The periods of a steady tail (simulate/steady-tail.ts) share their term
 * arrays, one per phase, laid on the sources' own breakpoint times. Two pieces with the same term
 * array over τ ranges [a, b] and [a, b + d] are the same function of τ; the lengths of the periods'
 * pieces differ only by the rounding of those times, |d| ≤ 2 ulps of t (measured on 10⁴ periods).
 * Measurements reuse what they found on the first such piece (knots, extrema, integrals), carried
 * to the other end by d where the end matters: y(b + d) = y(b) + y'(b)·d (the track also checks
 * that the next term, y''·d²/2, is below round-off of y).
 */

/** Ranges whose ends agree to this many ulps of t are the same stretch ... */
const SAME_RANGE_ULPS = 4;
/** ... when that is also a tiny part of their length (the terms beyond y'·d stay negligible). */
const SAME_RANGE_SHARE = 2 ** -20;

/** Whether a piece ending at τ = b (absolute time `end`) repeats one seen ending at τ = `seenB`. */
export function sameEnd(b: number, seenB: number, end: number): boolean {
  const d = Math.abs(b - seenB);
  return d <= SAME_RANGE_ULPS * Number.EPSILON * Math.abs(end) && d <= SAME_RANGE_SHARE * Math.abs(seenB);
}

/**
 * The pieces clipped to the span [start, end], as parallel arrays (a long pulse train has 10⁴
 * pieces: no object per piece, numbers unboxed): piece k covers [lo[k], hi[k]] (the interval it
 * governs, up to the next piece's start; a single instant when the span is one), and is
 * pieces[index[k]]. Pieces wholly outside the span are left out; when none is inside, the last
 * piece is taken over the whole span.
 *
 * rep[k] is the first clipped piece with the same term array (k itself when there is none before).
 * A run that repeats the arrays of the P pieces before it to the end (a steady tail) is found by
 * comparing arrays from the end backwards; the pieces before it are looked up by their arrays.
 */
export interface Clipped {
  count: number;
  index: Int32Array;
  lo: Float64Array;
  hi: Float64Array;
  rep: Int32Array;
}

/** Longest block of repeating phases looked for (a period of several sources' breakpoints). */
const MAX_PHASES = 64;

export function clipTable(pieces: readonly Piece[], start: number, end: number): Clipped {
  const n = Math.max(1, pieces.length);
  const index = new Int32Array(n);
  const lo = new Float64Array(n);
  const hi = new Float64Array(n);
  let count = 0;
  for (let i = 0; i < pieces.length; i++) {
    const piece = pieces[i]!;
    const next = pieces[i + 1];
    const a = Math.max(piece.t0, start);
    const b = Math.min(next ? next.t0 : Math.max(piece.t1, end), end);
    if (b < a || (b === a && count > 0)) continue;
    index[count] = i;
    lo[count] = a;
    hi[count++] = b;
  }
  if (count === 0 && pieces.length > 0) {
    index[0] = pieces.length - 1;
    lo[0] = start;
    hi[0] = end;
    count = 1;
  }
  const termsOf = (k: number) => pieces[index[k]!]!.terms;
  // the repeating run at the end: its period P is the distance from the last piece back to the
  // nearest piece with the same array; it starts where that stops holding
  let P = 0;
  if (count > 2) {
    const last = termsOf(count - 1);
    for (let p = 1; p <= MAX_PHASES && p < count; p++) {
      if (termsOf(count - 1 - p) === last) {
        P = p;
        break;
      }
    }
  }
  let tail = count;
  if (P > 0) {
    let k = count - 1;
    while (k - P >= 0 && termsOf(k - P) === termsOf(k)) k--;
    tail = k + 1;
  }
  const rep = new Int32Array(n);
  const firstOf = new Map<Piece['terms'], number>();
  for (let k = 0; k < tail; k++) {
    const terms = termsOf(k);
    const f = firstOf.get(terms);
    if (f === undefined) {
      firstOf.set(terms, k);
      rep[k] = k;
    } else rep[k] = f;
  }
  for (let k = tail; k < count; k++) rep[k] = rep[k - P]!;
  return { count, index, lo, hi, rep };
}
