import type { Piece } from '../simulate/result.js';
import { emptyGroups, type Groups, groupsBound, groupTerms, groupsDerivative, groupsValue } from '../lti/term.js';
import { maxOmega, pieceValue } from './evaluate.js';
import { uniformIntervals } from './peak.js';
import { type Clipped, clipTable, sameEnd } from './repeat.js';
import { findRoot } from './root.js';
import { Sweeper, sharedTables, uniformStep } from './sweep.js';

/**
 * A signal prepared for measurement: a list of continuous stretches (one per piece of the closed
 * form, clipped to the analysed span), each with knots placed so that the signal is monotone
 * between neighbouring knots. Knots include every local extremum, located by root-finding the
 * exact derivative, so peaks between sample points are not missed.
 *
 * The knots of all stretches are kept in flat typed arrays (a long pulse train has tens of
 * thousands of stretches: no arrays per stretch); `stretchesOf` gives them one object per stretch.
 */
export interface Track {
  /** knot times (increasing within a stretch; a stretch's first and last are its ends) and values, all stretches in order */
  ts: Float64Array;
  ys: Float64Array;
  /** stretch k holds knots first[k] … first[k + 1] − 1 (one entry more than there are stretches) */
  first: Int32Array;
  /** the signal inside stretch k (continuous there) */
  value(k: number, t: number): number;
  start: number;
  end: number;
  /**
   * Found on the way (closed forms only), for the steepest-slope search (shape.ts maxSlope): per
   * stretch an upper bound of |dy/dt| over it, and the largest |dy/dt| at a stretch start.
   */
  slopeBounds?: { upper: Float64Array; reached: number };
}

/** One stretch as its own object (see `stretchesOf`). */
export interface Stretch {
  /** The signal inside the stretch (continuous). */
  f: (t: number) => number;
  /** Knot times, increasing; ts[0] and ts[last] are the stretch ends. */
  ts: number[];
  /** Signal values at the knots. */
  ys: number[];
}

/** Number of stretches of a track. */
export function stretchCount(track: Track): number {
  return track.first.length - 1;
}

/** The stretches of a track as separate objects (copies of their knots). */
export function stretchesOf(track: Track): Stretch[] {
  const out: Stretch[] = [];
  for (let k = 0; k < stretchCount(track); k++) {
    const a = track.first[k]!;
    const b = track.first[k + 1]!;
    out.push({ f: (t) => track.value(k, t), ts: Array.from(track.ts.subarray(a, b)), ys: Array.from(track.ys.subarray(a, b)) });
  }
  return out;
}

/** Fewest grid intervals per piece when looking for extrema. */
const MIN_INTERVALS = 64;

/**
 * Knots and per-stretch data in growable typed arrays (no number[] growth, no boxed numbers: the
 * hot loops write the arrays directly and call methods with integer arguments only).
 */
class Buffers {
  ts: Float64Array;
  ys: Float64Array;
  /** knots so far */
  n = 0;
  first: Int32Array;
  upper: Float64Array;
  /** stretches so far */
  k = 0;
  constructor(stretches: number) {
    this.ts = new Float64Array(3 * stretches + 16);
    this.ys = new Float64Array(3 * stretches + 16);
    this.first = new Int32Array(stretches + 2);
    this.upper = new Float64Array(stretches + 1);
  }

  /** room for `more` knots */
  ensure(more: number): void {
    if (this.n + more <= this.ts.length) return;
    const size = 2 * (this.n + more);
    this.ts = grown(this.ts, size);
    this.ys = grown(this.ys, size);
  }

  push(t: number, y: number): void {
    this.ensure(1);
    this.ts[this.n] = t;
    this.ys[this.n++] = y;
  }

  /** ends the current stretch, with its bound on |y'| */
  close(upper: number): void {
    this.upper[this.k++] = upper;
    this.first[this.k] = this.n;
  }
}

function grown(a: Float64Array, size: number): Float64Array {
  const b = new Float64Array(size);
  b.set(a);
  return b;
}

/** The track of closed-form pieces: stretch k is the closed form of pieces[of[k]]. */
class PieceTrack implements Track {
  ts: Float64Array = new Float64Array(0);
  ys: Float64Array = new Float64Array(0);
  first: Int32Array = Int32Array.of(0);
  slopeBounds?: { upper: Float64Array; reached: number };
  constructor(
    readonly start: number,
    readonly end: number,
    private readonly pieces: readonly Piece[] = [],
    private readonly of: Int32Array = new Int32Array(0),
  ) {}

  value(k: number, t: number): number {
    return pieceValue(this.pieces[this.of[k]!]!, t);
  }
}

/**
 * Builds the measurement track from the exact pieces, or from the samples when there are none.
 *
 * A piece with the same term array as one laid out before, over the same τ range (see repeat.ts),
 * is the same function of τ: its knots are the same τ (shifted to its own start) with the same
 * values, and the same bounds; only the end value moves, by y'(b)·d, and the bound on |y'| by at
 * most |y''(b)|·|d| (added twice).
 */
export function buildTrack(times: Float64Array, values: Float64Array, pieces: readonly Piece[], clip?: Clipped): Track {
  const n = times.length;
  if (n === 0) return new PieceTrack(0, 0);
  const start = times[0]!;
  const end = times[n - 1]!;
  if (pieces.length === 0) return sampledTrack(times, values);

  const c = clip ?? clipTable(pieces, start, end);
  const count = c.count;
  const track = new PieceTrack(start, end, pieces, c.index.subarray(0, count));
  const buf = new Buffers(count);
  const ctx: Ctx = {
    buf,
    times,
    step: uniformStep(times),
    sweeper: new Sweeper(sharedTables(times)),
    G: emptyGroups(),
    D: emptyGroups(),
    D2: emptyGroups(),
    D3: emptyGroups(),
    D4: emptyGroups(),
    reached: 0,
    lastStart: 0,
  };
  // which pieces are repeated later (their layout is kept, by ordinal)
  const { rep, lo: los, hi: his } = c;
  const repeated = new Uint8Array(count);
  for (let k = 0; k < count; k++) if (rep[k] !== k) repeated[rep[k]!] = 1;
  const laid: (Laid | undefined)[] = [];
  for (let k = 0; k < count; k++) {
    const piece = pieces[c.index[k]!]!;
    const lo = los[k]!;
    const hi = his[k]!;
    const t0 = piece.t0;
    const r = rep[k]!;
    const seen = r !== k && hi > lo && pieces[c.index[r]!]!.terms === piece.terms ? laid[r] : undefined;
    if (seen !== undefined && seen.a === lo - t0 && sameEnd(hi - t0, seen.b, hi)) {
      const d = hi - t0 - seen.b;
      const taus = seen.taus ?? prepare(seen, piece.terms, ctx);
      const vs = seen.ys;
      const m = taus.length;
      // a repeat (written out here: this runs once per period of a long pulse train), when y''·d²/2
      // is below round-off of the end value, which then moves by y'·d alone
      if (seen.endCurve * d * d <= Number.EPSILON * Math.max(Math.abs(vs[0]!), Math.abs(vs[m - 1]!))) {
        if (seen.start > ctx.reached) ctx.reached = seen.start;
        buf.ensure(m);
        const ts = buf.ts;
        const ys = buf.ys;
        let w = buf.n;
        ts[w] = lo;
        ys[w++] = vs[0]!;
        let last = lo;
        for (let j = 1; j < m - 1; j++) {
          const t = t0 + taus[j]!;
          if (t > last && t < hi) {
            ts[w] = t;
            ys[w++] = vs[j]!;
            last = t;
          }
        }
        ts[w] = hi;
        ys[w++] = d === 0 ? vs[m - 1]! : vs[m - 1]! + seen.endSlope * d;
        buf.n = w;
        buf.upper[buf.k++] = d === 0 ? seen.upper : seen.upper + 2 * seen.endCurve * Math.abs(d);
        buf.first[buf.k] = w;
        continue;
      }
    }
    // a piece covering a small part of the span needs proportionally fewer grid intervals
    // (a long pulse train has tens of thousands of short pieces); never fewer than 8
    const share = end > start ? (hi - lo) / (end - start) : 1;
    // kept for the repeats: the first piece of each array laid out from its start (the one at the
    // start of the span may begin before it)
    const L = pieceStretch(piece, lo, hi, ctx, Math.max(8, Math.ceil(MIN_INTERVALS * share)), laid[r] === undefined && (r !== k || repeated[k] === 1));
    if (L) laid[r] = L;
  }
  track.ts = buf.ts.subarray(0, buf.n);
  track.ys = buf.ys.subarray(0, buf.n);
  track.first = buf.first.subarray(0, buf.k + 1);
  track.slopeBounds = { upper: buf.upper.subarray(0, buf.k), reached: ctx.reached };
  return track;
}

interface Ctx {
  buf: Buffers;
  times: Float64Array;
  /** the sample step when the times are equally spaced, else NaN */
  step: number;
  sweeper: Sweeper;
  /** scratch: the piece's terms grouped by exponent, and their derivatives */
  G: Groups;
  D: Groups;
  D2: Groups;
  D3: Groups;
  D4: Groups;
  /** the largest |y'| at a stretch start so far */
  reached: number;
  /** |y'| at the start of the stretch just laid out (0 when not found) */
  lastStart: number;
}

/**
 * A stretch laid out once, in τ = t − t0: its range, bound on |y'| and |y'| at its start, and its
 * knots in the track (`from` … `to` − 1, starting at `t0`). Made ready (`prepare`) at its first
 * repeat: knots as τ with their values, y' and |y''| at its end. (Most stretches never repeat.)
 */
interface Laid {
  a: number;
  b: number;
  t0: number;
  from: number;
  to: number;
  upper: number;
  start: number;
  taus: Float64Array | null;
  ys: Float64Array;
  endSlope: number;
  endCurve: number;
}

/**
 * Appends the stretch of one piece over [lo, hi] to the track, laid out on its own; returns its
 * layout for the repeats when `keep`.
 */
function pieceStretch(piece: Piece, lo: number, hi: number, ctx: Ctx, minIntervals: number, keep: boolean): Laid | undefined {
  const t0 = piece.t0;
  const buf = ctx.buf;
  if (hi === lo) {
    buf.push(lo, pieceValue(piece, lo));
    buf.close(Infinity);
    return undefined;
  }
  const a = lo - t0;
  const from = buf.n;
  layOut(piece, lo, hi, ctx, minIntervals);
  if (!keep || a !== 0) return undefined;
  return { a, b: hi - t0, t0, from, to: buf.n, upper: buf.upper[buf.k - 1]!, start: ctx.lastStart, taus: null, ys: new Float64Array(0), endSlope: 0, endCurve: 0 };
}

/**
 * Knots of a repeating stretch: its ends and the knots where the knot values turn or stay level
 * (the signal is monotone from knot to knot, so it stays monotone across a knot it goes straight
 * through in the same direction); y' and |y''| at its end.
 */
function prepare(L: Laid, terms: Piece['terms'], ctx: Ctx): Float64Array {
  const { ts, ys } = ctx.buf;
  const taus: number[] = [ts[L.from]! - L.t0];
  const vals: number[] = [ys[L.from]!];
  const last = L.to - 1;
  for (let i = L.from + 1; i < last; i++) {
    const up = ys[i]! - ys[i - 1]!;
    const next = ys[i + 1]! - ys[i]!;
    if (!((up > 0 && next > 0) || (up < 0 && next < 0))) {
      taus.push(ts[i]! - L.t0);
      vals.push(ys[i]!);
    }
  }
  taus.push(ts[last]! - L.t0);
  vals.push(ys[last]!);
  const D = groupsDerivative(groupTerms(terms, ctx.G), ctx.D);
  L.endSlope = groupsValue(D, L.b);
  L.endCurve = Math.abs(groupsValue(groupsDerivative(D, ctx.D2), L.b));
  L.ys = Float64Array.from(vals);
  return (L.taus = Float64Array.from(taus));
}

function layOut(piece: Piece, lo: number, hi: number, ctx: Ctx, minIntervals: number): void {
  const t0 = piece.t0;
  const buf = ctx.buf;
  const G = groupTerms(piece.terms, ctx.G);
  const D = groupsDerivative(G, ctx.D);
  ctx.lastStart = 0;

  // a short piece (a cycle of a pulse train) is often provably monotone: y'(a + s) stays within
  // max|y'''|·s²/2 of the line y'(a) + y''(a)·s, so no root when that line keeps its sign by more;
  // its ends are then its only knots
  const a = lo - t0;
  let upper = Infinity;
  if (a >= 0) {
    const w = hi - lo;
    const D2 = groupsDerivative(D, ctx.D2);
    const D3 = groupsDerivative(D2, ctx.D3);
    const d0 = groupsValue(D, a);
    const s0 = groupsValue(D2, a);
    const d1 = d0 + s0 * w;
    const r = (groupsBound(D3, a, a + w) * w * w) / 2;
    // for the slope search: |y'| ≤ its size, and ≤ |y'(a)| + |y''(a)|·w + max|y'''|·w²/2 (Taylor)
    upper = Math.min(groupsBound(D, a, a + w), Math.abs(d0) + Math.abs(s0) * w + r);
    ctx.lastStart = Math.abs(d0);
    if (Math.abs(d0) > ctx.reached) ctx.reached = Math.abs(d0);
    if (Math.min(Math.abs(d0), Math.abs(d1)) > r && d0 < 0 === d1 < 0) {
      buf.push(lo, groupsValue(G, a));
      buf.push(hi, groupsValue(G, hi - t0));
      buf.close(upper);
      return;
    }
    // or y' is provably monotone (y'' keeps its sign the same way, by max|y''''|·s²/2): then y' has
    // at most one root, where it changes sign between the ends, and that extremum is the only knot
    // besides the ends
    const D4 = groupsDerivative(D3, ctx.D4);
    const e1 = s0 + groupsValue(D3, a) * w;
    const r2 = (groupsBound(D4, a, a + w) * w * w) / 2;
    if (Math.min(Math.abs(s0), Math.abs(e1)) > r2 && s0 < 0 === e1 < 0) {
      const b = hi - t0;
      const db = groupsValue(D, b);
      buf.push(lo, groupsValue(G, a));
      if (d0 !== 0 && db !== 0 && d0 < 0 !== db < 0) {
        const root = findRoot((u) => groupsValue(D, u - t0), lo, hi, 1e-14, d0, db);
        if (root > lo && root < hi) buf.push(root, groupsValue(G, root - t0));
      }
      buf.push(hi, groupsValue(G, b));
      buf.close(upper);
      return;
    }
  }

  // the search grid of peak.ts (equal steps fine enough for the fastest oscillation, plus the
  // sample times inside the piece; no extra steps near the start), thinned where the fast
  // oscillations have died out (sweep.ts); value and derivative there without per-point exponentials
  const m = uniformIntervals(hi - lo, maxOmega(piece), minIntervals);
  const sw = ctx.sweeper;
  const count = sw.grid([G, D], { t0, lo, hi, m, minIntervals, extra: ctx.times, extraStep: ctx.step });
  const gts = sw.ts;
  const gy = sw.vals[0]!;
  const gd = sw.vals[1]!;

  // knots: every grid time (repeats skipped) and every root of the derivative between two of them
  let prevT = gts[0]!;
  let prevD = gd[0]!;
  buf.push(prevT, gy[0]!);
  for (let k = 1; k < count; k++) {
    const t = gts[k]!;
    if (t === prevT) continue;
    const d = gd[k]!;
    if (prevD !== 0 && d !== 0 && prevD < 0 !== d < 0) {
      const near = sw.near(D, piece, prevT - t0, t - t0);
      const r = findRoot((u) => near(u - t0), prevT, t, 1e-14, prevD, d);
      if (r > prevT && r < t) buf.push(r, groupsValue(G, r - t0));
    }
    buf.push(t, gy[k]!);
    prevT = t;
    prevD = d;
  }
  buf.close(upper);
}

function sampledTrack(times: Float64Array, values: Float64Array): Track {
  const ts = Float64Array.from(times);
  const ys = Float64Array.from(values);
  const f = (t: number): number => {
    let lo = 0;
    let hi = ts.length - 1;
    if (t <= ts[0]!) return ys[0]!;
    if (t >= ts[hi]!) return ys[hi]!;
    while (hi - lo > 1) {
      const mid = (lo + hi) >> 1;
      if (ts[mid]! <= t) lo = mid;
      else hi = mid;
    }
    const u = (t - ts[lo]!) / (ts[hi]! - ts[lo]!);
    return ys[lo]! + u * (ys[hi]! - ys[lo]!);
  };
  return { ts, ys, first: Int32Array.of(0, ts.length), value: (_k, t) => f(t), start: ts[0]!, end: ts[ts.length - 1]! };
}

/** Value at the very end of the track (the left-hand limit at the end of the span). */
export function endValue(track: Track): number {
  return track.ys.length > 0 ? track.ys[track.ys.length - 1]! : NaN;
}

/** Value at the start of the track (t = start, right-hand value). */
export function startValue(track: Track): number {
  return track.ys.length > 0 ? track.ys[0]! : NaN;
}
