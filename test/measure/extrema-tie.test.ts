/**
 * Peak and valley of a track: the earliest time wins a tie within 1e-12 relative, the tolerance of
 * every peak search (a level held flat, whose knots differ only in their last bits, reads its start).
 * The expectations are plain arithmetic on the knots.
 */
import { describe, expect, it } from 'vitest';
import { findPeakAndValley } from '../../src/measure/extrema.js';
import type { Track } from '../../src/measure/track.js';

const track = (ts: number[], ys: number[]): Track => ({
  ts: Float64Array.from(ts),
  ys: Float64Array.from(ys),
  first: Int32Array.of(0, ts.length),
  value: () => NaN,
  start: ts[0]!,
  end: ts[ts.length - 1]!,
});

describe('peak and valley ties', () => {
  it('a flat 47.94 V whose later knots are a few ulps higher: the peak is at the start', () => {
    const y = 47.94;
    const { peak } = findPeakAndValley(track([0, 1e-5, 2e-5, 3e-3], [y, y + 7e-15, y + 1.4e-14, 10]));
    expect(peak.time).toBe(0);
    expect(peak.value).toBe(y);
  });

  it('a flat −3 V whose later knots are a few ulps lower: the valley is at the start', () => {
    const { valley } = findPeakAndValley(track([0, 1, 2, 3], [-3, -3 - 4e-15, -3 - 9e-15, 0]));
    expect(valley.time).toBe(0);
  });

  it('a later value larger by more than the tie still wins', () => {
    const { peak } = findPeakAndValley(track([0, 1, 2], [1, 1 + 1e-9, 0]));
    expect(peak.time).toBe(1);
    expect(peak.value).toBe(1 + 1e-9);
  });
});
