import { describe, expect, it } from 'vitest';
import { balance } from '../../src/linalg/balance.js';

// Parlett & Reinsch balancing (Numer. Math. 13, 1969; from memory): a diagonal similarity by powers
// of two, so B = D⁻¹·M·D holds exactly, after which no single rescaling of an index by a power of
// two can shrink its row-plus-column norm by 5 % or more (the stopping rule of the algorithm).
describe('balancing', () => {
  it('badly scaled circuit-like matrix: exact similarity, equalized norms', () => {
    // volts next to nanohenry currents: couplings of 1e9 and 1e-6 across a chain, one cycle
    const n = 30;
    const M = Array.from({ length: n }, () => new Array<number>(n).fill(0));
    for (let i = 0; i < n; i++) {
      M[i][i] = -(1 + i);
      if (i + 1 < n) {
        M[i][i + 1] = i % 2 ? 1e9 : 3e-6;
        M[i + 1][i] = i % 2 ? -2e-6 : -7e8;
      }
    }
    M[0][n - 1] = 5;
    M[n - 1][0] = -0.25;
    const { B, d } = balance(M);
    for (let i = 0; i < n; i++) {
      expect(Number.isInteger(Math.log2(d[i]))).toBe(true);
      for (let j = 0; j < n; j++) expect(B[i][j]).toBe((M[i][j] * d[j]) / d[i]);
    }
    for (let i = 0; i < n; i++) {
      let c = 0;
      let r = 0;
      for (let k = 0; k < n; k++) {
        if (k === i) continue;
        c += Math.abs(B[k][i]);
        r += Math.abs(B[i][k]);
      }
      for (const f of [2, 0.5]) expect(c * f + r / f).toBeGreaterThan(0.95 * (c + r));
    }
    // the norm shrinks by many orders
    const norm = (X: number[][]) => Math.max(...X.map((row) => row.reduce((s, v) => s + Math.abs(v), 0)));
    expect(norm(B)).toBeLessThan(1e-3 * norm(M));
  });
});
