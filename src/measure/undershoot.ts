import type { Track } from './track.js';

/** Excursions below this many percent are rounding noise in the closed form and read as 0 (as overshoot.ts). */
const NOISE_PCT = 1e-9;

/** An event transition smaller than this fraction of the signal's peak-to-valley swing is not listed. */
export const EVENT_OF_SWING = 1e-3;

/** Overshoot and undershoot of the transition that one event (a piece boundary) starts. */
export interface EventShoot {
  /** s: the event time (start of the piece; the start of the span for the first) */
  t: number;
  /** the value just before the event (t = start+ for the first) */
  from: number;
  /** the value just before the next event (the end of the span for the last) */
  to: number;
  /** % of |to − from|: largest excursion past `to` in the direction of the transition, up to the next event */
  overshootPct: number;
  /** % of |to − from|: largest excursion past `from` against the transition, before the 50 % level (see `undershootPercent`) */
  undershootPct: number;
}

declare module '../simulate/result.js' {
  interface Metrics {
    /** undershoot (pre-shoot) of the transition initial → final, % (see undershoot.ts) */
    undershootPct?: number | null;
    /** per-event overshoot and undershoot, one entry per piece boundary with a transition (see undershoot.ts) */
    events?: EventShoot[];
  }
}

const clean = (pct: number) => (pct > NOISE_PCT ? pct : 0);

/**
 * Largest excursion against the transition from → to (below `from` for a rising one, above it for
 * a falling one) at the knots of `stretches` before the signal first reaches the 50 % level
 * (from + to)/2; 0 when it never goes the wrong way. Knots include every local extremum and the
 * signal is monotone between them, so the extremum before the 50 % instant is at a knot: exact
 * on the closed form.
 */
function preExcursion(track: Track, g0: number, g1: number, from: number, to: number): number {
  const dir = Math.sign(to - from);
  const mid = (from + to) / 2;
  let worst = 0;
  const ys = track.ys;
  for (let i = track.first[g0]!; i < track.first[g1]!; i++) {
    const y = ys[i]!;
    if ((y - mid) * dir >= 0) return worst;
    worst = Math.max(worst, (from - y) * dir);
  }
  return worst;
}

/** Largest excursion past `to` in the direction of from → to over the knots of stretches g0 … g1−1; 0 when none. */
function postExcursion(track: Track, g0: number, g1: number, from: number, to: number): number {
  const dir = Math.sign(to - from);
  let worst = 0;
  const ys = track.ys;
  for (let i = track.first[g0]!; i < track.first[g1]!; i++) worst = Math.max(worst, (ys[i]! - to) * dir);
  return worst;
}

/**
 * Undershoot in percent of the transition initial → final over the whole track: the largest
 * excursion beyond `initial` in the direction opposite to the transition, from the start of the
 * span until the signal first reaches 50 % of the transition. This is the pre-shoot of IEEE
 * Std 181 (from memory: an aberration in the pre-transition region, beyond the initial state);
 * naming it undershoot, ending the region at the 50 % instant and taking the percentage of
 * |final − initial| are ours. null without a transition.
 */
export function undershootPercent(track: Track, initial: number, final: number): number | null {
  const delta = final - initial;
  if (!(delta !== 0) || !Number.isFinite(delta)) return null;
  return clean((preExcursion(track, 0, track.first.length - 1, initial, final) / Math.abs(delta)) * 100);
}

/**
 * Per-event overshoot and undershoot. Every stretch of the track (one per piece of the closed
 * form: an interval between source breakpoints or switch events) starts an event at its first
 * time t_k. The transition runs from the value just before t_k (the end of the previous stretch;
 * the start value for the first) to the value just before t_(k+1) (the end of this stretch; the
 * end of the span for the last). Overshoot: largest excursion beyond the new level within
 * [t_k, t_(k+1)); undershoot: as `undershootPercent`, within the same interval; both in % of
 * |to − from|. Events whose transition is below 0.1 % of the peak-to-valley swing are left out.
 */
export function eventShoots(track: Track, swing: number, eventTimes?: readonly number[]): EventShoot[] {
  const out: EventShoot[] = [];
  const { ts, ys, first } = track;
  const count = first.length - 1;
  // With the sources' own event times, the stretches between two events form one event (a pulse
  // edge with a finite rise is one event, not a ramp and a level); without them, every stretch.
  // Event times sorted, walked alongside the stretch starts (which increase): no hashing per
  // stretch. Groups are index ranges [g0, g1) of stretches, closed in this loop (no closures:
  // a long train has 10⁴ of them, and numbers a closure writes live boxed).
  const starts = eventTimes ? ascending(eventTimes) : null;
  let p = 0;
  let prevEnd = 0;
  let started = false;
  let g0 = -1;
  let lastNonEmpty = -1;
  for (let k = 0; k <= count; k++) {
    let opens = k === count;
    if (k < count) {
      if (first[k + 1] === first[k]) continue;
      if (g0 < 0 || starts === null) opens = true;
      else {
        const t = ts[first[k]!]!;
        if (p > 0 && starts[p - 1]! > t) p = 0;
        while (p < starts.length && starts[p]! < t) p++;
        opens = p < starts.length && starts[p] === t;
      }
    }
    if (!opens) {
      lastNonEmpty = k;
      continue;
    }
    if (g0 >= 0) {
      const g1 = lastNonEmpty + 1;
      const from = started ? prevEnd : ys[first[g0]!]!;
      const to = ys[first[g1]! - 1]!;
      prevEnd = to;
      started = true;
      const size = Math.abs(to - from);
      if (Number.isFinite(size) && size !== 0 && !(size < EVENT_OF_SWING * swing)) {
        out.push({
          t: ts[first[g0]!]!,
          from,
          to,
          overshootPct: clean((postExcursion(track, g0, g1, from, to) / size) * 100),
          undershootPct: clean((preExcursion(track, g0, g1, from, to) / size) * 100),
        });
      }
    }
    g0 = k;
    lastNonEmpty = k;
  }
  return out;
}

/** The times in increasing order (as given when they already are: a long train has 10⁴ of them). */
function ascending(times: readonly number[]): Float64Array {
  const out = Float64Array.from(times);
  for (let i = 1; i < out.length; i++) if (!(out[i - 1]! <= out[i]!)) return out.sort();
  return out;
}
