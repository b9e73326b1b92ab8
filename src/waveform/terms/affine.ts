import type { Component } from '../component.js';

/** Components of a function that is affine on [t0, t1): value and slope read at the midpoint. */
export function affineComponents(value: (t: number) => number, slope: (t: number) => number, t0: number, t1: number): Omit<Component, 'input'>[] {
  const mid = (t0 + t1) / 2;
  const s = slope(mid);
  const v0 = value(mid) - s * (mid - t0);
  const out: Omit<Component, 'input'>[] = [];
  if (v0 !== 0) out.push({ power: 0, sigma: 0, omega: 0, re: v0, im: 0 });
  if (s !== 0) out.push({ power: 1, sigma: 0, omega: 0, re: s, im: 0 });
  return out;
}
