import type { SettleBand } from '../circuit/circuit.js';
import type { Metrics, Piece } from '../simulate/result.js';
import { findPeakAndValley } from './extrema.js';
import { overshootPercent } from './overshoot.js';
import { keepsSwinging } from './repeating.js';
import { riseTime } from './rise.js';
import { bandHalfWidth, settlingTime } from './settling.js';
import { buildTrack, endValue, startValue, type Track } from './track.js';
import { averageAndRms, delay50, maxSlope, ringing, WEIGHT_FLOOR } from './shape.js';
import { hasTransition } from './transition.js';
import { clipTable } from './repeat.js';
import { timeAbove } from './above.js';
import { eventShoots, undershootPercent } from './undershoot.js';

/**
 * All step-response metrics of one signal over the analysed span.
 *
 * - initial: value at the first sample time (t = 0+);
 * - final: value at the end of the span (left-hand limit there);
 * - peak / valley: largest / smallest value, extrema located on the closed form; a time within
 *   1e-12 of the span from the start is the start itself (rounding noise of the root finder);
 * - overshootPct, riseTime (10 → 90 %): relative to the transition initial → final, null without one
 *   (no transition: final − initial is rounding noise, or under 0.1 % of the peak-to-valley excursion);
 * - settlingTime: last time outside the band around final; null for a relative band without a
 *   transition.
 * - overshootPct, riseTime and settlingTime are all null when the signal keeps swinging to the end
 *   of the span (see `isPeriodicSignal`): it makes no single transition.
 *
 * - delay50: first time at 50 % of the transition, from the start of the span (null as riseTime);
 * - ringingHz, logDecrement: from the slowest-decaying oscillatory term of the last interval
 *   (see `ringing` in shape.ts); maxSlope: largest |dy/dt|; average, rms: exact integrals over
 *   the span divided by it. These need the closed form: null when `pieces` is empty.
 *
 * - undershootPct: the pre-shoot of the transition initial → final, % (see undershoot.ts); null as
 *   overshootPct;
 * - events: per-event overshoot and undershoot, one per piece boundary whose transition is at
 *   least 0.1 % of the peak-to-valley swing (see undershoot.ts); kept for a periodic signal too.
 *
 * - timeAbove: with a `threshold` (the watch's `above` level), the time above it and the first and
 *   last crossings (see above.ts); left out without one (the reports then give null).
 *
 * `pieces` is the exact closed form; when empty, the samples are used (linear interpolation).
 */
export function computeMetrics(times: Float64Array, values: Float64Array, pieces: readonly Piece[], band: SettleBand, threshold?: number, eventTimes?: readonly number[]): Metrics {
  const a = analyse(times, values, pieces, band);
  const { track, initial, final, peak, valley, moving } = a;
  const shape = { ...shapeMetrics(times, pieces, a), events: eventShoots(track, peak.value - valley.value, eventTimes), ...(threshold === undefined ? {} : { timeAbove: timeAbove(track, threshold) }) };
  if (a.periodic) {
    return { initial, final, finalIsLimit: false, peak, valley, overshootPct: null, undershootPct: null, riseTime: null, settlingTime: null, ...shape, delay50: null };
  }
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
    undershootPct: moving ? undershootPercent(track, initial, final) : null,
    riseTime: rise ? rise.duration : null,
    settlingTime: settle,
    ...shape,
    delay50: moving ? delay50(track, initial, final) : null,
  };
}

/** The closed-form measurements of shape.ts (all but delay50, which needs a transition). */
function shapeMetrics(times: Float64Array, pieces: readonly Piece[], a: ReturnType<typeof analyse>) {
  const { start, end } = a.track;
  const scale = Math.max(Math.abs(a.peak.value), Math.abs(a.valley.value));
  const floor = Math.max(WEIGHT_FLOOR * (a.peak.value - a.valley.value), 1e-12 * scale);
  const ring = pieces.length > 0 ? ringing(pieces, start, end, floor) : null;
  const clip = a.clip;
  const mean = averageAndRms(pieces, start, end, clip, times);
  return {
    ringingHz: ring ? ring.hz : null,
    logDecrement: ring ? ring.logDecrement : null,
    maxSlope: pieces.length > 0 ? maxSlope(pieces, start, end, times, a.track.slopeBounds, clip) : null,
    average: mean ? mean.average : null,
    rms: mean ? mean.rms : null,
  };
}

/**
 * Whether the signal keeps swinging to the end of the span (a sinusoid that never stops, or a
 * repeating drive it follows without settling), so that it makes no single transition.
 */
export function isPeriodicSignal(times: Float64Array, values: Float64Array, pieces: readonly Piece[], band: SettleBand): boolean {
  return analyse(times, values, pieces, band).periodic;
}

function analyse(times: Float64Array, values: Float64Array, pieces: readonly Piece[], band: SettleBand) {
  // the pieces clipped to the span once, for the track and the integrals (with their repeats)
  const clip = clipTable(pieces, times.length > 0 ? times[0]! : 0, times.length > 0 ? times[times.length - 1]! : 0);
  const track: Track = buildTrack(times, values, pieces, clip);
  const initial = startValue(track);
  const final = endValue(track);
  const { peak, valley } = findPeakAndValley(track);
  const span = track.end - track.start;
  for (const e of [peak, valley]) if (Math.abs(e.time - track.start) <= 1e-12 * span) e.time = track.start;
  const scale = Math.max(Math.abs(peak.value), Math.abs(valley.value));
  const excursion = peak.value - valley.value;
  const moving = hasTransition(initial, final, scale, excursion);
  // the band the signal must stay in to count as settled; without a transition, 2 % of the swing
  const half = bandHalfWidth(band, initial, final) ?? 0.02 * excursion;
  const periodic = keepsSwinging(pieces, track, final, half, scale);
  return { track, clip, initial, final, peak, valley, moving, periodic };
}
