import { refineRoot } from './root.js';
import type { Track } from './track.js';

/**
 * First time t ≥ `from` at which the signal reaches `level` going in `direction`
 * (+1: y ≥ level, −1: y ≤ level). A jump across the level counts at the time of the jump.
 * null when the signal never reaches the level.
 */
export function firstReach(track: Track, level: number, direction: 1 | -1, from = track.start): number | null {
  const g = (y: number) => direction * (y - level);
  const { ts, ys, first } = track;
  for (let k = 0; k + 1 < first.length; k++) {
    const a = first[k]!;
    const b = first[k + 1]!;
    if (b === a || ts[b - 1]! < from) continue;
    let prevT = NaN;
    let prevG = NaN;
    if (ts[a]! < from) {
      // start the walk exactly at `from`, inside this stretch
      prevT = from;
      prevG = g(track.value(k, from));
      if (prevG >= 0) return from;
    }
    for (let i = a; i < b; i++) {
      const t = ts[i]!;
      if (t < from || t === prevT) continue;
      const gk = g(ys[i]!);
      if (gk >= 0) {
        if (Number.isNaN(prevT)) return t;
        const h = (u: number) => track.value(k, u) - level;
        return refineRoot(h, prevT, t, direction * prevG, direction * gk);
      }
      prevT = t;
      prevG = gk;
    }
  }
  return null;
}
