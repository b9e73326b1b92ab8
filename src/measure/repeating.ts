import type { Piece } from '../simulate/result.js';
import { pieceIndexAt } from './evaluate.js';
import { settlingTime } from './settling.js';
import type { Track } from './track.js';

/**
 * Whether a signal keeps swinging to the end of the span instead of making one transition, so that
 * overshoot, rise time and settling time have no meaning:
 *
 * (a) the piece in force at the end holds an undamped oscillation (σ = 0, ω > 0) of more than
 *     rounding-noise size (a sinusoidal source that never stops), or
 * (b) the drive keeps switching (at least three piece boundaries in the last quarter of the span)
 *     and the signal does not settle: it is still outside the band (`halfWidth` around `final`)
 *     after the third-last boundary.
 */
export function keepsSwinging(pieces: readonly Piece[], track: Track, final: number, halfWidth: number, scale: number): boolean {
  if (pieces.length === 0 || track.first.length < 2) return false;
  const { start, end } = track;
  const last = pieces[pieceIndexAt(pieces, end)]!;
  for (const t of last.terms) {
    if ((t.kind === 'osc' || t.kind === 'quasi') && t.sigma === 0 && t.omega > 0 && amplitude(t) > 1e-9 * scale) return true;
  }
  const quarter = end - (end - start) / 4;
  // the third-last piece start in (quarter, end), from the back (a long train has 10⁴ pieces)
  let found = 0;
  let third = NaN;
  for (let i = pieces.length - 1; i >= 0 && found < 3; i--) {
    const t = pieces[i]!.t0;
    if (t > quarter && t < end) {
      found++;
      third = t;
    }
  }
  if (found < 3 || !(halfWidth > 0) || !Number.isFinite(halfWidth)) return false;
  return settlingTime(track, final, halfWidth) > third;
}

function amplitude(t: Piece['terms'][number]): number {
  if (t.kind === 'osc') return Math.hypot(t.cosCoef, t.sinCoef);
  if (t.kind === 'quasi') return Math.max(0, ...t.cosPoly.map(Math.abs), ...t.sinPoly.map(Math.abs));
  return 0;
}
