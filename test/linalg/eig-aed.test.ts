/**
 * The QR iteration's aggressive early deflation (src/linalg/schur-aed.ts), used on active blocks
 * of 110 rows or more (the cases below are larger).
 *
 * References: numpy.linalg.eig golden data (test/linalg/make_aed_golden.py, the matrices rebuilt
 * here from the same integer sequence); similarity invariance of the spectrum (textbook, from
 * memory) for matrices built as Q·D·Qᵀ with Q orthogonal and D of known eigenvalues; the defining
 * identity A·V = V·D. Tolerances: eigenvalue i may move by about ε·cond(λi)·‖A‖ (first-order
 * perturbation theory, textbook, from memory); a defective eigenvalue of a Jordan block of size 2
 * by about √(ε·‖A‖·‖N‖) (same source).
 */
import { readFileSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { describe, expect, it } from 'vitest';
import { eigFlat } from '../../src/linalg/eig.js';
import { swapBlocks } from '../../src/linalg/schur-aed.js';
import { frob, matchEigenvalues, pairs, randomMatrix, residual, rng } from './matrices.js';

interface GoldenCase {
  n: number;
  seed: number;
  lowerScale: number;
  condMax: number;
  re: number[];
  im: number[];
}

const file = join(dirname(fileURLToPath(import.meta.url)), 'aed-golden.json');
const golden = JSON.parse(readFileSync(file, 'utf8')) as { source: string; cases: GoldenCase[] };

function flat(A: number[][]): Float64Array {
  const n = A.length;
  const a = new Float64Array(n * n);
  for (let i = 0; i < n; i++) for (let j = 0; j < n; j++) a[i * n + j] = A[i][j];
  return a;
}

function solve(A: number[][], opts: { aed?: boolean; simd?: boolean }): { re: number[]; im: number[]; V: number[][] } {
  const n = A.length;
  const r = eigFlat(flat(A), n, { structured: false, ...opts });
  const V = Array.from({ length: n }, (_, i) => Array.from(r.V.subarray(i * n, (i + 1) * n)));
  return { re: Array.from(r.re), im: Array.from(r.im), V };
}

describe(`eig with aggressive early deflation vs ${golden.source} golden data`, () => {
  for (const c of golden.cases) {
    const A = randomMatrix(c.n, c.seed);
    if (c.lowerScale > 0) for (let i = 0; i < c.n; i++) for (let j = 0; j < i; j++) A[i][j] *= c.lowerScale;
    // simd: the WebAssembly kernels (src/linalg/simd) or the JavaScript ones
    for (const [aed, simd] of [[true, true], [false, true], [true, false], [false, false]]) {
      it(`random ${c.n}×${c.n} (seed ${c.seed}${c.lowerScale > 0 ? ', damped lower part' : ''}), aed ${aed}, simd ${simd}`, () => {
        const r = solve(A, { aed, simd });
        const tol = 1e-13 * Math.max(c.condMax, 10) * frob(A);
        expect(matchEigenvalues(pairs(r.re, r.im), pairs(c.re, c.im))).toBeLessThanOrEqual(tol);
        expect(matchEigenvalues(pairs(c.re, c.im), pairs(r.re, r.im))).toBeLessThanOrEqual(tol);
        expect(residual(A, r)).toBeLessThan(1e-12);
      });
    }
  }
});

/** A random orthogonal n×n matrix: a product of Householder reflectors of random vectors. */
function orthogonal(n: number, seed: number): number[][] {
  const r = rng(seed);
  const Q = Array.from({ length: n }, (_, i) => Array.from({ length: n }, (_, j): number => (i === j ? 1 : 0)));
  for (let k = 0; k < 6; k++) {
    const v = Array.from({ length: n }, () => 2 * r() - 1);
    const vv = v.reduce((s, x) => s + x * x, 0);
    for (const row of Q) {
      const d = row.reduce((s, x, j) => s + x * v[j], 0);
      for (let j = 0; j < n; j++) row[j] -= (2 * d * v[j]) / vv;
    }
  }
  return Q;
}

/** Q·D·Qᵀ. */
function similar(D: number[][], Q: number[][]): number[][] {
  const n = D.length;
  const QD = Q.map((row) => Array.from({ length: n }, (_, j) => row.reduce((s, q, k) => s + q * D[k][j], 0)));
  return QD.map((row) => Array.from({ length: n }, (_, j) => row.reduce((s, x, k) => s + x * Q[j][k], 0)));
}

/** Block diagonal D from eigenvalues: real ones 1×1, a pair a ± jb as [[a, b], [−b, a]]. */
function blockDiagonal(spec: { re: number; im: number }[]): { D: number[][]; values: { re: number; im: number }[] } {
  const n = spec.reduce((s, z) => s + (z.im === 0 ? 1 : 2), 0);
  const D = Array.from({ length: n }, () => new Array<number>(n).fill(0));
  const values: { re: number; im: number }[] = [];
  let k = 0;
  for (const z of spec) {
    if (z.im === 0) {
      D[k][k] = z.re;
      values.push(z);
      k++;
    } else {
      D[k][k] = D[k + 1][k + 1] = z.re;
      D[k][k + 1] = z.im;
      D[k + 1][k] = -z.im;
      values.push({ re: z.re, im: z.im }, { re: z.re, im: -z.im });
      k += 2;
    }
  }
  return { D, values };
}

describe('eig with aggressive early deflation: known spectra (similarity invariance, textbook, from memory)', () => {
  it('clusters: 40 × (−1), 20 × (−0.5 ± 2j), 30 × 0.25, the rest spread (normal, so perfectly conditioned)', () => {
    const spec: { re: number; im: number }[] = [];
    for (let k = 0; k < 40; k++) spec.push({ re: -1, im: 0 });
    for (let k = 0; k < 20; k++) spec.push({ re: -0.5, im: 2 });
    for (let k = 0; k < 30; k++) spec.push({ re: 0.25, im: 0 });
    for (let k = 0; k < 30; k++) spec.push(k % 3 === 0 ? { re: -3 + 0.1 * k, im: 0 } : { re: -0.2 * k, im: 0.5 + 0.05 * k });
    const { D, values } = blockDiagonal(spec);
    const A = similar(D, orthogonal(D.length, 5));
    const r = solve(A, {});
    expect(r.re.length).toBeGreaterThanOrEqual(150);
    const tol = 1e-12 * frob(A);
    expect(matchEigenvalues(pairs(r.re, r.im), values)).toBeLessThanOrEqual(tol);
    expect(matchEigenvalues(values, pairs(r.re, r.im))).toBeLessThanOrEqual(tol);
  });

  it('a graded spectrum (1 … 1e-8, real and complex) keeps its small eigenvalues to ε·‖A‖', () => {
    const spec: { re: number; im: number }[] = [];
    for (let k = 0; k < 100; k++) {
      const m = 10 ** (-8 * (k / 99));
      spec.push(k % 2 === 0 ? { re: -m, im: 0 } : { re: -0.3 * m, im: m });
    }
    const { D, values } = blockDiagonal(spec);
    const A = similar(D, orthogonal(D.length, 9));
    const r = solve(A, {});
    const tol = 1e-13 * D.length * frob(D);
    expect(matchEigenvalues(pairs(r.re, r.im), values)).toBeLessThanOrEqual(tol);
    expect(residual(A, r)).toBeLessThan(1e-12);
  });

  it('Jordan blocks of size 2 (defective): eigenvalues to √(ε·‖A‖·‖N‖), residual stays at round-off', () => {
    const spec: { re: number; im: number }[] = [];
    for (let k = 0; k < 70; k++) spec.push({ re: -1 - 0.02 * k, im: 0 });
    for (let k = 0; k < 30; k++) spec.push({ re: -0.1 * k, im: 1 + 0.1 * k });
    const { D, values } = blockDiagonal(spec);
    // couple the real eigenvalues two by two into Jordan blocks: equal diagonal, unit superdiagonal
    for (let k = 0; k < 70; k += 2) {
      D[k + 1][k + 1] = D[k][k];
      values[k + 1] = values[k];
      D[k][k + 1] = 1;
    }
    const A = similar(D, orthogonal(D.length, 13));
    const r = solve(A, {});
    const tol = 10 * Math.sqrt(2 ** -52 * frob(A));
    expect(matchEigenvalues(pairs(r.re, r.im), values)).toBeLessThanOrEqual(tol);
    expect(matchEigenvalues(values, pairs(r.re, r.im))).toBeLessThanOrEqual(tol);
  });

  it('a shifted random matrix keeps its spectrum shifted', () => {
    // A + σI has the eigenvalues of A plus σ (textbook, from memory): compares two AED runs whose
    // deflation decisions differ (the spike test is relative to each block's own size)
    const A = randomMatrix(160, 77);
    const B = A.map((row, i) => row.map((x, j) => (i === j ? x + 3.5 : x)));
    const ra = solve(A, {});
    const rb = solve(B, {});
    const shifted = pairs(ra.re, ra.im).map((z) => ({ re: z.re + 3.5, im: z.im }));
    expect(matchEigenvalues(pairs(rb.re, rb.im), shifted)).toBeLessThanOrEqual(1e-12 * frob(B));
  });
});

describe('swapBlocks: reordering the real Schur form (similarity invariance, textbook, from memory)', () => {
  /** Upper quasi-triangular n×n with the given block sizes; 2×2 blocks with complex eigenvalues. */
  function quasiTriangular(sizes: number[], seed: number): Float64Array {
    const r = rng(seed);
    const n = sizes.reduce((a, b) => a + b, 0);
    const T = new Float64Array(n * n);
    for (let i = 0; i < n; i++) for (let j = i; j < n; j++) T[i * n + j] = 2 * r() - 1;
    let k = 0;
    for (const s of sizes) {
      if (s === 2) {
        // [[a, b], [c, a]] with b·c < 0: the pair a ± j√(−b·c)
        T[(k + 1) * n + k + 1] = T[k * n + k];
        T[k * n + k + 1] = 0.5 + r();
        T[(k + 1) * n + k] = -(0.5 + r());
      }
      k += s;
    }
    return T;
  }

  function blockEigenvalues(T: Float64Array, n: number, at: number, size: number): { re: number; im: number }[] {
    if (size === 1) return [{ re: T[at * n + at], im: 0 }];
    const a = T[at * n + at];
    const b = T[at * n + at + 1];
    const c = T[(at + 1) * n + at];
    const d = T[(at + 1) * n + at + 1];
    const p = (a - d) / 2;
    const disc = p * p + b * c;
    const m = (a + d) / 2;
    return disc < 0
      ? [{ re: m, im: Math.sqrt(-disc) }, { re: m, im: -Math.sqrt(-disc) }]
      : [{ re: m + Math.sqrt(disc), im: 0 }, { re: m - Math.sqrt(disc), im: 0 }];
  }

  for (const [n1, n2] of [
    [1, 1],
    [1, 2],
    [2, 1],
    [2, 2],
  ]) {
    it(`blocks ${n1}×${n1} and ${n2}×${n2} trade places; U·T'·Uᵀ = T and U is orthogonal`, () => {
      const sizes = [1, 2, n1, n2, 1];
      const n = sizes.reduce((a, b) => a + b, 0);
      const T0 = quasiTriangular(sizes, 100 + 10 * n1 + n2);
      const T = T0.slice();
      const Ut = new Float64Array(n * n);
      for (let i = 0; i < n; i++) Ut[i * n + i] = 1;
      const j1 = 3;
      const first = blockEigenvalues(T0, n, j1, n1);
      const second = blockEigenvalues(T0, n, j1 + n1, n2);
      expect(swapBlocks(T, Ut, n, j1, n1, n2)).toBe(true);
      // the second block's eigenvalues now lead, the first's follow
      expect(matchEigenvalues(blockEigenvalues(T, n, j1, n2), second)).toBeLessThan(1e-14 * 10);
      expect(matchEigenvalues(blockEigenvalues(T, n, j1 + n2, n1), first)).toBeLessThan(1e-14 * 10);
      // exact zeros below the new blocks
      for (let i = j1 + n2; i < n; i++) for (let j = 0; j < j1 + n2; j++) expect(T[i * n + j]).toBe(0);
      // U = Utᵀ: U·T·Uᵀ reproduces T0, UᵀU = I
      let err = 0;
      let orth = 0;
      for (let i = 0; i < n; i++) {
        for (let j = 0; j < n; j++) {
          let acc = 0;
          for (let k = 0; k < n; k++) for (let l = 0; l < n; l++) acc += Ut[k * n + i] * T[k * n + l] * Ut[l * n + j];
          err = Math.max(err, Math.abs(acc - T0[i * n + j]));
          let o = 0;
          for (let k = 0; k < n; k++) o += Ut[i * n + k] * Ut[j * n + k];
          orth = Math.max(orth, Math.abs(o - (i === j ? 1 : 0)));
        }
      }
      expect(err).toBeLessThan(1e-14 * 20);
      expect(orth).toBeLessThan(1e-15 * 10);
    });
  }

  it('two 2×2 blocks with equal eigenvalues: the swap is refused (T unchanged) or an exact similarity', () => {
    // equal pairs: the Sylvester equation is singular; either the swap is refused, or the result
    // must still be an exact similarity with the same eigenvalues in both blocks
    const n = 4;
    const T = new Float64Array([1, 2, 0.3, -0.2, -0.5, 1, 0.7, 0.1, 0, 0, 1, 2, 0, 0, -0.5, 1]);
    const T0 = T.slice();
    const Ut = new Float64Array(16);
    for (let i = 0; i < 4; i++) Ut[i * 5] = 1;
    const ok = swapBlocks(T, Ut, n, 0, 2, 2);
    if (!ok) expect(Array.from(T)).toEqual(Array.from(T0));
    else {
      for (let i = 2; i < 4; i++) for (let j = 0; j < 2; j++) expect(T[i * n + j]).toBe(0);
      let err = 0;
      for (let i = 0; i < n; i++) {
        for (let j = 0; j < n; j++) {
          let acc = 0;
          for (let k = 0; k < n; k++) for (let l = 0; l < n; l++) acc += Ut[k * n + i] * T[k * n + l] * Ut[l * n + j];
          err = Math.max(err, Math.abs(acc - T0[i * n + j]));
        }
      }
      // an accepted swap dropped at most the threshold (10·ε·max|T|) below the blocks
      expect(err).toBeLessThan(1e-13);
    }
  });
});
