/**
 * Dense real eigen-decompositions on flat Float64Arrays.
 *
 *  - eig(A):            general real n×n matrix. Balancing (Parlett–Reinsch scaling by powers of 2),
 *                       Householder reduction to upper Hessenberg form, Francis double-shift QR with
 *                       deflation accumulating the Schur vectors, eigenvectors by back-substitution
 *                       on the quasi-triangular Schur form, back-transformation and undoing the
 *                       balancing. The QR iteration and back-substitution follow the classic
 *                       EISPACK hqr2 structure (textbook, from memory).
 *  - eigSymmetric(S):   real symmetric matrix. Householder tridiagonalization and implicit QL with
 *                       Wilkinson-type shifts (EISPACK tred2/tql2 structure, from memory).
 *  - eigRC(C, G):       the state matrix of an RC network, A = −C⁻¹·G with C, G symmetric positive
 *                       (semi)definite, through a symmetric problem (all poles real, ≤ 0).
 *
 * Output conventions of eig() are those of ml-matrix's EigenvalueDecomposition, so it can stand in
 * for it: eigenvalues re[i] + j·im[i]; a complex-conjugate pair occupies i, i+1 with im[i] > 0 and
 * im[i+1] = −im[i]; column i of V holds Re v and column i+1 holds Im v, where v is the eigenvector
 * of re[i] + j·im[i]. Then A·V = V·D with D block diagonal, 1×1 blocks [re] and 2×2 blocks
 * [[re, im], [−im, re]]. Unlike ml-matrix, each eigenvector is scaled to unit 2-norm (a complex
 * pair: ‖Re v‖² + ‖Im v‖² = 1); the directions are the same.
 *
 * eig() picks the cheapest exact route by the structure of A:
 *  - diagonally similar to a symmetric matrix (the state matrix of an RC network, A = −C⁻¹·G):
 *    the symmetric problem (symmetrize.ts), eigenvectors mapped back; a ladder (tridiagonal up to
 *    a permutation) through tridiagonal.ts: when definite (every RC ladder with a path to ground)
 *    by twisted factorizations with relative accuracy (definite-tridiagonal.ts), O(n²) however
 *    graded the spectrum; otherwise inverse iteration, O(n²) unless the spectrum has large
 *    clusters. The eigenvalues are then real and ascending.
 *  - tridiagonal up to a permutation otherwise (LC and RLC ladders), O(n²): eigenvalues by complex
 *    symmetric QL on the tridiagonal (complex-symmetric-tridiagonal.ts), refined together with the
 *    eigenvectors by inverse iteration (tridiagonal-vectors.ts). Where that declines (a rotation
 *    too far from unitary, an eigenvector short of its residual bound), the QR sweeps restricted to
 *    the active window and inverse iteration on the Hessenberg matrix (hessenberg-vectors.ts);
 *    nearly repeated eigenvalues take the Schur-form path, which keeps their vectors independent.
 *  - anything else: the Schur-form path above. Its sweeps chase the bulge inside the active
 *    window and apply the rest of each sweep afterwards in contiguous passes (sweepRest). Active
 *    blocks of AED_MIN rows or more first try aggressive early deflation (schur-aed.ts), whose
 *    undeflated eigenvalues then serve as the shifts of the next sweeps. From THREADS_MIN rows
 *    on, a second thread (threads/helper.ts) takes the Schur-vector work and half of the
 *    Hessenberg reduction and of the back-transformation, with bit-for-bit the same results.
 *
 * Storage: eig works row-major (a[i·n + j]); eigSymmetric works column-major internally (the
 * rotations of the QL sweep then run along contiguous memory). Both accept and return number[][].
 */

export interface EigResult {
  re: number[];
  im: number[];
  /** eigenvector matrix, row-major number[][] (columns are eigenvectors) */
  V: number[][];
}

export interface EigFlatResult {
  n: number;
  re: Float64Array;
  im: Float64Array;
  /** row-major n×n eigenvector matrix */
  V: Float64Array;
}

import { tridiagonalEigenvaluesComplex } from './complex-symmetric-tridiagonal.js';
import { hessenbergEigenvectors } from './hessenberg-vectors.js';
import { aggressiveDeflation, type SchurFn } from './schur-aed.js';
import { arenaClose, arenaI32, arenaOpen, ownedBy, simdInstance, type SimdExports } from './simd/simd.js';
import { hessenbergSplit, reflect3 } from './threads/kernels.js';
import { HelperFailed, L_LEFT, L_RIGHT, Session, helperWanted, sharedCopy, sharedF64 } from './threads/helper.js';
import { mainKernels } from './threads/simd-kernels.js';
import { pathOrder, symmetricEntry, symmetrize } from './symmetrize.js';
import { eigTridiagonal, tridiagonalQL } from './tridiagonal.js';
import { tridiagonalVectors } from './tridiagonal-vectors.js';

const EPS = 2 ** -52;
// relative mismatch allowed between Aᵢⱼ·dⱼ² and Aⱼᵢ·dᵢ² on the symmetric route: the route solves
// D·S·D⁻¹, which differs from A by at most half of this per entry
const SYMMETRIC_TOL = 1e-13;
// below this size the Schur-form path is cheap anyway
const INVERSE_ITERATION_MIN = 16;
// eigenvalues closer than this fraction of ‖H‖ count as repeated (see wellSeparated)
const SEPARATION = 1e-8;
// from this size on the dense path uses the helper thread (threads/helper.ts); measured on random
// matrices (medians, both cores free): slower with the helper at 120–170, about even at 200,
// faster from 250 on
const THREADS_MIN = 200;
// Hessenberg steps on fewer columns than this stay on the main thread (the waits would dominate)
const HESSENBERG_SHARED_MIN = 48;

/** Eigen-decomposition of a real (nonsymmetric) square matrix; see the module comment for conventions. */
export function eig(A: number[][]): EigResult {
  const n = A.length;
  const a = new Float64Array(n * n);
  for (let i = 0; i < n; i++) {
    const row = A[i];
    if (row.length !== n) throw new Error(`eig: matrix is not square (row ${i} has ${row.length} entries, expected ${n})`);
    for (let j = 0; j < n; j++) a[i * n + j] = row[j];
  }
  const r = eigFlat(a, n);
  return { re: Array.from(r.re), im: Array.from(r.im), V: toRows(r.V, n) };
}

/**
 * The same on a row-major Float64Array; `a` is overwritten. Throws when an entry is not finite or
 * the QR iteration fails to converge. Options (for tests and comparisons): balance: false skips
 * the balancing; structured: false forces the dense Schur-form path; inverseIteration: false
 * keeps ladders on the Schur-form path; aed: false turns off aggressive early deflation; threads:
 * false keeps the dense path on one thread, true uses the helper thread whatever the size (the
 * results are the same bit for bit).
 */
export function eigFlat(
  a: Float64Array,
  n: number,
  opts: { balance?: boolean; structured?: boolean; inverseIteration?: boolean; aed?: boolean; threads?: boolean; simd?: boolean } = {},
): EigFlatResult {
  if (a.length !== n * n) throw new Error('eigFlat: array length is not n·n');
  for (let k = 0; k < a.length; k++) if (!Number.isFinite(a[k])) throw new Error('eig: matrix has a non-finite entry');
  if (opts.structured !== false) {
    const r = eigSymmetrizable(a, n);
    if (r) return r;
  }
  const re = new Float64Array(n);
  const im = new Float64Array(n);
  const V = new Float64Array(n * n);
  if (n === 0) return { n, re, im, V };
  const order = opts.structured !== false ? pathOrder(patternAdjacency(a, n)) : null;
  if (order && opts.inverseIteration !== false && n >= INVERSE_ITERATION_MIN) {
    // a ladder: O(n²) on the tridiagonal alone, without touching the dense array
    const t = ladderEig(a, n, order, opts.balance !== false);
    if (t) {
      re.set(t.re);
      im.set(t.im);
      // V[order[i]][k] = δᵢ·X[k][i]
      transposeInto(V, t.X, n, order, (i) => t.scale[i]);
      normalizeColumns(V, n, im);
      return { n, re, im, V };
    }
  }
  // the dense path's arrays in the WebAssembly kernels' memory (simd/simd.ts): room for the
  // matrix, its copies and Schur vectors, the packed reflectors, the helper's ring and scratch
  const arena = opts.simd !== false && arenaOpen(arenaSize(n));
  try {
    return denseEig(a, n, opts, order, re, im, V);
  } finally {
    if (arena) arenaClose();
  }
}

/** Doubles the dense path may take from the arena for an n×n matrix (see arenaOpen). */
function arenaSize(n: number): number {
  const rows = Math.ceil(2 * Math.sqrt(n)) + 16;
  return Math.ceil(3.6 * n * n) + 2 * rows * (n + rows) + 200 * n + (1 << 19);
}

/** The Schur-form path (dense or ladder-ordered), on one thread or with the helper. */
function denseEig(
  a: Float64Array,
  n: number,
  opts: { balance?: boolean; inverseIteration?: boolean; aed?: boolean; threads?: boolean; simd?: boolean },
  order: number[] | null,
  re: Float64Array,
  im: Float64Array,
  V: Float64Array,
): EigFlatResult {
  if (!order && helperWanted(n, THREADS_MIN, opts.threads)) {
    const session = Session.open(n, opts.threads === true);
    if (session) {
      try {
        return eigWithHelper(a, n, opts, session);
      } catch (err) {
        // the helper failed: start over on one thread (a is untouched: the helper works on a copy)
        if (!(err instanceof HelperFailed)) throw err;
        return denseEig(a, n, { ...opts, threads: false }, order, re, im, V);
      } finally {
        session.close();
      }
    }
  }
  // every array of the Schur-form path lives in shared memory, also on one thread: V8 compiles
  // the loops for one kind of backing store; mixing both made them 2× slower (measured)
  a = sharedCopy(a);
  const scale = new Float64Array(n).fill(1);
  if (opts.balance !== false) balance(a, n, scale);
  // The Schur / eigenvector matrix is kept transposed (vt[j*n + i] = V[i][j]) while it is built:
  // the QR sweeps combine columns of V, which are then contiguous rows of vt.
  const vt = sharedF64(n * n);
  let ort: Float64Array | null = null;
  if (order) {
    // a ladder (LC, RLC): reordered along its path it is tridiagonal, hence already Hessenberg,
    // and the Householder reduction is skipped; the permutation is the starting Schur basis
    const p = a.slice();
    for (let i = 0; i < n; i++) {
      const ri = order[i] * n;
      for (let j = 0; j < n; j++) a[i * n + j] = p[ri + order[j]];
    }
  } else ort = hessenberg(a, n, null);
  if (order && opts.inverseIteration !== false && n >= INVERSE_ITERATION_MIN) {
    // tridiagonal, where ladderEig declined: eigenvalues alone (QR sweeps restricted to the active
    // window), then each eigenvector by inverse iteration on the tridiagonal, O(n) apiece, instead
    // of accumulating Schur vectors (O(n³)). For a full Hessenberg matrix the two cost about the
    // same (measured), so it keeps the Schur-form path.
    const h = sharedCopy(a);
    hqr2(h, n, vt, re, im, false, true, opts.aed !== false);
    const X = wellSeparated(re, im, hessenbergNorm(a, n)) ? hessenbergEigenvectors(a, n, re, im) : null;
    if (X) {
      for (let i = 0; i < n; i++) {
        const oi = order[i];
        const s = scale[oi];
        const b = oi * n;
        for (let j = 0; j < n; j++) V[b + j] = X[i * n + j] * s;
      }
      normalizeColumns(V, n, im);
      return { n, re, im, V };
    }
  }
  if (order) {
    vt.fill(0);
    for (let i = 0; i < n; i++) vt[i * n + order[i]] = 1;
  } else if (ort) accumulateQ(a, n, ort, vt, null);
  hqr2(a, n, vt, re, im, true, true, opts.aed !== false);
  finishVectors(vt, n, scale, V, im);
  return { n, re, im, V };
}

/**
 * The dense Schur-form path with the helper thread (threads/helper.ts): the same operations in
 * the same order as the one-thread path, on shared copies of the arrays (a stays untouched).
 */
function eigWithHelper(a: Float64Array, n: number, opts: { balance?: boolean; aed?: boolean }, session: Session): EigFlatResult {
  const { H, Vt } = session.job;
  H.set(a);
  const scale = new Float64Array(n).fill(1);
  if (opts.balance !== false) balance(H, n, scale);
  accumulateQ(H, n, hessenberg(H, n, session), Vt, session);
  const re = new Float64Array(n);
  const im = new Float64Array(n);
  hqr2(H, n, Vt, re, im, true, true, opts.aed !== false, session);
  const V = new Float64Array(n * n);
  finishVectors(Vt, n, scale, V, im);
  return { n, re, im, V };
}

/**
 * V from the transposed Schur-form eigenvectors: undoes the balancing (eigenvectors of D⁻¹·A·D are
 * D⁻¹·v, so v = D·v̂) while transposing back, in 32×32 tiles (a column-wise read of a large vt
 * misses the cache on every entry), then scales the columns to unit norm.
 */
function finishVectors(vt: Float64Array, n: number, scale: Float64Array, V: Float64Array, im: Float64Array): void {
  const B = 32;
  for (let i0 = 0; i0 < n; i0 += B) {
    const i1 = Math.min(i0 + B, n);
    for (let j0 = 0; j0 < n; j0 += B) {
      const j1 = Math.min(j0 + B, n);
      for (let i = i0; i < i1; i++) {
        const s = scale[i];
        const b = i * n;
        for (let j = j0; j < j1; j++) V[b + j] = vt[j * n + i] * s;
      }
    }
  }
  normalizeColumns(V, n, im);
}

/**
 * The symmetric route: null unless D⁻¹·A·D = S is symmetric for a diagonal D (see symmetrize.ts).
 * With S = U·Λ·Uᵀ, A·(D·U) = (D·U)·Λ. A ladder (S tridiagonal after reordering) takes
 * O(n²): QL for the eigenvalues, inverse iteration for the vectors; anything else Householder
 * tridiagonalization and QL with vectors.
 */
function eigSymmetrizable(a: Float64Array, n: number): EigFlatResult | null {
  const sym = symmetrize(a, n, SYMMETRIC_TOL);
  if (!sym) return null;
  const { scale } = sym;
  const re = new Float64Array(n);
  const im = new Float64Array(n);
  const V = new Float64Array(n * n);
  const order = pathOrder(sym.adjacency);
  if (order) {
    const d = new Float64Array(n);
    const e = new Float64Array(Math.max(n - 1, 0));
    for (let k = 0; k < n; k++) d[k] = a[order[k] * n + order[k]];
    for (let k = 0; k + 1 < n; k++) e[k] = symmetricEntry(a, n, order[k], order[k + 1]);
    const { values, z } = eigTridiagonal(d, e);
    re.set(values);
    // V[order[i]][k] = dᵢ·z[k][i]: a transposition, in blocks so that both sides stay in cache
    transposeInto(V, z, n, order, (i) => scale[order[i]]);
  } else {
    // S is symmetric, so its row-major array is also the column-major one eigSymmetricFlat reads
    const S = sym.S;
    eigSymmetricFlat(S, n, re);
    for (let i = 0; i < n; i++) {
      const s = scale[i];
      for (let k = 0; k < n; k++) V[i * n + k] = s * S[k * n + i];
    }
  }
  normalizeColumns(V, n, im);
  return { n, re, im, V };
}

// an eigenvalue of the complex QL whose imaginary part is below this fraction of ‖T‖ is real (its
// imaginary part is round-off); a genuine pair that close to the real axis is nearly repeated and
// fails wellSeparated anyway (2·REAL_AXIS < SEPARATION)
const REAL_AXIS = 1e-9;

/**
 * A ladder, i.e. A reordered along `order` is tridiagonal T, in O(n²): T's diagonal similarity
 * Δ⁻¹·T·Δ with |bₖ| ≈ |cₖ| (powers of 2, so exact; the natural balancing of a tridiagonal),
 * eigenvalues by complex symmetric QL (complex-symmetric-tridiagonal.ts) sorted into eig()'s
 * layout, then refined together with the eigenvectors by inverse iteration (tridiagonal-vectors.ts).
 * X (row i: state order[i]) holds the vectors of the balanced T, scale holds Δ. Null when any step
 * declines (the Hessenberg QR machinery then takes over).
 */
function ladderEig(
  a: Float64Array,
  n: number,
  order: number[],
  balanced: boolean,
): { re: Float64Array; im: Float64Array; X: Float64Array; scale: Float64Array } | null {
  const d = new Float64Array(n);
  const b = new Float64Array(Math.max(n - 1, 0));
  const c = new Float64Array(Math.max(n - 1, 0));
  for (let k = 0; k < n; k++) d[k] = a[order[k] * n + order[k]];
  for (let k = 0; k + 1 < n; k++) {
    b[k] = a[order[k] * n + order[k + 1]];
    c[k] = a[order[k + 1] * n + order[k]];
    if (b[k] === 0 || c[k] === 0) return null; // one-way coupling: not a similarity of a symmetric one
  }
  const scale = new Float64Array(n).fill(1);
  if (balanced) {
    // δₖ₊₁/δₖ ≈ √|cₖ/bₖ|, rounded to powers of 2 on the running sum of exponents (the ratios
    // |bₖ/cₖ| after scaling then stay within [1/4, 4], and so do their products)
    let exact = 0;
    let prev = 0;
    for (let k = 0; k + 1 < n; k++) {
      exact += 0.5 * Math.log2(Math.abs(c[k] / b[k]));
      const e = Math.round(exact);
      if (!(Math.abs(e) < 900)) return null;
      scale[k + 1] = 2 ** e;
      const f = 2 ** (e - prev);
      b[k] *= f;
      c[k] /= f;
      prev = e;
    }
  }
  const ev = tridiagonalEigenvaluesComplex(d, b, c);
  if (!ev) return null;
  let norm = 0;
  for (let k = 0; k < n; k++) norm = Math.max(norm, Math.abs(d[k]) + (k > 0 ? Math.abs(b[k - 1]) : 0) + (k + 1 < n ? Math.abs(c[k]) : 0));
  const tol = REAL_AXIS * norm;
  const real: number[] = [];
  const upper: number[] = [];
  const lower: number[] = [];
  for (let k = 0; k < n; k++) {
    if (Math.abs(ev.im[k]) <= tol) real.push(k);
    else (ev.im[k] > 0 ? upper : lower).push(k);
  }
  // conjugate pairs: the upper and lower halves must match one to one
  if (upper.length !== lower.length) return null;
  const byRe = (p: number, q: number): number => ev.re[p] - ev.re[q] || Math.abs(ev.im[p]) - Math.abs(ev.im[q]);
  upper.sort(byRe);
  lower.sort(byRe);
  for (let k = 0; k < upper.length; k++) {
    const u = upper[k];
    const l = lower[k];
    if (Math.hypot(ev.re[u] - ev.re[l], ev.im[u] + ev.im[l]) > SEPARATION * norm) return null;
  }
  real.sort(byRe);
  const re = new Float64Array(n);
  const im = new Float64Array(n);
  let j = 0;
  for (const k of real) re[j++] = ev.re[k];
  for (const k of upper) {
    re[j] = ev.re[k];
    im[j] = ev.im[k];
    re[j + 1] = ev.re[k];
    im[j + 1] = -ev.im[k];
    j += 2;
  }
  if (!wellSeparated(re, im, norm)) return null;
  const t = tridiagonalVectors(d, b, c, re, im);
  // the refinement must not have merged two eigenvalues (inverse iteration from a poor estimate
  // finds whichever eigenvalue dominates)
  if (!t || !wellSeparated(t.re, t.im, norm)) return null;
  return { re: t.re, im: t.im, X: t.X, scale };
}

/**
 * V[order[i]·n + k] = s(i)·Z[k·n + i] (column-major vectors of a reordered problem into eig()'s
 * row-major V), in blocks so that both sides stay in cache.
 */
function transposeInto(V: Float64Array, Z: Float64Array, n: number, order: number[], s: (i: number) => number): void {
  const B = 32;
  for (let i0 = 0; i0 < n; i0 += B) {
    const i1 = Math.min(i0 + B, n);
    for (let k0 = 0; k0 < n; k0 += B) {
      const k1 = Math.min(k0 + B, n);
      for (let i = i0; i < i1; i++) {
        const f = s(i);
        const dst = order[i] * n;
        for (let k = k0; k < k1; k++) V[dst + k] = Z[k * n + i] * f;
      }
    }
  }
}

/** ‖H‖∞ over the upper Hessenberg part of the row-major n×n array h. */
function hessenbergNorm(h: Float64Array, n: number): number {
  let norm = 0;
  for (let i = 0; i < n; i++) {
    let s = 0;
    for (let j = Math.max(i - 1, 0); j < n; j++) s += Math.abs(h[i * n + j]);
    norm = Math.max(norm, s);
  }
  return norm;
}

/**
 * Inverse iteration needs distinct eigenvalues: a repeated or nearly repeated one (identical
 * sections, several zero poles) would give the same vector twice where independent ones exist.
 * Those spectra take the Schur-form path, which keeps them apart. Pairs closer than
 * SEPARATION·norm are found through a grid of cells of that size (O(n): a ladder's poles may share
 * nearly one real part).
 */
function wellSeparated(re: Float64Array, im: Float64Array, norm: number): boolean {
  const n = re.length;
  const tol = SEPARATION * norm;
  if (!(tol > 0)) return n < 2;
  const cells = new Map<string, number[]>();
  for (let i = 0; i < n; i++) {
    const cx = Math.floor(re[i] / tol);
    const cy = Math.floor(im[i] / tol);
    for (let dx = -1; dx <= 1; dx++) {
      for (let dy = -1; dy <= 1; dy++) {
        const near = cells.get(`${cx + dx},${cy + dy}`);
        if (near) for (const j of near) if (Math.hypot(re[j] - re[i], im[j] - im[i]) <= tol) return false;
      }
    }
    const key = `${cx},${cy}`;
    const own = cells.get(key);
    if (own) own.push(i);
    else cells.set(key, [i]);
  }
  return true;
}

/**
 * Neighbours of each index in the off-diagonal pattern of A + Aᵀ, read row by row; stops early
 * once an index has three (not a path: pathOrder refuses it at once).
 */
function patternAdjacency(a: Float64Array, n: number): number[][] {
  const adj: number[][] = Array.from({ length: n }, () => []);
  const add = (i: number, j: number): boolean => {
    const l = adj[i];
    if (!l.includes(j)) l.push(j);
    return l.length <= 2;
  };
  for (let i = 0; i < n; i++) {
    const row = i * n;
    for (let j = 0; j < n; j++) {
      if (j === i || a[row + j] === 0) continue;
      if (!add(i, j) || !add(j, i)) return adj;
    }
  }
  return adj;
}

function toRows(v: Float64Array, n: number): number[][] {
  // an element loop: Array.from on a typed array is ten times slower (measured)
  const out: number[][] = new Array(n);
  for (let i = 0; i < n; i++) {
    const row: number[] = new Array(n);
    const b = i * n;
    for (let j = 0; j < n; j++) row[j] = v[b + j];
    out[i] = row;
  }
  return out;
}

/**
 * Parlett–Reinsch balancing: a diagonal similarity D⁻¹·A·D with D a power of 2 per index (so no
 * rounding), chosen so that each row and its column have comparable 1-norms. `scale` receives D.
 */
export function balance(a: Float64Array, n: number, scale: Float64Array): void {
  const RADIX = 2;
  const SQRDX = RADIX * RADIX;
  let noconv = true;
  for (let sweep = 0; noconv && sweep < 100; sweep++) {
    noconv = false;
    for (let i = 0; i < n; i++) {
      let c = 0;
      let r = 0;
      for (let j = 0; j < n; j++) {
        if (j === i) continue;
        c += Math.abs(a[j * n + i]);
        r += Math.abs(a[i * n + j]);
      }
      if (c === 0 || r === 0) continue;
      let g = r / RADIX;
      let f = 1;
      const s = c + r;
      while (c < g && f < 1e150) {
        f *= RADIX;
        c *= SQRDX;
      }
      g = r * RADIX;
      while (c >= g && f > 1e-150) {
        f /= RADIX;
        c /= SQRDX;
      }
      if ((c + r) / f < 0.95 * s) {
        scale[i] *= f;
        noconv = true;
        const inv = 1 / f;
        for (let j = 0; j < n; j++) a[i * n + j] *= inv;
        for (let j = 0; j < n; j++) a[j * n + i] *= f;
      }
    }
  }
}

/**
 * Householder reduction to upper Hessenberg form H = Qᵀ·A·Q, in place. Entries below the
 * subdiagonal are left holding the reflectors (hqr2 ignores them); the returned array holds their
 * leading entries. Each step: the reflector u from column m − 1, f = uᵀ·H/h, the left update on
 * rows m..n−1, then the right update of every row with its dot product with u formed in two
 * halves of the columns (kernels.ts hessenbergSplit). With a session the helper thread takes the
 * second half of the columns of each step (Session.hessenbergStep): two short waits per step,
 * which cost microseconds when both threads have a core; once the waits exceed a quarter of the
 * time (a busy machine) or the steps get small, the main thread does both halves, the same way.
 */
function hessenberg(H: Float64Array, n: number, session: Session | null): Float64Array {
  const high = n - 1;
  const K = mainKernels();
  const ort = sharedF64(n);
  const f = sharedF64(n);
  const sa = session ? session.job.sa : null;
  const sb = session ? session.job.sb : null;
  let split = session !== null;
  let waited = 0;
  let last = 0; // the last step shared with the helper
  const t0 = performance.now();
  for (let m = 1; m <= high - 1; m++) {
    let scale = 0;
    for (let i = m; i <= high; i++) scale += Math.abs(H[i * n + m - 1]);
    if (scale === 0) continue;
    let h = 0;
    for (let i = high; i >= m; i--) {
      ort[i] = H[i * n + m - 1] / scale;
      h += ort[i] * ort[i];
    }
    let g = Math.sqrt(h);
    if (ort[m] > 0) g = -g;
    h -= ort[m] * g;
    ort[m] -= g;
    const c = hessenbergSplit(n, m);
    if (split && n - m < HESSENBERG_SHARED_MIN) split = false;
    if (split) {
      session!.hessenbergStep(m, ort, h, c);
      // the helper's right update of the previous step (its columns may become ours)
      if (last) waited += session!.hessenbergWait(L_RIGHT, last);
      K.hessenbergLeft(H, n, m, ort, f, h, m, c, sa!);
      session!.hessenbergMark(m);
      waited += session!.hessenbergWait(L_LEFT, m);
      K.hessenbergRight(H, n, ort, sa!, sb!, h, m, c);
      last = m;
      if (waited > 1 && waited > 0.25 * (performance.now() - t0)) split = false;
    } else {
      if (last) {
        session!.hessenbergWait(L_RIGHT, last);
        last = 0;
      }
      K.hessenbergCols(H, n, m, ort, f, h, m, n);
      K.hessenbergStep(H, n, m, ort, f, h, c, 0, n);
    }
    ort[m] *= scale;
    H[m * n + m - 1] = scale * g;
  }
  if (last) session!.hessenbergWait(L_RIGHT, last);
  return ort;
}

/**
 * Vt := Qᵀ (row-major), i.e. V = Q column-major, from hessenberg()'s reflectors (packed first:
 * the QR sweeps overwrite them in H), on the helper thread when there is a session.
 */
function accumulateQ(H: Float64Array, n: number, ort: Float64Array, X: Float64Array, session: Session | null): void {
  const job = session ? session.job : null;
  const offs = job ? job.offs : (arenaI32(n) ?? new Int32Array(n));
  const hs = job ? job.hs : sharedF64(n);
  const u = job ? job.u : sharedF64(Math.max((n * (n - 1)) / 2, 1));
  packReflectors(H, n, ort, u, offs, hs);
  if (session) session.accumulate();
  else mainKernels().accumulateRows(hs, n, u, offs, X);
}

/** Packs reflector m as u_m = (ort[m], H[m+1][m−1], …, H[high][m−1]) at offs[m], and hs[m] = H[m][m−1]. */
function packReflectors(H: Float64Array, n: number, ort: Float64Array, u: Float64Array, offs: Int32Array, hs: Float64Array): void {
  const high = n - 1;
  let total = 0;
  for (let m = 1; m <= high - 1; m++) {
    offs[m] = total;
    total += high - m + 1;
  }
  for (let m = 1; m <= high - 1; m++) {
    const o = offs[m] - m;
    hs[m] = H[m * n + m - 1];
    u[o + m] = ort[m];
    for (let i = m + 1; i <= high; i++) u[o + i] = H[i * n + m - 1];
  }
}

/** Complex division (xr + j·xi)/(yr + j·yi), scaled to avoid overflow. */
function cdiv(xr: number, xi: number, yr: number, yi: number, out: Float64Array): void {
  if (Math.abs(yr) > Math.abs(yi)) {
    const r = yi / yr;
    const d = yr + r * yi;
    out[0] = (xr + r * xi) / d;
    out[1] = (xi - r * xr) / d;
  } else {
    const r = yr / yi;
    const d = yi + r * yr;
    out[0] = (r * xr + xi) / d;
    out[1] = (r * xi - xr) / d;
  }
}

const MAX_ITER_PER_EIGENVALUE = 60;
// active blocks from this size on use aggressive early deflation (schur-aed.ts); at n = 100 it
// cost more than the sweeps it saved (measured)
const AED_MIN = 110;
// percent of the AED window deflated above which AED runs again before any sweep
const AED_NIBBLE = 14;

/**
 * AED window for an active block of `size` rows: its cost beyond the small Schur form (the window's
 * transformation applied to the rows above it, the columns right of it and the Schur vectors) is
 * about nn·jw² per AED, that of a sweep about nn·size. Counted on random and RLC-mesh matrices
 * (n = 400 … 1000): 1.5·√size needs the fewest operations; larger windows deflate more but cost
 * more than the sweeps they save.
 */
function aedWindow(size: number): number {
  return Math.max(10, Math.round(1.5 * Math.sqrt(size)));
}

/** Real Schur form and Schur vectors of a small Hessenberg window (for AED). */
const schurForm: SchurFn = (T, n, Ut, d, e) => hqr2(T, n, Ut, d, e, true, false);

/**
 * The deferred part of one double-shift sweep with reflectors P_m..P_(n−1) (P_(n−1) acts on two
 * rows only; an all-zero reflector is the identity):
 *  - H := P_k·H on columns n+1..nn−1 (right of the window, never touched by the chase);
 *  - V := V·P_k, in the transposed storage Vt := P_kᵀ·Vt on rows k..k+2;
 *  - H := H·P_k on rows top..k (row by row: each row meets the sweep's reflectors in order, so a
 *    sliding window of three entries carries it, one load and one store per entry).
 * Left and right products commute, and each row or column sees its own reflectors in order.
 * Without vectors (eigenvalues only) just the active window is kept up to date: top = l, and
 * the first two items are skipped.
 *
 * The loops over memory live in small kernels (slide1, slide2, reflect*): the optimizing compiler
 * then compiles each on its own, instead of compiling a long first loop on the fly and stalling
 * on the code after it, which has not run yet (measured: first calls 2× slower). X: the
 * WebAssembly kernels when H and the reflectors are in their memory (hqr2 decides once).
 */
function sweepRest(
  H: Float64Array,
  Vt: Float64Array,
  nn: number,
  top: number,
  m: number,
  n: number,
  rx: Float64Array,
  ry: Float64Array,
  rz: Float64Array,
  rq: Float64Array,
  rr: Float64Array,
  vectors: boolean,
  pipe: Session | null,
  X: SimdExports | null,
): void {
  if (vectors) {
    const K = mainKernels();
    if (n + 1 < nn) K.applyLeft(H, nn, n + 1, nn - 1, m, n, rx, ry, rz, rq, rr, false);
    if (pipe) pipe.sweep(m, n, rx, ry, rz, rq, rr);
    else K.applyLeft(Vt, nn, 0, nn - 1, m, n, rx, ry, rz, rq, rr, true);
  }
  if (X) {
    X.slideRows(H.byteOffset, nn, top, m, n, rx.byteOffset, ry.byteOffset, rz.byteOffset, rq.byteOffset, rr.byteOffset);
    return;
  }
  let i = top;
  if ((n - top) % 2 === 1) {
    // an odd number of rows: the first goes alone, the rest in pairs
    slide1(H, i * nn, Math.max(i, m), n, rx, ry, rz, rq, rr);
    i++;
  }
  for (; i < n; i += 2) slide2(H, i * nn, (i + 1) * nn, i, m, n, rx, ry, rz, rq, rr);
}

/** Row at offset b: H := H·P_k for k = k0..n−1, a sliding window of three entries. */
function slide1(
  H: Float64Array,
  b: number,
  k0: number,
  n: number,
  rx: Float64Array,
  ry: Float64Array,
  rz: Float64Array,
  rq: Float64Array,
  rr: Float64Array,
): void {
  const last = n - 1;
  let h0 = H[b + k0];
  let h1 = H[b + k0 + 1];
  for (let k = k0; k < last; k++) {
    const h2 = H[b + k + 2];
    const pi = rx[k] * h0 + ry[k] * h1 + rz[k] * h2;
    H[b + k] = h0 - pi;
    h0 = h1 - pi * rq[k];
    h1 = h2 - pi * rr[k];
  }
  const pi = rx[last] * h0 + ry[last] * h1;
  H[b + last] = h0 - pi;
  H[b + n] = h1 - pi * rq[last];
}

/**
 * Rows i (offset a) and i+1 (offset b) together, sharing the reflector loads; row i meets
 * reflector i alone first when i ≥ m (row i+1 starts one reflector later).
 */
function slide2(
  H: Float64Array,
  a: number,
  b: number,
  i: number,
  m: number,
  n: number,
  rx: Float64Array,
  ry: Float64Array,
  rz: Float64Array,
  rq: Float64Array,
  rr: Float64Array,
): void {
  const last = n - 1;
  let k = i >= m ? i : m;
  let a0 = H[a + k];
  let a1 = H[a + k + 1];
  if (i >= m) {
    const a2 = H[a + k + 2];
    const pi = rx[k] * a0 + ry[k] * a1 + rz[k] * a2;
    H[a + k] = a0 - pi;
    a0 = a1 - pi * rq[k];
    a1 = a2 - pi * rr[k];
    k++;
  }
  let b0 = H[b + k];
  let b1 = H[b + k + 1];
  for (; k < last; k++) {
    const x = rx[k];
    const y = ry[k];
    const z = rz[k];
    const q = rq[k];
    const r = rr[k];
    const a2 = H[a + k + 2];
    const b2 = H[b + k + 2];
    const pa = x * a0 + y * a1 + z * a2;
    const pb = x * b0 + y * b1 + z * b2;
    H[a + k] = a0 - pa;
    H[b + k] = b0 - pb;
    a0 = a1 - pa * q;
    a1 = a2 - pa * r;
    b0 = b1 - pb * q;
    b1 = b2 - pb * r;
  }
  const pa = rx[last] * a0 + ry[last] * a1;
  const pb = rx[last] * b0 + ry[last] * b1;
  H[a + last] = a0 - pa;
  H[a + n] = a1 - pa * rq[last];
  H[b + last] = b0 - pb;
  H[b + n] = b1 - pb * rq[last];
}

/**
 * The bulge chase of one Francis double-shift step on the window l..n starting at row m, with the
 * first reflector's (p, q, r) from the shifts. Records the reflectors in (rx, ry, rz, rq, rr).
 * Kept apart from hqr2 so that the optimizing compiler treats this hot loop on its own.
 */
function francisSweep(
  H: Float64Array,
  nn: number,
  l: number,
  m: number,
  n: number,
  p: number,
  q: number,
  r: number,
  rx: Float64Array,
  ry: Float64Array,
  rz: Float64Array,
  rq: Float64Array,
  rr: Float64Array,
): void {
  let s: number;
  let x = 0;
  let y: number;
  let z: number;
  // Double QR step on rows l..n and columns m..n. The bulge chase itself only needs the
  // window and the three rows below each reflector; the rest is deferred to sweepRest, which
  // applies the whole sweep at once along contiguous memory (same products, less traffic).
  for (let k = m; k <= n - 1; k++) {
    const notlast = k !== n - 1;
    rx[k] = ry[k] = rz[k] = rq[k] = rr[k] = 0; // identity unless a reflector is formed
    if (k !== m) {
      p = H[k * nn + k - 1];
      q = H[(k + 1) * nn + k - 1];
      r = notlast ? H[(k + 2) * nn + k - 1] : 0;
      x = Math.abs(p) + Math.abs(q) + Math.abs(r);
      if (x === 0) continue;
      p /= x;
      q /= x;
      r /= x;
    }
    s = Math.sqrt(p * p + q * q + r * r);
    if (p < 0) s = -s;
    if (s === 0) continue;
    if (k !== m) H[k * nn + k - 1] = -s * x;
    else if (l !== m) H[k * nn + k - 1] = -H[k * nn + k - 1];
    p += s;
    x = p / s;
    y = q / s;
    z = r / s;
    q /= p;
    r /= p;
    rx[k] = x;
    ry[k] = y;
    rz[k] = z;
    rq[k] = q;
    rr[k] = r;
    // row modification inside the window (columns k..n)
    reflect3(H, k * nn, nn, k, n, notlast ? 3 : 2, 1, q, r, x, y, z);
    // column modification of the rows below the reflector (k+1..k+3): the chase reads them next;
    // rows 0..k are never combined again in this sweep, so their update waits for sweepRest
    const iEnd = Math.min(n, k + 3);
    if (notlast) {
      for (let i = k + 1; i <= iEnd; i++) {
        const b = i * nn + k;
        const pi = x * H[b] + y * H[b + 1] + z * H[b + 2];
        H[b] -= pi;
        H[b + 1] -= pi * q;
        H[b + 2] -= pi * r;
      }
    } else {
      for (let i = k + 1; i <= iEnd; i++) {
        const b = i * nn + k;
        const pi = x * H[b] + y * H[b + 1];
        H[b] -= pi;
        H[b + 1] -= pi * q;
      }
    }
  }
}

/**
 * Francis double-shift QR on the Hessenberg matrix H (row-major, in place) with deflation,
 * accumulating the Schur vectors in V, followed by back-substitution for the eigenvectors of the
 * quasi-triangular form and back-transformation V := V·X. With vectors = false only the
 * eigenvalues (d + j·e): the sweeps then keep just the active window up to date.
 */
function hqr2(
  H: Float64Array,
  nn: number,
  Vt: Float64Array,
  d: Float64Array,
  e: Float64Array,
  vectors = true,
  finish = true,
  aed = true,
  pipe: Session | null = null,
): void {
  let n = nn - 1;
  const low = 0;
  const high = nn - 1;
  let exshift = 0;
  let p = 0;
  let q = 0;
  let r = 0;
  let s = 0;
  let z = 0;
  let w: number;
  let x: number;
  let y: number;

  let norm = 0;
  for (let i = 0; i < nn; i++) for (let j = Math.max(i - 1, 0); j < nn; j++) norm += Math.abs(H[i * nn + j]);

  if (norm === 0) {
    // the zero matrix: all eigenvalues 0, V = I from the Hessenberg stage
    d.fill(0);
    e.fill(0);
    return;
  }
  // the reflectors of the current sweep: P_k = I − (x, y, z)·(1, q, r)ᵀ on rows/columns k..k+2
  const rx = sharedF64(nn);
  const ry = sharedF64(nn);
  const rz = sharedF64(nn);
  const rq = sharedF64(nn);
  const rr = sharedF64(nn);
  // the bulge chase as WebAssembly when H and the reflectors are in its memory
  const X = simdInstance();
  const chase = X && ownedBy(H) && ownedBy(rx) && ownedBy(ry) && ownedBy(rz) && ownedBy(rq) && ownedBy(rr) ? X : null;
  let iter = 0;
  let totalIter = 0;
  const maxTotal = MAX_ITER_PER_EIGENVALUE * Math.max(nn, 1);
  // shifts from the last aggressive early deflation, valid while the active block starts at shiftTop
  const shifts = new Float64Array(3 * nn);
  let shiftNext = 0;
  let shiftCount = 0;
  let shiftTop = -1;
  let useAed = aed;
  while (n >= low) {
    // look for a single small subdiagonal element
    let l = n;
    while (l > low) {
      s = Math.abs(H[(l - 1) * nn + l - 1]) + Math.abs(H[l * nn + l]);
      if (s === 0) s = norm;
      if (Math.abs(H[l * nn + l - 1]) <= EPS * s) break;
      l--;
    }
    if (l === n) {
      // one root found
      H[n * nn + n] += exshift;
      d[n] = H[n * nn + n];
      e[n] = 0;
      n--;
      iter = 0;
    } else if (l === n - 1) {
      // two roots found
      w = H[n * nn + n - 1] * H[(n - 1) * nn + n];
      p = (H[(n - 1) * nn + n - 1] - H[n * nn + n]) / 2;
      q = p * p + w;
      z = Math.sqrt(Math.abs(q));
      H[n * nn + n] += exshift;
      H[(n - 1) * nn + n - 1] += exshift;
      x = H[n * nn + n];
      if (q >= 0) {
        // real pair: rotate to upper triangular
        z = p >= 0 ? p + z : p - z;
        d[n - 1] = x + z;
        d[n] = d[n - 1];
        if (z !== 0) d[n] = x - w / z;
        e[n - 1] = 0;
        e[n] = 0;
        x = H[n * nn + n - 1];
        s = Math.abs(x) + Math.abs(z);
        p = x / s;
        q = z / s;
        r = Math.sqrt(p * p + q * q);
        p /= r;
        q /= r;
        if (vectors) {
          mainKernels().rotatePair(H, (n - 1) * nn, n * nn, n - 1, nn - 1, p, q);
          for (let i = 0; i <= n; i++) {
            const b = i * nn;
            z = H[b + n - 1];
            H[b + n - 1] = q * z + p * H[b + n];
            H[b + n] = q * H[b + n] - p * z;
          }
          if (pipe) pipe.rotate(n, p, q);
          else mainKernels().rotatePair(Vt, (n - 1) * nn, n * nn, low, high, p, q);
        }
      } else {
        // complex pair
        d[n - 1] = x + p;
        d[n] = x + p;
        e[n - 1] = z;
        e[n] = -z;
      }
      n -= 2;
      iter = 0;
    } else {
      // no convergence yet: form the shift
      x = H[n * nn + n];
      y = 0;
      w = 0;
      if (l < n) {
        y = H[(n - 1) * nn + n - 1];
        w = H[n * nn + n - 1] * H[(n - 1) * nn + n];
      }
      if (shiftTop !== l) shiftNext = shiftCount = 0;
      const size = n - l + 1;
      if (useAed && size >= AED_MIN && shiftNext >= shiftCount) {
        const jw = Math.min(aedWindow(size), Math.floor((size - 1) / 3));
        const r = aggressiveDeflation(H, nn, l, n, jw, Vt, vectors ? 0 : l, vectors, schurForm, shifts, jw >> 1, pipe);
        if (!r) useAed = false;
        else {
          shiftNext = 0;
          shiftCount = r.pairs;
          shiftTop = l;
          if (r.deflated > 0) {
            // deflate first (the loop finds the zero subdiagonal entries); a large haul asks for
            // another AED rather than sweeps with the remaining shifts
            if (100 * r.deflated > AED_NIBBLE * jw) shiftCount = 0;
            continue;
          }
        }
      }
      if (shiftNext < shiftCount) {
        x = shifts[3 * shiftNext];
        y = shifts[3 * shiftNext + 1];
        w = shifts[3 * shiftNext + 2];
        shiftNext++;
      }
      if (iter === 10) {
        // Wilkinson's original ad hoc shift
        exshift += x;
        for (let i = low; i <= n; i++) H[i * nn + i] -= x;
        s = Math.abs(H[n * nn + n - 1]) + Math.abs(H[(n - 1) * nn + n - 2]);
        x = y = 0.75 * s;
        w = -0.4375 * s * s;
      }
      if (iter === 30) {
        // a second exceptional shift
        s = (y - x) / 2;
        s = s * s + w;
        if (s > 0) {
          s = Math.sqrt(s);
          if (y < x) s = -s;
          s = x - w / ((y - x) / 2 + s);
          for (let i = low; i <= n; i++) H[i * nn + i] -= s;
          exshift += s;
          x = y = w = 0.964;
        }
      }
      iter++;
      if (++totalIter > maxTotal) throw new Error('eig: the QR iteration did not converge');
      // look for two consecutive small subdiagonal elements
      let m = n - 2;
      while (m >= l) {
        z = H[m * nn + m];
        r = x - z;
        s = y - z;
        p = (r * s - w) / H[(m + 1) * nn + m] + H[m * nn + m + 1];
        q = H[(m + 1) * nn + m + 1] - z - r - s;
        r = H[(m + 2) * nn + m + 1];
        s = Math.abs(p) + Math.abs(q) + Math.abs(r);
        p /= s;
        q /= s;
        r /= s;
        if (m === l) break;
        if (
          Math.abs(H[m * nn + m - 1]) * (Math.abs(q) + Math.abs(r)) <
          EPS * (Math.abs(p) * (Math.abs(H[(m - 1) * nn + m - 1]) + Math.abs(z) + Math.abs(H[(m + 1) * nn + m + 1])))
        ) {
          break;
        }
        m--;
      }
      for (let i = m + 2; i <= n; i++) {
        H[i * nn + i - 2] = 0;
        if (i > m + 2) H[i * nn + i - 3] = 0;
      }
      // Double QR step on rows l..n and columns m..n (francisSweep), then the deferred rest
      if (chase) chase.francisSweep(H.byteOffset, nn, l, m, n, p, q, r, rx.byteOffset, ry.byteOffset, rz.byteOffset, rq.byteOffset, rr.byteOffset);
      else francisSweep(H, nn, l, m, n, p, q, r, rx, ry, rz, rq, rr);
      sweepRest(H, Vt, nn, vectors ? 0 : l, m, n, rx, ry, rz, rq, rr, vectors, pipe, chase);
    }
  }

  if (!vectors || !finish) return;
  if (pipe) pipe.drainHelping();
  backSubstitute(H, nn, d, e, norm);
  if (pipe) pipe.backTransform();
  else mainKernels().backTransformRange(H, nn, Vt, 0, nn, sharedF64(4 * nn));
}

/**
 * Eigenvectors of the upper quasi-triangular Schur form by back-substitution (hqr2 structure),
 * written into H in place: column n of X in column n (a pair: Re, Im in columns n−1, n).
 *
 * Four columns (vectors, a pair counting two) at a time: each row of the triangle is read once
 * for the four dot products (at n = 1000 the triangle does not fit in cache, and one pass per
 * vector was memory-bound). The per-vector arithmetic is hqr2's, in the same order: entries not
 * solved yet are zeros in the work array, so the dot products over j = i+1..hi equal hqr2's over
 * its solved range.
 */
function backSubstitute(H: Float64Array, nn: number, d: Float64Array, e: Float64Array, norm: number): void {
  const xs = sharedF64(4 * nn); // xs[4·j + slot]: entry j of the vector in slot
  const dots = sharedF64(4);
  // the dot products as WebAssembly vectors when the arrays are in its memory (same running sums)
  const X = simdInstance();
  const k = X && ownedBy(H) && ownedBy(xs) && ownedBy(dots) ? X : null;
  const sz = new Float64Array(4); // per slot: w, r, s saved at the lower row of a 2×2 block
  const sr = new Float64Array(4);
  const ss = new Float64Array(4);
  const cd = new Float64Array(2);
  let hi = nn - 1;
  while (hi >= 0) {
    let lo = Math.max(0, hi - 3);
    if (e[lo] < 0) lo++; // the second column of a pair: the pair goes to the next group
    xs.fill(0, 0, 4 * (hi + 1));
    for (let c = lo; c <= hi; c++) {
      const sl = c - lo;
      if (e[c] === 0) xs[4 * c + sl] = 1;
      else if (e[c] < 0) {
        // the pair's last two entries (columns c − 1: real part, c: imaginary part)
        const p = d[c];
        const q = e[c];
        const bn = c * nn;
        const bn1 = bn - nn;
        if (Math.abs(H[bn + c - 1]) > Math.abs(H[bn1 + c])) {
          xs[4 * (c - 1) + sl - 1] = q / H[bn + c - 1];
          xs[4 * (c - 1) + sl] = -(H[bn + c] - p) / H[bn + c - 1];
        } else {
          cdiv(0, -H[bn1 + c], H[bn1 + c - 1] - p, q, cd);
          xs[4 * (c - 1) + sl - 1] = cd[0];
          xs[4 * (c - 1) + sl] = cd[1];
        }
        xs[4 * c + sl] = 1;
      }
    }
    for (let i = hi - 1; i >= 0; i--) {
      const bi = i * nn;
      if (k) k.dots4i(H.byteOffset + 8 * (bi + i + 1), xs.byteOffset + 32 * (i + 1), hi - i, dots.byteOffset);
      else backDots(H, bi, i, hi, xs, dots);
      for (let c = lo; c <= hi; c++) {
        if (e[c] === 0) {
          if (c > i) realStep(H, nn, d, e, norm, i, c - lo, d[c], hi, xs, dots, sz, ss);
        } else if (e[c] < 0 && c - 1 > i) {
          complexStep(H, nn, d, e, norm, i, c - 1 - lo, d[c], e[c], hi, xs, dots, sz, sr, ss, cd);
        }
      }
    }
    for (let c = lo; c <= hi; c++) {
      const sl = c - lo;
      if (e[c] === 0) {
        for (let i = 0; i <= c; i++) H[i * nn + c] = xs[4 * i + sl];
      } else if (e[c] < 0) {
        // H[c][c−1] now holds Re v_c = 0, which the back-transformation never reads
        for (let i = 0; i <= c; i++) {
          H[i * nn + c - 1] = xs[4 * i + sl - 1];
          H[i * nn + c] = xs[4 * i + sl];
        }
      }
    }
    hi = lo - 1;
  }
}

/** Row i of the real eigenvector (eigenvalue p) in slot sl, given its dot product dots[sl]. */
/** dots[t] = Σ_{j = i+1..hi} H[i][j]·xs[4j + t], t = 0..3 (row i at offset bi). */
function backDots(H: Float64Array, bi: number, i: number, hi: number, xs: Float64Array, dots: Float64Array): void {
  let a0 = 0;
  let a1 = 0;
  let a2 = 0;
  let a3 = 0;
  for (let j = i + 1; j <= hi; j++) {
    const h = H[bi + j];
    const o = 4 * j;
    a0 += h * xs[o];
    a1 += h * xs[o + 1];
    a2 += h * xs[o + 2];
    a3 += h * xs[o + 3];
  }
  dots[0] = a0;
  dots[1] = a1;
  dots[2] = a2;
  dots[3] = a3;
}

function realStep(
  H: Float64Array,
  nn: number,
  d: Float64Array,
  e: Float64Array,
  norm: number,
  i: number,
  sl: number,
  p: number,
  hi: number,
  xs: Float64Array,
  dots: Float64Array,
  sz: Float64Array,
  ss: Float64Array,
): void {
  const bi = i * nn;
  const w = H[bi + i] - p;
  const r = dots[sl];
  if (e[i] < 0) {
    sz[sl] = w;
    ss[sl] = r;
    return;
  }
  if (e[i] === 0) {
    xs[4 * i + sl] = w !== 0 ? -r / w : -r / (EPS * norm);
  } else {
    // solve the real 2×2 system of a complex-pair block
    const x = H[bi + i + 1];
    const y = H[bi + nn + i];
    const z = sz[sl];
    const s = ss[sl];
    const q = (d[i] - p) * (d[i] - p) + e[i] * e[i];
    const t = (x * s - z * r) / q;
    xs[4 * i + sl] = t;
    xs[4 * (i + 1) + sl] = Math.abs(x) > Math.abs(z) ? (-r - w * t) / x : (-s - y * t) / z;
  }
  // overflow control
  const t = Math.abs(xs[4 * i + sl]);
  if (EPS * t * t > 1) for (let j = i; j <= hi; j++) xs[4 * j + sl] /= t;
}

/** Row i of the complex eigenvector (eigenvalue p + j·q) in slots sl (real part) and sl + 1. */
function complexStep(
  H: Float64Array,
  nn: number,
  d: Float64Array,
  e: Float64Array,
  norm: number,
  i: number,
  sl: number,
  p: number,
  q: number,
  hi: number,
  xs: Float64Array,
  dots: Float64Array,
  sz: Float64Array,
  sr: Float64Array,
  ss: Float64Array,
  cd: Float64Array,
): void {
  const bi = i * nn;
  const ra = dots[sl];
  const sa = dots[sl + 1];
  const w = H[bi + i] - p;
  if (e[i] < 0) {
    sz[sl] = w;
    sr[sl] = ra;
    ss[sl] = sa;
    return;
  }
  const oi = 4 * i + sl;
  if (e[i] === 0) {
    cdiv(-ra, -sa, w, q, cd);
    xs[oi] = cd[0];
    xs[oi + 1] = cd[1];
  } else {
    // solve the complex 2×2 system
    const x = H[bi + i + 1];
    const y = H[bi + nn + i];
    const z = sz[sl];
    const r = sr[sl];
    const s = ss[sl];
    let vr = (d[i] - p) * (d[i] - p) + e[i] * e[i] - q * q;
    const vi = (d[i] - p) * 2 * q;
    if (vr === 0 && vi === 0) vr = EPS * norm * (Math.abs(w) + Math.abs(q) + Math.abs(x) + Math.abs(y) + Math.abs(z));
    cdiv(x * r - z * ra + q * sa, x * s - z * sa - q * ra, vr, vi, cd);
    const xr = cd[0];
    const xi = cd[1];
    xs[oi] = xr;
    xs[oi + 1] = xi;
    if (Math.abs(x) > Math.abs(z) + Math.abs(q)) {
      xs[oi + 4] = (-ra - w * xr + q * xi) / x;
      xs[oi + 5] = (-sa - w * xi - q * xr) / x;
    } else {
      cdiv(-r - y * xr, -s - y * xi, z, q, cd);
      xs[oi + 4] = cd[0];
      xs[oi + 5] = cd[1];
    }
  }
  // overflow control
  const t = Math.max(Math.abs(xs[oi]), Math.abs(xs[oi + 1]));
  if (EPS * t * t > 1) {
    for (let j = i; j <= hi; j++) {
      xs[4 * j + sl] /= t;
      xs[4 * j + sl + 1] /= t;
    }
  }
}

/** Unit 2-norm columns; a complex pair (columns i, i+1) is scaled jointly. */
function normalizeColumns(V: Float64Array, n: number, im: Float64Array): void {
  const ss = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    const b = i * n;
    for (let j = 0; j < n; j++) ss[j] += V[b + j] * V[b + j];
  }
  const f = new Float64Array(n);
  for (let j = 0; j < n; j++) {
    if (im[j] > 0 && j + 1 < n) {
      const s = Math.sqrt(ss[j] + ss[j + 1]);
      f[j] = f[j + 1] = s > 0 ? 1 / s : 1;
      j++;
    } else {
      const s = Math.sqrt(ss[j]);
      f[j] = s > 0 ? 1 / s : 1;
    }
  }
  for (let i = 0; i < n; i++) {
    const b = i * n;
    for (let j = 0; j < n; j++) V[b + j] *= f[j];
  }
}

// ------------------------------------------------------------------------------------------------
// Symmetric path
// ------------------------------------------------------------------------------------------------

export interface SymEigResult {
  /** eigenvalues in ascending order */
  values: number[];
  /** orthonormal eigenvectors as columns (row-major number[][]) */
  V: number[][];
}

/**
 * Eigen-decomposition of a real symmetric matrix S = V·diag(values)·Vᵀ. Only the lower triangle is
 * read. Householder tridiagonalization followed by implicit QL iteration with shifts.
 */
export function eigSymmetric(S: number[][]): SymEigResult {
  const n = S.length;
  // column-major z[j*n + i] = Z[i][j]; S is symmetric so S[i][j] (lower triangle) fills it
  const z = new Float64Array(n * n);
  for (let i = 0; i < n; i++) {
    if (S[i].length !== n) throw new Error('eigSymmetric: matrix is not square');
    for (let j = 0; j <= i; j++) {
      const v = S[i][j];
      if (!Number.isFinite(v)) throw new Error('eigSymmetric: matrix has a non-finite entry');
      z[j * n + i] = v;
      z[i * n + j] = v;
    }
  }
  const d = new Float64Array(n);
  const e = new Float64Array(n);
  eigSymmetricFlat(z, n, d, e);
  const V: number[][] = new Array(n);
  for (let i = 0; i < n; i++) {
    const row = new Array<number>(n);
    for (let j = 0; j < n; j++) row[j] = z[j * n + i];
    V[i] = row;
  }
  return { values: Array.from(d), V };
}

/**
 * Flat form: z is the symmetric matrix in column-major order (z[j*n+i] = S[i][j]); on return it
 * holds the eigenvectors column-major (column j at z[j*n .. j*n+n−1]) and d the ascending eigenvalues.
 */
export function eigSymmetricFlat(z: Float64Array, n: number, d: Float64Array, e = new Float64Array(n)): void {
  if (n === 0) return;
  tred2(z, n, d, e);
  // tred2 leaves the subdiagonal in e[1..n−1]; the QL solver takes e[i] = T[i][i+1]
  e.copyWithin(0, 1);
  tridiagonalQL(d, e, z);
}

/** Householder tridiagonalization; Z (column-major, Z(i,j) = z[j*n+i]) becomes the orthogonal factor. */
function tred2(z: Float64Array, n: number, d: Float64Array, e: Float64Array): void {
  // Z(i,j) = z[j*n + i]
  for (let j = 0; j < n; j++) d[j] = z[j * n + n - 1];
  for (let i = n - 1; i > 0; i--) {
    let scale = 0;
    let h = 0;
    for (let k = 0; k < i; k++) scale += Math.abs(d[k]);
    if (scale === 0) {
      e[i] = d[i - 1];
      for (let j = 0; j < i; j++) {
        d[j] = z[j * n + i - 1];
        z[j * n + i] = 0;
        z[i * n + j] = 0;
      }
    } else {
      for (let k = 0; k < i; k++) {
        d[k] /= scale;
        h += d[k] * d[k];
      }
      let f = d[i - 1];
      let g = Math.sqrt(h);
      if (f > 0) g = -g;
      e[i] = scale * g;
      h -= f * g;
      d[i - 1] = f - g;
      for (let j = 0; j < i; j++) e[j] = 0;
      // e = A·u on the leading i×i block (lower triangle of column j is contiguous)
      for (let j = 0; j < i; j++) {
        f = d[j];
        const cj = j * n;
        z[i * n + j] = f;
        g = e[j] + z[cj + j] * f;
        for (let k = j + 1; k <= i - 1; k++) {
          const zkj = z[cj + k];
          g += zkj * d[k];
          e[k] += zkj * f;
        }
        e[j] = g;
      }
      f = 0;
      for (let j = 0; j < i; j++) {
        e[j] /= h;
        f += e[j] * d[j];
      }
      const hh = f / (h + h);
      for (let j = 0; j < i; j++) e[j] -= hh * d[j];
      for (let j = 0; j < i; j++) {
        f = d[j];
        g = e[j];
        const cj = j * n;
        for (let k = j; k <= i - 1; k++) z[cj + k] -= f * e[k] + g * d[k];
        d[j] = z[cj + i - 1];
        z[cj + i] = 0;
      }
    }
    d[i] = h;
  }
  // accumulate transformations
  for (let i = 0; i < n - 1; i++) {
    const ci = i * n;
    const ci1 = ci + n;
    z[ci + n - 1] = z[ci + i];
    z[ci + i] = 1;
    const h = d[i + 1];
    if (h !== 0) {
      for (let k = 0; k <= i; k++) d[k] = z[ci1 + k] / h;
      for (let j = 0; j <= i; j++) {
        const cj = j * n;
        let g = 0;
        for (let k = 0; k <= i; k++) g += z[ci1 + k] * z[cj + k];
        for (let k = 0; k <= i; k++) z[cj + k] -= g * d[k];
      }
    }
    for (let k = 0; k <= i; k++) z[ci1 + k] = 0;
  }
  for (let j = 0; j < n; j++) {
    d[j] = z[j * n + n - 1];
    z[j * n + n - 1] = 0;
  }
  z[(n - 1) * n + n - 1] = 1;
  e[0] = 0;
}

// ------------------------------------------------------------------------------------------------
// RC networks
// ------------------------------------------------------------------------------------------------

export interface RCEigResult {
  /** the poles, real and ≤ 0 for a passive network, ascending (most negative first) */
  values: number[];
  /**
   * eigenvectors of the pencil in the original node coordinates (n × r, r = rank of C):
   * G·V = −C·V·diag(values), normalized so that Vᵀ·C·V = I
   */
  V: number[][];
  /** rank of C: the number of states (nodes without capacitance are eliminated) */
  rank: number;
}

/**
 * Poles and modes of an RC network  C·v' = −G·v + (sources), C and G symmetric positive
 * (semi)definite (nodal capacitance and conductance matrices).
 *
 * When C is positive definite the state matrix is A = −C⁻¹·G, which is similar to the symmetric
 * −C^(−1/2)·G·C^(−1/2); so all poles are real and a symmetric solver applies: with C = Q·Λ·Qᵀ and
 * S = −Λ^(−1/2)·Qᵀ·G·Q·Λ^(−1/2) = U·M·Uᵀ, the poles are M and the modes V = Q·Λ^(−1/2)·U
 * (A·V = V·M, Vᵀ·C·V = I).
 *
 * When C is only semidefinite (nodes with no capacitance), the directions in C's null space carry no
 * state: with Q = [Qr Q0] split at C's numerical rank, the algebraic part gives z = −G00⁻¹·G0r·y and
 * the remaining conductance is the Schur complement Geff = Grr − Gr0·G00⁻¹·G0r (still symmetric
 * positive semidefinite), so the same construction applies to (Λr, Geff), and modes map back as
 * v = (Qr − Q0·G00⁻¹·G0r)·y. G00 must then be nonsingular (every capacitance-free node has a
 * resistive path to a capacitor node or ground); otherwise this throws.
 *
 * `relTol` decides C's numerical rank relative to its largest eigenvalue.
 */
export function eigRC(C: number[][], G: number[][], relTol = 1e-12): RCEigResult {
  const n = C.length;
  if (G.length !== n) throw new Error('eigRC: C and G differ in size');
  if (n === 0) return { values: [], V: [], rank: 0 };
  const ce = eigSymmetric(C);
  const lmax = Math.max(...ce.values.map(Math.abs));
  const tol = relTol * lmax;
  const rIdx: number[] = [];
  const zIdx: number[] = [];
  ce.values.forEach((v, k) => {
    if (v < -tol) throw new Error('eigRC: C is not positive semidefinite');
    (v > tol ? rIdx : zIdx).push(k);
  });
  const r = rIdx.length;
  const q = ce.V;
  // Gq = Qᵀ·G·Q
  const GQ = mul(G, q);
  const Gq = mul(transposeOf(q), GQ);
  // basis columns of the original coordinates for the states: P = Qr − Q0·G00⁻¹·G0r  (n × r)
  let P: number[][] = q.map((row) => rIdx.map((k) => row[k]));
  let Geff: number[][] = rIdx.map((i) => rIdx.map((j) => Gq[i][j]));
  if (zIdx.length > 0) {
    const G00 = zIdx.map((i) => zIdx.map((j) => Gq[i][j]));
    const G0r = zIdx.map((i) => rIdx.map((j) => Gq[i][j]));
    const X = choleskySolve(G00, G0r); // G00⁻¹·G0r, |z| × r
    const Gr0 = rIdx.map((i) => zIdx.map((j) => Gq[i][j]));
    const corr = mul(Gr0, X);
    Geff = Geff.map((row, i) => row.map((v, j) => v - 0.5 * (corr[i][j] + corr[j][i])));
    const Q0X = mul(
      q.map((row) => zIdx.map((k) => row[k])),
      X,
    );
    P = P.map((row, i) => row.map((v, j) => v - Q0X[i][j]));
  }
  const isq = rIdx.map((k) => 1 / Math.sqrt(ce.values[k]));
  const S = Geff.map((row, i) => row.map((v, j) => -v * isq[i] * isq[j]));
  const se = eigSymmetric(S);
  // V = P·Λr^(−1/2)·U
  const W = se.V.map((row, i) => row.map((v) => v * isq[i]));
  const V = mul(P, W);
  return { values: se.values, V, rank: r };
}

function mul(a: number[][], b: number[][]): number[][] {
  const n = a.length;
  const k = b.length;
  const m = k ? b[0].length : 0;
  const out: number[][] = new Array(n);
  for (let i = 0; i < n; i++) {
    const o = new Array<number>(m).fill(0);
    const ai = a[i];
    for (let p = 0; p < k; p++) {
      const v = ai[p];
      if (v === 0) continue;
      const bp = b[p];
      for (let j = 0; j < m; j++) o[j] += v * bp[j];
    }
    out[i] = o;
  }
  return out;
}

function transposeOf(a: number[][]): number[][] {
  const r = a.length;
  const c = r ? a[0].length : 0;
  return Array.from({ length: c }, (_, j) => Array.from({ length: r }, (_, i) => a[i][j]));
}

/** Solve S·X = B for symmetric positive definite S by Cholesky; throws when S is not. */
function choleskySolve(S: number[][], B: number[][]): number[][] {
  const n = S.length;
  const L = S.map(() => new Array<number>(n).fill(0));
  const scale = Math.max(...S.map((row, i) => Math.abs(row[i])));
  for (let j = 0; j < n; j++) {
    let s = S[j][j];
    for (let k = 0; k < j; k++) s -= L[j][k] * L[j][k];
    if (!(s > 1e-14 * scale)) throw new Error('eigRC: a node without capacitance has no resistive path (singular conductance block)');
    const ljj = Math.sqrt(s);
    L[j][j] = ljj;
    for (let i = j + 1; i < n; i++) {
      let t = S[i][j];
      for (let k = 0; k < j; k++) t -= L[i][k] * L[j][k];
      L[i][j] = t / ljj;
    }
  }
  const m = B.length ? B[0].length : 0;
  const X = B.map((row) => row.slice());
  for (let c = 0; c < m; c++) {
    for (let i = 0; i < n; i++) {
      let t = X[i][c];
      for (let k = 0; k < i; k++) t -= L[i][k] * X[k][c];
      X[i][c] = t / L[i][i];
    }
    for (let i = n - 1; i >= 0; i--) {
      let t = X[i][c];
      for (let k = i + 1; k < n; k++) t -= L[k][i] * X[k][c];
      X[i][c] = t / L[i][i];
    }
  }
  return X;
}
