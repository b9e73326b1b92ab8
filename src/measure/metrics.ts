import type { SettleBand } from '../circuit/circuit.js';
import type { Metrics, Piece } from '../simulate/result.js';
import { findPeakAndValley } from './extrema.js';
import { overshootPercent } from './overshoot.js';
import { riseTime } from './rise.js';
import { bandHalfWidth, settlingTime } from './settling.js';
import { buildTrack, endValue, startValue } from './track.js';
import { hasTransition } from './transition.js';

/**
 * All step-response metrics of one signal over the analysed span.
 *
 * - initial: value at the first sample time (t = 0+);
 * - final: value at the end of the span (left-hand limit there);
 * - peak / valley: largest / smallest value, extrema located on the closed form;
 * - overshootPct, riseTime (10 → 90 %): relative to the transition initial → final, null without one
 *   (no transition: final − initial is rounding noise, or under 0.1 % of the peak-to-valley excursion);
 * - settlingTime: last time outside the band around final; null for a relative band without a
 *   transition.
 *
 * `pieces` is the exact closed form; when empty, the samples are used (linear interpolation).
 */
export function computeMetrics(times: Float64Array, values: Float64Array, pieces: readonly Piece[], band: SettleBand): Metrics {
  const track = buildTrack(times, values, pieces);
  const initial = startValue(track);
  const final = endValue(track);
  const { peak, valley } = findPeakAndValley(track);
  const scale = Math.max(Math.abs(peak.value), Math.abs(valley.value));
  const moving = hasTransition(initial, final, scale, peak.value - valley.value);

  const rise = moving ? riseTime(track, initial, final) : null;
  const half = bandHalfWidth(band, initial, final);
  const settle = half === null || (band.kind === 'relative' && !moving) ? null : settlingTime(track, final, half);

  return {
    initial,
    final,
    finalIsLimit: false,
    peak,
    valley,
    overshootPct: moving ? overshootPercent(initial, final, peak.value, valley.value) : null,
    riseTime: rise ? rise.duration : null,
    settlingTime: settle,
  };
}
