/** Relative size below which a change initial → final counts as no transition (rounding noise). */
export const TRANSITION_REL_TOL = 1e-9;

/** Whether initial → final is a real transition compared with the signal's overall scale. */
export function hasTransition(initial: number, final: number, scale: number): boolean {
  const delta = Math.abs(final - initial);
  if (!Number.isFinite(delta) || delta === 0) return false;
  const ref = Math.max(Math.abs(initial), Math.abs(final), Math.abs(scale));
  return delta > TRANSITION_REL_TOL * ref;
}
