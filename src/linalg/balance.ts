import type { Mat } from './dense.js';

/**
 * Diagonal similarity D⁻¹·M·D by powers of two that equalizes row and column norms
 * (Parlett & Reinsch, Numer. Math. 13, 1969). Exact in floating point (only exponents change);
 * it shrinks ‖M‖ for badly scaled matrices (volts next to nanohenry currents), which keeps the
 * matrix exponential accurate.
 */
export function balance(M: Mat): { B: Mat; d: number[] } {
  const n = M.length;
  const B = M.map((row) => row.slice());
  const d = new Array<number>(n).fill(1);
  for (let sweep = 0; sweep < 100; sweep++) {
    let changed = false;
    for (let i = 0; i < n; i++) {
      let c = 0;
      let r = 0;
      for (let j = 0; j < n; j++) {
        if (j === i) continue;
        c += Math.abs(B[j][i]);
        r += Math.abs(B[i][j]);
      }
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
      if ((c + r) / f < 0.95 * s) {
        changed = true;
        d[i] *= f;
        for (let j = 0; j < n; j++) B[i][j] /= f;
        for (let j = 0; j < n; j++) B[j][i] *= f;
      }
    }
    if (!changed) break;
  }
  return { B, d };
}
