/**
 * Root of a continuous function on a bracket [a, b] with f(a)·f(b) ≤ 0, by Brent's method
 * (inverse quadratic interpolation and secant steps, safeguarded by bisection).
 * Converges to a bracket width of about `relTol`·|t| (default 1e-14), never worse than bisection.
 */
export function findRoot(
  f: (t: number) => number,
  a: number,
  b: number,
  relTol = 1e-14,
  fa = f(a),
  fb = f(b),
): number {
  if (fa === 0) return a;
  if (fb === 0) return b;
  if (Number.isNaN(fa) || Number.isNaN(fb) || Math.sign(fa) === Math.sign(fb)) {
    // No sign change: return the end nearer to zero (callers only pass brackets).
    return Math.abs(fa) <= Math.abs(fb) ? a : b;
  }
  const absTol = relTol * Math.max(Math.abs(a), Math.abs(b)) + Number.MIN_VALUE;
  let c = a;
  let fc = fa;
  let d = b - a;
  let e = d;
  for (let iter = 0; iter < 300; iter++) {
    if (Math.sign(fb) === Math.sign(fc)) {
      c = a;
      fc = fa;
      d = b - a;
      e = d;
    }
    if (Math.abs(fc) < Math.abs(fb)) {
      a = b;
      b = c;
      c = a;
      fa = fb;
      fb = fc;
      fc = fa;
    }
    const tol = 2 * Number.EPSILON * Math.abs(b) + 0.5 * absTol;
    const m = 0.5 * (c - b);
    if (Math.abs(m) <= tol || fb === 0) return b;
    if (Math.abs(e) >= tol && Math.abs(fa) > Math.abs(fb)) {
      const s = fb / fa;
      let p: number;
      let q: number;
      if (a === c) {
        p = 2 * m * s;
        q = 1 - s;
      } else {
        const qa = fa / fc;
        const r = fb / fc;
        p = s * (2 * m * qa * (qa - r) - (b - a) * (r - 1));
        q = (qa - 1) * (r - 1) * (s - 1);
      }
      if (p > 0) q = -q;
      else p = -p;
      if (2 * p < Math.min(3 * m * q - Math.abs(tol * q), Math.abs(e * q))) {
        e = d;
        d = p / q;
      } else {
        d = m;
        e = m;
      }
    } else {
      d = m;
      e = m;
    }
    a = b;
    fa = fb;
    b += Math.abs(d) > tol ? d : m > 0 ? tol : -tol;
    fb = f(b);
  }
  return b;
}

/**
 * findRoot to 1e-14 of the root itself, not of the bracket's ends: a bracket from near 0 to far
 * out (knots are only the ends and extrema of a stretch) would otherwise leave the root at
 * 1e-14 of the far end. The first root is refined once more inside its own uncertainty.
 */
export function refineRoot(f: (t: number) => number, a: number, b: number, fa: number, fb: number): number {
  const r = findRoot(f, a, b, 1e-14, fa, fb);
  const far = Math.max(Math.abs(a), Math.abs(b));
  if (!(far > 4 * Math.abs(r)) || fa === 0 || fb === 0) return r;
  const d = 4e-14 * far;
  const lo = Math.max(a, r - d);
  const hi = Math.min(b, r + d);
  const flo = f(lo);
  const fhi = f(hi);
  if (!(flo !== 0 && fhi !== 0 && flo < 0 !== fhi < 0)) return r;
  return findRoot(f, lo, hi, 1e-14, flo, fhi);
}
