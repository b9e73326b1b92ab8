/** Relative size below which a change initial → final counts as no transition (rounding noise). */
export const TRANSITION_REL_TOL = 1e-9;

/**
 * A change initial → final smaller than this fraction of the signal's whole excursion
 * (peak − valley) is a pulse that has (nearly) returned, not a transition: overshoot relative to
 * it would be meaningless (millions of percent).
 */
export const TRANSITION_OF_EXCURSION = 1e-3;

/**
 * Whether initial → final is a real transition, compared with the signal's overall scale
 * (largest magnitude) and its excursion (peak − valley).
 */
export function hasTransition(initial: number, final: number, scale: number, excursion = 0): boolean {
  const delta = Math.abs(final - initial);
  if (!Number.isFinite(delta) || delta === 0) return false;
  const ref = Math.max(Math.abs(initial), Math.abs(final), Math.abs(scale));
  return delta > TRANSITION_REL_TOL * ref && delta > TRANSITION_OF_EXCURSION * excursion;
}
