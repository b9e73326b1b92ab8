import { type Groups, groupValue, groupsValue as groupsAt } from '../lti/term.js';

/**
 * Grouped sums (lti/term.ts) evaluated on equally spaced points without an exponential per term and
 * point: e^(κ(τa + i·h)) = e^(κτa)·e^(κ·i·h). Per chunk of CHUNK points, one exact e^(κτa) per group
 * and one complex multiply per group and point by a cached e^(κ·i·h) (exact to a few ulps: no
 * error builds up from chunk to chunk). Groups whose size over a chunk is below SKIP of the rounding
 * of the sum (the largest single term there times 2⁻⁵²) are left out of that chunk: they change no
 * digit. Used to bracket the extrema of long closed forms (hundreds of terms, 10⁵ grid points) and
 * of long pulse trains (10⁴ pieces of the same few shapes, which share the tables).
 */

const CHUNK = 64;
/** a group counts when it can reach 1e-3 of the sum's rounding (2⁻⁵² of its largest term) */
const SKIP = 1e-3 * 2 ** -52;

/** Tables e^(κ·i·h), i < CHUNK, interleaved (re, im), shared by every sweep of one measurement. */
export class PowerTables {
  private readonly byStep = new Map<number, Map<number, Map<number, Float64Array>>>();

  // the last few tables asked for (a pulse train asks for the same two or three over and over:
  // comparing numbers is cheaper than hashing them)
  private readonly recent: { kr: number; ki: number; h: number; t: Float64Array }[] = [];

  get(kr: number, ki: number, h: number): Float64Array {
    for (const r of this.recent) if (r.kr === kr && r.ki === ki && r.h === h) return r.t;
    const t = this.lookup(kr, ki, h);
    if (this.recent.length >= 4) this.recent.pop();
    this.recent.unshift({ kr, ki, h, t });
    return t;
  }

  private lookup(kr: number, ki: number, h: number): Float64Array {
    let a = this.byStep.get(h);
    if (!a) this.byStep.set(h, (a = new Map()));
    let b = a.get(kr);
    if (!b) a.set(kr, (b = new Map()));
    let t = b.get(ki);
    if (!t) {
      t = new Float64Array(2 * CHUNK);
      for (let i = 0; i < CHUNK; i++) {
        const x = i * h;
        const m = kr === 0 ? 1 : Math.exp(kr * x);
        t[2 * i] = ki === 0 ? m : m * Math.cos(ki * x);
        t[2 * i + 1] = ki === 0 ? 0 : m * Math.sin(ki * x);
      }
      b.set(ki, t);
    }
    return t;
  }
}

// A table depends on (κ, h) alone, and the measurements of one run search the same modes on the
// same grids (every watch's track and slope search, over the same sample times): within a scope
// opened by the run (shareTables … releaseTables) they share their tables through the sample-time
// array; other callers keep tables of their own (nothing retained behind a result)
const sharedByKey = new WeakMap<object, PowerTables>();

/** Lets the measurements keyed by `key` (a run's sample times) share their power tables. */
export function shareTables(key: object): void {
  if (!sharedByKey.has(key)) sharedByKey.set(key, new PowerTables());
}

/** The tables shared under `key` when shareTables opened them, else new ones. */
export function sharedTables(key: object | undefined): PowerTables {
  return (key && sharedByKey.get(key)) || new PowerTables();
}

/** Ends the sharing under `key` (its tables: about 10 MB for a 1000-state run). */
export function releaseTables(key: object): void {
  sharedByKey.delete(key);
}

/** Per-group data of a sweep: log-size of each channel's coefficients, to skip negligible groups. */
interface Prep {
  /** per channel and group: log of Σ|c_k| (−Infinity when zero) */
  logAmp: Float64Array[];
  /** per channel and group: whether the group is a single coefficient (its size is a lower bound too) */
  single: boolean[];
  /** whether any group is a polynomial */
  poly: boolean;
}

function prepare(chs: readonly Groups[]): Prep {
  const g0 = chs[0]!;
  const logAmp = chs.map((g) => {
    const out = new Float64Array(g.n);
    for (let q = 0; q < g.n; q++) {
      let s = 0;
      for (let i = g.off[q]!; i < g.off[q + 1]!; i++) s += Math.hypot(g.cr[i]!, g.ci[i]!);
      out[q] = Math.log(s);
    }
    return out;
  });
  const single: boolean[] = [];
  for (let q = 0; q < g0.n; q++) single.push(g0.off[q + 1]! - g0.off[q]! === 1);
  return { logAmp, single, poly: single.some((x) => !x) };
}

/**
 * Which groups matter on [ta, tb] (τ, 0 ≤ ta ≤ tb): a group is skipped when, in every channel, its
 * bound Σ|c_k|·tb^k·max(e^(kr·ta), e^(kr·tb)) is below SKIP/n of the largest single-coefficient
 * group's smallest size there. Returns the count written into `alive`.
 */
function aliveGroups(chs: readonly Groups[], prep: Prep, ta: number, tb: number, alive: Int32Array): number {
  const g = chs[0]!;
  const n = g.n;
  const logSkip = Math.log(SKIP / n);
  const floors: number[] = [];
  for (let c = 0; c < chs.length; c++) {
    const la = prep.logAmp[c]!;
    let top = -Infinity;
    for (let q = 0; q < n; q++) {
      if (!prep.single[q]) continue;
      const kr = g.kr[q]!;
      const v = la[q]! + Math.min(kr * ta, kr * tb);
      if (v > top) top = v;
    }
    floors.push(top + logSkip);
  }
  const logTb = prep.poly ? Math.log(Math.max(tb, 1e-300)) : 0;
  let count = 0;
  for (let q = 0; q < n; q++) {
    const kr = g.kr[q]!;
    const deg = g.off[q + 1]! - g.off[q]! - 1;
    const env = Math.max(kr * ta, kr * tb);
    let keep = false;
    for (let c = 0; c < chs.length && !keep; c++) {
      let la = prep.logAmp[c]![q]!;
      if (deg > 0) {
        // Σ|c_k|·tb^k ≤ Σ|c_k|·max(1, tb)^deg
        la += deg * Math.max(0, logTb);
      }
      if (!(la + env < floors[c]!)) keep = true;
    }
    if (keep) alive[count++] = q;
  }
  return count;
}

/** The fastest oscillation |Im κ| among the groups alive[0 … na−1]. */
function fastest(g: Groups, alive: Int32Array, na: number): number {
  let w = 0;
  for (let j = 0; j < na; j++) w = Math.max(w, Math.abs(g.ki[alive[j]!]!));
  return w;
}

/**
 * The fastest oscillation |Im κ| among the groups alive[0 … na−1] whose size at τ = ta reaches
 * e^logThin of the largest single-coefficient group's there, in some channel.
 */
function fastestAbove(chs: readonly Groups[], prep: Prep, ta: number, alive: Int32Array, na: number, logThin: number): number {
  const g = chs[0]!;
  const n = g.n;
  let w = 0;
  for (let c = 0; c < chs.length; c++) {
    const la = prep.logAmp[c]!;
    let top = -Infinity;
    for (let q = 0; q < n; q++) {
      if (!prep.single[q]) continue;
      const v = la[q]! + g.kr[q]! * ta;
      if (v > top) top = v;
    }
    const floor = top + logThin;
    for (let j = 0; j < na; j++) {
      const q = alive[j]!;
      const ki = Math.abs(g.ki[q]!);
      if (ki > w && !(la[q]! + g.kr[q]! * ta < floor)) w = ki;
    }
  }
  return w;
}

/** Grows a scratch array to at least n entries (contents not kept); makes it when missing (a new channel). */
function room(a: Float64Array<ArrayBuffer> | undefined, n: number): Float64Array<ArrayBuffer> {
  return a && a.length >= n ? a : new Float64Array(Math.max(n, 2 * (a?.length ?? 0)));
}

/**
 * The evaluation of one measurement: the power tables and scratch arrays shared by all its pieces
 * (a pulse train has tens of thousands: no allocation per piece). `grid` leaves its result in
 * ts[0 … count−1] and vals[c][0 … count−1], valid until the next call.
 */
export class Sweeper {
  constructor(readonly tables = new PowerTables()) {}
  ts = new Float64Array(64);
  vals = [new Float64Array(64), new Float64Array(64)];
  private uT = new Float64Array(64);
  private uV = [new Float64Array(64), new Float64Array(64)];
  private sV = [new Float64Array(64), new Float64Array(64)];
  private pts: number[] = [];
  private alive = new Int32Array(16);

  /**
   * The groups of `g` (the grouped sum of `owner`, one piece) that matter on [ta, tb] (τ), for
   * root refinement there: an evaluator of their sum (the others are below 1e-3 of its
   * rounding), valid until the next call.
   */
  near(g: Groups, owner: object, ta: number, tb: number): (tau: number) => number {
    if (g.n <= CHUNK) return (tau) => groupsAt(g, tau);
    // the sizes of the groups, once per piece (`owner`: a long closed form refines many roots)
    if (this.nearOf !== owner) {
      this.nearOf = owner;
      this.nearPrep = prepare([g]);
    }
    const idx = this.nearIdx.length >= g.n ? this.nearIdx : (this.nearIdx = new Int32Array(g.n));
    const na = aliveGroups([g], this.nearPrep!, ta, tb, idx);
    return (tau) => groupsAtSome(g, idx, na, tau);
  }

  /**
   * The groups of the channels `chs` (one layout) that matter on [ta, tb] (τ) in any of them, into
   * `nearIdx`; returns their count (see `near`; `atSome` evaluates them).
   */
  nearAll(chs: readonly Groups[], owner: object, ta: number, tb: number): number {
    const g = chs[0]!;
    const idx = this.nearIdx.length >= g.n ? this.nearIdx : (this.nearIdx = new Int32Array(g.n));
    if (g.n <= CHUNK) {
      for (let q = 0; q < g.n; q++) idx[q] = q;
      return g.n;
    }
    if (this.nearOf !== owner) {
      this.nearOf = owner;
      this.nearPrep = prepare(chs);
    }
    return aliveGroups(chs, this.nearPrep!, ta, tb, idx);
  }

  /** Every channel at τ, summed over the first `count` groups of `nearIdx` (set by nearAll), into out. */
  atSome(chs: readonly Groups[], count: number, tau: number, out: Float64Array): void {
    channelsAtSome(chs, this.nearIdx, count, tau, out);
  }

  private nearOf: object | null = null;

  // the power tables of the current layout by step and group (cleared per call: the layout changes)
  private readonly byStep = new Map<number, Float64Array[]>();
  private readonly tab = (q: number, kr: number, ki: number, h: number): Float64Array => {
    let list = this.byStep.get(h);
    if (!list) this.byStep.set(h, (list = []));
    return (list[q] ??= this.tables.get(kr, ki, h));
  };

  private all = new Int32Array(0);
  private at = new Float64Array(4);

  /** 0 … n−1 */
  private allRoom(n: number): Int32Array {
    if (this.all.length < n) {
      this.all = new Int32Array(Math.max(n, 2 * this.all.length));
      for (let q = 0; q < this.all.length; q++) this.all[q] = q;
    }
    return this.all;
  }

  private atRoom(n: number): Float64Array {
    if (this.at.length < n) this.at = new Float64Array(n);
    return this.at;
  }
  private nearPrep: Prep | null = null;

  private nearIdx = new Int32Array(16);

  private aliveRoom(n: number): Int32Array {
    if (this.alive.length < n) this.alive = new Int32Array(Math.max(n, 2 * this.alive.length));
    return this.alive;
  }

  /**
   * Values of the channels (grouped sums of one layout, e.g. a signal and its derivative) at τ_i = tau0 + i·h, i = 0 … count−1, written to out[c][at + i].
   */
  uniform(chs: readonly Groups[], tau0: number, h: number, count: number, out: Float64Array[], at: number): void {
    const g = chs[0]!;
    this.byStep.clear();
    const prep = count > CHUNK ? prepare(chs) : null;
    const alive = this.aliveRoom(g.n);
    for (let c = 0; c < chs.length; c++) out[c]!.fill(0, at, at + count);
    for (let i0 = 0; i0 < count; i0 += CHUNK) {
      const len = Math.min(CHUNK, count - i0);
      const ta = tau0 + i0 * h;
      let na: number;
      if (prep) na = aliveGroups(chs, prep, ta, ta + (len - 1) * h, alive);
      else {
        for (let q = 0; q < g.n; q++) alive[q] = q;
        na = g.n;
      }
      for (let j = 0; j < na; j++) accumulate(chs, alive[j]!, ta, h, len, out, at + i0, this.tab);
    }
  }

  /**
   * The uniform search grid lo + width·k/m (k = 0 … m, the last point exactly hi), thinned where
   * the fast oscillations have died out: the stride s (a power of two) keeps s·width/m ≤ π/4 over
   * the fastest oscillation still of any size, and at least `minIntervals` intervals over the
   * whole width. Leaves the times in uT and the channels in uV; returns the count.
   */
  private searchGrid(chs: readonly Groups[], t0: number, lo: number, hi: number, m: number, minIntervals: number, harmonics: number, thin = 0): number {
    const g = chs[0]!;
    const width = hi - lo;
    const hb = width / m;
    this.uT = room(this.uT, m + 1);
    for (let c = 0; c < chs.length; c++) this.uV[c] = room(this.uV[c]!, m + 1);
    const ts = this.uT;
    const vals = this.uV;
    const prep = m + 1 > CHUNK ? prepare(chs) : null;
    const alive = this.aliveRoom(g.n);
    let sMax = 1;
    while (sMax * 2 * minIntervals <= m) sMax *= 2;
    let count = 0;
    let k = 0;
    while (k <= m) {
      const ta = lo + (width * k) / m - t0;
      let na: number;
      let s = 1;
      if (prep) {
        na = aliveGroups(chs, prep, ta, ta + (CHUNK - 1) * sMax * hb, alive);
        const w = thin > 0 ? fastestAbove(chs, prep, ta, alive, na, Math.log(thin)) : fastest(g, alive, na);
        const fit = w > 0 ? Math.PI / 4 / (harmonics * w * hb) : Infinity;
        while (s < sMax && 2 * s <= fit) s *= 2;
        // stay on multiples of the stride: the grid is a subset of the one of stride 1
        while (s > 1 && k % s !== 0) s /= 2;
      } else {
        for (let q = 0; q < g.n; q++) alive[q] = q;
        na = g.n;
      }
      const len = Math.min(CHUNK, Math.floor((m - k) / s) + 1);
      for (let i = 0; i < len; i++) {
        const kk = k + i * s;
        ts[count + i] = kk === m ? hi : lo + (width * kk) / m;
      }
      for (let c = 0; c < chs.length; c++) vals[c]!.fill(0, count, count + len);
      for (let j = 0; j < na; j++) accumulate(chs, alive[j]!, ta, s * hb, len, vals, count, this.tab);
      count += len;
      k += len * s;
      // the last point is always hi
      if (k > m && ts[count - 1] !== hi) k = m;
    }
    return count;
  }

  /**
   * The channels on the merged search grid of one piece: the thinned uniform grid, the extra
   * times inside (lo, hi) and the further points, in increasing time (repeated times kept: walks
   * skip them). Returns the count; the result is in ts and vals.
   */
  grid(chs: readonly Groups[], spec: GridSpec): number {
    const { t0, lo, hi } = spec;
    this.byStep.clear();
    const nU = this.searchGrid(chs, t0, lo, hi, spec.m, spec.minIntervals, spec.harmonics ?? 1, spec.thin);
    // extra times strictly inside (lo, hi)
    let a = 0;
    let nS = 0;
    const e = spec.extra;
    if (e) {
      let b = e.length;
      while (a < b) {
        const mid = (a + b) >> 1;
        if (e[mid]! <= lo) a = mid + 1;
        else b = mid;
      }
      while (a + nS < e.length && e[a + nS]! < hi) nS++;
    }
    const pts = this.pts;
    pts.length = 0;
    if (spec.points) {
      for (const t of spec.points) pts.push(t);
      pts.sort((x, y) => x - y);
    }
    const nP = pts.length;
    const n = nU + nS + nP;
    this.ts = room(this.ts, n);
    for (let c = 0; c < chs.length; c++) {
      this.vals[c] = room(this.vals[c]!, n);
      this.sV[c] = room(this.sV[c]!, nS + nP);
    }
    const Sv = this.sV;
    if (nS >= 8 && spec.extraStep > 0) this.uniform(chs, e![a]! - t0, spec.extraStep, nS, Sv, 0);
    else for (let i = 0; i < nS; i++) for (let c = 0; c < chs.length; c++) Sv[c]![i] = groupsAt(chs[c]!, e![a + i]! - t0);
    // the further points one by one, all channels sharing each group's exponential
    if (nP > 0) {
      const g = chs[0]!;
      const all = this.allRoom(g.n);
      const at = this.atRoom(chs.length);
      for (let i = 0; i < nP; i++) {
        channelsAtSome(chs, all, g.n, pts[i]! - t0, at);
        for (let c = 0; c < chs.length; c++) Sv[c]![nS + i] = at[c]!;
      }
    }
    // three-way merge by time
    const ts = this.ts;
    const vals = this.vals;
    const uT = this.uT;
    const uV = this.uV;
    let iu = 0;
    let is = 0;
    let ip = 0;
    for (let k = 0; k < n; k++) {
      const tu = iu < nU ? uT[iu]! : Infinity;
      const tsx = is < nS ? e![a + is]! : Infinity;
      const tp = ip < nP ? pts[ip]! : Infinity;
      if (tu <= tsx && tu <= tp) {
        ts[k] = tu;
        for (let c = 0; c < chs.length; c++) vals[c]![k] = uV[c]![iu]!;
        iu++;
      } else if (tsx <= tp) {
        ts[k] = tsx;
        for (let c = 0; c < chs.length; c++) vals[c]![k] = Sv[c]![is]!;
        is++;
      } else {
        ts[k] = tp;
        for (let c = 0; c < chs.length; c++) vals[c]![k] = Sv[c]![nS + ip]!;
        ip++;
      }
    }
    return n;
  }
}

/** Adds group q of every channel at τ = ta + i·h, i < len, to out[c][at + i]. */
function accumulate(chs: readonly Groups[], q: number, ta: number, h: number, len: number, out: Float64Array[], at: number, tables: (q: number, kr: number, ki: number, h: number) => Float64Array): void {
  const g = chs[0]!;
  const kr = g.kr[q]!;
  const ki = g.ki[q]!;
  const o0 = g.off[q]!;
  const o1 = g.off[q + 1]!;
  // e^(κ·ta), exact
  let er = 1;
  let ei = 0;
  if (ta !== 0) {
    const m = kr === 0 ? 1 : Math.exp(kr * ta);
    er = ki === 0 ? m : m * Math.cos(ki * ta);
    ei = ki === 0 ? 0 : m * Math.sin(ki * ta);
  }
  const real = ki === 0;
  const constant = real && kr === 0;
  const tab = constant ? null : tables(q, kr, ki, h);
  if (tab && o1 - o0 === 1 && chs.length === 4 && chs.every((ch) => ch.cr[o0] !== 0 || ch.ci[o0] !== 0)) {
    // v, v', i, i' of the joint peak search: one pass over the table for the four (each as the
    // loop below does it; a zero coefficient takes that loop, which skips it)
    const [c0, c1, c2, c3] = chs as [Groups, Groups, Groups, Groups];
    const [d0, d1, d2, d3] = out as [Float64Array, Float64Array, Float64Array, Float64Array];
    if (real) {
      // as below: (c·e^(κ·ta))·T_i, with c real
      const a0 = c0.cr[o0]! * er;
      const a1 = c1.cr[o0]! * er;
      const a2 = c2.cr[o0]! * er;
      const a3 = c3.cr[o0]! * er;
      for (let i = 0; i < len; i++) {
        const t = tab[2 * i]!;
        d0[at + i] += a0 * t;
        d1[at + i] += a1 * t;
        d2[at + i] += a2 * t;
        d3[at + i] += a3 * t;
      }
      return;
    }
    const r0 = c0.cr[o0]! * er - c0.ci[o0]! * ei;
    const r1 = c1.cr[o0]! * er - c1.ci[o0]! * ei;
    const r2 = c2.cr[o0]! * er - c2.ci[o0]! * ei;
    const r3 = c3.cr[o0]! * er - c3.ci[o0]! * ei;
    const i0 = c0.cr[o0]! * ei + c0.ci[o0]! * er;
    const i1 = c1.cr[o0]! * ei + c1.ci[o0]! * er;
    const i2 = c2.cr[o0]! * ei + c2.ci[o0]! * er;
    const i3 = c3.cr[o0]! * ei + c3.ci[o0]! * er;
    for (let i = 0; i < len; i++) {
      const tr = tab[2 * i]!;
      const ti = tab[2 * i + 1]!;
      d0[at + i] += r0 * tr - i0 * ti;
      d1[at + i] += r1 * tr - i1 * ti;
      d2[at + i] += r2 * tr - i2 * ti;
      d3[at + i] += r3 * tr - i3 * ti;
    }
    return;
  }
  for (let c = 0; c < chs.length; c++) {
    const ch = chs[c]!;
    const dst = out[c]!;
    if (o1 - o0 === 1) {
      const cr = ch.cr[o0]!;
      const ci = ch.ci[o0]!;
      if (cr === 0 && ci === 0) continue;
      if (constant) {
        for (let i = 0; i < len; i++) dst[at + i] += cr;
      } else if (real) {
        const a = cr * er;
        for (let i = 0; i < len; i++) dst[at + i] += a * tab![2 * i]!;
      } else {
        // Re[(cr + j·ci)·E·T_i]
        const ar = cr * er - ci * ei;
        const ai = cr * ei + ci * er;
        for (let i = 0; i < len; i++) dst[at + i] += ar * tab![2 * i]! - ai * tab![2 * i + 1]!;
      }
    } else {
      for (let i = 0; i < len; i++) {
        const tau = ta + i * h;
        let pr = 0;
        let pi = 0;
        for (let x = o1 - 1; x >= o0; x--) {
          pr = pr * tau + ch.cr[x]!;
          pi = pi * tau + ch.ci[x]!;
        }
        let zr = er;
        let zi = ei;
        if (tab) {
          zr = er * tab[2 * i]! - ei * tab[2 * i + 1]!;
          zi = er * tab[2 * i + 1]! + ei * tab[2 * i]!;
        }
        dst[at + i] += pr * zr - pi * zi;
      }
    }
  }
}

/** Whether sorted times are equally spaced to within rounding (sample times are): the step, or NaN. */
export function uniformStep(times: ArrayLike<number>): number {
  const n = times.length;
  if (n < 3) return NaN;
  const t0 = times[0]!;
  const h = (times[n - 1]! - t0) / (n - 1);
  if (!(h > 0)) return NaN;
  for (let k = 1; k < n; k++) {
    const t = times[k]!;
    if (Math.abs(t - (t0 + k * h)) > 4 * Number.EPSILON * Math.max(Math.abs(t), Math.abs(t0))) return NaN;
  }
  return h;
}

/** Where a measurement searches one piece: the stretch, the uniform grid and the extra times. */
export interface GridSpec {
  /** piece start (τ = t − t0) */
  t0: number;
  lo: number;
  hi: number;
  /** uniform intervals of stride 1 (peak.ts uniformIntervals) and the fewest to keep when thinning */
  m: number;
  minIntervals: number;
  /** sorted extra times (sample times); those strictly inside (lo, hi) are used */
  extra?: ArrayLike<number>;
  /** their step when equally spaced (uniformStep), else NaN */
  extraStep: number;
  /** further times (unsorted), evaluated one by one */
  points?: number[];
  /**
   * the thinned grid keeps π/4 per step of `harmonics` times the fastest oscillation still alive
   * (2 for the product of two channels, whose frequencies add); default 1
   */
  harmonics?: number;
  /**
   * when given, only groups of at least this size relative to the largest (per channel, at the
   * start of each chunk) set the stride of the thinned grid; by default every group summed does.
   * For searches that certify the intervals between grid points (certify.ts): the grid is then
   * only a matter of speed
   */
  thin?: number;
}

/** Σ of the groups idx[0 … count−1] of g at τ (as lti/term.ts groupsValue). */
function groupsAtSome(g: Groups, idx: Int32Array, count: number, tau: number): number {
  let s = 0;
  for (let j = 0; j < count; j++) s += groupValue(g, idx[j]!, tau);
  return s;
}

/** Each channel (one layout) at τ over the groups idx[0 … count−1], sharing the exponentials, into out[c]. */
export function channelsAtSome(chs: readonly Groups[], idx: Int32Array, count: number, tau: number, out: Float64Array): void {
  const g = chs[0]!;
  const nc = chs.length;
  out.fill(0, 0, nc);
  for (let j = 0; j < count; j++) {
    const q = idx[j]!;
    const a = g.kr[q]!;
    const w = g.ki[q]!;
    const m = a === 0 ? 1 : Math.exp(a * tau);
    const cw = w === 0 ? 1 : Math.cos(w * tau);
    const sw = w === 0 ? 0 : Math.sin(w * tau);
    const o0 = g.off[q]!;
    const o1 = g.off[q + 1]!;
    for (let c = 0; c < nc; c++) {
      const ch = chs[c]!;
      let pr = 0;
      let pi = 0;
      for (let i = o1 - 1; i >= o0; i--) {
        pr = pr * tau + ch.cr[i]!;
        pi = pi * tau + ch.ci[i]!;
      }
      out[c] += w === 0 ? m * pr : m * (pr * cw - pi * sw);
    }
  }
}
