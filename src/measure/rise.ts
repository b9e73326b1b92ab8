import { firstReach } from './crossing.js';
import type { Track } from './track.js';

export interface RiseTime {
  /** t90 − t10 */
  duration: number;
  /** first time at 10 % of the transition */
  t10: number;
  /** first time at 90 % of the transition, after t10 */
  t90: number;
}

/**
 * 10 % → 90 % transition time from `initial` to `final` (also for a falling transition).
 * Crossing times are exact roots of the closed form. null when there is no transition.
 */
export function riseTime(track: Track, initial: number, final: number, low = 0.1, high = 0.9): RiseTime | null {
  const delta = final - initial;
  if (!(delta !== 0) || !Number.isFinite(delta)) return null;
  const dir = delta > 0 ? 1 : -1;
  const t10 = firstReach(track, initial + low * delta, dir);
  if (t10 === null) return null;
  const t90 = firstReach(track, initial + high * delta, dir, t10);
  if (t90 === null) return null;
  return { duration: t90 - t10, t10, t90 };
}
