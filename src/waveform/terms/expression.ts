/**
 * An expression source is the one input without a closed form. It is replaced by a piecewise-linear
 * interpolant refined by bisection until the interpolant's deviation at each segment's quarter
 * points is below 1e-9 of the function's range (or the segment count limit is reached); the
 * largest deviation seen is reported as the input's approximation error. The network's response
 * to the interpolant is then exact.
 */
export function sampleExpression(fn: (t: number) => number, span: number): { points: { t: number; v: number }[]; maxError: number } {
  const MAX_SEGMENTS = 20_000;
  const f = (t: number) => {
    const v = fn(t);
    if (!Number.isFinite(v)) throw new Error(`the expression is not finite at t = ${t} s`);
    return v;
  };
  const coarse = 64;
  let pts = Array.from({ length: coarse + 1 }, (_, i) => ({ t: (span * i) / coarse, v: f((span * i) / coarse) }));
  const range = Math.max(1e-300, ...pts.map((p) => Math.abs(p.v)));
  const tol = 1e-9 * range;
  let maxError = 0;
  for (let round = 0; round < 30; round++) {
    const next: { t: number; v: number }[] = [pts[0]];
    let refined = false;
    maxError = 0;
    for (let i = 0; i + 1 < pts.length; i++) {
      const a = pts[i];
      const b = pts[i + 1];
      const errAt = (frac: number) => {
        const t = a.t + frac * (b.t - a.t);
        return Math.abs(f(t) - (a.v + frac * (b.v - a.v)));
      };
      const err = Math.max(errAt(0.25), errAt(0.5), errAt(0.75));
      if (err > tol && pts.length + next.length < MAX_SEGMENTS) {
        const tm = (a.t + b.t) / 2;
        next.push({ t: tm, v: f(tm) });
        refined = true;
      } else maxError = Math.max(maxError, err);
      next.push(b);
    }
    pts = next;
    if (!refined) break;
  }
  return { points: pts, maxError };
}
