/**
 * The O(n²) route for nonsymmetric tridiagonal matrices (LC and RLC ladders):
 * complex-symmetric-tridiagonal.ts (eigenvalues by complex symmetric QL) and tridiagonal-vectors.ts
 * (inverse iteration with Rayleigh-quotient refinement).
 *
 * Reference: the closed form of the tridiagonal Toeplitz matrix with diagonal a, superdiagonal b and
 * subdiagonal c, eigenvalues a + 2·√(b·c)·cos(kπ/(n+1)), k = 1..n (textbook, from memory): b·c < 0
 * gives the complex pairs of a uniformly damped LC ladder (and one real pole a for odd n),
 * b·c > 0 real poles; |b| ≠ |c| makes T nonnormal.
 */
import { describe, expect, it } from 'vitest';
import { tridiagonalEigenvaluesComplex } from '../../src/linalg/complex-symmetric-tridiagonal.js';
import { tridiagonalVectors } from '../../src/linalg/tridiagonal-vectors.js';
import { matchEigenvalues } from './matrices.js';

function toeplitz(n: number, a: number, b: number, c: number) {
  const exact: { re: number; im: number }[] = [];
  const q = Math.sqrt(Math.abs(b * c));
  for (let k = 1; k <= n; k++) {
    const v = 2 * q * Math.cos((k * Math.PI) / (n + 1));
    // cos vanishes for k = (n+1)/2: that pole is exactly real
    exact.push(b * c < 0 ? { re: a, im: Math.abs(v) < 1e-12 ? 0 : v } : { re: a + v, im: 0 });
  }
  return {
    d: new Float64Array(n).fill(a),
    b: new Float64Array(n - 1).fill(b),
    c: new Float64Array(n - 1).fill(c),
    exact,
    norm: Math.abs(a) + Math.abs(b) + Math.abs(c),
  };
}

/** Real eigenvalues first, then the pairs (upper half-plane member first): eig()'s layout. */
function layout(re: Float64Array, im: Float64Array, tol: number): { re: Float64Array; im: Float64Array } {
  const n = re.length;
  const r = new Float64Array(n);
  const i = new Float64Array(n);
  let j = 0;
  for (let k = 0; k < n; k++) if (Math.abs(im[k]) <= tol) r[j++] = re[k];
  for (let k = 0; k < n; k++) {
    if (im[k] > tol) {
      r[j] = r[j + 1] = re[k];
      i[j] = im[k];
      i[j + 1] = -im[k];
      j += 2;
    }
  }
  expect(j).toBe(n);
  return { re: r, im: i };
}

const pairsOf = (re: ArrayLike<number>, im: ArrayLike<number>): { re: number; im: number }[] => Array.from(re, (x, k) => ({ re: x, im: im[k] }));

const CASES: [number, number, number, number][] = [
  [41, -0.1, 2, -0.5],
  [200, -0.3, 1, -1],
  [41, -0.1, 2, 0.5],
  [301, 0.05, 3, -3],
];

describe('tridiagonal Toeplitz: closed-form eigenvalues (textbook, from memory)', () => {
  for (const [n, a, b, c] of CASES) {
    it(`n = ${n}, a = ${a}, b = ${b}, c = ${c}: QL, then refined eigenvalues and eigenvectors`, () => {
      const T = toeplitz(n, a, b, c);
      const ev = tridiagonalEigenvaluesComplex(T.d, T.b, T.c);
      expect(ev).not.toBeNull();
      expect(matchEigenvalues(pairsOf(ev!.re, ev!.im), T.exact)).toBeLessThan(1e-14 * T.norm);
      const est = layout(ev!.re, ev!.im, 1e-9 * T.norm);
      const r = tridiagonalVectors(T.d, T.b, T.c, est.re, est.im);
      expect(r).not.toBeNull();
      expect(matchEigenvalues(pairsOf(r!.re, r!.im), T.exact)).toBeLessThan(1e-14 * T.norm);
      // T·v = λ·v for v = X[k] + j·X[k+1] (pairs) or X[k] (real), unit 2-norm
      let worst = 0;
      for (let k = 0; k < n; k++) {
        const xr = r!.X.subarray(k * n, k * n + n);
        const xi = r!.im[k] > 0 ? r!.X.subarray((k + 1) * n, (k + 2) * n) : new Float64Array(n);
        let s2 = 0;
        for (let i = 0; i < n; i++) {
          const tr = a * xr[i] + (i > 0 ? c * xr[i - 1] : 0) + (i + 1 < n ? b * xr[i + 1] : 0);
          const ti = a * xi[i] + (i > 0 ? c * xi[i - 1] : 0) + (i + 1 < n ? b * xi[i + 1] : 0);
          worst = Math.max(worst, Math.hypot(tr - (r!.re[k] * xr[i] - r!.im[k] * xi[i]), ti - (r!.re[k] * xi[i] + r!.im[k] * xr[i])));
          s2 += xr[i] * xr[i] + xi[i] * xi[i];
        }
        expect(Math.abs(s2 - 1)).toBeLessThan(1e-14);
        if (r!.im[k] > 0) k++;
      }
      expect(worst).toBeLessThan(1e-14 * T.norm);
    });
  }
  it('estimates off by 1e-9·‖T‖ are refined to the closed form', () => {
    const [n, a, b, c] = CASES[1];
    const T = toeplitz(n, a, b, c);
    const ev = tridiagonalEigenvaluesComplex(T.d, T.b, T.c)!;
    const est = layout(ev.re, ev.im, 1e-9 * T.norm);
    for (let k = 0; k < n; k++) {
      const shift = 1e-9 * T.norm * (k % 2 === 0 ? 1 : -1);
      est.re[k] += est.im[k] < 0 ? -shift : shift; // a pair moves together: conjugates stay exact
      if (est.im[k] > 0) {
        est.re[k + 1] = est.re[k];
        k++;
      }
    }
    const r = tridiagonalVectors(T.d, T.b, T.c, est.re, est.im);
    expect(r).not.toBeNull();
    expect(matchEigenvalues(pairsOf(r!.re, r!.im), T.exact)).toBeLessThan(1e-14 * T.norm);
  });
  it('a one-way coupling (b·c = 0) is refused', () => {
    const T = toeplitz(5, -1, 1, -1);
    T.c[2] = 0;
    expect(tridiagonalVectors(T.d, T.b, T.c, new Float64Array(5).fill(-1), new Float64Array(5))).toBeNull();
  });
});
