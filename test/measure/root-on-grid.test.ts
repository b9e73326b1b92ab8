/**
 * An extremum exactly on a grid point, where the derivative sampled on the grid is rounding noise
 * of the wrong sign (so the bracket is the next interval) and the root finder returns that end:
 * it must still be a candidate. The reference is the calculus of f(t) = 5 − (t − 1)² (largest at
 * t = 1, from memory); the grid derivative at t = 1 is taken as +1e-20 instead of 0, as the
 * round-off of a repeated pole's t³ term gave in a critically damped circuit.
 */
import { describe, expect, it } from 'vitest';
import { extremaOnGrid, peakOnGrid } from '../../src/measure/grid.js';
import { walkDerivative } from '../../src/measure/peak.js';

const f = (t: number) => 5 - (t - 1) ** 2;
const df = (t: number) => -2 * (t - 1);
const ts = Float64Array.of(0, 0.5, 1, 1.5, 2);
// f' on the grid, with rounding noise of the wrong sign at the extremum
const dfs = Float64Array.of(2, 1, 1e-20, -1, -2);

describe('an extremum on a grid point with a noisy grid derivative', () => {
  it('peakOnGrid: |f| largest, 5 at t = 1', () => {
    const p = peakOnGrid(ts, dfs, f, df);
    expect(p.value).toBe(5);
    expect(p.time).toBe(1);
  });

  it('extremaOnGrid: the maximum 5 at t = 1', () => {
    const { max } = extremaOnGrid(ts, dfs, f, df);
    expect(max.value).toBe(5);
    expect(max.time).toBe(1);
  });

  it('walkDerivative reports the root at the grid point', () => {
    const roots: number[] = [];
    walkDerivative([...ts], (t) => (t === 1 ? 1e-20 : df(t)), (t) => roots.push(t), () => {});
    expect(roots).toContain(1);
  });
});
