/**
 * The loops of the general eigen-solver that either thread may run (eig.ts on the main thread,
 * helper.ts on the helper thread). The helper's source is built from these functions' text, so
 * each one may call only the others in this file and the language's globals: no imports, no
 * module-level state.
 *
 * Each kernel works on a range (columns or rows) with the same operations in the same order on
 * every entry whatever the range: split between two threads, the results are bit-for-bit those of
 * one thread.
 */

/**
 * One Householder step of the Hessenberg reduction (step m, reflector u = ort[m..n−1], P = I −
 * u·uᵀ/h): f[j] = (uᵀ·H)[j]/h for the columns j0..j1−1 (rows m..n−1, four per pass over f).
 */
export function hessenbergCols(H: Float64Array, n: number, m: number, ort: Float64Array, f: Float64Array, h: number, j0: number, j1: number): void {
  const high = n - 1;
  f.fill(0, j0, j1);
  let i = m;
  for (; i + 3 <= high; i += 4) {
    const o0 = ort[i];
    const o1 = ort[i + 1];
    const o2 = ort[i + 2];
    const o3 = ort[i + 3];
    const b0 = i * n;
    const b1 = b0 + n;
    const b2 = b1 + n;
    const b3 = b2 + n;
    for (let j = j0; j < j1; j++) f[j] += o0 * H[b0 + j] + o1 * H[b1 + j] + o2 * H[b2 + j] + o3 * H[b3 + j];
  }
  for (; i <= high; i++) {
    const oi = ort[i];
    const base = i * n;
    for (let j = j0; j < j1; j++) f[j] += oi * H[base + j];
  }
  for (let j = j0; j < j1; j++) f[j] /= h;
}

/**
 * The split point of Hessenberg step m's columns m..n−1 into two parts. Each row's dot product
 * with the reflector is formed as (sum over m..c−1) + (sum over c..n−1), on one thread as on two
 * (hessenbergStep, or hessenbergLeft/Right on each thread's half), so both give the same bits.
 */
export function hessenbergSplit(n: number, m: number): number {
  // on a multiple of 8 (a 64-byte cache line when rows are aligned): the threads then never write
  // to the same line of a row (one shared line per row and step made the split slower than one
  // thread, measured)
  const c = (m + ((n - m + 1) >> 1) + 7) & ~7;
  return c < n ? c : n - 1;
}

/**
 * Hessenberg step m on one thread, rows i0..i1−1 (f = uᵀ·H/h already formed): the left update
 * H −= u·fᵀ on rows m..n−1, then H := H·(I − u·uᵀ/h) on every row, the dot product in two halves
 * split at c. Four rows at a time: each row is read and written twice.
 */
export function hessenbergStep(H: Float64Array, n: number, m: number, ort: Float64Array, f: Float64Array, h: number, c: number, i0: number, i1: number): void {
  let i = i0;
  for (; i + 3 < i1; i += 4) {
    const b0 = i * n;
    const b1 = b0 + n;
    const b2 = b1 + n;
    const b3 = b2 + n;
    let a0 = 0;
    let a1 = 0;
    let a2 = 0;
    let a3 = 0;
    let s0 = 0;
    let s1 = 0;
    let s2 = 0;
    let s3 = 0;
    if (i + 3 < m) {
      for (let j = m; j < c; j++) {
        const oj = ort[j];
        a0 += oj * H[b0 + j];
        a1 += oj * H[b1 + j];
        a2 += oj * H[b2 + j];
        a3 += oj * H[b3 + j];
      }
      for (let j = c; j < n; j++) {
        const oj = ort[j];
        s0 += oj * H[b0 + j];
        s1 += oj * H[b1 + j];
        s2 += oj * H[b2 + j];
        s3 += oj * H[b3 + j];
      }
    } else if (i >= m) {
      const o0 = ort[i];
      const o1 = ort[i + 1];
      const o2 = ort[i + 2];
      const o3 = ort[i + 3];
      for (let j = m; j < c; j++) {
        const oj = ort[j];
        const fj = f[j];
        const v0 = H[b0 + j] - o0 * fj;
        const v1 = H[b1 + j] - o1 * fj;
        const v2 = H[b2 + j] - o2 * fj;
        const v3 = H[b3 + j] - o3 * fj;
        H[b0 + j] = v0;
        H[b1 + j] = v1;
        H[b2 + j] = v2;
        H[b3 + j] = v3;
        a0 += oj * v0;
        a1 += oj * v1;
        a2 += oj * v2;
        a3 += oj * v3;
      }
      for (let j = c; j < n; j++) {
        const oj = ort[j];
        const fj = f[j];
        const v0 = H[b0 + j] - o0 * fj;
        const v1 = H[b1 + j] - o1 * fj;
        const v2 = H[b2 + j] - o2 * fj;
        const v3 = H[b3 + j] - o3 * fj;
        H[b0 + j] = v0;
        H[b1 + j] = v1;
        H[b2 + j] = v2;
        H[b3 + j] = v3;
        s0 += oj * v0;
        s1 += oj * v1;
        s2 += oj * v2;
        s3 += oj * v3;
      }
    } else {
      // a block straddling row m: one row at a time
      for (let r = i; r < i + 4; r++) hessenbergRow(H, n, m, ort, f, h, c, r);
      continue;
    }
    const t0 = (a0 + s0) / h;
    const t1 = (a1 + s1) / h;
    const t2 = (a2 + s2) / h;
    const t3 = (a3 + s3) / h;
    for (let j = m; j < n; j++) {
      const oj = ort[j];
      H[b0 + j] -= t0 * oj;
      H[b1 + j] -= t1 * oj;
      H[b2 + j] -= t2 * oj;
      H[b3 + j] -= t3 * oj;
    }
  }
  for (; i < i1; i++) hessenbergRow(H, n, m, ort, f, h, c, i);
}

/** Row i of hessenbergStep alone. */
export function hessenbergRow(H: Float64Array, n: number, m: number, ort: Float64Array, f: Float64Array, h: number, c: number, i: number): void {
  const b = i * n;
  let a = 0;
  let s = 0;
  if (i >= m) {
    const oi = ort[i];
    for (let j = m; j < n; j++) {
      const v = H[b + j] - oi * f[j];
      H[b + j] = v;
      if (j < c) a += ort[j] * v;
      else s += ort[j] * v;
    }
  } else {
    for (let j = m; j < c; j++) a += ort[j] * H[b + j];
    for (let j = c; j < n; j++) s += ort[j] * H[b + j];
  }
  const t = (a + s) / h;
  for (let j = m; j < n; j++) H[b + j] -= t * ort[j];
}

/**
 * One thread's half of Hessenberg step m, columns j0..j1−1 (the other half on the other thread):
 * f there, the left update on rows m..n−1, and each row's partial dot product into sp.
 */
export function hessenbergLeft(H: Float64Array, n: number, m: number, ort: Float64Array, f: Float64Array, h: number, j0: number, j1: number, sp: Float64Array): void {
  hessenbergCols(H, n, m, ort, f, h, j0, j1);
  let i = 0;
  // rows above m: dot products only, four rows at a time
  for (; i + 3 < m; i += 4) {
    const b0 = i * n;
    const b1 = b0 + n;
    const b2 = b1 + n;
    const b3 = b2 + n;
    let a0 = 0;
    let a1 = 0;
    let a2 = 0;
    let a3 = 0;
    for (let j = j0; j < j1; j++) {
      const oj = ort[j];
      a0 += oj * H[b0 + j];
      a1 += oj * H[b1 + j];
      a2 += oj * H[b2 + j];
      a3 += oj * H[b3 + j];
    }
    sp[i] = a0;
    sp[i + 1] = a1;
    sp[i + 2] = a2;
    sp[i + 3] = a3;
  }
  for (; i < m; i++) {
    const b = i * n;
    let a = 0;
    for (let j = j0; j < j1; j++) a += ort[j] * H[b + j];
    sp[i] = a;
  }
  // rows m..n−1: the left update, then the dot product of the updated row
  for (; i + 3 < n; i += 4) {
    const b0 = i * n;
    const b1 = b0 + n;
    const b2 = b1 + n;
    const b3 = b2 + n;
    const o0 = ort[i];
    const o1 = ort[i + 1];
    const o2 = ort[i + 2];
    const o3 = ort[i + 3];
    let a0 = 0;
    let a1 = 0;
    let a2 = 0;
    let a3 = 0;
    for (let j = j0; j < j1; j++) {
      const oj = ort[j];
      const fj = f[j];
      const v0 = H[b0 + j] - o0 * fj;
      const v1 = H[b1 + j] - o1 * fj;
      const v2 = H[b2 + j] - o2 * fj;
      const v3 = H[b3 + j] - o3 * fj;
      H[b0 + j] = v0;
      H[b1 + j] = v1;
      H[b2 + j] = v2;
      H[b3 + j] = v3;
      a0 += oj * v0;
      a1 += oj * v1;
      a2 += oj * v2;
      a3 += oj * v3;
    }
    sp[i] = a0;
    sp[i + 1] = a1;
    sp[i + 2] = a2;
    sp[i + 3] = a3;
  }
  for (; i < n; i++) {
    const b = i * n;
    const oi = ort[i];
    let a = 0;
    for (let j = j0; j < j1; j++) {
      const v = H[b + j] - oi * f[j];
      H[b + j] = v;
      a += ort[j] * v;
    }
    sp[i] = a;
  }
}

/** The right update of Hessenberg step m on columns j0..j1−1 of every row, with the two halves' dot products. */
export function hessenbergRight(H: Float64Array, n: number, ort: Float64Array, sa: Float64Array, sb: Float64Array, h: number, j0: number, j1: number): void {
  let i = 0;
  for (; i + 1 < n; i += 2) {
    const b0 = i * n;
    const b1 = b0 + n;
    const t0 = (sa[i] + sb[i]) / h;
    const t1 = (sa[i + 1] + sb[i + 1]) / h;
    for (let j = j0; j < j1; j++) {
      const oj = ort[j];
      H[b0 + j] -= t0 * oj;
      H[b1 + j] -= t1 * oj;
    }
  }
  for (; i < n; i++) {
    const b = i * n;
    const t = (sa[i] + sb[i]) / h;
    for (let j = j0; j < j1; j++) H[b + j] -= t * ort[j];
  }
}

/**
 * Rows j0..j0+3 of X through the packed Hessenberg reflectors (u at offs; hs[m] = H[m][m−1] of
 * the reduced matrix), last to first. The update by reflector m is fused
 * with the dot products of reflector m − 1 (which read exactly the entries the update has just
 * written, plus entry m − 1): one pass over the rows per reflector instead of two, with the same
 * operations in the same order.
 */
export function accumulateBlock(hs: Float64Array, n: number, u: Float64Array, offs: Int32Array, X: Float64Array, j0: number): void {
  const high = n - 1;
  const b0 = j0 * n;
  const b1 = b0 + n;
  const b2 = b1 + n;
  const b3 = b2 + n;
  let g0 = 0;
  let g1 = 0;
  let g2 = 0;
  let g3 = 0;
  let ready = false; // g0..g3 hold reflector m's dot products
  for (let m = Math.min(high - 1, j0 + 3); m >= 1; m--) {
    const hm = hs[m];
    if (hm === 0) {
      ready = false;
      continue;
    }
    const o = offs[m] - m;
    if (!ready) {
      g0 = g1 = g2 = g3 = 0;
      for (let i = m; i <= high; i++) {
        const ui = u[o + i];
        g0 += ui * X[b0 + i];
        g1 += ui * X[b1 + i];
        g2 += ui * X[b2 + i];
        g3 += ui * X[b3 + i];
      }
    }
    // two divisions avoid underflow
    const den = u[o + m];
    g0 = g0 / den / hm;
    g1 = g1 / den / hm;
    g2 = g2 / den / hm;
    g3 = g3 / den / hm;
    const p = m - 1;
    if (p >= 1 && hs[p] !== 0) {
      const q = offs[p] - p;
      const up = u[q + p];
      let d0 = up * X[b0 + p];
      let d1 = up * X[b1 + p];
      let d2 = up * X[b2 + p];
      let d3 = up * X[b3 + p];
      for (let i = m; i <= high; i++) {
        const ui = u[o + i];
        const wi = u[q + i];
        const x0 = X[b0 + i] + g0 * ui;
        const x1 = X[b1 + i] + g1 * ui;
        const x2 = X[b2 + i] + g2 * ui;
        const x3 = X[b3 + i] + g3 * ui;
        X[b0 + i] = x0;
        X[b1 + i] = x1;
        X[b2 + i] = x2;
        X[b3 + i] = x3;
        d0 += wi * x0;
        d1 += wi * x1;
        d2 += wi * x2;
        d3 += wi * x3;
      }
      g0 = d0;
      g1 = d1;
      g2 = d2;
      g3 = d3;
      ready = true;
    } else {
      for (let i = m; i <= high; i++) {
        const ui = u[o + i];
        X[b0 + i] += g0 * ui;
        X[b1 + i] += g1 * ui;
        X[b2 + i] += g2 * ui;
        X[b3 + i] += g3 * ui;
      }
      ready = false;
    }
  }
}

/** The last rows (fewer than four), one at a time. */
export function accumulateTail(hs: Float64Array, n: number, u: Float64Array, offs: Int32Array, X: Float64Array, j0: number): void {
  const high = n - 1;
  for (let j = j0; j < n; j++) {
    const b = j * n;
    for (let m = Math.min(high - 1, j); m >= 1; m--) {
      const hm = hs[m];
      if (hm === 0) continue;
      const o = offs[m] - m;
      let g = 0;
      for (let i = m; i <= high; i++) g += u[o + i] * X[b + i];
      g = g / u[o + m] / hm;
      for (let i = m; i <= high; i++) X[b + i] += g * u[o + i];
    }
  }
}

/**
 * X := Qᵀ (row-major) from the packed reflectors: the rows of I go through the reflectors last to
 * first (row j is untouched by those of index m > j), four rows at a time (one pass over a
 * reflector serves four dot products and four updates).
 */
export function accumulateRows(hs: Float64Array, n: number, u: Float64Array, offs: Int32Array, X: Float64Array): void {
  X.fill(0);
  for (let i = 0; i < n; i++) X[i * n + i] = 1;
  for (let j0 = 0; j0 < n; j0 += 4) {
    if (j0 + 4 <= n) accumulateBlock(hs, n, u, offs, X, j0);
    else accumulateTail(hs, n, u, offs, X, j0);
  }
}

/**
 * M := P_k·M (transposed: false; P = I − v·uᵀ with v = (x, y, z), u = (1, q, r)) or M := P_kᵀ·M
 * (transposed: true) on rows k..k+2, columns c0..c1, for k = m..n−1 in order. Two consecutive
 * reflectors share one pass over the columns (four rows in registers).
 */
export function applyLeft(
  M: Float64Array,
  nn: number,
  c0: number,
  c1: number,
  m: number,
  n: number,
  rx: Float64Array,
  ry: Float64Array,
  rz: Float64Array,
  rq: Float64Array,
  rr: Float64Array,
  transposed: boolean,
): void {
  // the product with (w0, w1, w2) forms the dot, (e0, e1, e2) scale the update
  let k = m;
  for (; k + 1 < n - 1; k += 2) {
    const r0 = k * nn;
    if (transposed) {
      reflect4(M, r0, nn, c0, c1, rx[k], ry[k], rz[k], 1, rq[k], rr[k], rx[k + 1], ry[k + 1], rz[k + 1], 1, rq[k + 1], rr[k + 1]);
    } else {
      reflect4(M, r0, nn, c0, c1, 1, rq[k], rr[k], rx[k], ry[k], rz[k], 1, rq[k + 1], rr[k + 1], rx[k + 1], ry[k + 1], rz[k + 1]);
    }
  }
  for (; k <= n - 1; k++) {
    const r0 = k * nn;
    const rows = k < n - 1 ? 3 : 2;
    if (transposed) reflect3(M, r0, nn, c0, c1, rows, rx[k], ry[k], rz[k], 1, rq[k], rr[k]);
    else reflect3(M, r0, nn, c0, c1, rows, 1, rq[k], rr[k], rx[k], ry[k], rz[k]);
  }
}

/** Two reflectors on rows r0/nn … r0/nn + 3 (the second one row lower), columns c0..c1. */
export function reflect4(
  M: Float64Array,
  r0: number,
  nn: number,
  c0: number,
  c1: number,
  a0: number,
  a1: number,
  a2: number,
  f0: number,
  f1: number,
  f2: number,
  b0: number,
  b1: number,
  b2: number,
  g0: number,
  g1: number,
  g2: number,
): void {
  const r1 = r0 + nn;
  const r2 = r1 + nn;
  const r3 = r2 + nn;
  for (let j = c0; j <= c1; j++) {
    let v0 = M[r0 + j];
    let v1 = M[r1 + j];
    let v2 = M[r2 + j];
    let v3 = M[r3 + j];
    const p = a0 * v0 + a1 * v1 + a2 * v2;
    v0 -= p * f0;
    v1 -= p * f1;
    v2 -= p * f2;
    const t = b0 * v1 + b1 * v2 + b2 * v3;
    v1 -= t * g0;
    v2 -= t * g1;
    v3 -= t * g2;
    M[r0 + j] = v0;
    M[r1 + j] = v1;
    M[r2 + j] = v2;
    M[r3 + j] = v3;
  }
}

/** One reflector on three rows (or two: the last reflector of a sweep) from row offset r0, columns c0..c1. */
export function reflect3(
  M: Float64Array,
  r0: number,
  nn: number,
  c0: number,
  c1: number,
  rows: number,
  a0: number,
  a1: number,
  a2: number,
  f0: number,
  f1: number,
  f2: number,
): void {
  const r1 = r0 + nn;
  if (rows === 3) {
    const r2 = r1 + nn;
    for (let j = c0; j <= c1; j++) {
      const p = a0 * M[r0 + j] + a1 * M[r1 + j] + a2 * M[r2 + j];
      M[r0 + j] -= p * f0;
      M[r1 + j] -= p * f1;
      M[r2 + j] -= p * f2;
    }
  } else {
    for (let j = c0; j <= c1; j++) {
      const p = a0 * M[r0 + j] + a1 * M[r1 + j];
      M[r0 + j] -= p * f0;
      M[r1 + j] -= p * f1;
    }
  }
}

/** Rows a, b (offsets ra, rb) of M, columns c0..c1: a := q·a + p·b, b := q·b − p·a (hqr2's real-pair rotation). */
export function rotatePair(M: Float64Array, ra: number, rb: number, c0: number, c1: number, p: number, q: number): void {
  for (let j = c0; j <= c1; j++) {
    const z = M[ra + j];
    M[ra + j] = q * z + p * M[rb + j];
    M[rb + j] = q * M[rb + j] - p * z;
  }
}

/**
 * Rows k0..k0+jw−1 of M, columns c0..c1: M := Uᵀ·M = Ut·M (row j of the result = Σₖ Ut[j][k]·row k),
 * four result rows per pass over two rows of M. `out` holds at least jw·(c1 − c0 + 1) entries.
 */
export function leftMultiply(M: Float64Array, nn: number, k0: number, c0: number, c1: number, Ut: Float64Array, jw: number, out: Float64Array): void {
  const width = c1 - c0 + 1;
  out.fill(0, 0, jw * width);
  let j = 0;
  for (; j + 3 < jw; j += 4) {
    const o0 = j * width;
    const o1 = o0 + width;
    const o2 = o1 + width;
    const o3 = o2 + width;
    const u0 = j * jw;
    const u1 = u0 + jw;
    const u2 = u1 + jw;
    const u3 = u2 + jw;
    let k = 0;
    for (; k + 1 < jw; k += 2) {
      const p0 = Ut[u0 + k];
      const q0 = Ut[u0 + k + 1];
      const p1 = Ut[u1 + k];
      const q1 = Ut[u1 + k + 1];
      const p2 = Ut[u2 + k];
      const q2 = Ut[u2 + k + 1];
      const p3 = Ut[u3 + k];
      const q3 = Ut[u3 + k + 1];
      const b0 = (k0 + k) * nn + c0;
      const b1 = b0 + nn;
      for (let c = 0; c < width; c++) {
        const m0 = M[b0 + c];
        const m1 = M[b1 + c];
        out[o0 + c] += p0 * m0 + q0 * m1;
        out[o1 + c] += p1 * m0 + q1 * m1;
        out[o2 + c] += p2 * m0 + q2 * m1;
        out[o3 + c] += p3 * m0 + q3 * m1;
      }
    }
    for (; k < jw; k++) {
      const p0 = Ut[u0 + k];
      const p1 = Ut[u1 + k];
      const p2 = Ut[u2 + k];
      const p3 = Ut[u3 + k];
      const b0 = (k0 + k) * nn + c0;
      for (let c = 0; c < width; c++) {
        const m0 = M[b0 + c];
        out[o0 + c] += p0 * m0;
        out[o1 + c] += p1 * m0;
        out[o2 + c] += p2 * m0;
        out[o3 + c] += p3 * m0;
      }
    }
  }
  for (; j < jw; j++) {
    const o = j * width;
    const u = j * jw;
    let k = 0;
    for (; k + 1 < jw; k += 2) {
      const a0 = Ut[u + k];
      const a1 = Ut[u + k + 1];
      const b0 = (k0 + k) * nn + c0;
      const b1 = b0 + nn;
      for (let c = 0; c < width; c++) out[o + c] += a0 * M[b0 + c] + a1 * M[b1 + c];
    }
    for (; k < jw; k++) {
      const a0 = Ut[u + k];
      const b0 = (k0 + k) * nn + c0;
      for (let c = 0; c < width; c++) out[o + c] += a0 * M[b0 + c];
    }
  }
  for (let r = 0; r < jw; r++) {
    const b = (k0 + r) * nn + c0;
    for (let c = 0; c < width; c++) M[b + c] = out[r * width + c];
  }
}

/**
 * V := V·X in the transposed storage, columns i0..i1−1 of Vt (X upper triangular in X's upper
 * triangle, from the back-substitution). Row j of the result = Σ_{k ≤ j} X[k][j]·(row k of Vt);
 * going from the last row up, rows k < j are still old. Four result rows at a time, so each pass
 * over Vt's rows serves four of them (a quarter of the memory traffic: at n = 1000, Vt does not
 * fit in cache), two rows of Vt per pass. `acc` holds at least 4·nn entries.
 */
export function backTransformRange(X: Float64Array, nn: number, Vt: Float64Array, i0: number, i1: number, acc: Float64Array): void {
  let j = nn - 1;
  for (; j >= 3; j -= 4) {
    // result rows j − 3 … j in acc[0..3]; k ≤ j − 3 reaches all four
    for (let t = 0; t < 4; t++) acc.fill(0, t * nn + i0, t * nn + i1);
    const r0 = j - 3;
    let k = 0;
    for (; k + 1 <= r0; k += 2) {
      const h0 = k * nn;
      const h1 = h0 + nn;
      backTransformPair(acc, Vt, nn, h0, h1, i0, i1, X[h0 + r0], X[h0 + r0 + 1], X[h0 + r0 + 2], X[h0 + j], X[h1 + r0], X[h1 + r0 + 1], X[h1 + r0 + 2], X[h1 + j]);
    }
    // the rest of the triangle, one row of Vt and one result row at a time
    for (; k <= j; k++) {
      const bk = k * nn;
      for (let t = Math.max(0, k - r0); t < 4; t++) {
        const x = X[bk + r0 + t];
        if (x === 0) continue;
        const o = t * nn;
        for (let i = i0; i < i1; i++) acc[o + i] += x * Vt[bk + i];
      }
    }
    for (let t = 0; t < 4; t++) {
      const o = t * nn;
      const b = (r0 + t) * nn;
      for (let i = i0; i < i1; i++) Vt[b + i] = acc[o + i];
    }
  }
  // the first rows, fewer than four: one at a time
  for (; j >= 0; j--) {
    acc.fill(0, i0, i1);
    for (let k = 0; k <= j; k++) {
      const x = X[k * nn + j];
      if (x === 0) continue;
      const bk = k * nn;
      for (let i = i0; i < i1; i++) acc[i] += x * Vt[bk + i];
    }
    const b = j * nn;
    for (let i = i0; i < i1; i++) Vt[b + i] = acc[i];
  }
}

/** acc row t += a_t·(Vt row at h0) + b_t·(Vt row at h1), t = 0..3, columns i0..i1−1. */
export function backTransformPair(
  acc: Float64Array,
  Vt: Float64Array,
  nn: number,
  h0: number,
  h1: number,
  i0: number,
  i1: number,
  a0: number,
  a1: number,
  a2: number,
  a3: number,
  b0: number,
  b1: number,
  b2: number,
  b3: number,
): void {
  const o1 = nn;
  const o2 = 2 * nn;
  const o3 = 3 * nn;
  for (let i = i0; i < i1; i++) {
    const v = Vt[h0 + i];
    const w = Vt[h1 + i];
    acc[i] += a0 * v + b0 * w;
    acc[o1 + i] += a1 * v + b1 * w;
    acc[o2 + i] += a2 * v + b2 * w;
    acc[o3 + i] += a3 * v + b3 * w;
  }
}
