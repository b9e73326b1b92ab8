/**
 * Overshoot in percent of the transition initial → final: how far the signal goes past the final
 * value (the peak for a rising transition, the valley for a falling one). 0 when it never goes
 * past; null when there is no transition.
 */
export function overshootPercent(initial: number, final: number, peak: number, valley: number): number | null {
  const delta = final - initial;
  if (!(delta !== 0) || !Number.isFinite(delta)) return null;
  const beyond = delta > 0 ? peak - final : final - valley;
  return Math.max(0, beyond / Math.abs(delta)) * 100;
}
