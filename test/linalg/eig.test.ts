/**
 * The dense eigen-solvers of src/linalg/eig.ts.
 *
 * References: the defining identity A·V = V·D itself (residuals), ml-matrix's
 * EigenvalueDecomposition (agreement on a few cases), and for exactly known spectra textbook
 * results from memory (named beside each check). numpy.linalg.eig golden data is checked in
 * eig-golden.test.ts.
 */
import { EigenvalueDecomposition, Matrix } from 'ml-matrix';
import { describe, expect, it } from 'vitest';
import { eig, eigRC, eigSymmetric } from '../../src/linalg/eig.js';
import { frob, lcLadder, matchEigenvalues, pairs, randomMatrix, rcLadder, residual, rng, zerosM } from './matrices.js';

const TOL = 1e-12;

function checkConvention(r: { re: number[]; im: number[] }): void {
  for (let i = 0; i < r.re.length; i++) {
    if (r.im[i] > 0) {
      expect(r.im[i + 1]).toBe(-r.im[i]);
      expect(r.re[i + 1]).toBe(r.re[i]);
      i++;
    } else expect(r.im[i]).toBe(0);
  }
}

describe('eig: residual ‖AV − VD‖/‖A‖ (reference: the defining identity)', () => {
  for (const n of [1, 2, 3, 7, 20, 60, 150]) {
    it(`random dense ${n}×${n}`, () => {
      const A = randomMatrix(n, 1000 + n);
      const r = eig(A);
      checkConvention(r);
      expect(residual(A, r)).toBeLessThan(TOL);
    });
  }
  for (const n of [20, 80, 200]) {
    it(`RC ladder, ${n} states: real negative poles`, () => {
      const { A } = rcLadder(n);
      const r = eig(A);
      expect(residual(A, r)).toBeLessThan(TOL);
      expect(r.im.every((v) => v === 0)).toBe(true);
      expect(Math.max(...r.re)).toBeLessThan(0);
    });
    it(`lossy LC ladder, ${n} states: stable, mostly complex`, () => {
      const A = lcLadder(n);
      const r = eig(A);
      checkConvention(r);
      expect(residual(A, r)).toBeLessThan(TOL);
      expect(Math.max(...r.re)).toBeLessThan(0);
      expect(r.im.filter((v) => v !== 0).length).toBeGreaterThan(n / 2);
    });
  }
  it('complex pair columns are Re v and Im v of the eigenvalue with im > 0', () => {
    // rotation generator [[0, −1], [1, 0]]: eigenvalue +j has eigenvector (1, −j)/√2 (textbook, from memory)
    const r = eig([
      [0, -1],
      [1, 0],
    ]);
    expect(r.re).toEqual([0, 0]);
    expect(r.im[0]).toBeCloseTo(1, 15);
    const [[a, b], [c, d]] = r.V;
    // v = (a + jb, c + jd) satisfies A·v = j·v  ⇔  −(c + jd) = j(a + jb)  ⇔  c = b, d = −a
    expect(c).toBeCloseTo(b, 14);
    expect(d).toBeCloseTo(-a, 14);
    expect(a * a + b * b + c * c + d * d).toBeCloseTo(1, 14);
  });
  it('badly scaled (graded) matrix: balancing keeps the residual small', () => {
    const n = 12;
    const B = randomMatrix(n, 5);
    const s = Array.from({ length: n }, (_, i) => 10 ** (i - 6));
    const A = B.map((row, i) => row.map((v, j) => (v * s[i]) / s[j]));
    const r = eig(A);
    const rb = eig(B);
    expect(matchEigenvalues(pairs(r.re, r.im), pairs(rb.re, rb.im))).toBeLessThan(1e-10);
  });
});

describe('eig: special spectra (textbook, from memory)', () => {
  it('diagonal and triangular matrices: eigenvalues are the diagonal', () => {
    const T = [
      [3, 1, 4],
      [0, -1, 5],
      [0, 0, 2],
    ];
    const r = eig(T);
    expect([...r.re].sort((x, y) => x - y)).toEqual([-1, 2, 3]);
    expect(residual(T, r)).toBeLessThan(TOL);
  });
  it('zero matrix and 0×0', () => {
    const r = eig(zerosM(4));
    expect(r.re).toEqual([0, 0, 0, 0]);
    expect(eig([]).re).toEqual([]);
  });
  it('defective Jordan block does not crash and finds the eigenvalue', () => {
    const n = 6;
    const J = zerosM(n);
    for (let i = 0; i < n; i++) {
      J[i][i] = -2;
      if (i + 1 < n) J[i][i + 1] = 1;
    }
    const r = eig(J);
    expect(r.re.every(Number.isFinite)).toBe(true);
    expect(r.V.flat().every(Number.isFinite)).toBe(true);
    // perturbation theory: a Jordan block of size k moves its eigenvalue by O(ε^(1/k))
    for (let i = 0; i < n; i++) expect(Math.hypot(r.re[i] + 2, r.im[i])).toBeLessThan(1e-2);
    expect(residual(J, r)).toBeLessThan(TOL);
  });
  it('critically damped series RLC (double pole −R/2L) does not crash', () => {
    // x = (vC, iL): vC' = iL/C, iL' = (−vC − R·iL)/L, with R = 2√(L/C): double pole −R/(2L)
    const L = 1e-3;
    const C = 1e-6;
    const R = 2 * Math.sqrt(L / C);
    const A = [
      [0, 1 / C],
      [-1 / L, -R / L],
    ];
    const r = eig(A);
    const p = -R / (2 * L);
    for (let i = 0; i < 2; i++) expect(Math.hypot(r.re[i] - p, r.im[i]) / Math.abs(p)).toBeLessThan(1e-7);
    expect(residual(A, r)).toBeLessThan(TOL);
  });
  it('repeated semisimple eigenvalues (identity blocks) keep independent vectors', () => {
    const r0 = rng(3);
    const n = 10;
    // A = Q·diag(1,1,1,2,2,−1,−1,−1,−1,5)·Q⁻¹ with a random well-conditioned Q
    const d = [1, 1, 1, 2, 2, -1, -1, -1, -1, 5];
    const Q = Array.from({ length: n }, (_, i) => Array.from({ length: n }, (_, j) => (i === j ? 3 : 0) + r0() - 0.5));
    const inv = inverseOf(Q);
    const A = Q.map((qi) => Array.from({ length: n }, (_, j) => qi.reduce((s, q, k) => s + q * d[k] * inv[k][j], 0)));
    const r = eig(A);
    expect(matchEigenvalues(pairs(r.re, r.im), pairs(d, new Array(n).fill(0)))).toBeLessThan(1e-10 * frob(A));
    expect(residual(A, r)).toBeLessThan(TOL);
    // the eigenvector matrix is not singular: its smallest singular value is bounded away from 0
    const s = new Matrix(r.V).transpose().mmul(new Matrix(r.V));
    const ev = new EigenvalueDecomposition(s, { assumeSymmetric: true }).realEigenvalues;
    expect(Math.min(...ev)).toBeGreaterThan(1e-6);
  });
  it('non-finite input is refused', () => {
    expect(() => eig([[NaN]])).toThrow(/non-finite/);
    expect(() => eig([[1, 2]])).toThrow(/not square/);
  });
});

function inverseOf(Q: number[][]): number[][] {
  // Gauss–Jordan with partial pivoting (textbook, from memory)
  const n = Q.length;
  const M = Q.map((r, i) => [...r, ...Array.from({ length: n }, (_, j) => (i === j ? 1 : 0))]);
  for (let c = 0; c < n; c++) {
    let p = c;
    for (let i = c + 1; i < n; i++) if (Math.abs(M[i][c]) > Math.abs(M[p][c])) p = i;
    [M[c], M[p]] = [M[p], M[c]];
    const piv = M[c][c];
    for (let j = 0; j < 2 * n; j++) M[c][j] /= piv;
    for (let i = 0; i < n; i++) {
      if (i === c) continue;
      const f = M[i][c];
      for (let j = 0; j < 2 * n; j++) M[i][j] -= f * M[c][j];
    }
  }
  return M.map((r) => r.slice(n));
}

describe('eig agrees with ml-matrix EigenvalueDecomposition (reference: ml-matrix)', () => {
  const cases: [string, number[][]][] = [
    ['random 8×8', randomMatrix(8, 42)],
    ['random 40×40', randomMatrix(40, 43)],
    ['lossy LC ladder 30', lcLadder(30)],
    ['RC ladder 30', rcLadder(30).A],
  ];
  for (const [name, A] of cases) {
    it(name, () => {
      const ours = eig(A);
      const ml = new EigenvalueDecomposition(new Matrix(A), { assumeSymmetric: false });
      const scale = Math.max(...ours.re.map((x, i) => Math.hypot(x, ours.im[i])));
      const d = matchEigenvalues(pairs(ours.re, ours.im), pairs(ml.realEigenvalues, ml.imaginaryEigenvalues));
      expect(d / scale).toBeLessThan(1e-12);
      // same convention: ml-matrix's V also satisfies the residual test with its (re, im)
      const mlr = { re: ml.realEigenvalues, im: ml.imaginaryEigenvalues, V: ml.eigenvectorMatrix.to2DArray() };
      const mlres = residual(A, mlr) / (frob(mlr.V) / Math.sqrt(A.length));
      expect(mlres).toBeLessThan(1e-10);
      // eigen-directions agree: for each of our real eigenvectors, the matching ml-matrix column is parallel
      for (let j = 0; j < A.length; j++) {
        if (ours.im[j] !== 0) continue;
        const k = ml.realEigenvalues.findIndex((x, kk) => ml.imaginaryEigenvalues[kk] === 0 && Math.abs(x - ours.re[j]) <= 1e-9 * scale);
        if (k < 0) continue;
        const u = ours.V.map((r) => r[j]);
        const w = mlr.V.map((r) => r[k]);
        const cos = Math.abs(u.reduce((s, x, i) => s + x * w[i], 0)) / (Math.hypot(...u) * Math.hypot(...w));
        expect(cos).toBeGreaterThan(1 - 1e-9);
      }
    });
  }
});

describe('eigSymmetric (reference: orthogonality and the defining identity)', () => {
  for (const n of [1, 2, 10, 100]) {
    it(`random symmetric ${n}×${n}`, () => {
      const B = randomMatrix(n, 77 + n);
      const S = B.map((r, i) => r.map((v, j) => v + B[j][i]));
      const { values, V } = eigSymmetric(S);
      for (let i = 1; i < n; i++) expect(values[i]).toBeGreaterThanOrEqual(values[i - 1]);
      const nS = frob(S);
      let res = 0;
      let orth = 0;
      for (let i = 0; i < n; i++) {
        for (let j = 0; j < n; j++) {
          let sv = 0;
          let vv = 0;
          for (let k = 0; k < n; k++) {
            sv += S[i][k] * V[k][j];
            vv += V[k][i] * V[k][j];
          }
          res = Math.max(res, Math.abs(sv - V[i][j] * values[j]));
          orth = Math.max(orth, Math.abs(vv - (i === j ? 1 : 0)));
        }
      }
      expect(res / nS).toBeLessThan(1e-13);
      expect(orth).toBeLessThan(1e-13 * Math.max(n, 10));
    });
  }
  it('agrees with eig on the same symmetric matrix', () => {
    const B = randomMatrix(30, 9);
    const S = B.map((r, i) => r.map((v, j) => v + B[j][i]));
    const a = eigSymmetric(S).values;
    const b = eig(S).re.sort((x, y) => x - y);
    a.forEach((v, i) => expect(Math.abs(v - b[i])).toBeLessThan(1e-12 * frob(S)));
  });
  it('path graph Laplacian: eigenvalues 2 − 2cos(kπ/(n+1)) (textbook, from memory)', () => {
    const n = 50;
    const S = zerosM(n);
    for (let i = 0; i < n; i++) {
      S[i][i] = 2;
      if (i + 1 < n) S[i][i + 1] = S[i + 1][i] = -1;
    }
    const { values } = eigSymmetric(S);
    values.forEach((v, k) => expect(Math.abs(v - (2 - 2 * Math.cos(((k + 1) * Math.PI) / (n + 1))))).toBeLessThan(1e-13));
  });
});

describe('eigRC: RC networks through the symmetric problem', () => {
  for (const n of [20, 120]) {
    it(`RC ladder ${n}: same poles as eig(−C⁻¹G), modes satisfy A·V = V·M`, () => {
      const { A, C, G } = rcLadder(n);
      const rc = eigRC(C, G);
      expect(rc.rank).toBe(n);
      const ge = eig(A).re.sort((x, y) => x - y);
      const scale = Math.max(...ge.map(Math.abs));
      rc.values.forEach((v, i) => expect(Math.abs(v - ge[i]) / scale).toBeLessThan(1e-12));
      let res = 0;
      for (let i = 0; i < n; i++)
        for (let j = 0; j < n; j++) {
          let av = 0;
          for (let k = 0; k < n; k++) av += A[i][k] * rc.V[k][j];
          res = Math.max(res, Math.abs(av - rc.V[i][j] * rc.values[j]) / (scale * Math.max(...rc.V.map((r) => Math.abs(r[j])))));
        }
      expect(res).toBeLessThan(1e-12);
    });
  }
  it('semidefinite C: a capacitance-free middle node is eliminated (Kron reduction)', () => {
    // gnd –R1– a(C1) –R2– b(no C) –R3– c(C2) –R4– gnd. Eliminating b joins a and c through R2+R3.
    const [R1, R2, R3, R4, C1, C2] = [1e3, 2e3, 3e3, 4e3, 1e-6, 2e-6];
    const G = [
      [1 / R1 + 1 / R2, -1 / R2, 0],
      [-1 / R2, 1 / R2 + 1 / R3, -1 / R3],
      [0, -1 / R3, 1 / R3 + 1 / R4],
    ];
    const C = [
      [C1, 0, 0],
      [0, 0, 0],
      [0, 0, C2],
    ];
    const rc = eigRC(C, G);
    expect(rc.rank).toBe(2);
    // the 2-state model written by hand: Rm = R2 + R3 between a and c
    const Rm = R2 + R3;
    const A2 = [
      [-(1 / R1 + 1 / Rm) / C1, 1 / Rm / C1],
      [1 / Rm / C2, -(1 / R4 + 1 / Rm) / C2],
    ];
    const e2 = eig(A2).re.sort((x, y) => x - y);
    rc.values.forEach((v, i) => expect(Math.abs(v - e2[i]) / Math.abs(e2[0])).toBeLessThan(1e-12));
    // modes in node coordinates satisfy G·v = −λ·C·v on every node (including b's KCL)
    for (let j = 0; j < 2; j++) {
      const v = rc.V.map((r) => r[j]);
      for (let i = 0; i < 3; i++) {
        const gv = G[i].reduce((s, g, k) => s + g * v[k], 0);
        const cv = C[i].reduce((s, c, k) => s + c * v[k], 0);
        expect(Math.abs(gv + rc.values[j] * cv)).toBeLessThan(1e-12 * (1 / R1) * Math.max(...v.map(Math.abs)));
      }
    }
  });
  it('a floating capacitance-free node is refused', () => {
    expect(() =>
      eigRC(
        [
          [1, 0],
          [0, 0],
        ],
        [
          [1, 0],
          [0, 0],
        ],
      ),
    ).toThrow(/no resistive path/);
  });
});
