/**
 * The definite tridiagonal solver (src/linalg/definite-tridiagonal.ts) and eigTridiagonal's use
 * of it.
 *
 * References: mpmath golden data at 60 digits for graded matrices (test/linalg/graded-golden.json,
 * made by make_graded_golden.py), where only a method with relative accuracy gets the small
 * eigenvalues right; the closed form of tridiag(−1, 2, −1) (eigenvalues 2 − 2cos(kπ/(n+1)),
 * textbook, from memory); and the defining identities (T·z = λ·z, ZᵀZ = I).
 */
import { readFileSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { describe, expect, it } from 'vitest';
import { stats } from './tridiagonal-stats.js';
import { eigDefiniteTridiagonal } from '../../src/linalg/definite-tridiagonal.js';
import { eigTridiagonal, tridiagonalEigenvalues } from '../../src/linalg/tridiagonal.js';

interface Case {
  name: string;
  d: number[];
  e: number[];
  values: number[];
}
const file = join(dirname(fileURLToPath(import.meta.url)), 'graded-golden.json');
const golden = JSON.parse(readFileSync(file, 'utf8')) as { source: string; cases: Case[] };


describe(`graded definite tridiagonal vs ${golden.source} golden data`, () => {
  for (const c of golden.cases) {
    it(`${c.name}: every eigenvalue to high relative accuracy, orthonormal vectors`, () => {
      const d = Float64Array.from(c.d);
      const e = Float64Array.from(c.e);
      const r = eigDefiniteTridiagonal(d, e, tridiagonalEigenvalues(d, e));
      expect(r).not.toBeNull();
      const { values, z } = r!;
      // scaled diagonally dominant with κ(M) ≈ 20: relative perturbation bound of order n·κ·ε
      // (Barlow & Demmel, from memory); 1e-13 is about n·ε at n = 200
      for (let k = 0; k < c.values.length; k++) expect(Math.abs(values[k] - c.values[k]) / Math.abs(c.values[k])).toBeLessThan(1e-13);
      const s = stats(d, e, values, z);
      expect(s.residual).toBeLessThan(1e-15);
      expect(s.orth).toBeLessThan(1e-13);
      // the public entry point takes this path for definite blocks
      const all = eigTridiagonal(d, e);
      expect(Array.from(all.values)).toEqual(Array.from(values));
    });
  }
});

describe('tridiag(−1, 2, −1): closed form (textbook, from memory)', () => {
  for (const n of [2, 40, 500]) {
    it(`n = ${n}: relative clusters at both ends of the spectrum stay orthogonal`, () => {
      const d = new Float64Array(n).fill(2);
      const e = new Float64Array(n - 1).fill(-1);
      const r = eigDefiniteTridiagonal(d, e, tridiagonalEigenvalues(d, e));
      expect(r).not.toBeNull();
      const { values, z } = r!;
      for (let k = 0; k < n; k++) {
        const exact = 2 - 2 * Math.cos(((k + 1) * Math.PI) / (n + 1));
        expect(Math.abs(values[k] - exact)).toBeLessThan(4e-15 * 4);
      }
      const s = stats(d, e, values, z);
      expect(s.residual).toBeLessThan(1e-14);
      expect(s.orth).toBeLessThan(1e-13);
    });
  }
});

describe('not definite or too tightly clustered: null (the caller takes another method)', () => {
  it('indefinite', () => {
    const d = Float64Array.from([1, -1, 2]);
    const e = Float64Array.from([0.5, 0.5]);
    expect(eigDefiniteTridiagonal(d, e, tridiagonalEigenvalues(d, e))).toBeNull();
  });
  it('semidefinite (a floating RC network: a zero pole)', () => {
    const d = Float64Array.from([1, 2, 1]);
    const e = Float64Array.from([-1, -1]);
    expect(eigDefiniteTridiagonal(d, e, tridiagonalEigenvalues(d, e))).toBeNull();
  });
});
