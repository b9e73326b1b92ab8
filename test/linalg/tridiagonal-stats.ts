/**
 * Residual max_k ‖T·z_k − λ_k·z_k‖/‖T‖∞ and orthogonality max |zᵀz − I| of a symmetric tridiagonal
 * eigen-decomposition (diagonal d, off-diagonal e; eigenvector k in z[k·n … k·n + n − 1]).
 */
export function stats(d: Float64Array, e: Float64Array, values: Float64Array, z: Float64Array): { residual: number; orth: number } {
  const n = d.length;
  let norm = 0;
  for (let i = 0; i < n; i++) norm = Math.max(norm, Math.abs(d[i]) + (i > 0 ? Math.abs(e[i - 1]) : 0) + (i < n - 1 ? Math.abs(e[i]) : 0));
  let residual = 0;
  let orth = 0;
  for (let k = 0; k < n; k++) {
    const v = z.subarray(k * n, k * n + n);
    let r2 = 0;
    for (let i = 0; i < n; i++) {
      const t = d[i] * v[i] + (i > 0 ? e[i - 1] * v[i - 1] : 0) + (i < n - 1 ? e[i] * v[i + 1] : 0) - values[k] * v[i];
      r2 += t * t;
    }
    residual = Math.max(residual, Math.sqrt(r2) / norm);
    for (let l = k; l < n; l++) {
      let s = 0;
      for (let i = 0; i < n; i++) s += v[i] * z[l * n + i];
      orth = Math.max(orth, Math.abs(s - (k === l ? 1 : 0)));
    }
  }
  return { residual, orth };
}
