import { type Mat, type Vec, zeros } from '../linalg/dense.js';
import { solveSquare } from '../linalg/factor.js';
import { type LU, luFactor, luSingular, luSolve, luSolveFlat } from '../linalg/lu.js';
import type { Descriptor, SparseRows } from './descriptor.js';
import type { Reduction } from './reduce.js';

/** One row's nonzeros: ascending columns and their values. */
export interface SparseRow {
  idx: Int32Array;
  val: Float64Array;
}

/**
 * The index-one reduction with what the model builder reads without forming every dense matrix
 * (Zp, F and E_dd are formed on first use only).
 */
export interface IndexOneReduction extends Reduction {
  index1: { d: number[]; Edd: Mat; eddDiagonal: Float64Array | null };
  /** F by rows, nonzeros only */
  Frows: SparseRow[];
  /** row i of Zp: z_i in terms of p */
  zpRow(i: number): Vec;
  /** k when z_i is p_k itself (a differential unknown), else −1 */
  unitAt(i: number): number;
}

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
 * Works on the descriptor's sparse rows: a thousand-state circuit touches a few entries per row.
 */
export function reduceIndexOne(desc: Descriptor, m: number): IndexOneReduction | null {
  const { nz, Erows: E, Arows: A, B } = desc;
  // a variable is differential when its row or its column of E has a nonzero
  const touched = new Uint8Array(nz);
  for (let i = 0; i < nz; i++) {
    for (const [j, v] of E[i]) {
      if (v !== 0) {
        touched[i] = 1;
        touched[j] = 1;
      }
    }
  }
  const d: number[] = [];
  const a: number[] = [];
  for (let i = 0; i < nz; i++) (touched[i] ? d : a).push(i);
  const np = d.length;
  const na = a.length;
  const posD = new Int32Array(nz).fill(-1);
  const posA = new Int32Array(nz).fill(-1);
  d.forEach((i, k) => (posD[i] = k));
  a.forEach((i, r) => (posA[i] = r));
  // E_dd is diagonal when every capacitor has a grounded or otherwise private node: a row scaling
  let diagonal = true;
  for (const i of d) for (const [j, v] of E[i]) if (v !== 0 && j !== i) diagonal = false;
  const eddDiagonal = diagonal ? Float64Array.from(d, (i) => E[i].get(i) ?? 0) : null;
  const Edd = diagonal ? null : denseSub(E, d, posD, np);
  if (!(eddDiagonal ? diagonalConditioned(eddDiagonal) : wellConditioned(Edd!, null))) return null;
  // A_aa is block diagonal after a permutation (its connected components: a node between a
  // resistor and an inductor is a block of one). Partial pivoting never leaves a block and the
  // substitutions skip the zeros between blocks, so factoring and solving block by block gives the
  // very numbers one LU of A_aa would, at the cost of the blocks.
  const root = a.map((_, r) => r);
  const find = (r: number): number => (root[r] === r ? r : (root[r] = find(root[r])));
  a.forEach((i, r) => {
    for (const [j, v] of A[i]) if (v !== 0 && posA[j] >= 0 && posA[j] !== r) root[find(r)] = find(posA[j]);
  });
  const blocks = new Map<number, number[]>();
  for (let r = 0; r < na; r++) {
    const b = find(r);
    const list = blocks.get(b);
    if (list) list.push(r);
    else blocks.set(b, [r]);
  }
  const Xrows: SparseRow[] = new Array(na);
  const AaaInvBa: Mat = new Array(na);
  let minPivot = Infinity;
  let maxPivot = 0;
  const local = new Int32Array(na);
  for (const rows of blocks.values()) {
    const size = rows.length;
    rows.forEach((r, q) => (local[r] = q));
    const M = rows.map((r) => {
      const row = new Array<number>(size).fill(0);
      for (const [j, v] of A[a[r]]) if (posA[j] >= 0) row[local[posA[j]]] = v;
      return row;
    });
    const f = luFactor(M);
    minPivot = Math.min(minPivot, f.minPivot);
    maxPivot = Math.max(maxPivot, f.maxPivot);
    if (luSingular(f)) return null;
    // the columns of p this block's rows reach, ascending
    const cols = [...new Set(rows.flatMap((r) => [...A[a[r]]].filter(([j, v]) => v !== 0 && posD[j] >= 0).map(([j]) => posD[j])))].sort((x, y) => x - y);
    const nc = cols.length;
    const at = new Map(cols.map((c, q) => [c, q]));
    const rhs = new Float64Array(size * nc);
    rows.forEach((r, q) => {
      for (const [j, v] of A[a[r]]) if (posD[j] >= 0) rhs[q * nc + at.get(posD[j])!] = v;
    });
    const X = nc ? luSolveFlat(f, rhs, nc) : rhs;
    rows.forEach((r, q) => {
      const keep: number[] = [];
      for (let c = 0; c < nc; c++) if (X[q * nc + c] !== 0) keep.push(c);
      Xrows[r] = { idx: Int32Array.from(keep, (c) => cols[c]), val: Float64Array.from(keep, (c) => X[q * nc + c]) };
    });
    const Ba = m ? luSolve(f, rows.map((r) => B[a[r]].slice())) : rows.map(() => []);
    rows.forEach((r, q) => (AaaInvBa[r] = Ba[q]));
  }
  // the pivot ratio that leaves room for the digits we need (a cheap condition test)
  if (na && !(minPivot > 1e-12 * maxPivot)) return null;

  // A difference that is round-off of the terms it came from (below 1e-13 of their magnitude)
  // is an exact zero: an inductor straight across a source has no decay at all, not 5e-15/s.
  const chop = (v: number, mag: number) => (Math.abs(v) <= 1e-13 * mag ? 0 : v);
  // A_da is sparse (a capacitor node touches a few resistors): per differential row its nonzeros
  // at algebraic columns, ascending; a row without any leaves that row of A_dd (and B_d) as it is
  const touches = d.map((i) => {
    const t: { k: number; v: number }[] = [];
    for (const [j, v] of A[i]) if (v !== 0 && posA[j] >= 0) t.push({ k: posA[j], v });
    return t.sort((x, y) => x.k - y.k);
  });
  // per differential row: A_dd's row, minus A_da·(A_aa⁻¹·A_ad) where A_da has entries, each
  // difference chopped against its terms; only the columns those rows reach are visited
  const val = new Float64Array(np);
  const p = new Float64Array(np);
  const mag = new Float64Array(np);
  const mark = new Int32Array(np).fill(-1);
  const Fr: { cols: number[]; vals: number[] }[] = [];
  for (let r = 0; r < np; r++) {
    const i = d[r];
    const list: number[] = [];
    for (const [j, v] of A[i]) {
      const c = posD[j];
      if (c < 0) continue;
      val[c] = v;
      if (mark[c] !== r) {
        mark[c] = r;
        list.push(c);
      }
    }
    const touch = touches[r];
    if (touch.length) {
      for (const c of list) {
        p[c] = 0;
        mag[c] = Math.abs(val[c]);
      }
      for (const { k, v } of touch) {
        const { idx, val: xv } = Xrows[k];
        for (let q = 0; q < idx.length; q++) {
          const j = idx[q];
          if (mark[j] !== r) {
            mark[j] = r;
            list.push(j);
            val[j] = 0;
            p[j] = 0;
            mag[j] = 0;
          }
          const t = v * xv[q];
          p[j] += t;
          mag[j] += Math.abs(t);
        }
      }
      for (const c of list) val[c] = chop(val[c] - p[c], mag[c]);
    }
    list.sort((x, y) => x - y);
    const vals = list.map((c) => val[c]);
    for (const c of list) val[c] = 0;
    Fr.push({ cols: list, vals });
  }
  const Gr = d.map((i, r) => {
    const out = B[i].slice();
    const touch = touches[r];
    if (!touch.length) return out;
    for (let j = 0; j < m; j++) {
      let q = 0;
      let mg = Math.abs(out[j]);
      for (const { k, v } of touch) {
        const t = v * AaaInvBa[k][j];
        q += t;
        mg += Math.abs(t);
      }
      out[j] = chop(out[j] - q, mg);
    }
    return out;
  });

  let Fdense: Mat | null = null;
  let Frows: SparseRow[];
  let G0: Mat;
  if (eddDiagonal) {
    Frows = Fr.map(({ cols, vals }, r) => {
      const e = eddDiagonal[r];
      const keep = cols.map((_, q) => q).filter((q) => vals[q] !== 0);
      return { idx: Int32Array.from(keep, (q) => cols[q]), val: Float64Array.from(keep, (q) => vals[q] / e) };
    });
    G0 = Gr.map((row, r) => row.map((v) => v / eddDiagonal[r]));
  } else {
    try {
      const dense = Fr.map(({ cols, vals }) => {
        const row = new Array<number>(np).fill(0);
        cols.forEach((c, q) => (row[c] = vals[q]));
        return row;
      });
      Fdense = np ? solveSquare(Edd!, dense) : [];
      G0 = np && m ? solveSquare(Edd!, Gr) : d.map(() => new Array<number>(m).fill(0));
    } catch {
      return null;
    }
    Frows = Fdense.map((row) => {
      const idx: number[] = [];
      const val: number[] = [];
      row.forEach((v, j) => {
        if (v !== 0) {
          idx.push(j);
          val.push(v);
        }
      });
      return { idx: Int32Array.from(idx), val: Float64Array.from(val) };
    });
  }

  const Zu0 = zeros(nz, m);
  a.forEach((i, r) => {
    for (let j = 0; j < m; j++) Zu0[i][j] = -AaaInvBa[r][j];
  });
  const rows = new Map<number, Vec>();
  const zpRow = (i: number): Vec => {
    let row = rows.get(i);
    if (!row) {
      row = new Array<number>(np).fill(0);
      if (posD[i] >= 0) row[posD[i]] = 1;
      else {
        const { idx, val: xv } = Xrows[posA[i]];
        for (let q = 0; q < idx.length; q++) row[idx[q]] = -xv[q];
      }
      rows.set(i, row);
    }
    return row;
  };
  let ZpDense: Mat | null = null;
  let EddDense: Mat | null = Edd;
  return {
    get Zp() {
      return (ZpDense ??= Array.from({ length: nz }, (_, i) => zpRow(i)));
    },
    Zu: [Zu0],
    get F() {
      return (Fdense ??= Frows.map(({ idx, val }) => {
        const row = new Array<number>(np).fill(0);
        for (let q = 0; q < idx.length; q++) row[idx[q]] = val[q];
        return row;
      }));
    },
    G: [G0],
    index1: {
      d,
      get Edd() {
        return (EddDense ??= eddDiagonal ? Array.from(eddDiagonal, (e, k) => Array.from({ length: np }, (_, j) => (j === k ? e : 0))) : []);
      },
      eddDiagonal,
    },
    Frows,
    zpRow,
    unitAt: (i) => posD[i],
  };
}

/** Rows `rows` and the columns with position pos[j] ≥ 0 of a sparse matrix, dense. */
function denseSub(M: SparseRows, rows: number[], pos: Int32Array, ncols: number): Mat {
  return rows.map((i) => {
    const r = new Array<number>(ncols).fill(0);
    for (const [j, v] of M[i]) if (pos[j] >= 0) r[pos[j]] = v;
    return r;
  });
}

/** Nonzero diagonal with a ratio that leaves room for the digits we need. */
function diagonalConditioned(diag: Float64Array): boolean {
  let lo = Infinity;
  let hi = 0;
  for (const v of diag) {
    lo = Math.min(lo, Math.abs(v));
    hi = Math.max(hi, Math.abs(v));
  }
  return diag.length === 0 || (lo > 0 && Number.isFinite(hi) && lo > 1e-12 * hi);
}

/** Nonsingular with a pivot ratio that leaves room for the digits we need (a cheap condition test). */
function wellConditioned(M: Mat, f: LU | null): boolean {
  if (M.length === 0) return true;
  // a diagonal matrix (grounded capacitors, inductors): its own pivots
  if (M.every((row, i) => row.every((v, j) => v === 0 || i === j))) return diagonalConditioned(Float64Array.from(M, (row, i) => row[i]));
  const lu = f ?? luFactor(M);
  return !luSingular(lu) && lu.minPivot > 1e-12 * lu.maxPivot;
}
