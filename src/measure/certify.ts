import type { Groups } from '../lti/term.js';
import { channelsAtSome } from './sweep.js';

/**
 * Certification of the grid intervals an extremum search did not refine. The search grid brackets
 * the roots of y' by sign changes; an interval whose ends have y' of one sign can still hold a pair
 * of roots (a local maximum and minimum) between them. Here every such interval is either shown
 * unable to hold a value above the reference (the largest |y| found, within the tie tolerance) by
 * a Taylor bound with max|y''| over it, or split in four and searched again (roots refined by
 * Brent's method), until it is. So the peak does not rest on any particular grid: a search on a
 * coarser grid finds every extremum that a finer one would, where it matters for the peak.
 *
 * The bound of |y| over [a, b] (h = b − a, M ≥ |y''| there), from either end:
 *   y(a + s) ≤ y(a) + y'(a)·s + ½M·s²  and  −y(a + s) ≤ −y(a) − y'(a)·s + ½M·s²   (0 ≤ s ≤ h),
 * a convex parabola in s, whose largest value on [0, h] is at s = 0 or s = h; the same from b.
 */
export function intervalBound(ya: number, dya: number, yb: number, dyb: number, h: number, m2: number, m4 = Infinity): number {
  const x = Math.min(Math.max(upper(ya, dya, yb, dyb, h, 0.5 * m2), upper(-ya, -dya, -yb, -dyb, h, 0.5 * m2)), hermiteBound(ya, dya, yb, dyb, h, m4));
  return Number.isNaN(x) ? Infinity : x;
}

/**
 * max |y| over [a, b] (h = b − a) from the cubic Hermite interpolant H of y, y' at both ends and
 * max|y⁗| ≤ m4 there: |y − H| ≤ m4/4!·(t − a)²(t − b)² ≤ m4·h⁴/384 (the interpolation error of
 * two double nodes), and max|H| at an end or where H' = 0 (a quadratic).
 */
export function hermiteBound(ya: number, dya: number, yb: number, dyb: number, h: number, m4: number): number {
  if (!(m4 < Infinity)) return Infinity;
  // H(x) = ya + C·x + B·x² + A·x³, x ∈ [0, 1]
  const A = 2 * ya + h * dya - 2 * yb + h * dyb;
  const B = -3 * ya - 2 * h * dya + 3 * yb - h * dyb;
  const C = h * dya;
  const H = (x: number) => ya + x * (C + x * (B + x * A));
  let m = Math.max(Math.abs(ya), Math.abs(yb));
  // H'(x) = 3A·x² + 2B·x + C
  const a = 3 * A;
  const b = 2 * B;
  const roots: number[] = [];
  if (a === 0) {
    if (b !== 0) roots.push(-C / b);
  } else {
    const disc = b * b - 4 * a * C;
    if (disc >= 0) {
      const q = -0.5 * (b + (b >= 0 ? 1 : -1) * Math.sqrt(disc));
      roots.push(q / a);
      if (q !== 0) roots.push(C / q);
    }
  }
  for (const x of roots) if (x > 0 && x < 1) m = Math.max(m, Math.abs(H(x)));
  // the roots are found to rounding: H is flat there, so a rounding of x changes H by far less
  // than the margin added here for the rounding of H (2⁻⁴⁶ of the sizes involved: a few ulps)
  const h2 = h * h;
  return m + (Math.abs(ya) + Math.abs(yb) + h * (Math.abs(dya) + Math.abs(dyb))) * 2 ** -46 + (m4 * h2 * h2) / 384;
}

/**
 * max over s ∈ [0, h] of min(P(s), Q(s)), P(s) = ya + dya·s + q·s², Q(s) = yb − dyb·(h − s) + q·(h − s)²:
 * where P ≤ Q the minimum is P, convex, so its largest value is at 0, h or where P = Q (P − Q is
 * linear in s), and the same for Q.
 */
function upper(ya: number, dya: number, yb: number, dyb: number, h: number, q: number): number {
  const P = (s: number) => ya + dya * s + q * s * s;
  const Q = (s: number) => yb - dyb * (h - s) + q * (h - s) * (h - s);
  let m = Math.max(Math.min(ya, Q(0)), Math.min(P(h), yb));
  // P − Q = (ya − yb + dyb·h − q·h²) + s·(dya − dyb + 2q·h)
  const slope = dya - dyb + 2 * q * h;
  if (slope !== 0) {
    const s = -(ya - yb + dyb * h - q * h * h) / slope;
    if (s > 0 && s < h) m = Math.max(m, Math.max(P(s), Q(s)));
  }
  return m;
}

/**
 * Bounds of |Σ groups| for channels of one layout over short intervals, cheaper than a sum over
 * every group per interval (lti/term.ts groupsBound): the groups are bucketed by decay rate (powers of two), each bucket's
 * channel sums Σ|c|·e^(Re κ·τc) taken once at the start τc of a stretch (`stretch`), and an
 * interval [a, b] of the stretch bounded by Σ_bucket W·e^(−r·(a − τc)) with r the slowest decay of
 * the bucket (growing groups: e^(r·(b − τc)) with r the fastest growth). Polynomial factors are
 * bounded at the stretch's end. Times are τ (from the piece start).
 */
export class LayoutEnvelope {
  private readonly mag: Float64Array[];
  private readonly slotOf: Int32Array;
  /** per slot: the rate of its bound, and whether it grows (0: decays or constant) */
  private readonly rate: number[] = [];
  private readonly grows: number[] = [];
  /** the sums: channel c, slot s at W[c·slots + s] */
  private W: Float64Array = new Float64Array(0);
  private tc = 0;
  private readonly poly: boolean;
  readonly slots: number;

  constructor(private readonly chs: readonly Groups[]) {
    const g = chs[0]!;
    const m = g.off[g.n]!;
    this.mag = chs.map((ch) => {
      const a = new Float64Array(m);
      for (let i = 0; i < m; i++) a[i] = Math.sqrt(ch.cr[i]! * ch.cr[i]! + ch.ci[i]! * ch.ci[i]!);
      return a;
    });
    this.slotOf = new Int32Array(g.n);
    const slots = new Map<number, number>();
    let poly = false;
    for (let q = 0; q < g.n; q++) {
      if (g.off[q + 1]! - g.off[q]! > 1) poly = true;
      const kr = g.kr[q]!;
      // key: 0 for constants, ±(j + 2000) for a decay (−) or growth (+) between 2^j and 2^(j+1)
      const j = kr === 0 ? 0 : Math.floor(Math.log2(Math.abs(kr)));
      const key = kr === 0 ? 0 : kr < 0 ? -(j + 2000) : j + 2000;
      let slot = slots.get(key);
      if (slot === undefined) {
        slot = this.rate.length;
        slots.set(key, slot);
        this.rate.push(kr === 0 ? 0 : kr < 0 ? 2 ** j : 2 ** (j + 1));
        this.grows.push(kr > 0 ? 1 : 0);
      }
      this.slotOf[q] = slot;
    }
    this.poly = poly;
    this.slots = this.rate.length;
  }

  /** Takes the sums at τc for a stretch [τc, τe] (the intervals asked for next lie inside it) into W (made when not given). */
  stretch(tc: number, te: number, W = new Float64Array(this.chs.length * this.slots)): Float64Array {
    const g = this.chs[0]!;
    const S = this.slots;
    const nc = this.chs.length;
    W.fill(0);
    for (let q = 0; q < g.n; q++) {
      const kr = g.kr[q]!;
      const env = kr === 0 ? 1 : Math.exp(kr * tc);
      if (env === 0) continue;
      const o0 = g.off[q]!;
      const o1 = g.off[q + 1]!;
      const slot = this.slotOf[q]!;
      for (let c = 0; c < nc; c++) {
        const mag = this.mag[c]!;
        let p: number;
        if (this.poly) {
          p = 0;
          for (let i = o1 - 1; i >= o0; i--) p = p * te + mag[i]!;
        } else p = mag[o0]!;
        W[c * S + slot] += p * env;
      }
    }
    this.use(W, tc);
    return W;
  }

  /** Makes sums taken before (by `stretch`, at τc) current. */
  use(W: Float64Array, tc: number): void {
    this.W = W;
    this.tc = tc;
  }

  /** Bounds over [a, b] (τ, inside the current stretch) into out[c]. */
  over(a: number, b: number, out: Float64Array): void {
    const W = this.W;
    const S = this.slots;
    const nc = this.chs.length;
    out.fill(0, 0, nc);
    const da = Math.max(0, a - this.tc);
    const db = Math.max(0, b - this.tc);
    for (let s = 0; s < S; s++) {
      const r = this.rate[s]!;
      const f = r === 0 ? 1 : this.grows[s] === 1 ? Math.exp(r * db) : da === 0 ? 1 : Math.exp(-r * da);
      if (f === 0) continue;
      for (let c = 0; c < nc; c++) out[c] += W[c * S + s]! * f;
    }
  }
}

/** One signal of a certification: y and y' at a time, and a bound of |y''| over an interval. */
export interface Certified {
  /** writes y(t) into yd[0] and y'(t) into yd[1]; the interval [a, b] holds t (for the groups that matter there) */
  at(t: number, a: number, b: number, yd: Float64Array): void;
  /** a bound of |y| over [a, b] from y, y' at its ends (intervalBound with bounds of |y''|, |y⁗| there) */
  bound(a: number, b: number, ya: number, dya: number, yb: number, dyb: number): number;
  /** the root of y' in [a, b] bracketed by y'(a), y'(b) of opposite signs: refine it, consider it, and make sure of the rest of [a, b] */
  root(a: number, b: number, ya: number, da: number, yb: number, db: number, depth: number): void;
  /** a time to consider as a candidate (a zero of y' on a split point) */
  consider(t: number): void;
  /** the end of an interval that holds its largest value to the tie tolerance, or of one too narrow to split (kept only when above the peak so far by more than a tie) */
  edge(t: number): void;
  /** one more split allowed (false: the work budget is spent, the certification gives up) */
  spend(): boolean;
  /** the value an interval must be shown not to exceed */
  reference(): number;
}

/** Thrown by certify when the work budget (Certified.spend) is spent. */
export const GIVE_UP = new Error('certification budget spent');

/** Values this close (relative) are a tie (peak.ts TIE). */
const TIE = 1e-12;

/** Parts per split, and the narrowest interval split again (relative to its time). */
const SPLIT = 4;
const NARROWEST = 1e-13;

/**
 * Shows that [a, b] holds no value of |y| above s.reference(), splitting where the bound cannot tell, and refining the roots of y' that the splits bracket. The
 * values at the ends are given (y, y').
 */
export function certify(s: Certified, a: number, b: number, ya: number, dya: number, yb: number, dyb: number, depth = 0): void {
  const bound = s.bound(a, b, ya, dya, yb, dyb);
  if (!(bound > s.reference())) return;
  if (!s.spend()) throw GIVE_UP;
  // an end within the tie tolerance of the bound holds the largest value there, to that tolerance
  // (a stretch the search had not reached the top of yet: its values exceed the reference)
  const ea = Math.abs(ya);
  const eb = Math.abs(yb);
  if (!(bound > Math.max(ea, eb) * (1 + TIE)) || b - a <= NARROWEST * Math.max(Math.abs(a), Math.abs(b)) || depth > 60) {
    s.edge(ea >= eb ? a : b);
    return;
  }
  const yd = new Float64Array(2);
  let x0 = a;
  let y0 = ya;
  let d0 = dya;
  for (let j = 1; j <= SPLIT; j++) {
    let x1 = b;
    let y1 = yb;
    let d1 = dyb;
    if (j < SPLIT) {
      x1 = a + ((b - a) * j) / SPLIT;
      s.at(x1, a, b, yd);
      y1 = yd[0]!;
      d1 = yd[1]!;
      if (d1 === 0) s.consider(x1);
    }
    if (d0 !== 0 && d1 !== 0 && d0 < 0 !== d1 < 0) s.root(x0, x1, y0, d0, y1, d1, depth + 1);
    else if (x1 > x0) certify(s, x0, x1, y0, d0, y1, d1, depth + 1);
    x0 = x1;
    y0 = y1;
    d0 = d1;
  }
}

// 0 … n−1, grown as needed (the group indices of "all groups")
let everyGroup = new Int32Array(0);

/** Each channel (one layout) at τ over all groups, into out[c] (sweep.ts channelsAtSome). */
export function layoutValues(chs: readonly Groups[], tau: number, out: Float64Array): void {
  const n = chs[0]!.n;
  if (everyGroup.length < n) everyGroup = Int32Array.from({ length: Math.max(n, 2 * everyGroup.length) }, (_, q) => q);
  channelsAtSome(chs, everyGroup, n, tau, out);
}

