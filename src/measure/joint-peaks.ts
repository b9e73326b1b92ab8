import type { Piece } from '../simulate/result.js';
import { emptyGroups, groupsBound, groupsDerivative, groupTermsAlike, type Groups } from '../lti/term.js';
import { pieceValue } from './evaluate.js';
import { gridFloor, geometricSteps, uniformIntervals, TIE, type MagnitudePeak } from './peak.js';
import { findRoot } from './root.js';
import { Sweeper, uniformStep } from './sweep.js';

/**
 * Peak |v|, |i| and |v·i| of one piece of a part's voltage and current, found together: the two
 * closed forms are regrouped into one layout (they hold the same modes) and v, v', i, i' are
 * evaluated on one search grid by the sweeper (sweep.ts: no exponential per term and point, groups
 * far below the rounding of the sum skipped, the grid thinned where fast oscillations have died
 * out, twice as fine as for one signal since v·i holds the sums of the frequencies). Every root
 * of a derivative bracketed by the grid (v', i', v'·i + v·i') is refined by Brent's method on the
 * closed form restricted to the groups that matter there, and every candidate value is the exact
 * closed form at that time: the search of peak.ts / grid.ts (peakOnGrid), only cheaper.
 */
export class JointPeaks {
  private readonly sw = new Sweeper();
  private readonly step: number;
  private readonly V = emptyGroups();
  private readonly I = emptyGroups();
  private readonly DV = emptyGroups();
  private readonly DI = emptyGroups();
  private readonly D2V = emptyGroups();
  private readonly D2I = emptyGroups();
  private readonly at = new Float64Array(4);
  private dp = new Float64Array(64);

  constructor(private readonly times?: ArrayLike<number>) {
    this.step = times ? uniformStep(times) : NaN;
  }

  /**
   * Updates the peaks with those of v (piece pv) and i (piece pi, the same start) over [lo, hi]:
   * `omega` and `rate` are the time scales the grid must resolve in one signal.
   */
  search(pv: Piece, pi: Piece, lo: number, hi: number, omega: number, rate: number, v: MagnitudePeak, i: MagnitudePeak, p: MagnitudePeak): void {
    const fv = (t: number) => pieceValue(pv, t);
    const fi = (t: number) => pieceValue(pi, t);
    const fp = (t: number) => pieceValue(pv, t) * pieceValue(pi, t);
    const bv = start(fv, lo);
    const bi = start(fi, lo);
    const bp = start(fp, lo);
    if (hi > lo) {
      const t0 = pv.t0;
      const chs: Groups[] = [this.V, this.DV, this.I, this.DI];
      groupTermsAlike([pv.terms, pi.terms], [this.V, this.I]);
      groupsDerivative(this.V, this.DV);
      groupsDerivative(this.I, this.DI);
      // the grid of peak.ts searchGrid for the product: scales doubled, steps shrinking towards lo
      const width = hi - lo;
      const floor = gridFloor(width, 2 * rate);
      const points: number[] = [];
      geometricSteps(lo, width, 2 * rate, points);
      const sw = this.sw;
      const n = sw.grid(chs, { t0, lo, hi, m: uniformIntervals(width, 2 * omega, floor), minIntervals: floor, extra: this.times, extraStep: this.step, points, harmonics: 2 });
      const ts = sw.ts;
      const [gv, gdv, gi, gdi] = sw.vals as [Float64Array, Float64Array, Float64Array, Float64Array];
      if (this.dp.length < n) this.dp = new Float64Array(2 * n);
      const dp = this.dp;
      for (let k = 0; k < n; k++) dp[k] = gdv[k]! * gi[k]! + gv[k]! * gdi[k]!;
      const owner = {};
      const out = this.at;
      // |v| and |i| over a bracket: Taylor from either end with max|y''| there (groupsBound)
      groupsDerivative(this.DV, this.D2V);
      groupsDerivative(this.DI, this.D2I);
      const taylor = (y: Float64Array, dy: Float64Array, d2: Groups, k: number) => {
        const h = ts[k]! - ts[k - 1]!;
        const r = 0.5 * groupsBound(d2, ts[k - 1]! - t0, ts[k]! - t0) * h * h;
        const x = Math.min(Math.abs(y[k - 1]!) + Math.abs(dy[k - 1]!) * h, Math.abs(y[k]!) + Math.abs(dy[k]!) * h) + r;
        return Number.isNaN(x) ? Infinity : x;
      };
      const boundV = (k: number) => taylor(gv, gdv, this.D2V, k);
      const boundI = (k: number) => taylor(gi, gdi, this.D2I, k);
      const fHi = (f: (t: number) => number) => Math.abs(f(hi));
      // the derivative restricted to the groups that matter on the bracket [a, b]
      const near = (a: number, b: number, which: (o: Float64Array) => number) => {
        const count = sw.nearAll(chs, owner, a - t0, b - t0);
        return (t: number) => {
          sw.atSome(chs, count, t - t0, out);
          return which(out);
        };
      };
      walk(ts, gdv, n, fv, (a, b) => near(a, b, (o) => o[1]!), bv, boundV, Math.max(v.value, fHi(fv)));
      walk(ts, gdi, n, fi, (a, b) => near(a, b, (o) => o[3]!), bi, boundI, Math.max(i.value, fHi(fi)));
      walk(ts, dp, n, fp, (a, b) => near(a, b, (o) => o[1]! * o[2]! + o[0]! * o[3]!), bp, (k) => boundV(k) * boundI(k), Math.max(p.value, fHi(fp)));
    }
    keep(v, bv);
    keep(i, bi);
    keep(p, bp);
  }
}

function start(f: (t: number) => number, lo: number): MagnitudePeak {
  return { value: Math.abs(f(lo)), time: lo };
}

function keep(best: MagnitudePeak, p: MagnitudePeak): void {
  if (p.value > best.value * (1 + TIE)) {
    best.value = p.value;
    best.time = p.time;
  }
}

/** Relative margin by which a bracket's bound must fall short of a found value to be skipped. */
const SKIP_MARGIN = 1e-6;

/**
 * peakOnGrid (grid.ts) over ts[0 … n−1] with the derivative `dfs` there: the last point and every
 * root of the derivative bracketed by a sign change (refined by Brent's method on `df` of the
 * bracket), each evaluated with the exact f; the earliest time wins a tie. Updates `best`.
 * A bracket whose bound of |f| (`bound(k)` over [ts[k−1], ts[k]]) stays below a value already
 * found (`best`, or `floor`: the peak so far of the earlier pieces, or |f| at the last point) by
 * more than SKIP_MARGIN is not refined: its root cannot give the peak, nor tie with it.
 */
function walk(
  ts: Float64Array,
  dfs: Float64Array,
  n: number,
  f: (t: number) => number,
  df: (a: number, b: number) => (t: number) => number,
  best: MagnitudePeak,
  bound: (k: number) => number,
  floor: number,
): void {
  const consider = (t: number) => {
    const y = Math.abs(f(t));
    if (y > best.value * (1 + TIE) || (Number.isNaN(best.value) && !Number.isNaN(y))) {
      best.value = y;
      best.time = t;
    }
  };
  if (n < 2) return;
  let prevD = dfs[0]!;
  for (let k = 1; k < n; k++) {
    const d = dfs[k]!;
    if (prevD !== 0 && d !== 0 && prevD < 0 !== d < 0) {
      const a = ts[k - 1]!;
      const b = ts[k]!;
      if (!(bound(k) * (1 + SKIP_MARGIN) < Math.max(best.value, floor))) {
        const r = findRoot(df(a, b), a, b, 1e-14, prevD, d);
        if (r > a && r < b) consider(r);
      }
    } else if (d === 0 && k < n - 1) {
      consider(ts[k]!);
    }
    prevD = d;
  }
  consider(ts[n - 1]!);
}
