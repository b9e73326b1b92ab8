import type { Piece } from '../simulate/result.js';
import { emptyGroups, groupsBound, groupsDerivative, groupTermsAlike, type Groups } from '../lti/term.js';
import { pieceValue } from './evaluate.js';
import { gridFloor, geometricSteps, uniformIntervals, TIE, type MagnitudePeak } from './peak.js';
import { findRoot } from './root.js';
import { Sweeper, uniformStep } from './sweep.js';
import { certify, GIVE_UP, intervalBound, LayoutEnvelope, layoutValues, type Certified } from './certify.js';

/**
 * Peak |v|, |i| and |v·i| of one piece of a part's voltage and current, found together: the two
 * closed forms are regrouped into one layout (they hold the same modes) and v, v', i, i' are
 * evaluated on one search grid by the sweeper (sweep.ts: no exponential per term and point, groups
 * far below the rounding of the sum skipped, the grid thinned where fast oscillations have died
 * out, twice as fine as for one signal since v·i holds the sums of the frequencies). Every root
 * of a derivative bracketed by the grid (v', i', v'·i + v·i') is refined by Brent's method on the
 * closed form restricted to the groups that matter there, and every candidate value is the exact
 * closed form at that time: the search of peak.ts / grid.ts (peakOnGrid), only cheaper.
 *
 * The sample times are not on the grid (they were 10⁴ points per part; see the constructor).
 * Instead every grid interval that is not a refined bracket, and every bracket whose root is not
 * shown to be its only one (|y''(r)| against max|y'''|), is certified (certify.ts): shown by
 * Taylor and Hermite bounds with max|y''|, max|y⁗| to hold no value above the peak (within the
 * tie tolerance), or split and searched again. So the peak is the closed form's largest value to
 * 1e-12 whatever the grid, and the grid's stride is set only by the modes above 1e-3 of the
 * largest (THIN).
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
  private readonly D3V = emptyGroups();
  private readonly D4V = emptyGroups();
  private readonly D3I = emptyGroups();
  private readonly D4I = emptyGroups();
  private readonly at = new Float64Array(4);
  private dp = new Float64Array(64);
  private gp = new Float64Array(64);
  private readonly pending: number[] = [];
  private readonly roots: number[] = [];
  private readonly e6 = new Float64Array(6);

  /**
   * `times`: the run's sample times. With `samples` they join the search grid (the grid of the
   * watched signals' search); without (the default), the grid is the uniform one of the time
   * scales plus the steps towards the piece start, and every interval without a bracketed root
   * is certified (certify.ts) instead: the sample times were 10⁴ extra points per part, and
   * they guaranteed nothing the certification does not.
   */
  constructor(
    private readonly times?: ArrayLike<number>,
    private readonly samples = false,
  ) {
    this.step = times ? uniformStep(times) : NaN;
  }

  /**
   * Updates the peaks with those of v (piece pv) and i (piece pi, the same start) over [lo, hi]:
   * `omega` and `rate` are the time scales the grid must resolve in one signal.
   */
  search(pv: Piece, pi: Piece, lo: number, hi: number, omega: number, rate: number, v: MagnitudePeak, i: MagnitudePeak, p: MagnitudePeak): void {
    if (this.samples) {
      this.searchOnce(pv, pi, lo, hi, omega, rate, v, i, p, false);
      return;
    }
    try {
      this.searchOnce(pv, pi, lo, hi, omega, rate, v, i, p, true);
    } catch (e) {
      if (e !== GIVE_UP) throw e;
      // the certification gave up (its budget spent): the search of the sample times' grid
      this.searchOnce(pv, pi, lo, hi, omega, rate, v, i, p, false);
    }
  }

  /** search on the certified grid (certified) or on the grid with the sample times; updates v, i, p only when done */
  private searchOnce(pv: Piece, pi: Piece, lo: number, hi: number, omega: number, rate: number, v: MagnitudePeak, i: MagnitudePeak, p: MagnitudePeak, certified: boolean): void {
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
      const n = sw.grid(chs, { t0, lo, hi, m: uniformIntervals(width, 2 * omega, floor), minIntervals: floor, extra: certified ? undefined : this.times, extraStep: this.step, points, harmonics: 2, thin: certified ? THIN : undefined });
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
      const dV = (o: Float64Array) => o[1]!;
      const dI = (o: Float64Array) => o[3]!;
      const dP = (o: Float64Array) => o[1]! * o[2]! + o[0]! * o[3]!;
      const floorV = Math.max(v.value, fHi(fv));
      const floorI = Math.max(i.value, fHi(fi));
      const floorP = Math.max(p.value, fHi(fp));
      if (!certified) {
        walk(ts, gdv, n, fv, (a, b) => near(a, b, dV), bv, boundV, floorV);
        walk(ts, gdi, n, fi, (a, b) => near(a, b, dI), bi, boundI, floorI);
        walk(ts, dp, n, fp, (a, b) => near(a, b, dP), bp, (k) => boundV(k) * boundI(k), floorP);
      } else {
        // the grid alone (no sample times): the intervals without a bracketed root are certified
        if (this.gp.length < n) this.gp = new Float64Array(2 * n);
        const gp = this.gp;
        for (let k = 0; k < n; k++) gp[k] = gv[k]! * gi[k]!;
        groupsDerivative(this.D2V, this.D3V);
        groupsDerivative(this.D3V, this.D4V);
        groupsDerivative(this.D2I, this.D3I);
        groupsDerivative(this.D3I, this.D4I);
        const bounds = new Bounds10([this.V, this.DV, this.D2V, this.D3V, this.D4V, this.I, this.DI, this.D2I, this.D3I, this.D4I], t0, ts, n);
        const six = [this.V, this.DV, this.D2V, this.I, this.DI, this.D2I];
        const e6 = this.e6;
        // per channel: y and y' from v, v', i, i' (o), y'' from v … i'' (e), and from the bounds b of
        // |v| … |v⁗|, |i| … |i⁗| over an interval, bounds of |y''|, |y'''|, |y⁗| (Leibniz's rule for v·i)
        const channels: Channel[] = [
          { y: gv, dy: gdv, f: fv, best: bv, bound: boundV, floor: floorV, val: (o) => o[0]!, der: dV, d2: (e) => e[2]!, m2: (b) => b[2]!, m3: (b) => b[3]!, m4: (b) => b[4]! },
          { y: gi, dy: gdi, f: fi, best: bi, bound: boundI, floor: floorI, val: (o) => o[2]!, der: dI, d2: (e) => e[5]!, m2: (b) => b[7]!, m3: (b) => b[8]!, m4: (b) => b[9]! },
          {
            y: gp,
            dy: dp,
            f: fp,
            best: bp,
            bound: (k) => boundV(k) * boundI(k),
            floor: floorP,
            val: (o) => o[0]! * o[2]!,
            der: dP,
            d2: (e) => e[2]! * e[3]! + 2 * e[1]! * e[4]! + e[0]! * e[5]!,
            m2: (b) => b[2]! * b[5]! + 2 * b[1]! * b[6]! + b[0]! * b[7]!,
            m3: (b) => b[3]! * b[5]! + 3 * b[2]! * b[6]! + 3 * b[1]! * b[7]! + b[0]! * b[8]!,
            m4: (b) => b[0]! * b[9]! + 4 * b[1]! * b[8]! + 6 * b[2]! * b[7]! + 4 * b[3]! * b[6]! + b[4]! * b[5]!,
          },
        ];
        for (const ch of channels) {
          const { y, dy, f, best } = ch;
          const via = (b: Float64Array, ya: number, da: number, yb: number, db: number, h: number) => intervalBound(ya, da, yb, db, h, ch.m2(b), ch.m4(b));
          const pending = this.pending;
          const roots = this.roots;
          pending.length = 0;
          roots.length = 0;
          const ref = () => Math.max(best.value, ch.floor) * (1 + TIE);
          walk(
            ts,
            dy,
            n,
            f,
            (a, b) => near(a, b, ch.der),
            best,
            ch.bound,
            ch.floor,
            (k) => pending.push(k),
            (k, r) => roots.push(k, r),
          );
          // a cheap look with the bounds over the chunk of the grid holding the interval, then over the interval
          const r0 = ref();
          const fine = (k: number) => {
            const ya = y[k - 1]!;
            const da = dy[k - 1]!;
            const yb = y[k]!;
            const db = dy[k]!;
            const h = ts[k]! - ts[k - 1]!;
            return !(via(bounds.coarse(k), ya, da, yb, db, h) > r0) || !(via(bounds.interval(k), ya, da, yb, db, h) > r0);
          };
          let kept = 0;
          for (const k of pending) if (!fine(k)) pending[kept++] = k;
          pending.length = kept;
          let keptRoots = 0;
          for (let j = 0; j < roots.length; j += 2) {
            if (!fine(roots[j]!)) {
              roots[keptRoots++] = roots[j]!;
              roots[keptRoots++] = roots[j + 1]!;
            }
          }
          roots.length = keptRoots;
          if (pending.length === 0 && roots.length === 0) continue;
          let budget = BUDGET;
          const consider = (t: number) => considerAt(best, Math.abs(f(t)), t);
          const yd = new Float64Array(2);
          const s: Certified = {
            at: (t, a, b, out2) => {
              const count = sw.nearAll(chs, owner, a - t0, b - t0);
              sw.atSome(chs, count, t - t0, out);
              out2[0] = ch.val(out);
              out2[1] = ch.der(out);
            },
            bound: (a, b, ya, da, yb, db) => via(bounds.over(a, b), ya, da, yb, db, b - a),
            root: (a, b, ya, da, yb, db, depth) => {
              // a root on a split point (to rounding) comes back as that end: a candidate all the same
              const r = Math.min(Math.max(findRoot(near(a, b, ch.der), a, b, 1e-14, da, db), a), b);
              consider(r);
              checkRoot(a, b, ya, da, yb, db, r, depth);
            },
            consider,
            edge: (t) => {
              const x = Math.abs(f(t));
              if (x > best.value * (1 + TIE)) considerAt(best, x, t);
            },
            reference: ref,
            spend: () => --budget >= 0,
          };
          // a root r of y' in [a, b] (y, y' given at the ends) is the only one within δ = |y''(r)|/max|y'''|
          // of it: y' = y'(r) + y''(r)·(t − r) + at most ½·max|y'''|·(t − r)², and y'(r) is zero to
          // rounding; what of [a, b] lies farther than δ from r is certified
          const checkRoot = (a: number, b: number, ya: number, da: number, yb: number, db: number, r: number, depth: number) => {
            if (!(s.bound(a, b, ya, da, yb, db) > ref())) return;
            layoutValues(six, r - t0, e6);
            const m3 = ch.m3(bounds.over(a, b));
            const delta = Math.abs(ch.d2(e6)) / m3;
            if (delta >= Math.max(r - a, b - r)) return;
            const l = r - delta;
            if (l > a) {
              s.at(l, a, b, yd);
              certify(s, a, l, ya, da, yd[0]!, yd[1]!, depth + 1);
            }
            const u = r + delta;
            if (u < b) {
              s.at(u, a, b, yd);
              certify(s, u, b, yd[0]!, yd[1]!, yb, db, depth + 1);
            }
          };
          for (const k of pending) {
            const a = ts[k - 1]!;
            const b = ts[k]!;
            if (b > a) {
              bounds.interval(k);
              certify(s, a, b, y[k - 1]!, dy[k - 1]!, y[k]!, dy[k]!);
            }
          }
          for (let j = 0; j < roots.length; j += 2) {
            const k = roots[j]!;
            bounds.interval(k);
            checkRoot(ts[k - 1]!, ts[k]!, y[k - 1]!, dy[k - 1]!, y[k]!, dy[k]!, roots[j + 1]!, 0);
          }
        }
      }
    }
    keep(v, bv);
    keep(i, bi);
    keep(p, bp);
  }
}

function start(f: (t: number) => number, lo: number): MagnitudePeak {
  return { value: Math.abs(f(lo)), time: lo };
}

/** One of the three signals of the certified search (v, i, v·i). */
interface Channel {
  /** y, y' on the grid */
  y: Float64Array;
  dy: Float64Array;
  /** the exact closed form */
  f: (t: number) => number;
  best: MagnitudePeak;
  /** walk's bound of a bracket, and the floor it skips below */
  bound: (k: number) => number;
  floor: number;
  /** y, y' from v, v', i, i' */
  val: (o: Float64Array) => number;
  der: (o: Float64Array) => number;
  /** y'' from v, v', v'', i, i', i'' */
  d2: (e: Float64Array) => number;
  /** bounds of |y''|, |y'''|, |y⁗| from those of |v| … |v⁗|, |i| … |i⁗| */
  m2: (b: Float64Array) => number;
  m3: (b: Float64Array) => number;
  m4: (b: Float64Array) => number;
}

/** As walk's `consider`, for a candidate found out of time order: an earlier time wins a tie. */
function considerAt(best: MagnitudePeak, y: number, t: number): void {
  if (y > best.value * (1 + TIE) || (Number.isNaN(best.value) && !Number.isNaN(y)) || (t < best.time && y * (1 + TIE) >= best.value)) {
    best.value = y;
    best.time = t;
  }
}

/**
 * Bounds of |v|, |v'| … |v⁗| and |i|, |i'| … |i⁗| over the intervals of one piece's grid
 * (certify.ts LayoutEnvelope, its sums taken per chunk of CHUNK intervals when first asked for).
 */
class Bounds10 {
  private readonly env: LayoutEnvelope;
  /** the sums over the whole piece, and per chunk (when first asked for) */
  private readonly whole: Float64Array;
  private readonly sums: (Float64Array | undefined)[] = [];
  private readonly wide: (Float64Array | undefined)[] = [];
  private readonly out = new Float64Array(10);
  private readonly tLo: number;
  constructor(
    chs: readonly Groups[],
    private readonly t0: number,
    private readonly ts: Float64Array,
    private readonly n: number,
  ) {
    this.env = new LayoutEnvelope(chs);
    this.tLo = ts[0]! - t0;
    this.whole = this.env.stretch(this.tLo, ts[n - 1]! - t0);
  }

  /** over the whole chunk holding interval k (ts[k − 1] … ts[k]), from the sums over the piece */
  coarse(k: number): Float64Array {
    const c = Math.floor((k - 1) / CHUNK);
    let w = this.wide[c];
    if (!w) {
      w = new Float64Array(10);
      this.env.use(this.whole, this.tLo);
      this.env.over(this.ts[c * CHUNK]! - this.t0, this.ts[Math.min((c + 1) * CHUNK, this.n - 1)]! - this.t0, w);
      this.wide[c] = w;
    }
    return w;
  }

  /** over interval k, from the sums over its chunk, which becomes current (valid until the next call) */
  interval(k: number): Float64Array {
    const c = Math.floor((k - 1) / CHUNK);
    const tc = this.ts[c * CHUNK]! - this.t0;
    const W = this.sums[c];
    if (W) this.env.use(W, tc);
    else this.sums[c] = this.env.stretch(tc, this.ts[Math.min((c + 1) * CHUNK, this.n - 1)]! - this.t0);
    this.env.over(this.ts[k - 1]! - this.t0, this.ts[k]! - this.t0, this.out);
    return this.out;
  }

  /** over [a, b] (absolute times) inside the current chunk (valid until the next call) */
  over(a: number, b: number): Float64Array {
    this.env.over(a - this.t0, b - this.t0, this.out);
    return this.out;
  }
}

const CHUNK = 64;
/** groups below this size relative to the largest do not set the stride of the certified search's grid */
const THIN = 1e-3;
/** splits the certification of one signal of one piece may make before it gives up */
const BUDGET = 20_000;

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
  open?: (k: number) => void,
  found?: (k: number, r: number) => void,
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
        // a root on a grid point (to rounding) comes back as that end: a candidate all the same
        const r = Math.min(Math.max(findRoot(df(a, b), a, b, 1e-14, prevD, d), a), b);
        consider(r);
        found?.(k, r);
      }
    } else {
      if (d === 0 && k < n - 1) consider(ts[k]!);
      open?.(k);
    }
    prevD = d;
  }
  consider(ts[n - 1]!);
}
