import type { RunResult } from '../simulate/result.js';
import { refineRoot } from './root.js';
import { buildTrack, type Track } from './track.js';

/** Time a signal spends above a level over the span, with the first and last crossings of it. */
export interface TimeAbove {
  /** the level (V or A), from `watch … above LEVEL` */
  threshold: number;
  /** s: total time with y(t) > threshold over the span */
  total: number;
  /** s: first time the signal crosses the level (either way) inside the span; null if it never does */
  first: number | null;
  /** s: last such time; null if it never crosses */
  last: number | null;
}

declare module '../simulate/result.js' {
  interface Metrics {
    /** time above the watch's threshold; null when the watch has none (see above.ts) */
    timeAbove?: TimeAbove | null;
  }
}

/**
 * Time above `threshold` on a measurement track (see track.ts): between neighbouring knots the
 * signal is monotone, so each sign change of y − threshold there is one crossing, located by
 * Brent's method on the exact closed form (on the straight lines between samples for a track
 * built from samples). Stretches are the pieces of the closed form: a jump across the level
 * between pieces is a crossing at the time of the jump. Intervals above that touch (a tangent
 * touch of the level, a piece boundary the signal passes continuously) are one interval.
 * The start and the end of the span are not crossings. Dirac impulses have no duration and
 * are left out.
 */
export function timeAbove(track: Track, threshold: number): TimeAbove {
  const { start, end } = track;
  const intervals: [number, number][] = [];
  const { ts, ys, first } = track;
  for (let j = 0; j + 1 < first.length; j++) {
    const a = first[j]!;
    const n = first[j + 1]! - a;
    if (n < 2) continue;
    const h = (t: number) => track.value(j, t) - threshold;
    let prevT = ts[a]!;
    let prevG = ys[a]! - threshold;
    let openedAt: number | null = prevG > 0 ? prevT : null;
    for (let k = 1; k < n; k++) {
      const t = ts[a + k]!;
      const g = ys[a + k]! - threshold;
      if (t > prevT && g > 0 !== (openedAt !== null)) {
        const r = refineRoot(h, prevT, t, prevG, g);
        if (openedAt === null) openedAt = r;
        else {
          intervals.push([openedAt, r]);
          openedAt = null;
        }
      }
      prevT = t;
      prevG = g;
    }
    if (openedAt !== null) intervals.push([openedAt, ts[a + n - 1]!]);
  }
  // merge intervals that touch (rounding of a root at a piece boundary: 1e-12 of the span)
  const eps = 1e-12 * (end - start);
  const merged: [number, number][] = [];
  for (const iv of intervals) {
    const last = merged[merged.length - 1];
    if (last && iv[0] - last[1] <= eps) last[1] = Math.max(last[1], iv[1]);
    else if (iv[1] > iv[0]) merged.push([iv[0], iv[1]]);
  }
  let total = 0;
  const crossings: number[] = [];
  for (const [a, b] of merged) {
    total += b - a;
    if (a - start > eps) crossings.push(a);
    if (end - b > eps) crossings.push(b);
  }
  return {
    threshold,
    total,
    first: crossings.length > 0 ? crossings[0]! : null,
    last: crossings.length > 0 ? crossings[crossings.length - 1]! : null,
  };
}

/**
 * The time-above figure of trace `index` of a run: the one in its metrics when present, else
 * measured here from the watch's threshold; null when the watch has no `above` level.
 */
export function traceTimeAbove(result: RunResult, index: number): TimeAbove | null {
  const threshold = result.circuit.watches[index]?.threshold;
  const trace = result.traces[index];
  if (threshold === undefined || !trace) return null;
  if (trace.metrics.timeAbove) return trace.metrics.timeAbove;
  return timeAbove(buildTrack(result.times, trace.values, trace.pieces), threshold);
}
