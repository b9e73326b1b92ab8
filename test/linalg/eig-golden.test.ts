/**
 * Reference: numpy.linalg.eig golden data (LAPACK dgeev underneath), produced by
 * test/golden/make_eig_golden.py; the circuit matrices in it are written from Kirchhoff's laws in
 * that script, independently of ringdown. The JSON is committed, so this test never needs python.
 *
 * Tolerance: eigenvalue i may move by about ε·cond(λi)·‖A‖ under rounding (first-order
 * perturbation theory, textbook, from memory); we allow 1e-13·condMax·‖A‖_F with the largest
 * eigenvalue condition number the script computed (scipy.linalg.eig left/right vectors), where ‖A‖
 * is taken after balancing-invariant scaling: for graded matrices the spectral radius is used.
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
  rows?: number[][];
  triplets?: [number, number, number][];
}

const file = join(dirname(fileURLToPath(import.meta.url)), '..', 'golden', 'eig-golden.json');
const golden = JSON.parse(readFileSync(file, 'utf8')) as { source: string; cases: GoldenCase[] };

function matrixOf(c: GoldenCase): number[][] {
  if (c.rows) return c.rows;
  const A = zerosM(c.n);
  for (const [i, j, v] of c.triplets ?? []) A[i][j] = v;
  return A;
}

describe(`eig vs ${golden.source} golden data`, () => {
  for (const c of golden.cases) {
    it(`${c.name} (n = ${c.n}, ${c.note})`, () => {
      const A = matrixOf(c);
      const r = eig(A);
      const radius = Math.max(...c.re.map((x, i) => Math.hypot(x, c.im[i])));
      const size = Math.min(frob(A), radius * c.n);
      const d = matchEigenvalues(pairs(r.re, r.im), pairs(c.re, c.im));
      expect(d).toBeLessThanOrEqual(1e-13 * Math.max(c.condMax, 10) * size);
      // every eigenvalue found once: the matching also works the other way round
      expect(matchEigenvalues(pairs(c.re, c.im), pairs(r.re, r.im))).toBeLessThanOrEqual(1e-13 * Math.max(c.condMax, 10) * size);
      if (c.condMax < 1e6) expect(residual(A, r)).toBeLessThan(1e-12);
    });
  }
});
