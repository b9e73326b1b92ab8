/**
 * e^A − I without forming e^A (linalg/expm.ts), the step of the stiff cross-check.
 * Sources: the scalar identity e^x − 1 = expm1(x) (IEEE libm, to the last bit); the rotation
 * e^([[0, −θ], [θ, 0]]) = [[cos θ, −sin θ], [sin θ, cos θ]] and e^(diag(a, b)) = diag(e^a, e^b)
 * (textbook, from memory).
 */
import { describe, expect, it } from 'vitest';
import { expmMinusIdentity } from '../../src/linalg/expm.js';

/** e^A − I by its defining series Σ_{k≥1} Aᵏ/k!, summed until the terms vanish (small ‖A‖ only). */
function seriesMinusIdentity(A: number[][]): number[][] {
  const n = A.length;
  const sum = A.map((r) => r.slice());
  let term = A.map((r) => r.slice());
  for (let k = 2; k < 60; k++) {
    term = term.map((r) => A[0]!.map((_, j) => r.reduce((s, x, l) => s + (x * A[l]![j]!) / k, 0)));
    for (let i = 0; i < n; i++) for (let j = 0; j < n; j++) sum[i]![j]! += term[i]![j]!;
  }
  return sum;
}

const rel = (x: number, y: number) => Math.abs(x - y) / Math.abs(y);

describe('expmMinusIdentity', () => {
  it('keeps the relative accuracy of a decay of 1e-9 per step, which e^A − I loses', () => {
    const x = -1e-9;
    const F = expmMinusIdentity([[x, 0], [0, -0.7]]);
    expect(rel(F[0][0], Math.expm1(x))).toBeLessThan(4e-16);
    expect(rel(F[1][1], Math.expm1(-0.7))).toBeLessThan(4e-16);
    expect(F[0][1]).toBe(0);
    // the same through e^A = I + F rounded: only about seven digits of the decrement survive
    expect(rel(1 + F[0][0] - 1, Math.expm1(x))).toBeGreaterThan(1e-9);
  });

  it('agrees with the rotation and with the defining series', () => {
    const th = 1.3;
    const F = expmMinusIdentity([[0, -th], [th, 0]]);
    expect(Math.abs(F[0][0] - (Math.cos(th) - 1))).toBeLessThan(1e-15);
    expect(Math.abs(F[1][0] - Math.sin(th))).toBeLessThan(1e-15);
    const A = [[-1.2, 0.4, 0.1], [0.3, -2.5, 0.7], [0, 0.2, -0.4]];
    const E = seriesMinusIdentity(A);
    const G = expmMinusIdentity(A);
    for (let i = 0; i < 3; i++) for (let j = 0; j < 3; j++) expect(Math.abs(G[i][j] - E[i][j])).toBeLessThan(1e-15);
  });

  it('refuses a matrix beyond the unscaled Padé range', () => {
    expect(() => expmMinusIdentity([[-6]])).toThrow();
  });
});
