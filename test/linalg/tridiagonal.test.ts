/**
 * The symmetric tridiagonal solver of src/linalg/tridiagonal.ts.
 *
 * References: closed forms for the tridiagonal Toeplitz matrix tridiag(1, −2, 1) (eigenvalues
 * −2 + 2·cos(kπ/(n+1)), eigenvectors sin(jkπ/(n+1)); textbook, from memory), Wilkinson's W21+
 * matrix (largest eigenvalue 10.746194182903393, its neighbour 7·10⁻¹⁴ away; from memory,
 * Wilkinson's "The Algebraic Eigenvalue Problem", digits confirmed with numpy.linalg.eigvalsh),
 * and the defining identities (T·z = λ·z, ZᵀZ = I).
 */
import { describe, expect, it } from 'vitest';
import { stats } from './tridiagonal-stats.js';
import { eigTridiagonal, tridiagonalEigenvalues, tridiagonalEigenvectors, tridiagonalQL } from '../../src/linalg/tridiagonal.js';


function toeplitz(n: number): { d: Float64Array; e: Float64Array } {
  return { d: new Float64Array(n).fill(-2), e: new Float64Array(n - 1).fill(1) };
}

describe('tridiagonal Toeplitz tridiag(1, −2, 1): closed form (textbook, from memory)', () => {
  for (const n of [1, 2, 5, 60, 300]) {
    it(`n = ${n}: eigenvalues −2 + 2cos(kπ/(n+1)), eigenvectors sin(jkπ/(n+1))`, () => {
      const { d, e } = toeplitz(n);
      const exact = Array.from({ length: n }, (_, k) => -2 + 2 * Math.cos(((n - k) * Math.PI) / (n + 1))); // ascending
      const { values, z } = eigTridiagonal(d, e);
      for (let k = 0; k < n; k++) expect(Math.abs(values[k] - exact[k])).toBeLessThan(1e-14 * 4);
      const s = stats(d, e, values, z);
      expect(s.residual).toBeLessThan(1e-14);
      expect(s.orth).toBeLessThan(1e-13);
      // eigenvector of the k-th largest eigenvalue: sin(j·k'π/(n+1)), k' = n − k, up to sign
      for (const k of [0, Math.floor(n / 2), n - 1]) {
        const kk = n - k;
        const ref = Array.from({ length: n }, (_, j) => Math.sin(((j + 1) * kk * Math.PI) / (n + 1)));
        const nr = Math.hypot(...ref);
        const dot = ref.reduce((acc, r, j) => acc + (r / nr) * z[k * n + j], 0);
        expect(Math.abs(Math.abs(dot) - 1)).toBeLessThan(1e-12);
      }
    });
  }
  it('eigenvalues alone (QL without vectors) agree with the closed form', () => {
    const n = 200;
    const { d, e } = toeplitz(n);
    const w = tridiagonalEigenvalues(d, e);
    for (let k = 0; k < n; k++) expect(Math.abs(w[k] - (-2 + 2 * Math.cos(((n - k) * Math.PI) / (n + 1))))).toBeLessThan(4e-14);
  });
});

describe('clusters: inverse iteration keeps the vectors orthogonal', () => {
  it("Wilkinson's W21+: the top pair 7e-14 apart (from memory, confirmed with numpy)", () => {
    const n = 21;
    const d = Float64Array.from({ length: n }, (_, i) => Math.abs(i - 10));
    const e = new Float64Array(n - 1).fill(1);
    const w = tridiagonalEigenvalues(d, e);
    expect(Math.abs(w[n - 1] - 10.746194182903393)).toBeLessThan(1e-13);
    expect(Math.abs(w[n - 2] - 10.746194182903322)).toBeLessThan(1e-13);
    const z = tridiagonalEigenvectors(d, e, w);
    expect(z).not.toBeNull();
    const s = stats(d, e, w, z as Float64Array);
    expect(s.residual).toBeLessThan(1e-14);
    expect(s.orth).toBeLessThan(1e-13);
  });
  it('two identical decoupled blocks: exactly repeated eigenvalues, independent orthonormal vectors', () => {
    const m = 30;
    const d = new Float64Array(2 * m).fill(-2);
    const e = new Float64Array(2 * m - 1).fill(1);
    e[m - 1] = 0;
    const { values, z } = eigTridiagonal(d, e);
    const s = stats(d, e, values, z);
    expect(s.residual).toBeLessThan(1e-14);
    expect(s.orth).toBeLessThan(1e-13);
    // each eigenvalue −2 + 2cos(kπ/(m+1)) twice (textbook, from memory)
    for (let k = 0; k < m; k++) {
      const ex = -2 + 2 * Math.cos(((m - k) * Math.PI) / (m + 1));
      expect(Math.abs(values[2 * k] - ex)).toBeLessThan(1e-14 * 4);
      expect(Math.abs(values[2 * k + 1] - ex)).toBeLessThan(1e-14 * 4);
    }
  });
  it('graded ladder (pole spread 10⁵): inverse iteration and QL with vectors agree', () => {
    const n = 120;
    const d = new Float64Array(n);
    const e = new Float64Array(n - 1);
    // S = −C^(−1/2)·G·C^(−1/2) for an RC ladder with capacitances growing geometrically
    const C = Array.from({ length: n }, (_, i) => 10 ** ((5 * i) / n));
    for (let i = 0; i < n; i++) d[i] = -(i + 1 < n ? 2 : 1) / C[i];
    for (let i = 0; i < n - 1; i++) e[i] = 1 / Math.sqrt(C[i] * C[i + 1]);
    const w = tridiagonalEigenvalues(d, e);
    const z1 = tridiagonalEigenvectors(d, e, w);
    expect(z1).not.toBeNull();
    const z2 = new Float64Array(n * n);
    for (let k = 0; k < n; k++) z2[k * n + k] = 1;
    const w2 = Float64Array.from(d);
    tridiagonalQL(w2, e, z2);
    for (let k = 0; k < n; k++) expect(Math.abs(w2[k] - w[k])).toBeLessThan(1e-15 * 4);
    for (const z of [z1 as Float64Array, z2]) {
      const s = stats(d, e, w, z);
      expect(s.residual).toBeLessThan(1e-14);
      expect(s.orth).toBeLessThan(1e-13);
    }
  });
});
