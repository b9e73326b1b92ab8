/**
 * Aggressive early deflation (AED) for the Francis QR iteration of eig.ts (the known scheme,
 * written from memory).
 *
 * The trailing jw×jw window W of the active block H[l..n][l..n] is brought to real Schur form
 * T = Uᵀ·W·U. Its only coupling to the rest of the active block is the subdiagonal entry s above
 * it, which after the similarity becomes the spike s·Uᵀ·e₁ (column kwtop − 1, rows of the window).
 * A diagonal block of T whose spike entries are below the round-off of the block itself has
 * converged, even when no subdiagonal entry of H is small yet: it is deflated by setting its spike
 * entries to zero (a perturbation of the size a deflation test accepts anyway). Undeflatable
 * blocks are moved to the top of T by swapping adjacent diagonal blocks, so that the deflatable
 * ones collect at the bottom; the undeflated part is then returned to Hessenberg form and the
 * whole transformation is applied to the rest of H and to the Schur vectors (as products of U with
 * contiguous row blocks). The undeflated eigenvalues are the shifts of the next sweeps.
 *
 * Why: the double-shift iteration converges at the bottom only, about two sweeps per eigenvalue;
 * AED finds the many eigenvalues of the trailing part that converge together, at the cost of a
 * small Schur form, and supplies better shifts (measured: about half the sweeps).
 */

import { arenaMark, arenaRelease, ownedBy, simdInstance } from './simd/simd.js';
import { sharedF64, type Session } from './threads/helper.js';
import { mainKernels } from './threads/simd-kernels.js';

const EPS = 2 ** -52;
const SAFE_MIN = 2 ** -1022;

// scratch for the block swaps (at most 4×4) and the window products, reused across calls: AED
// runs often and small typed-array allocations showed up as garbage-collection time (measured)
const sD = new Float64Array(16);
const sQ = new Float64Array(16);
const sQD = new Float64Array(16);
const sR = new Float64Array(16);
const sK = new Float64Array(16);
const sM = new Float64Array(8);
const s4a = new Float64Array(4);
const s4b = new Float64Array(4);
const s4c = new Float64Array(4);
const s4d = new Float64Array(4);
let scratch = new Float64Array(1024);

/** Scratch of `len` for a product into M: from the kernels' arena when M is there (they need both). */
function scratchFor(M: Float64Array, len: number): Float64Array {
  if (ownedBy(M)) {
    const a = sharedF64(len);
    if (ownedBy(a)) return a;
  }
  return work(len);
}

/** A reused buffer of at least `len` entries (contents undefined). */
function work(len: number): Float64Array {
  if (scratch.length < len) scratch = new Float64Array(Math.max(len, 2 * scratch.length));
  return scratch;
}

/** Real Schur form of an n×n Hessenberg T in place, Schur vectors accumulated in Ut (transposed). */
export type SchurFn = (T: Float64Array, n: number, Ut: Float64Array, d: Float64Array, e: Float64Array) => void;

export interface AedOutcome {
  /** eigenvalues deflated at the bottom of the window (their subdiagonal entries are now exact zeros) */
  deflated: number;
  /** shift pairs written to `shifts` as (x, y, w): the roots of λ² − (x + y)·λ + x·y − w */
  pairs: number;
}

/**
 * One AED step on the active block l..n of H (row-major nn×nn) with a window of jw rows
 * (jw ≤ n − l). Vt holds the Schur vectors transposed (updated when `vectors`); rows top..kwtop−1
 * above the window are updated (top = 0 with vectors, l without). At most maxPairs shift pairs
 * are written. Null when the window's Schur form fails (H is then unchanged).
 */
export function aggressiveDeflation(
  H: Float64Array,
  nn: number,
  l: number,
  n: number,
  jw: number,
  Vt: Float64Array,
  top: number,
  vectors: boolean,
  schur: SchurFn,
  shifts: Float64Array,
  maxPairs: number,
  pipe: Session | null = null,
): AedOutcome | null {
  // the window's arrays come from the kernels' arena when one is open: given back afterwards
  // (the helper thread gets Ut through the ring, a copy)
  const mark = arenaMark();
  try {
    const kwtop = n - jw + 1;
    const s = kwtop > l ? H[kwtop * nn + kwtop - 1] : 0;
    const T = sharedF64(jw * jw);
    for (let i = 0; i < jw; i++) {
      const b = (kwtop + i) * nn + kwtop;
      for (let j = Math.max(i - 1, 0); j < jw; j++) T[i * jw + j] = H[b + j];
    }
    const Ut = sharedF64(jw * jw);
    for (let i = 0; i < jw; i++) Ut[i * jw + i] = 1;
    const d = new Float64Array(jw);
    const e = new Float64Array(jw);
    try {
      schur(T, jw, Ut, d, e);
    } catch {
      return null;
    }
    // the exact quasi-triangular form: the QR iteration leaves negligible subdiagonal entries where it
    // deflated and stale bulge entries below; a 2×2 block is a complex pair (e > 0 at its top row)
    for (let i = 1; i < jw; i++) {
      const b = i * jw;
      for (let j = 0; j < i - 1; j++) T[b + j] = 0;
      if (!(e[i - 1] > 0)) T[b + i - 1] = 0;
    }

    // deflation test from the bottom; undeflatable blocks move up to position ilst
    const small = SAFE_MIN * (jw / EPS);
    let ns = jw;
    let ilst = 0;
    while (ilst < ns) {
      const k = ns - 1;
      const pair = k > ilst && T[k * jw + k - 1] !== 0;
      if (!pair) {
        let foo = Math.abs(T[k * jw + k]);
        if (foo === 0) foo = Math.abs(s);
        if (Math.abs(s * Ut[k * jw]) <= Math.max(small, EPS * foo)) {
          ns--;
          continue;
        }
        if (!moveUp(T, Ut, jw, k, 1, ilst)) break;
        ilst++;
      } else {
        let foo = Math.abs(T[k * jw + k]) + Math.sqrt(Math.abs(T[k * jw + k - 1])) * Math.sqrt(Math.abs(T[(k - 1) * jw + k]));
        if (foo === 0) foo = Math.abs(s);
        if (Math.max(Math.abs(s * Ut[k * jw]), Math.abs(s * Ut[(k - 1) * jw])) <= Math.max(small, EPS * foo)) {
          ns -= 2;
          continue;
        }
        if (!moveUp(T, Ut, jw, k - 1, 2, ilst)) break;
        ilst += 2;
      }
    }
    const pairs = shiftPairs(T, jw, ns, shifts, maxPairs);
    const deflated = jw - ns;
    if (deflated === 0 && s !== 0) return { deflated: 0, pairs };

    if (ns > 1 && s !== 0) restoreHessenberg(T, Ut, jw, ns);
    if (kwtop > l) H[kwtop * nn + kwtop - 1] = s * Ut[0];
    for (let i = 0; i < jw; i++) {
      const b = (kwtop + i) * nn + kwtop;
      for (let j = 0; j < jw; j++) H[b + j] = j >= i - 1 ? T[i * jw + j] : 0;
    }
    // the rest of the similarity: rows above the window (H := H·U), columns to its right (H := Uᵀ·H)
    // and the Schur vectors (V := V·U, i.e. Vt := Uᵀ·Vt)
    if (top < kwtop) rightMultiply(H, nn, top, kwtop - 1, kwtop, Ut, jw);
    if (vectors) {
      const K = mainKernels();
      if (n + 1 < nn) K.leftMultiply(H, nn, kwtop, n + 1, nn - 1, Ut, jw, scratchFor(H, jw * (nn - n - 1)));
      if (pipe) pipe.aed(kwtop, Ut, jw);
      else K.leftMultiply(Vt, nn, kwtop, 0, nn - 1, Ut, jw, scratchFor(Vt, jw * nn));
    }
    return { deflated, pairs };
  } finally {
    arenaRelease(mark);
  }
}

/**
 * The eigenvalues of T's leading ns×ns quasi-triangular part as shift pairs (x, y, w): a complex
 * block as itself, real eigenvalues two by two (an odd one out twice). At most maxPairs.
 */
function shiftPairs(T: Float64Array, jw: number, ns: number, out: Float64Array, maxPairs: number): number {
  let pairs = 0;
  let pendingReal = NaN;
  const real = (v: number): void => {
    if (Number.isNaN(pendingReal)) {
      pendingReal = v;
      return;
    }
    if (pairs < maxPairs) {
      out[3 * pairs] = pendingReal;
      out[3 * pairs + 1] = v;
      out[3 * pairs + 2] = 0;
      pairs++;
    }
    pendingReal = NaN;
  };
  for (let i = 0; i < ns && pairs < maxPairs; i++) {
    if (i + 1 < ns && T[(i + 1) * jw + i] !== 0) {
      const a = T[i * jw + i];
      const b = T[i * jw + i + 1];
      const c = T[(i + 1) * jw + i];
      const dd = T[(i + 1) * jw + i + 1];
      const p = (a - dd) / 2;
      const disc = p * p + b * c;
      const mid = (a + dd) / 2;
      if (disc < 0) {
        out[3 * pairs] = mid;
        out[3 * pairs + 1] = mid;
        out[3 * pairs + 2] = disc; // x = y = Re λ, w = −(Im λ)²
        pairs++;
      } else {
        const r = Math.sqrt(disc);
        real(mid + r);
        real(mid - r);
      }
      i++;
    } else real(T[i * jw + i]);
  }
  if (!Number.isNaN(pendingReal) && pairs < maxPairs) {
    out[3 * pairs] = pendingReal;
    out[3 * pairs + 1] = pendingReal;
    out[3 * pairs + 2] = 0;
    pairs++;
  }
  return pairs;
}

/** Moves the diagonal block of `size` at ifst up to ilst by adjacent swaps; false when a swap is refused. */
function moveUp(T: Float64Array, Ut: Float64Array, jw: number, ifst: number, size: number, ilst: number): boolean {
  let here = ifst;
  while (here > ilst) {
    const above = here - 2 >= ilst && T[(here - 1) * jw + here - 2] !== 0 ? 2 : 1;
    const j1 = here - above;
    if (!swapBlocks(T, Ut, jw, j1, above, size)) return false;
    here = j1;
  }
  return true;
}

/**
 * Swaps the adjacent diagonal blocks of T at j1 (n1 rows) and j1 + n1 (n2 rows) by an orthogonal
 * similarity, applied to all of T and to Ut. Refused (false, nothing changed) when the swapped form
 * would leave an entry above round-off below the new blocks (nearly equal eigenvalues of the two
 * blocks make the swap ill-conditioned).
 */
export function swapBlocks(T: Float64Array, Ut: Float64Array, n: number, j1: number, n1: number, n2: number): boolean {
  if (n1 === 1 && n2 === 1) {
    const j2 = j1 + 1;
    const t11 = T[j1 * n + j1];
    const t22 = T[j2 * n + j2];
    // the eigenvector of t22 is (t12, t22 − t11); rotate it onto e₁
    const f = T[j1 * n + j2];
    const g = t22 - t11;
    const r = Math.hypot(f, g);
    if (r === 0) return true;
    const c = f / r;
    const sn = g / r;
    rotateRows(T, n, j1, j2, j1, n - 1, c, sn);
    rotateColumns(T, n, j1, j2, 0, j2, c, sn);
    rotateRows(Ut, n, j1, j2, 0, n - 1, c, sn);
    T[j1 * n + j1] = t22;
    T[j2 * n + j2] = t11;
    T[j2 * n + j1] = 0;
    return true;
  }
  const nd = n1 + n2;
  const D = sD;
  let dnorm = 0;
  for (let i = 0; i < nd; i++) {
    for (let j = 0; j < nd; j++) {
      const v = T[(j1 + i) * n + j1 + j];
      D[i * 4 + j] = v;
      dnorm = Math.max(dnorm, Math.abs(v));
    }
  }
  // T11·X − X·T22 = T12; then [−X; I] spans the invariant subspace of T22
  const X = sylvester(D, n1, n2);
  // Householder QR of M = [−X; I] (nd×n2): Q's first n2 columns span range(M)
  const M = sM.fill(0);
  for (let i = 0; i < n1; i++) for (let j = 0; j < n2; j++) M[i * 2 + j] = -X[i * 2 + j];
  for (let j = 0; j < n2; j++) M[(n1 + j) * 2 + j] = 1;
  const Q = sQ.fill(0);
  for (let i = 0; i < nd; i++) Q[i * 4 + i] = 1;
  const v = s4a;
  for (let c = 0; c < n2; c++) {
    const len = nd - c;
    for (let i = 0; i < len; i++) v[i] = M[(c + i) * 2 + c];
    const tau = house(v, len);
    if (tau === 0) continue;
    // M := P·M on rows c.., columns c..; Q := Q·P on columns c..
    for (let j = c; j < n2; j++) {
      let dot = 0;
      for (let i = 0; i < len; i++) dot += v[i] * M[(c + i) * 2 + j];
      dot *= tau;
      for (let i = 0; i < len; i++) M[(c + i) * 2 + j] -= dot * v[i];
    }
    for (let i = 0; i < nd; i++) {
      let dot = 0;
      for (let k = 0; k < len; k++) dot += Q[i * 4 + c + k] * v[k];
      dot *= tau;
      for (let k = 0; k < len; k++) Q[i * 4 + c + k] -= dot * v[k];
    }
  }
  // the swapped block Qᵀ·D·Q: its lower-left n1×n2 part must be round-off
  const QD = sQD;
  const R = sR;
  for (let i = 0; i < nd; i++) {
    for (let j = 0; j < nd; j++) {
      let acc = 0;
      for (let k = 0; k < nd; k++) acc += Q[k * 4 + i] * D[k * 4 + j];
      QD[i * 4 + j] = acc;
    }
  }
  for (let i = 0; i < nd; i++) {
    for (let j = 0; j < nd; j++) {
      let acc = 0;
      for (let k = 0; k < nd; k++) acc += QD[i * 4 + k] * Q[k * 4 + j];
      R[i * 4 + j] = acc;
    }
  }
  const thresh = Math.max(10 * EPS * dnorm, SAFE_MIN / EPS);
  for (let i = n2; i < nd; i++) for (let j = 0; j < n2; j++) if (!(Math.abs(R[i * 4 + j]) <= thresh)) return false;
  // apply to T: rows j1.. (columns j1..n−1) and columns j1.. (rows 0..j1 + nd − 1), and to Ut
  const tmp = s4a;
  for (let col = j1; col < n; col++) {
    for (let i = 0; i < nd; i++) tmp[i] = T[(j1 + i) * n + col];
    for (let i = 0; i < nd; i++) {
      let acc = 0;
      for (let k = 0; k < nd; k++) acc += Q[k * 4 + i] * tmp[k];
      T[(j1 + i) * n + col] = acc;
    }
  }
  for (let row = 0; row < j1 + nd; row++) {
    const b = row * n + j1;
    for (let j = 0; j < nd; j++) tmp[j] = T[b + j];
    for (let j = 0; j < nd; j++) {
      let acc = 0;
      for (let k = 0; k < nd; k++) acc += tmp[k] * Q[k * 4 + j];
      T[b + j] = acc;
    }
  }
  for (let col = 0; col < n; col++) {
    for (let i = 0; i < nd; i++) tmp[i] = Ut[(j1 + i) * n + col];
    for (let i = 0; i < nd; i++) {
      let acc = 0;
      for (let k = 0; k < nd; k++) acc += Q[k * 4 + i] * tmp[k];
      Ut[(j1 + i) * n + col] = acc;
    }
  }
  // exact zeros below the new blocks (and below the subdiagonal inside them)
  for (let i = 0; i < nd; i++) {
    for (let j = 0; j < nd; j++) {
      const below = i >= n2 ? j < n2 || i - j > 1 : i - j > 1;
      if (below) T[(j1 + i) * n + j1 + j] = 0;
    }
  }
  return true;
}

/**
 * X (n1×n2, stride 2) with T11·X − X·T22 = T12, T11 = D[0..n1−1][0..n1−1], T22 = D[n1..][n1..],
 * T12 = D[0..n1−1][n1..] (stride 4): the n1·n2 Kronecker system by Gaussian elimination with
 * complete pivoting; a pivot below round-off is replaced by it (nearly equal eigenvalues: the swap
 * test then decides).
 */
function sylvester(D: Float64Array, n1: number, n2: number): Float64Array {
  const m = n1 * n2;
  const K = sK.fill(0);
  const rhs = s4b.fill(0);
  let kmax = 0;
  // unknown (i, j) at index i + n1·j
  for (let j = 0; j < n2; j++) {
    for (let i = 0; i < n1; i++) {
      const u = i + n1 * j;
      rhs[u] = D[i * 4 + n1 + j];
      for (let k = 0; k < n1; k++) K[u * 4 + k + n1 * j] += D[i * 4 + k];
      for (let k = 0; k < n2; k++) K[u * 4 + i + n1 * k] -= D[(n1 + k) * 4 + n1 + j];
    }
  }
  for (let k = 0; k < 16; k++) kmax = Math.max(kmax, Math.abs(K[k]));
  const smin = Math.max(EPS * kmax, SAFE_MIN);
  const perm = [0, 1, 2, 3];
  for (let c = 0; c < m; c++) {
    let bi = c;
    let bj = c;
    let best = -1;
    for (let i = c; i < m; i++) {
      for (let j = c; j < m; j++) {
        const a = Math.abs(K[i * 4 + j]);
        if (a > best) {
          best = a;
          bi = i;
          bj = j;
        }
      }
    }
    if (bi !== c) {
      for (let j = 0; j < m; j++) {
        const t = K[c * 4 + j];
        K[c * 4 + j] = K[bi * 4 + j];
        K[bi * 4 + j] = t;
      }
      const t = rhs[c];
      rhs[c] = rhs[bi];
      rhs[bi] = t;
    }
    if (bj !== c) {
      for (let i = 0; i < m; i++) {
        const t = K[i * 4 + c];
        K[i * 4 + c] = K[i * 4 + bj];
        K[i * 4 + bj] = t;
      }
      const t = perm[c];
      perm[c] = perm[bj];
      perm[bj] = t;
    }
    if (Math.abs(K[c * 4 + c]) < smin) K[c * 4 + c] = smin;
    const piv = K[c * 4 + c];
    for (let i = c + 1; i < m; i++) {
      const f = K[i * 4 + c] / piv;
      if (f === 0) continue;
      for (let j = c; j < m; j++) K[i * 4 + j] -= f * K[c * 4 + j];
      rhs[i] -= f * rhs[c];
    }
  }
  const y = s4c.fill(0);
  for (let i = m - 1; i >= 0; i--) {
    let acc = rhs[i];
    for (let j = i + 1; j < m; j++) acc -= K[i * 4 + j] * y[j];
    y[i] = acc / K[i * 4 + i];
  }
  const X = s4d.fill(0);
  for (let c = 0; c < m; c++) {
    const u = perm[c];
    X[(u % n1) * 2 + Math.floor(u / n1)] = y[c];
  }
  return X;
}

/**
 * Householder vector of x[0..len−1] in place: afterwards x = v with v[0] = 1 and the return value
 * τ, such that (I − τ·v·vᵀ)·x_old = β·e₁. τ = 0 when x_old is already a multiple of e₁.
 */
function house(x: Float64Array, len: number): number {
  let scale = 0;
  for (let i = 1; i < len; i++) scale = Math.max(scale, Math.abs(x[i]));
  if (scale === 0) {
    x[0] = 1;
    return 0;
  }
  scale = Math.max(scale, Math.abs(x[0]));
  let ss = 0;
  for (let i = 0; i < len; i++) ss += (x[i] / scale) ** 2;
  const alpha = x[0];
  const beta = (alpha >= 0 ? -1 : 1) * scale * Math.sqrt(ss);
  const tau = (beta - alpha) / beta;
  const f = 1 / (alpha - beta);
  for (let i = 1; i < len; i++) x[i] *= f;
  x[0] = 1;
  return tau;
}

/**
 * After deflation: the spike of the undeflated part (first entries of its Schur vectors) is
 * reflected onto e₁, then T[0..ns−1][0..ns−1] is reduced to Hessenberg form again by reflectors
 * that leave index 0 alone, so the spike stays a multiple of e₁. All applied to T (left on full
 * rows, right on the leading ns rows: the rows below are zero there) and to Ut.
 */
function restoreHessenberg(T: Float64Array, Ut: Float64Array, jw: number, ns: number): void {
  const v = new Float64Array(ns);
  for (let i = 0; i < ns; i++) v[i] = Ut[i * jw];
  let tau = house(v, ns);
  if (tau !== 0) reflectBoth(T, Ut, jw, ns, 0, ns, v, tau);
  for (let c = 0; c + 2 < ns; c++) {
    const len = ns - c - 1;
    for (let i = 0; i < len; i++) v[i] = T[(c + 1 + i) * jw + c];
    tau = house(v, len);
    if (tau !== 0) reflectBoth(T, Ut, jw, ns, c + 1, len, v, tau);
    for (let i = c + 2; i < ns; i++) T[i * jw + c] = 0;
  }
}

/** T := P·T·P and Ut := P·Ut for P = I − τ·v·vᵀ acting on indices r0..r0+len−1 (T's right product on rows 0..ns−1). */
function reflectBoth(T: Float64Array, Ut: Float64Array, jw: number, ns: number, r0: number, len: number, v: Float64Array, tau: number): void {
  reflectRows(T, jw, r0, len, v, tau);
  reflectRows(Ut, jw, r0, len, v, tau);
  for (let r = 0; r < ns; r++) {
    const b = r * jw + r0;
    let dot = 0;
    for (let i = 0; i < len; i++) dot += T[b + i] * v[i];
    dot *= tau;
    for (let i = 0; i < len; i++) T[b + i] -= dot * v[i];
  }
}

/** M := P·M on rows r0..r0+len−1, all jw columns (T's columns left of r0 − 1 are zero in those rows). */
function reflectRows(M: Float64Array, jw: number, r0: number, len: number, v: Float64Array, tau: number): void {
  const w = work(jw).fill(0, 0, jw);
  for (let i = 0; i < len; i++) {
    const vi = v[i];
    const b = (r0 + i) * jw;
    for (let j = 0; j < jw; j++) w[j] += vi * M[b + j];
  }
  for (let i = 0; i < len; i++) {
    const f = tau * v[i];
    const b = (r0 + i) * jw;
    for (let j = 0; j < jw; j++) M[b + j] -= f * w[j];
  }
}

/** Rows a, b of M (columns c0..c1): a := c·a + s·b, b := c·b − s·a. */
function rotateRows(M: Float64Array, n: number, a: number, b: number, c0: number, c1: number, c: number, s: number): void {
  const ra = a * n;
  const rb = b * n;
  for (let j = c0; j <= c1; j++) {
    const x = M[ra + j];
    const y = M[rb + j];
    M[ra + j] = c * x + s * y;
    M[rb + j] = c * y - s * x;
  }
}

/** Columns a, b of M (rows r0..r1), the same rotation. */
function rotateColumns(M: Float64Array, n: number, a: number, b: number, r0: number, r1: number, c: number, s: number): void {
  for (let i = r0; i <= r1; i++) {
    const x = M[i * n + a];
    const y = M[i * n + b];
    M[i * n + a] = c * x + s * y;
    M[i * n + b] = c * y - s * x;
  }
}

/**
 * Rows r0..r1 of M, columns k0..k0+jw−1: M := M·U, with U = Utᵀ (dot products with the rows of
 * Ut, four at a time: independent sums instead of one running sum waiting on each addition).
 */
function rightMultiply(M: Float64Array, nn: number, r0: number, r1: number, k0: number, Ut: Float64Array, jw: number): void {
  const X = simdInstance();
  if (X && ownedBy(M)) {
    // the kernel wants U itself (two result columns per vector, each summed in the order below)
    const U = sharedF64(jw * jw);
    const row = sharedF64(jw);
    if (ownedBy(U) && ownedBy(row)) {
      for (let k = 0; k < jw; k++) for (let j = 0; j < jw; j++) U[k * jw + j] = Ut[j * jw + k];
      X.rightMultiply(M.byteOffset, nn, r0, r1, k0, U.byteOffset, jw, row.byteOffset);
      return;
    }
  }
  const row = work(jw);
  for (let r = r0; r <= r1; r++) {
    const b = r * nn + k0;
    for (let k = 0; k < jw; k++) row[k] = M[b + k];
    let j = 0;
    for (; j + 3 < jw; j += 4) {
      const u0 = j * jw;
      const u1 = u0 + jw;
      const u2 = u1 + jw;
      const u3 = u2 + jw;
      let a0 = 0;
      let a1 = 0;
      let a2 = 0;
      let a3 = 0;
      for (let k = 0; k < jw; k++) {
        const x = row[k];
        a0 += x * Ut[u0 + k];
        a1 += x * Ut[u1 + k];
        a2 += x * Ut[u2 + k];
        a3 += x * Ut[u3 + k];
      }
      M[b + j] = a0;
      M[b + j + 1] = a1;
      M[b + j + 2] = a2;
      M[b + j + 3] = a3;
    }
    for (; j < jw; j++) {
      const u = j * jw;
      let acc = 0;
      for (let k = 0; k < jw; k++) acc += row[k] * Ut[u + k];
      M[b + j] = acc;
    }
  }
}
