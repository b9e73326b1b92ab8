/**
 * Eigenvalues of a real nonsymmetric tridiagonal matrix in O(n²), through a complex symmetric one.
 *
 * With b_k = T[k][k+1] and c_k = T[k+1][k], the diagonal similarity δ_{k+1}/δ_k = √(c_k/b_k) turns
 * T into the complex symmetric tridiagonal with the same diagonal and off-diagonal f_k = √(b_k·c_k)
 * (imaginary where b_k·c_k < 0: the energy exchange of an LC ladder). Implicit QL with
 * Wilkinson-type shifts runs on it unchanged in complex arithmetic (EISPACK tql1 structure, from
 * memory; complex symmetric QL as in Cullum & Willoughby, from memory): the rotations become
 * complex orthogonal (c² + s² = 1) and keep the matrix complex symmetric tridiagonal, so a sweep
 * costs O(n) where the Hessenberg QR sweeps on T fill the upper triangle.
 *
 * Complex orthogonal rotations are not unitary: one with |c|, |s| ≫ 1 (p² + f² nearly zero) would
 * amplify rounding, so such a step is refused (null) and the caller takes the Hessenberg QR path.
 * The eigenvalues are validated downstream by the eigenvector residuals.
 */

const EPS = 2 ** -52;
const MAX_ITER = 60;
// largest growth |c| + |s| of a rotation accepted before the method gives up
const MAX_ROTATION = 1e3;

/**
 * Eigenvalues (re[k] + j·im[k], unordered) of the real tridiagonal with diagonal d[0..n−1],
 * superdiagonal b[0..n−2] and subdiagonal c[0..n−2]; null when the iteration breaks down.
 */
export function tridiagonalEigenvaluesComplex(
  d: Float64Array,
  b: Float64Array,
  c: Float64Array,
): { re: Float64Array; im: Float64Array } | null {
  const n = d.length;
  const dr = Float64Array.from(d);
  const di = new Float64Array(n);
  const er = new Float64Array(n);
  const ei = new Float64Array(n);
  for (let k = 0; k + 1 < n; k++) {
    const q = b[k] * c[k];
    if (q >= 0) er[k] = Math.sqrt(q);
    else ei[k] = Math.sqrt(-q);
  }
  let fr = 0;
  let fi = 0;
  let tst1 = 0;
  for (let l = 0; l < n; l++) {
    tst1 = Math.max(tst1, Math.abs(dr[l]) + Math.abs(di[l]) + Math.abs(er[l]) + Math.abs(ei[l]));
    let m = l;
    while (m < n - 1 && Math.abs(er[m]) + Math.abs(ei[m]) > EPS * tst1) m++;
    if (m > l) {
      let iter = 0;
      do {
        if (++iter > MAX_ITER) return null;
        // shift: the eigenvalue of the leading 2×2 block nearer d[l]
        let gr = dr[l];
        let gi = di[l];
        // p = (d[l+1] − g) / (2·e[l])
        let [pr, pi] = cdiv(dr[l + 1] - gr, di[l + 1] - gi, 2 * er[l], 2 * ei[l]);
        // r = ±√(p² + 1), the sign making p + r large
        let [rr, ri] = csqrt(pr * pr - pi * pi + 1, 2 * pr * pi);
        if (pr * rr + pi * ri < 0) {
          rr = -rr;
          ri = -ri;
        }
        const [qr, qi] = cdiv(er[l], ei[l], pr + rr, pi + ri);
        dr[l] = qr;
        di[l] = qi;
        const d1r = er[l] * (pr + rr) - ei[l] * (pi + ri);
        const d1i = er[l] * (pi + ri) + ei[l] * (pr + rr);
        dr[l + 1] = d1r;
        di[l + 1] = d1i;
        const hr0 = gr - dr[l];
        const hi0 = gi - di[l];
        for (let i = l + 2; i < n; i++) {
          dr[i] -= hr0;
          di[i] -= hi0;
        }
        fr += hr0;
        fi += hi0;
        // QL sweep from m up to l
        pr = dr[m];
        pi = di[m];
        let cr = 1;
        let ci = 0;
        let c2r = 1;
        let c2i = 0;
        let c3r = 1;
        let c3i = 0;
        const el1r = er[l + 1];
        const el1i = ei[l + 1];
        let sr = 0;
        let si = 0;
        let s2r = 0;
        let s2i = 0;
        for (let i = m - 1; i >= l; i--) {
          c3r = c2r;
          c3i = c2i;
          c2r = cr;
          c2i = ci;
          s2r = sr;
          s2i = si;
          const eir = er[i];
          const eii = ei[i];
          // g = c·e[i], h = c·p
          gr = cr * eir - ci * eii;
          gi = cr * eii + ci * eir;
          const hr = cr * pr - ci * pi;
          const hi = cr * pi + ci * pr;
          // r = √(p² + e[i]²) (complex, not a modulus; csqrt inlined: this is the inner loop)
          {
            const x = pr * pr - pi * pi + eir * eir - eii * eii;
            const y = 2 * (pr * pi + eir * eii);
            let mag = Math.sqrt(x * x + y * y);
            if (!(mag > 1e-150 && mag < 1e150)) mag = Math.hypot(x, y);
            if (mag === 0) {
              rr = 0;
              ri = 0;
            } else if (x >= 0) {
              rr = Math.sqrt(0.5 * (mag + x));
              ri = y / (2 * rr);
            } else {
              const t = Math.sqrt(0.5 * (mag - x));
              rr = Math.abs(y) / (2 * t);
              ri = y < 0 ? -t : t;
            }
          }
          const rabs = Math.abs(rr) + Math.abs(ri);
          if (!(rabs * MAX_ROTATION >= Math.abs(pr) + Math.abs(pi) + Math.abs(eir) + Math.abs(eii))) return null;
          // e[i+1] = s·r
          er[i + 1] = sr * rr - si * ri;
          ei[i + 1] = sr * ri + si * rr;
          // s = e[i]/r, c = p/r
          const den = rr * rr + ri * ri;
          const ir = rr / den;
          const ii = -ri / den;
          sr = eir * ir - eii * ii;
          si = eir * ii + eii * ir;
          cr = pr * ir - pi * ii;
          ci = pr * ii + pi * ir;
          const dir = dr[i];
          const dii = di[i];
          // p = c·d[i] − s·g
          pr = cr * dir - ci * dii - (sr * gr - si * gi);
          pi = cr * dii + ci * dir - (sr * gi + si * gr);
          // d[i+1] = h + s·(c·g + s·d[i])
          const ur = cr * gr - ci * gi + (sr * dir - si * dii);
          const ui = cr * gi + ci * gr + (sr * dii + si * dir);
          dr[i + 1] = hr + (sr * ur - si * ui);
          di[i + 1] = hi + (sr * ui + si * ur);
        }
        // p = −s·s2·c3·el1·e[l] / dl1
        let tr = sr * s2r - si * s2i;
        let ti = sr * s2i + si * s2r;
        [tr, ti] = [tr * c3r - ti * c3i, tr * c3i + ti * c3r];
        [tr, ti] = [tr * el1r - ti * el1i, tr * el1i + ti * el1r];
        [tr, ti] = [tr * er[l] - ti * ei[l], tr * ei[l] + ti * er[l]];
        [pr, pi] = cdiv(-tr, -ti, d1r, d1i);
        er[l] = sr * pr - si * pi;
        ei[l] = sr * pi + si * pr;
        dr[l] = cr * pr - ci * pi;
        di[l] = cr * pi + ci * pr;
        if (!Number.isFinite(dr[l] + di[l] + er[l] + ei[l])) return null;
      } while (Math.abs(er[l]) + Math.abs(ei[l]) > EPS * tst1);
    }
    dr[l] += fr;
    di[l] += fi;
    er[l] = 0;
    ei[l] = 0;
  }
  return { re: dr, im: di };
}

/** (ar + j·ai) / (br + j·bi), scaled (Smith's formula). */
function cdiv(ar: number, ai: number, br: number, bi: number): [number, number] {
  if (Math.abs(br) >= Math.abs(bi)) {
    const r = bi / br;
    const den = br + r * bi;
    return [(ar + r * ai) / den, (ai - r * ar) / den];
  }
  const r = br / bi;
  const den = bi + r * br;
  return [(r * ar + ai) / den, (r * ai - ar) / den];
}

/** Principal square root of x + j·y. */
function csqrt(x: number, y: number): [number, number] {
  const m = Math.sqrt(x * x + y * y);
  const mag = m > 1e-150 && m < 1e150 ? m : Math.hypot(x, y);
  if (mag === 0) return [0, 0];
  if (x >= 0) {
    const t = Math.sqrt(0.5 * (mag + x));
    return [t, y / (2 * t)];
  }
  const t = Math.sqrt(0.5 * (mag - x));
  return [Math.abs(y) / (2 * t), y < 0 ? -t : t];
}

