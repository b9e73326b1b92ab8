import { describe, expect, it } from 'vitest';
import { bandFactor, bandLU, bandMatrix, bandSolve, bandwidths } from '../../src/linalg/band.js';

function rng(seed: number) {
  let s = seed >>> 0;
  return () => ((s = (Math.imul(s, 1664525) + 1013904223) >>> 0) / 2 ** 32) * 2 - 1;
}

describe('band LU', () => {
  it('solves tridiag(−1, 2, −1)·x = 1: x_i = i(n + 1 − i)/2 (discrete Poisson problem, textbook, from memory)', () => {
    const n = 500;
    const a = new Float64Array(n * n);
    for (let i = 0; i < n; i++) {
      a[i * n + i] = 2;
      if (i > 0) a[i * n + i - 1] = -1;
      if (i + 1 < n) a[i * n + i + 1] = -1;
    }
    expect(bandwidths(a, n)).toEqual({ kl: 1, ku: 1 });
    const x = bandSolve(bandLU(a, n), new Float64Array(n).fill(1));
    for (let i = 0; i < n; i++) {
      const k = i + 1;
      expect(Math.abs(x[i] - (k * (n + 1 - k)) / 2) / ((n * n) / 8)).toBeLessThan(1e-12);
    }
  });

  it('pivots within the band: residual at round-off for banded and dense matrices with small diagonals', () => {
    for (const [n, kl, ku] of [
      [60, 2, 3],
      [40, 39, 39],
      [50, 0, 4],
    ]) {
      const r = rng(n + kl);
      const a = new Float64Array(n * n);
      for (let i = 0; i < n; i++) for (let j = Math.max(0, i - kl); j <= Math.min(n - 1, i + ku); j++) a[i * n + j] = r();
      for (let i = 0; i < n; i++) a[i * n + i] *= 1e-6; // forces row exchanges
      if (kl === 0) for (let i = 0; i < n; i++) a[i * n + i] = 1 + Math.abs(r());
      const b = Float64Array.from({ length: n }, () => r());
      const x = bandSolve(bandLU(a.slice(), n), b.slice());
      let res = 0;
      let size = 0;
      for (let i = 0; i < n; i++) {
        let acc = -b[i];
        for (let j = 0; j < n; j++) {
          acc += a[i * n + j] * x[j];
          size = Math.max(size, Math.abs(a[i * n + j] * x[j]));
        }
        res = Math.max(res, Math.abs(acc));
      }
      expect(res / size).toBeLessThan(1e-12);
    }
  });

  it('band storage gives the very factors and solutions of the full array (same operations, narrower rows)', () => {
    for (const [n, kl, ku] of [
      [80, 1, 1],
      [70, 2, 5],
      [30, 0, 3],
    ]) {
      const r = rng(7 * n + kl);
      const full = new Float64Array(n * n);
      const band = bandMatrix(n, kl, ku);
      expect(band.a.length).toBeLessThan(n * n);
      for (let i = 0; i < n; i++) {
        for (let j = Math.max(0, i - kl); j <= Math.min(n - 1, i + ku); j++) {
          const v = i === j ? 1e-3 * r() : r(); // small diagonals force row exchanges
          full[i * n + j] = v;
          band.a[band.off[i] + j] = v;
        }
      }
      const b = Float64Array.from({ length: n }, () => r());
      const x = bandSolve(bandLU(full, n), b.slice());
      const y = bandSolve(bandFactor(band), b.slice());
      expect(Array.from(y)).toEqual(Array.from(x));
    }
  });

  it('rows stop at their last nonzero: the same bits as updating the whole band, for rows half empty within it', () => {
    // the reference is the textbook band elimination (Golub & Van Loan, Matrix Computations, §4.3,
    // from memory: every row update runs to the band's edge);
    // skipping the entries that are zero in the pivot row subtracts f·0, which changes nothing
    for (const [n, kl, ku] of [
      [90, 6, 9],
      [60, 20, 20],
    ]) {
      const r = rng(11 * n + ku);
      const a = new Float64Array(n * n);
      for (let i = 0; i < n; i++) {
        for (let j = Math.max(0, i - kl); j <= Math.min(n - 1, i + ku); j++) if (i === j || r() > 0.5) a[i * n + j] = r();
        a[i * n + i] *= 1e-4; // small diagonals force row exchanges
      }
      const b = Float64Array.from({ length: n }, () => r());
      const x = bandSolve(bandLU(a.slice(), n), b.slice());
      // reference
      const m = a.slice();
      const bw = bandwidths(m, n);
      const kuf = Math.min(n - 1, bw.ku + bw.kl);
      const y = b.slice();
      for (let k = 0; k < n; k++) {
        const last = Math.min(n - 1, k + bw.kl);
        let p = k;
        for (let i = k + 1; i <= last; i++) if (Math.abs(m[i * n + k]) > Math.abs(m[p * n + k])) p = i;
        const end = Math.min(n - 1, k + kuf);
        for (let j = k; j <= end; j++) [m[k * n + j], m[p * n + j]] = [m[p * n + j], m[k * n + j]];
        [y[k], y[p]] = [y[p], y[k]];
        for (let i = k + 1; i <= last; i++) {
          const f = (m[i * n + k] /= m[k * n + k]);
          if (f === 0) continue;
          for (let j = k + 1; j <= end; j++) m[i * n + j] -= f * m[k * n + j];
          y[i] -= f * y[k];
        }
      }
      for (let i = n - 1; i >= 0; i--) {
        let acc = y[i];
        for (let j = i + 1; j <= Math.min(n - 1, i + kuf); j++) acc -= m[i * n + j] * y[j];
        y[i] = acc / m[i * n + i];
      }
      expect(Array.from(x)).toEqual(Array.from(y));
    }
  });
});
