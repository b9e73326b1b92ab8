import { Matrix, SingularValueDecomposition } from 'ml-matrix';
import { luFactor, luSingular, luSolve } from './lu.js';
import { type Mat, cols, zeros } from './dense.js';


/** Orthonormal bases from a singular value decomposition, split at the numerical rank. */
export interface RankSplit {
  rank: number;
  /** left singular vectors spanning the range (rows × rank) */
  range: Mat;
  /** left singular vectors orthogonal to the range (rows × (rows − rank)) */
  leftNull: Mat;
  /** right singular vectors spanning the null space (cols × (cols − rank)) */
  nullSpace: Mat;
  singular: number[];
}

/**
 * Numerical rank with tolerance relative to the largest singular value (and an absolute floor
 * `scale`, the size of the quantities the matrix multiplies, so an all-zero block has rank 0).
 */
export function rankSplit(a: Mat, nCols = cols(a), relTol = 1e-10, scale = 0): RankSplit {
  const rows = a.length;
  if (rows === 0 || nCols === 0) {
    return { rank: 0, range: zeros(rows, 0), leftNull: identityCols(rows), nullSpace: identityCols(nCols), singular: [] };
  }
  // Pad to a square matrix so ml-matrix returns square U and V; the range and row-space bases
  // of the true matrix are the singular vectors of the nonzero singular values.
  const n = Math.max(rows, nCols);
  const padded = zeros(n, n);
  for (let i = 0; i < rows; i++) for (let j = 0; j < nCols; j++) padded[i][j] = a[i][j];
  const svd = new SingularValueDecomposition(new Matrix(padded), { autoTranspose: false });
  const s = svd.diagonal;
  const U = svd.leftSingularVectors.to2DArray();
  const V = svd.rightSingularVectors.to2DArray();
  const order = s.map((_, i) => i).sort((x, y) => s[y] - s[x]);
  const tol = Math.max(relTol * (s[order[0]] ?? 0), scale * 1e-13, Number.MIN_VALUE);
  const r = Math.min(order.filter((i) => s[i] > tol).length, rows, nCols);
  const lead = order.slice(0, r);
  const range = Array.from({ length: rows }, (_, i) => lead.map((k) => U[i][k]));
  const rowSpace = Array.from({ length: nCols }, (_, i) => lead.map((k) => V[i][k]));
  return {
    rank: r,
    range,
    leftNull: complement(range, rows),
    nullSpace: complement(rowSpace, nCols),
    singular: order.map((i) => s[i]),
  };
}

/** An orthonormal basis of the orthogonal complement of the orthonormal columns of q (n rows). */
export function complement(q: Mat, n: number): Mat {
  const r = q.length ? q[0].length : 0;
  const cand = zeros(n, r + n);
  for (let i = 0; i < n; i++) {
    for (let k = 0; k < r; k++) cand[i][k] = q[i][k];
    cand[i][r + i] = 1;
  }
  const full = orthonormalize(cand, r + n);
  return full.map((row) => row.slice(r, n));
}

function identityCols(n: number): Mat {
  const m = zeros(n, n);
  for (let i = 0; i < n; i++) m[i][i] = 1;
  return m;
}

/** Modified Gram–Schmidt on the columns (twice, for orthogonality to working precision). */
export function orthonormalize(a: Mat, k: number): Mat {
  const n = a.length;
  const q = a.map((row) => row.slice(0, k));
  const keep: number[] = [];
  for (let j = 0; j < k; j++) {
    for (let pass = 0; pass < 2; pass++) {
      for (const p of keep) {
        let d = 0;
        for (let i = 0; i < n; i++) d += q[i][p] * q[i][j];
        for (let i = 0; i < n; i++) q[i][j] -= d * q[i][p];
      }
    }
    let nrm = 0;
    for (let i = 0; i < n; i++) nrm += q[i][j] * q[i][j];
    nrm = Math.sqrt(nrm);
    if (nrm < 1e-8) continue;
    for (let i = 0; i < n; i++) q[i][j] /= nrm;
    keep.push(j);
  }
  return q.map((row) => keep.map((j) => row[j]));
}

/** Solve a·x = b for a square nonsingular a (LU with partial pivoting on typed arrays). */
export function solveSquare(a: Mat, b: Mat): Mat {
  if (a.length === 0) return [];
  const f = luFactor(a);
  if (luSingular(f)) throw new Error('singular matrix in solveSquare');
  if (cols(b) === 0) return a.map(() => []);
  return luSolve(f, b);
}

/** Least-squares / minimum-norm solution via the pseudo-inverse from an SVD. */
export function pinvSolve(a: Mat, b: Mat, aCols = cols(a), relTol = 1e-12): Mat {
  const bc = cols(b);
  if (a.length === 0 || aCols === 0) return zeros(aCols, bc);
  const svd = new SingularValueDecomposition(new Matrix(a), { autoTranspose: true });
  const s = svd.diagonal;
  const U = svd.leftSingularVectors.to2DArray();
  const V = svd.rightSingularVectors.to2DArray();
  const tol = relTol * s.reduce((m, v) => Math.max(m, v), 0);
  const out = zeros(aCols, bc);
  for (let k = 0; k < s.length; k++) {
    if (s[k] <= tol) continue;
    for (let j = 0; j < bc; j++) {
      let c = 0;
      for (let i = 0; i < a.length; i++) c += U[i][k] * b[i][j];
      c /= s[k];
      for (let i = 0; i < aCols; i++) out[i][j] += V[i][k] * c;
    }
  }
  return out;
}
