/**
 * Small dense-matrix helpers on plain row-major arrays (number[][]).
 * The model and LTI stages use these for bookkeeping; heavy factorizations go through ml-matrix.
 */
export type Mat = number[][];
export type Vec = number[];

/**
 * A plain array copy of `len` entries of a typed array from `from` (Array.from on a typed array
 * goes through the iterator protocol and is an order of magnitude slower).
 */
export function toArray(a: Float64Array, from = 0, len = a.length - from): number[] {
  const out = new Array<number>(len);
  for (let j = 0; j < len; j++) out[j] = a[from + j];
  return out;
}

export function zeros(rows: number, cols: number): Mat {
  return Array.from({ length: rows }, () => new Array<number>(cols).fill(0));
}

export function identity(n: number): Mat {
  const m = zeros(n, n);
  for (let i = 0; i < n; i++) m[i][i] = 1;
  return m;
}

export function cols(m: Mat, fallback = 0): number {
  return m.length ? m[0].length : fallback;
}

export function matmul(a: Mat, b: Mat, bCols = cols(b)): Mat {
  const n = a.length;
  const k = b.length;
  // b's rows as compressed lists of nonzeros: circuit matrices are mostly zeros (a capacitor's row
  // touches a few nodes), and then a·b costs Σ over a's nonzeros of the matching row of b
  let nnz = 0;
  for (let p = 0; p < k; p++) {
    const bp = b[p];
    for (let j = 0; j < bCols; j++) if (bp[j] !== 0) nnz++;
  }
  const out: Mat = new Array(n);
  const row = new Float64Array(bCols);
  if (nnz <= 0.25 * k * bCols) {
    const start = new Int32Array(k + 1);
    const idx = new Int32Array(nnz);
    const val = new Float64Array(nnz);
    let q = 0;
    for (let p = 0; p < k; p++) {
      start[p] = q;
      const bp = b[p];
      for (let j = 0; j < bCols; j++) {
        if (bp[j] !== 0) {
          idx[q] = j;
          val[q++] = bp[j];
        }
      }
    }
    start[k] = q;
    for (let i = 0; i < n; i++) {
      row.fill(0);
      const ai = a[i];
      for (let p = 0; p < k; p++) {
        const aip = ai[p];
        if (aip === 0) continue;
        for (let r = start[p]; r < start[p + 1]; r++) row[idx[r]] += aip * val[r];
      }
      out[i] = toArray(row);
    }
    return out;
  }
  // dense b: flat typed array, the i-k-j loop then runs on contiguous memory
  const B = new Float64Array(k * bCols);
  for (let p = 0; p < k; p++) {
    const bp = b[p];
    for (let j = 0; j < bCols; j++) B[p * bCols + j] = bp[j];
  }
  for (let i = 0; i < n; i++) {
    row.fill(0);
    const ai = a[i];
    for (let p = 0; p < k; p++) {
      const aip = ai[p];
      if (aip === 0) continue;
      const off = p * bCols;
      for (let j = 0; j < bCols; j++) row[j] += aip * B[off + j];
    }
    out[i] = toArray(row);
  }
  return out;
}

export function matvec(a: Mat, x: Vec): Vec {
  return a.map((row) => {
    let s = 0;
    for (let j = 0; j < row.length; j++) s += row[j] * x[j];
    return s;
  });
}

export function add(a: Mat, b: Mat, scaleB = 1): Mat {
  return a.map((row, i) => row.map((v, j) => v + scaleB * b[i][j]));
}

export function scale(a: Mat, s: number): Mat {
  return a.map((row) => row.map((v) => v * s));
}

export function transpose(a: Mat, aCols = cols(a)): Mat {
  const out = zeros(aCols, a.length);
  for (let i = 0; i < a.length; i++) for (let j = 0; j < aCols; j++) out[j][i] = a[i][j];
  return out;
}

export function column(a: Mat, j: number): Vec {
  return a.map((row) => row[j]);
}

export function dot(a: Vec, b: Vec): number {
  let s = 0;
  for (let i = 0; i < a.length; i++) s += a[i] * b[i];
  return s;
}

/** Largest absolute entry (a cheap scale for tolerances). */
export function maxAbs(a: Mat): number {
  let m = 0;
  for (const row of a) for (const v of row) m = Math.max(m, Math.abs(v));
  return m;
}

export function norm1(a: Mat): number {
  let best = 0;
  const c = cols(a);
  for (let j = 0; j < c; j++) {
    let s = 0;
    for (let i = 0; i < a.length; i++) s += Math.abs(a[i][j]);
    best = Math.max(best, s);
  }
  return best;
}

/** Rows `idx` of a. */
export function pickRows(a: Mat, idx: number[]): Mat {
  return idx.map((i) => a[i].slice());
}

