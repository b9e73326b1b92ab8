import { type Mat, add, cols, matmul, maxAbs, transpose, zeros } from '../linalg/dense.js';
import { pinvSolve, rankSplit, solveSquare } from '../linalg/factor.js';

/**
 * Reduce a descriptor system  E·z' = A·z + B·u  to an explicit ODE on a minimal set of
 * coordinates p:
 *
 *   z = Zp·p + Σ_j Zu[j]·u^(j)          p' = F·p + Σ_j G[j]·u^(j)
 *
 * Method: split the equations into differential rows (range of E·Zp) and algebraic rows (its left
 * null space); solve the algebraic rows for as many coordinates as they fix and substitute; repeat
 * until E·Zp has full column rank. Each substitution may bring in the derivative of an input: that
 * is how a capacitor across a voltage source (or an inductor in series with a current source)
 * ends up with a state that follows the source instead of a state of its own.
 */
export interface Reduction {
  Zp: Mat;
  Zu: Mat[];
  F: Mat;
  G: Mat[];
  /**
   * Set by the index-one reduction: p are the differential unknowns `d` themselves and
   * E_dd·p = the stored charges/fluxes of those rows, so the state after an instant follows
   * from charge and flux conservation alone (no algebraic branch can carry an impulse).
   */
  index1?: { d: number[]; Edd: Mat };
}

export class ReductionError extends Error {}

export function reduceDescriptor(E: Mat, A: Mat, B: Mat, nz: number, m: number, relTol = 1e-10): Reduction {
  let Zp: Mat = Array.from({ length: nz }, (_, i) => Array.from({ length: nz }, (_, j) => (i === j ? 1 : 0)));
  let np = nz;
  let Zu: Mat[] = [zeros(nz, m)];
  const scaleA = Math.max(1e-300, maxAbs(A));
  // rank decisions are relative to the size of the matrices themselves, so that a direction that
  // only round-off connects to a capacitor or inductor does not count as a state
  const scaleE = Math.max(1e-300, maxAbs(E)) * 1e3;
  for (let iter = 0; iter <= nz + 1; iter++) {
    const M = matmul(E, Zp, np);
    const R = residualInputs(E, A, B, Zu, m);
    const split = rankSplit(M, np, relTol, scaleE);
    const U2t = transpose(split.leftNull, nz - split.rank);
    const AZp = matmul(A, Zp, np);
    const Kalg = matmul(U2t, AZp, np);
    const ks = rankSplit(Kalg, np, relTol, scaleA);
    if (ks.rank === 0) {
      requireZero(R.map((Rj) => matmul(U2t, Rj, m)), 'the circuit equations constrain the sources themselves', inputScale(R, scaleA));
      if (split.rank !== np) throw new ReductionError('the circuit equations do not determine every voltage and current');
      const U1t = transpose(split.range, split.rank);
      const square = matmul(U1t, M, np);
      const left = (X: Mat) => solveSquare(square, matmul(U1t, X, cols(X, m)));
      // A rate that is round-off of the terms it was computed from is an exact zero (an inductor
      // straight across a source, a capacitor on a node nothing else touches): compare each entry
      // with the same product taken in absolute values, |(U1ᵀ·M)⁻¹|·|U1ᵀ|·|A|·|Zp|.
      const abs = (X: Mat) => X.map((row) => row.map(Math.abs));
      const inv = solveSquare(square, square.map((_, i) => square.map((__, j) => (i === j ? 1 : 0))));
      const mag = matmul(abs(inv), matmul(abs(U1t), matmul(abs(A), abs(Zp), np), np), np);
      // (also below 1e-13 of the fastest coupling: slower than any eigen-solver can resolve next to it)
      const F = left(AZp).map((row, i) => row.map((v, j) => (Math.abs(v) <= Math.max(1e-12 * mag[i][j], 1e-13 * scaleA) ? 0 : v)));
      const G = R.map((Rj) => left(Rj));
      return { Zp, Zu, F, G };
    }
    // Keep the q independent combinations of the algebraic rows; the others must involve sources only.
    const Qt = transpose(ks.range, ks.rank);
    const rest = transpose(ks.leftNull, Kalg.length - ks.rank);
    requireZero(R.map((Rj) => matmul(rest, matmul(U2t, Rj, m), m)), 'the circuit equations constrain the sources themselves', inputScale(R, scaleA));
    const Kq = matmul(Qt, Kalg, np);
    const Rq = R.map((Rj) => matmul(Qt, matmul(U2t, Rj, m), m));
    // Kq·p + Σ Rq[j]·u^(j) = 0  ⇒  p = Nk·p' − Kq⁺·Σ Rq[j]·u^(j)
    const newZu: Mat[] = [];
    for (let j = 0; j < R.length; j++) {
      const part = matmul(Zp, pinvSolve(Kq, Rq[j], np), m).map((row) => row.map((v) => -v));
      newZu.push(j < Zu.length ? add(Zu[j], part) : part);
    }
    // round-off below 1e-14 of the (equilibrated) matrices' scale is no coupling: without this, a
    // derivative-of-source term of size 1e-32 would survive as a spurious Dirac read-out
    const reference = Math.max(...newZu.map(maxAbs));
    Zu = trimTrailingZero(newZu.map((Z) => Z.map((row) => row.map((v) => (Math.abs(v) < 1e-14 * reference ? 0 : v)))));
    const Nk = ks.nullSpace;
    np = np - ks.rank;
    Zp = matmul(Zp, Nk, np);
    if (np === 0) {
      return { Zp, Zu, F: [], G: Zu.map(() => []) };
    }
  }
  throw new ReductionError('the reduction of the circuit equations did not terminate');
}

/**
 * Input terms of E·z' − A·z − B·u = 0 after substituting z = Zp·p + Σ Zu[j]·u^(j):
 * the equation reads  E·Zp·p' = A·Zp·p + Σ_j R[j]·u^(j)  with
 * R[0] = A·Zu[0] + B,  R[j] = A·Zu[j] − E·Zu[j−1].
 */
function residualInputs(E: Mat, A: Mat, B: Mat, Zu: Mat[], m: number): Mat[] {
  const R: Mat[] = [];
  for (let j = 0; j <= Zu.length; j++) {
    let Rj = j < Zu.length ? matmul(A, Zu[j], m) : zeros(A.length, m);
    if (j === 0) Rj = add(Rj, B);
    if (j > 0) Rj = add(Rj, matmul(E, Zu[j - 1], m), -1);
    R.push(Rj);
  }
  return trimTrailingZero(R);
}

function inputScale(R: Mat[], scaleA: number): number {
  return Math.max(1, scaleA, ...R.map(maxAbs));
}

function trimTrailingZero(list: Mat[]): Mat[] {
  const out = list.slice();
  while (out.length > 1 && out[out.length - 1].every((row) => row.every((v) => Math.abs(v) < 1e-300))) out.pop();
  return out;
}

/** The blocks must vanish up to round-off relative to `scale` (the size of the terms they came from). */
function requireZero(blocks: Mat[], why: string, scale: number): void {
  for (const b of blocks) {
    const big = maxAbs(b);
    if (big > 1e-9 * scale) {
      throw new ReductionError(why);
    }
  }
}

/**
 * Choose, in the given order of preference, rows of X (each row: one physical quantity as a linear
 * function of p) that are linearly independent; returns their indices (as many as X has columns).
 */
export function independentRows(X: Mat, np: number): number[] {
  // Gram–Schmidt (twice) with sparse bookkeeping: each basis vector keeps the list of its nonzero
  // entries, so rows that touch few p (one capacitor's node voltages) cost O(their support), and a
  // circuit of a thousand states is not an O(n³) affair
  const basis: { v: Float64Array; nz: number[] }[] = [];
  const byCol: number[][] = Array.from({ length: np }, () => []);
  const chosen: number[] = [];
  const v = new Float64Array(np);
  const mark = new Int32Array(np).fill(-1);
  for (let i = 0; i < X.length && chosen.length < np; i++) {
    const row = X[i];
    const nz: number[] = [];
    let nrm0 = 0;
    for (let k = 0; k < np; k++) {
      v[k] = row[k];
      if (row[k] !== 0) {
        nz.push(k);
        mark[k] = i;
        nrm0 = Math.hypot(nrm0, row[k]);
      }
    }
    if (nrm0 === 0) continue;
    for (let pass = 0; pass < 2; pass++) {
      // only basis vectors sharing an entry with v can have a nonzero product with it; entries
      // that fill in while v is reduced make later basis vectors count too (the same order and
      // products as plain modified Gram–Schmidt, minus the exact zeros)
      const touched = new Uint8Array(basis.length);
      for (const k of nz) for (const b of byCol[k]) touched[b] = 1;
      for (let b = 0; b < basis.length; b++) {
        if (!touched[b]) continue;
        const q = basis[b];
        let d = 0;
        for (const k of q.nz) d += q.v[k] * v[k];
        if (d === 0) continue;
        for (const k of q.nz) {
          v[k] -= d * q.v[k];
          if (mark[k] !== i) {
            mark[k] = i;
            nz.push(k);
            for (const c of byCol[k]) touched[c] = 1;
          }
        }
      }
    }
    let nrm = 0;
    for (const k of nz) nrm = Math.hypot(nrm, v[k]);
    if (nrm <= 1e-8 * nrm0) continue;
    const q = new Float64Array(np);
    const qnz: number[] = [];
    for (const k of nz) {
      if (v[k] === 0) continue;
      q[k] = v[k] / nrm;
      qnz.push(k);
      byCol[k].push(basis.length);
    }
    basis.push({ v: q, nz: qnz });
    chosen.push(i);
  }
  return chosen;
}

