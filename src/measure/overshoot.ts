/** Overshoot below this many percent is rounding noise in the closed form and reads as 0. */
const NOISE_PCT = 1e-9;

/**
 * Overshoot in percent of the transition initial → final: how far the signal goes past the final
 * value (the peak for a rising transition, the valley for a falling one). 0 when it never goes
 * past; null when there is no transition.
 */
export function overshootPercent(initial: number, final: number, peak: number, valley: number): number | null {
  const delta = final - initial;
  if (!(delta !== 0) || !Number.isFinite(delta)) return null;
  const beyond = delta > 0 ? peak - final : final - valley;
  const pct = (beyond / Math.abs(delta)) * 100;
  return pct > NOISE_PCT ? pct : 0;
}
