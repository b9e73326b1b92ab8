import { type Mat, zeros } from '../linalg/dense.js';
import { solveSquare } from '../linalg/factor.js';
import { luFactor, luSingular } from '../linalg/lu.js';
import type { Reduction } from './reduce.js';

/**
 * The common case, solved on the circuit's own variables: the unknowns split into differential ones
 * (a capacitor's node or an inductor's current: a nonzero column of E) and algebraic ones (the rest).
 * When E restricted to the differential unknowns and A restricted to the algebraic ones are both
 * nonsingular, the algebraic unknowns follow from a Schur complement:
 *
 *   z_a = −A_aa⁻¹·(A_ad·p + B_a·u),   E_dd·p' = (A_dd − A_da·A_aa⁻¹·A_ad)·p + (B_d − A_da·A_aa⁻¹·B_a)·u
 *
 * No rotated bases are involved, so a zero coupling stays an exact zero (the general reduction in
 * reduce.ts mixes variables of very different scale and leaves round-off where the circuit has
 * none). Returns null when the conditions do not hold; the caller then uses the general reduction.
 */
export function reduceIndexOne(E: Mat, A: Mat, B: Mat, nz: number, m: number): Reduction | null {
  const d: number[] = [];
  const a: number[] = [];
  // a variable is differential when its row or its column of E has a nonzero (one pass over E)
  const touched = new Uint8Array(nz);
  for (let i = 0; i < nz; i++) {
    const row = E[i];
    for (let j = 0; j < nz; j++) {
      if (row[j] !== 0) {
        touched[i] = 1;
        touched[j] = 1;
      }
    }
  }
  for (let i = 0; i < nz; i++) (touched[i] ? d : a).push(i);
  const sub = (M: Mat, rows: number[], cols: number[]) => rows.map((i) => cols.map((j) => M[i][j]));
  const Edd = sub(E, d, d);
  const Aaa = sub(A, a, a);
  if (!wellConditioned(Edd) || !wellConditioned(Aaa)) return null;
  let AaaInvAad: Mat;
  let AaaInvBa: Mat;
  let F: Mat;
  let G0: Mat;
  try {
    const Aad = sub(A, a, d);
    const Ba = a.map((i) => B[i].slice());
    AaaInvAad = a.length ? solveSquare(Aaa, Aad) : [];
    AaaInvBa = a.length && m ? solveSquare(Aaa, Ba) : a.map(() => new Array<number>(m).fill(0));
    const Ada = sub(A, d, a);
    // A difference that is round-off of the terms it came from (below 1e-13 of their magnitude)
    // is an exact zero: an inductor straight across a source has no decay at all, not 5e-15/s.
    const chop = (v: number, mag: number) => (Math.abs(v) <= 1e-13 * mag ? 0 : v);
    // A_da is sparse (a capacitor node touches a few resistors): only its nonzeros contribute,
    // and a row of it without any leaves that row of A_dd (and B_d) as it is
    const correct = (rowA: number[], r: number, X: Mat): number[] => {
      const out = rowA.slice();
      const touch: number[] = [];
      Ada[r].forEach((v, k) => v !== 0 && touch.push(k));
      if (!touch.length) return out;
      for (let j = 0; j < out.length; j++) {
        let p = 0;
        let mag = Math.abs(rowA[j]);
        for (const k of touch) {
          const t = Ada[r][k] * X[k][j];
          p += t;
          mag += Math.abs(t);
        }
        out[j] = chop(rowA[j] - p, mag);
      }
      return out;
    };
    const Fr = d.map((i, r) => correct(d.map((j) => A[i][j]), r, AaaInvAad));
    const Gr = d.map((i, r) => (m ? correct(B[i].slice(), r, AaaInvBa) : []));
    // E_dd is diagonal when every capacitor has a grounded or otherwise private node: a row scaling
    const diagonal = Edd.every((row, i) => row.every((v, j) => i === j || v === 0));
    const divide = (M: Mat) => M.map((row, i) => row.map((v) => v / Edd[i][i]));
    F = d.length ? (diagonal ? divide(Fr) : solveSquare(Edd, Fr)) : [];
    G0 = d.length && m ? (diagonal ? divide(Gr) : solveSquare(Edd, Gr)) : d.map(() => new Array<number>(m).fill(0));
  } catch {
    return null;
  }
  const np = d.length;
  const Zp = zeros(nz, np);
  const Zu0 = zeros(nz, m);
  d.forEach((i, k) => (Zp[i][k] = 1));
  a.forEach((i, r) => {
    for (let k = 0; k < np; k++) Zp[i][k] = -AaaInvAad[r][k];
    for (let j = 0; j < m; j++) Zu0[i][j] = -AaaInvBa[r][j];
  });
  return { Zp, Zu: [Zu0], F, G: [G0], index1: { d, Edd } };
}

/** Nonsingular with a pivot ratio that leaves room for the digits we need (a cheap condition test). */
function wellConditioned(M: Mat): boolean {
  if (M.length === 0) return true;
  // a diagonal matrix (grounded capacitors, inductors): its own pivots
  if (M.every((row, i) => row.every((v, j) => v === 0 || i === j))) {
    let lo = Infinity;
    let hi = 0;
    M.forEach((row, i) => {
      lo = Math.min(lo, Math.abs(row[i]));
      hi = Math.max(hi, Math.abs(row[i]));
    });
    return lo > 0 && Number.isFinite(hi) && lo > 1e-12 * hi;
  }
  const f = luFactor(M);
  return !luSingular(f) && f.minPivot > 1e-12 * f.maxPivot;
}
