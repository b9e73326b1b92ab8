import type { SettleBand } from '../circuit/circuit.js';
import { refineRoot } from './root.js';
import type { Track } from './track.js';

/** Half-width of the settling band; null when a relative band has no transition to be relative to. */
export function bandHalfWidth(band: SettleBand, initial: number, final: number): number | null {
  if (band.kind === 'absolute') return Math.abs(band.value);
  const w = Math.abs(band.fraction) * Math.abs(final - initial);
  return w > 0 && Number.isFinite(w) ? w : null;
}

/**
 * The last time the signal is outside final ± halfWidth (the moment it enters the band for
 * good). The start of the span when it never leaves the band.
 */
export function settlingTime(track: Track, final: number, halfWidth: number): number {
  const outside = (y: number) => Math.abs(y - final) > halfWidth;
  const { ts, ys, first } = track;
  for (let k = first.length - 2; k >= 0; k--) {
    const a = first[k]!;
    const b = first[k + 1]!;
    for (let i = b - 1; i >= a; i--) {
      const y = ys[i]!;
      if (!outside(y)) continue;
      const t = ts[i]!;
      // Last outside knot of a stretch: the signal jumps into the band at the boundary,
      // or is still outside at the end of the span.
      if (i === b - 1) return t;
      const edge = y > final ? final + halfWidth : final - halfWidth;
      const h = (u: number) => track.value(k, u) - edge;
      return refineRoot(h, t, ts[i + 1]!, y - edge, ys[i + 1]! - edge);
    }
  }
  return track.start;
}
