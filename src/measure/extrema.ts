import { TIE } from './peak.js';
import type { Track } from './track.js';

export interface Extremum {
  value: number;
  time: number;
}

/**
 * Largest and smallest value over the span; the earliest time wins a tie (values within 1e-12
 * relative, as in every peak search: a level held flat reads its start, not the knot where
 * rounding happened to put its last ulp).
 */
export function findPeakAndValley(track: Track): { peak: Extremum; valley: Extremum } {
  // (in locals: a number stored into an object field on every new extreme would be a new heap number)
  let pv = -Infinity;
  let pt = track.start;
  let vv = Infinity;
  let vt = track.start;
  const { ts, ys } = track;
  for (let k = 0; k < ts.length; k++) {
    const y = ys[k]!;
    if (y > pv + TIE * Math.abs(pv) || pv === -Infinity) {
      pv = y;
      pt = ts[k]!;
    }
    if (y < vv - TIE * Math.abs(vv) || vv === Infinity) {
      vv = y;
      vt = ts[k]!;
    }
  }
  return { peak: { value: pv === -Infinity ? NaN : pv, time: pt }, valley: { value: vv === Infinity ? NaN : vv, time: vt } };
}
