import type { Track } from './track.js';

export interface Extremum {
  value: number;
  time: number;
}

/** Largest and smallest value over the span (the earliest time wins a tie). */
export function findPeakAndValley(track: Track): { peak: Extremum; valley: Extremum } {
  const peak: Extremum = { value: -Infinity, time: track.start };
  const valley: Extremum = { value: Infinity, time: track.start };
  const { ts, ys } = track;
  for (let k = 0; k < ts.length; k++) {
    const y = ys[k]!;
    if (y > peak.value) {
      peak.value = y;
      peak.time = ts[k]!;
    }
    if (y < valley.value) {
      valley.value = y;
      valley.time = ts[k]!;
    }
  }
  if (peak.value === -Infinity) peak.value = NaN;
  if (valley.value === Infinity) valley.value = NaN;
  return { peak, valley };
}
