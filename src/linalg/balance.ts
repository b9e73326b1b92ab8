import type { Mat } from './dense.js';

/**
 * Diagonal similarity D⁻¹·M·D by powers of two that equalizes row and column norms
 * (Parlett & Reinsch, Numer. Math. 13, 1969). Exact in floating point (only exponents change);
 * it shrinks ‖M‖ for badly scaled matrices (volts next to nanohenry currents), which keeps the
 * matrix exponential accurate.
 */
export function balance(M: Mat): { B: Mat; d: number[] } {
  const d = balanceScale(M);
  const B = M.map((row, i) => row.map((v, j) => (v === 0 || i === j ? v : (v * d[j]) / d[i])));
  return { B, d };
}

/** The powers of two d of balance() alone (a caller that reads only B's nonzeros forms them itself). */
export function balanceScale(M: Mat): number[] {
  const n = M.length;
  // the sweeps read only the off-diagonal nonzeros (a circuit matrix has a few per row), by row
  // and by column, gathered once; d are powers of two, so B = D⁻¹·M·D is exact at the end
  const rows: { j: number[]; v: number[] }[] = Array.from({ length: n }, () => ({ j: [], v: [] }));
  const cols: { k: number[]; v: number[] }[] = Array.from({ length: n }, () => ({ k: [], v: [] }));
  for (let i = 0; i < n; i++) {
    const row = M[i];
    for (let j = 0; j < n; j++) {
      if (j === i || row[j] === 0) continue;
      const a = Math.abs(row[j]);
      rows[i].j.push(j);
      rows[i].v.push(a);
      cols[j].k.push(i);
      cols[j].v.push(a);
    }
  }
  const d = new Array<number>(n).fill(1);
  for (let sweep = 0; sweep < 100; sweep++) {
    let changed = false;
    for (let i = 0; i < n; i++) {
      // column and row 1-norms of B = D⁻¹·M·D off the diagonal: |B_ki| = |M_ki|·d_i/d_k, |B_ij| = |M_ij|·d_j/d_i
      let c = 0;
      let r = 0;
      const col = cols[i];
      for (let q = 0; q < col.k.length; q++) c += (col.v[q] * d[i]) / d[col.k[q]];
      const row = rows[i];
      for (let q = 0; q < row.j.length; q++) r += (row.v[q] * d[row.j[q]]) / d[i];
      if (c === 0 || r === 0) continue;
      let f = 1;
      const s = c + r;
      while (c < r / 2) {
        c *= 2;
        r /= 2;
        f *= 2;
      }
      while (c >= r * 2) {
        c /= 2;
        r *= 2;
        f /= 2;
      }
      // (c and r are already the norms after scaling by f)
      if (c + r < 0.95 * s) {
        changed = true;
        d[i] *= f;
      }
    }
    if (!changed) break;
  }
  return d;
}
