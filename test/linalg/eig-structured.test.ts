/**
 * eig()'s symmetric route for matrices diagonally similar to a symmetric one (RC networks).
 *
 * References: the uniform RC ladder's poles in closed form, −(2/RC)·(1 − cos((2k−1)π/(2n+1))) for
 * a ladder fed at one end from a grounded source and open at the other (textbook, from memory:
 * the eigenvalues of tridiag(−1, 2, −1) with last diagonal entry 1); eigRC (the same poles through
 * C^(−1/2)·G·C^(−1/2) built from C and G, not from A); the general Hessenberg-QR path; and the
 * defining identities.
 */
import { describe, expect, it } from 'vitest';
import { eig, eigFlat, eigRC } from '../../src/linalg/eig.js';
import { frob, lcLadder, matchEigenvalues, pairs, rcLadder, residual, rng, zerosM } from './matrices.js';

/** P·D·A·D⁻¹·Pᵀ with a random power-of-ten diagonal D and a random permutation P. */
function scrambled(A: number[][], seed: number): { B: number[][]; perm: number[]; s: number[] } {
  const n = A.length;
  const r = rng(seed);
  const s = Array.from({ length: n }, () => 10 ** Math.floor(6 * r() - 3));
  const perm = Array.from({ length: n }, (_, i) => i);
  for (let i = n - 1; i > 0; i--) {
    const j = Math.floor(r() * (i + 1));
    [perm[i], perm[j]] = [perm[j], perm[i]];
  }
  const B = perm.map((pi) => perm.map((pj) => (A[pi][pj] * s[pi]) / s[pj]));
  return { B, perm, s };
}

/** Largest |cos| between distinct columns of diag(w)·V (orthogonality of the symmetric form's vectors). */
function maxCos(V: number[][], w: number[]): number {
  const n = V.length;
  const cols = Array.from({ length: n }, (_, k) => V.map((row, i) => row[k] * w[i]));
  const nr = cols.map((c) => Math.hypot(...c));
  let worst = 0;
  for (let a = 0; a < n; a++) {
    for (let b = a + 1; b < n; b++) {
      const dot = cols[a].reduce((acc, x, i) => acc + x * cols[b][i], 0);
      worst = Math.max(worst, Math.abs(dot) / (nr[a] * nr[b]));
    }
  }
  return worst;
}

/** RC mesh: a random spanning tree plus as many random chords (loops), one path to ground. */
function rcMesh(n: number, seed: number): { A: number[][]; G: number[][]; Cd: number[] } {
  const r0 = rng(seed);
  const G = zerosM(n);
  const link = (i: number, j: number, g: number): void => {
    G[i][i] += g;
    G[j][j] += g;
    G[i][j] -= g;
    G[j][i] -= g;
  };
  for (let i = 1; i < n; i++) link(Math.floor(r0() * i), i, 1e-3 * (1 + 9 * r0()));
  for (let e = 0; e < n; e++) {
    const i = Math.floor(r0() * n);
    const j = (i + 1 + Math.floor(r0() * (n - 1))) % n;
    link(i, j, 1e-3 * (1 + 9 * r0()));
  }
  G[0][0] += 1e-2;
  const Cd = Array.from({ length: n }, () => 1e-9 * (1 + 99 * r0()));
  return { A: G.map((row, i) => row.map((g) => -g / Cd[i])), G, Cd };
}

describe('uniform RC ladder: closed-form poles (textbook, from memory)', () => {
  for (const n of [1, 3, 40, 250]) {
    it(`${n} sections, states scaled and reordered`, () => {
      const R = 1e3;
      const C = 1e-9;
      const a = 1 / (R * C);
      const A = zerosM(n);
      for (let k = 0; k < n; k++) {
        A[k][k] = k === n - 1 ? -a : -2 * a;
        if (k > 0) A[k][k - 1] = a;
        if (k < n - 1) A[k][k + 1] = a;
      }
      const { B } = scrambled(A, 17 + n);
      const r = eig(B);
      expect(r.im.every((v) => v === 0)).toBe(true);
      const exact = Array.from({ length: n }, (_, k) => -2 * a * (1 - Math.cos(((2 * k + 1) * Math.PI) / (2 * n + 1))));
      expect(matchEigenvalues(pairs(r.re, r.im), pairs(exact, new Array(n).fill(0)))).toBeLessThan(1e-14 * 4 * a);
      expect(residual(B, r)).toBeLessThan(1e-14);
    });
  }
});

describe('RC networks through the symmetric route', () => {
  for (const n of [30, 200]) {
    it(`random RC ladder, ${n} states: agrees with eigRC and the general path; orthogonal symmetric form`, () => {
      const { A, C, G } = rcLadder(n, 5 + n);
      const r = eig(A);
      expect(residual(A, r)).toBeLessThan(1e-14);
      const rc = eigRC(C, G);
      const scaleA = Math.max(...rc.values.map(Math.abs));
      expect(matchEigenvalues(pairs(r.re, r.im), pairs(rc.values, new Array(n).fill(0)))).toBeLessThan(1e-13 * scaleA);
      const flat = new Float64Array(A.flat());
      const g = eigFlat(flat, n, { structured: false });
      expect(matchEigenvalues(pairs(r.re, r.im), pairs(Array.from(g.re), Array.from(g.im)))).toBeLessThan(1e-13 * scaleA);
      // D⁻¹·A·D symmetric with D = C^(−1/2): the columns of C^(1/2)·V are orthogonal
      expect(maxCos(r.V, C.map((row, i) => Math.sqrt(row[i])))).toBeLessThan(1e-13);
    });
  }
  it('RC mesh with loops (dense symmetric route): agrees with eigRC, orthogonal symmetric form', () => {
    const { A, G, Cd } = rcMesh(40, 23);
    const n = A.length;
    const r = eig(A);
    expect(r.im.every((v) => v === 0)).toBe(true);
    expect(residual(A, r)).toBeLessThan(1e-14);
    const C = zerosM(n).map((row, i) => row.map((_, j) => (i === j ? Cd[i] : 0)));
    const rc = eigRC(C, G);
    const scaleA = Math.max(...rc.values.map(Math.abs));
    expect(matchEigenvalues(pairs(r.re, r.im), pairs(rc.values, new Array(n).fill(0)))).toBeLessThan(1e-13 * scaleA);
    expect(maxCos(r.V, Cd.map(Math.sqrt))).toBeLessThan(1e-13);
  });
  it('a loop whose ratios contradict each other is not symmetrizable: the general path still solves it', () => {
    // every pair is sign-consistent, but around the loop 0→1→2→0 the ratios Aᵢⱼ/Aⱼᵢ multiply to
    // (1/2)·(1/1)·(8/1) = 4, not 1
    const A = [
      [-3, 1, 1],
      [2, -3, 1],
      [8, 1, -3],
    ];
    const r = eig(A);
    expect(residual(A, r)).toBeLessThan(1e-14);
    // characteristic polynomial det(A − λI) evaluated at each eigenvalue (exact identity)
    for (let i = 0; i < 3; i++) {
      if (r.im[i] !== 0) continue;
      const l = r.re[i];
      const M = A.map((row, p) => row.map((v, q) => v - (p === q ? l : 0)));
      const det =
        M[0][0] * (M[1][1] * M[2][2] - M[1][2] * M[2][1]) -
        M[0][1] * (M[1][0] * M[2][2] - M[1][2] * M[2][0]) +
        M[0][2] * (M[1][0] * M[2][1] - M[1][1] * M[2][0]);
      expect(Math.abs(det)).toBeLessThan(1e-12 * frob(A) ** 3);
    }
  });
  it('an RC mesh with couplings perturbed by 1e-6 (loops no longer consistent) takes the general path', () => {
    // on a tree any sign-consistent pattern is symmetrizable; loops are what the check must catch
    const { A } = rcMesh(40, 29);
    const r0 = rng(31);
    const P = A.map((row, i) => row.map((v, j) => (i === j ? v : v * (1 + 1e-6 * (2 * r0() - 1)))));
    const r = eig(P);
    expect(residual(P, r)).toBeLessThan(1e-14);
  });
});

describe('ladders with complex poles: tridiagonal after reordering, vectors by inverse iteration', () => {
  it('uniformly damped ladder: poles −σ ± j·2ω₀·cos(kπ/(n+1)) (textbook, from memory), scaled and reordered', () => {
    // A = −σI + K with K tridiagonal, K[k][k+1] = a_k, K[k+1][k] = −ω₀²/a_k: diagonally similar to
    // ω₀·(skew tridiag(1, 0, −1)), whose eigenvalues are j·2ω₀·cos(kπ/(n+1)) (those of
    // tridiag(1, 0, 1) times j)
    const n = 300;
    const w0 = 1e6;
    const sigma = 2e3;
    const r0 = rng(41);
    const A = zerosM(n);
    for (let k = 0; k < n; k++) A[k][k] = -sigma;
    for (let k = 0; k + 1 < n; k++) {
      // modest spread: a random walk of large factors along the chain makes the poles
      // ill-conditioned in floating point for any method (numpy.linalg.eig too)
      const a = w0 * 10 ** (0.2 * r0() - 0.1);
      A[k][k + 1] = a;
      A[k + 1][k] = -(w0 * w0) / a;
    }
    const { B } = scrambled(A, 43);
    const r = eig(B);
    const exRe: number[] = [];
    const exIm: number[] = [];
    for (let k = 1; k <= n; k++) {
      exRe.push(-sigma);
      exIm.push(2 * w0 * Math.cos((k * Math.PI) / (n + 1)));
    }
    expect(matchEigenvalues(pairs(r.re, r.im), pairs(exRe, exIm))).toBeLessThan(1e-13 * 2 * w0);
    expect(residual(B, r)).toBeLessThan(1e-14);
  });
  for (const n of [40, 300]) {
    it(`random lossy LC ladder, ${n} states: agrees with the Schur-form path`, () => {
      const A = lcLadder(n, 50 + n);
      const r = eig(A);
      expect(residual(A, r)).toBeLessThan(1e-14);
      const g = eigFlat(new Float64Array(A.flat()), n, { inverseIteration: false });
      const scaleA = Math.max(...r.re.map((x, i) => Math.hypot(x, r.im[i])));
      expect(matchEigenvalues(pairs(r.re, r.im), pairs(Array.from(g.re), Array.from(g.im)))).toBeLessThan(1e-12 * scaleA);
    });
  }
  it('two identical decoupled ladders (every pole twice) keep independent vectors', () => {
    const m = 30;
    const L = lcLadder(m, 61);
    const A = zerosM(2 * m);
    for (let i = 0; i < m; i++) {
      for (let j = 0; j < m; j++) {
        A[i][j] = L[i][j];
        A[m + i][m + j] = L[i][j];
      }
    }
    const r = eig(A);
    expect(residual(A, r)).toBeLessThan(1e-14);
    // the eigenvector matrix is not singular: its smallest singular value is bounded away from 0
    const VtV = r.V[0].map((_, a) => r.V[0].map((__, b) => r.V.reduce((acc, row) => acc + row[a] * row[b], 0)));
    const s = eig(VtV).re; // symmetric positive semidefinite: real eigenvalues
    expect(Math.min(...s)).toBeGreaterThan(1e-6);
  });
});

describe('nearly defective poles keep nearly dependent vectors (what modal.ts detects)', () => {
  // a critically damped section (vC, iL): vC' = iL/C, iL' = (−vC − R·iL)/L with R = 2√(L/C) has
  // the double pole −R/(2L) (textbook, from memory); coupled into a lossy ladder by c·ω₀ it splits.
  // c = 1e-10: the split stays at rounding level, the poles count as repeated (Schur-form path);
  // c = 1e-3: split by about 5e-4 of the pole (measured), inverse iteration on the ladder path
  for (const c of [1e-10, 1e-3]) {
    it(`coupling ${c}`, () => {
      const L = 1e-3;
      const C = 1e-6;
      const R = 2 * Math.sqrt(L / C);
      const ladder = lcLadder(38, 71);
      const n = 40;
      const A = zerosM(n);
      A[0][1] = 1 / C;
      A[1][0] = -1 / L;
      A[1][1] = -R / L;
      for (let i = 0; i < 38; i++) for (let j = 0; j < 38; j++) A[i + 2][j + 2] = ladder[i][j];
      const k = c * Math.sqrt(1 / (L * C));
      A[1][2] = k;
      A[2][1] = -k;
      const p = -R / (2 * L);
      const r = eig(A);
      expect(residual(A, r)).toBeLessThan(1e-13);
      const near = r.re.map((_, i) => i).filter((i) => Math.hypot(r.re[i] - p, r.im[i]) < 1e-2 * Math.abs(p));
      expect(near.length).toBe(2);
      // the two columns (two real vectors, or Re v and Im v of a pair) are nearly dependent:
      // σmin/σmax of the n×2 matrix they form, from its 2×2 Gram matrix
      const [x, y] = near.map((col) => r.V.map((row) => row[col]));
      const g11 = x.reduce((acc, v) => acc + v * v, 0);
      const g22 = y.reduce((acc, v) => acc + v * v, 0);
      const g12 = x.reduce((acc, v, i) => acc + v * y[i], 0);
      const mean = (g11 + g22) / 2;
      const dev = Math.hypot((g11 - g22) / 2, g12);
      expect(Math.sqrt(Math.max(mean - dev, 0) / (mean + dev))).toBeLessThan(1e-2);
    });
  }
});
