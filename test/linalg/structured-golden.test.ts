/**
 * Reference: numpy.linalg.eig golden data (LAPACK dgeev) for circuit state matrices of benchmark
 * size that eig() routes through its structured paths (RC networks, shuffled ladders) and a
 * general RLC mesh; produced by test/linalg/make_structured_golden.py from Kirchhoff's laws,
 * independently of ringdown. The JSON is committed, so this test never needs python.
 *
 * Tolerance as in eig-golden.test.ts: an eigenvalue may move by about ε·cond(λ)·‖A‖ under
 * rounding (first-order perturbation theory, textbook, from memory); we allow
 * 1e-13·max(condMax, 10)·min(‖A‖_F, n·radius).
 */
import { readFileSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { describe, expect, it } from 'vitest';
import { eig } from '../../src/linalg/eig.js';
import { frob, matchEigenvalues, pairs, residual, zerosM } from './matrices.js';

interface GoldenCase {
  name: string;
  n: number;
  note: string;
  condMax: number;
  re: number[];
  im: number[];
  triplets: [number, number, number][];
}

const file = join(dirname(fileURLToPath(import.meta.url)), 'structured-golden.json');
const golden = JSON.parse(readFileSync(file, 'utf8')) as { source: string; cases: GoldenCase[] };

describe(`eig vs ${golden.source} golden data (circuit matrices, structured paths)`, () => {
  for (const c of golden.cases) {
    it(`${c.name} (n = ${c.n}, ${c.note})`, () => {
      const A = zerosM(c.n);
      for (const [i, j, v] of c.triplets) A[i][j] = v;
      const r = eig(A);
      const radius = Math.max(...c.re.map((x, i) => Math.hypot(x, c.im[i])));
      const size = Math.min(frob(A), radius * c.n);
      const tol = 1e-13 * Math.max(c.condMax, 10) * size;
      expect(matchEigenvalues(pairs(r.re, r.im), pairs(c.re, c.im))).toBeLessThanOrEqual(tol);
      expect(matchEigenvalues(pairs(c.re, c.im), pairs(r.re, r.im))).toBeLessThanOrEqual(tol);
      // real poles stay exactly real (RC networks: the symmetric route)
      if (c.im.every((v) => v === 0)) expect(r.im.every((v) => v === 0)).toBe(true);
      expect(residual(A, r)).toBeLessThan(1e-13);
    });
  }
});
