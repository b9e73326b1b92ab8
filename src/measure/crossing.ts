import { findRoot } from './root.js';
import type { Track } from './track.js';

/**
 * First time t ≥ `from` at which the signal reaches `level` going in `direction`
 * (+1: y ≥ level, −1: y ≤ level). A jump across the level counts at the time of the jump.
 * null when the signal never reaches the level.
 */
export function firstReach(track: Track, level: number, direction: 1 | -1, from = track.start): number | null {
  const g = (y: number) => direction * (y - level);
  for (const s of track.stretches) {
    if (s.ts[s.ts.length - 1]! < from) continue;
    let prevT = NaN;
    let prevG = NaN;
    if (s.ts[0]! < from) {
      // start the walk exactly at `from`, inside this stretch
      prevT = from;
      prevG = g(s.f(from));
      if (prevG >= 0) return from;
    }
    for (let k = 0; k < s.ts.length; k++) {
      const t = s.ts[k]!;
      if (t < from || t === prevT) continue;
      const gk = g(s.ys[k]!);
      if (gk >= 0) {
        if (Number.isNaN(prevT)) return t;
        const h = (u: number) => s.f(u) - level;
        return findRoot(h, prevT, t, 1e-14, direction * prevG, direction * gk);
      }
      prevT = t;
      prevG = gk;
    }
  }
  return null;
}
