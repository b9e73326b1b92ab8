/**
 * The periods of a steady tail (simulate/steady-tail.ts) share their term arrays, one per phase,
 * laid on the sources' own breakpoint times. Two pieces with the same term array over τ ranges
 * [a, b] and [a, b + d] are the same function of τ; the lengths of the periods' pieces differ only
 * by the rounding of those times, |d| ≤ 2 ulps of t (measured on 10⁴ periods). Measurements reuse
 * what they found on the first such piece (knots, extrema, integrals), carried to the other end
 * by d where the end matters: y(b + d) = y(b) + y'(b)·d, the next term y''·d²/2 being far below
 * round-off of y.
 */

/** Ranges whose ends agree to this many ulps of t are the same stretch. */
const SAME_RANGE_ULPS = 4;

/** Whether a piece ending at τ = b (absolute time `end`) repeats one seen ending at τ = `seenB`. */
export function sameEnd(b: number, seenB: number, end: number): boolean {
  return Math.abs(b - seenB) <= SAME_RANGE_ULPS * Number.EPSILON * Math.abs(end);
}
