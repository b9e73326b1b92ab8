import type { Term } from '../simulate/result.js';
import type { C } from './complex.js';

/**
 * Exact integrals of closed forms over [0, T]: of one sum of terms, and of the product of two
 * (power v·i, or i²·R). Every term is Re[Σ_k C_k·τ^k·e^(κτ)]; a product of two such terms is again
 * of that form (exponents add, conjugate or not), and ∫0^T τ^k·e^(κτ) dτ has a closed form.
 * Written with plain numbers (no complex objects): long pulse trains integrate tens of thousands
 * of pieces.
 */
interface Monos {
  /** per monomial: coefficient (re, im), power k, exponent (re, im) */
  cre: number[];
  cim: number[];
  k: number[];
  kre: number[];
  kim: number[];
}

function monomials(terms: Term[]): Monos {
  const m: Monos = { cre: [], cim: [], k: [], kre: [], kim: [] };
  const push = (re: number, im: number, k: number, kr: number, ki: number) => {
    if (re === 0 && im === 0) return;
    m.cre.push(re);
    m.cim.push(im);
    m.k.push(k);
    m.kre.push(kr);
    m.kim.push(ki);
  };
  for (const t of terms) {
    switch (t.kind) {
      case 'exp':
        push(t.coef, 0, 0, t.lambda, 0);
        break;
      case 'poly-exp':
        t.polyCoefs.forEach((a, k) => push(a, 0, k, t.lambda, 0));
        break;
      case 'osc':
        // e^(στ)(a cos ωτ + b sin ωτ) = Re[(a − jb)·e^((σ + jω)τ)]
        push(t.cosCoef, -t.sinCoef, 0, t.sigma, t.omega);
        break;
      case 'quasi': {
        const n = Math.max(t.cosPoly.length, t.sinPoly.length);
        for (let k = 0; k < n; k++) push(t.cosPoly[k] ?? 0, -(t.sinPoly[k] ?? 0), k, t.sigma, t.omega);
        break;
      }
    }
  }
  return m;
}

/**
 * The monomials of `terms` into `m` (reused; entries past the count are stale), zero coefficients
 * kept: the layout is the terms' shape. Returns the count.
 */
function monomialsInto(terms: Term[], m: Monos): number {
  let n = 0;
  for (const t of terms) {
    switch (t.kind) {
      case 'exp':
        n = put(m, n, t.coef, 0, 0, t.lambda, 0);
        break;
      case 'poly-exp':
        for (let k = 0; k < t.polyCoefs.length; k++) n = put(m, n, t.polyCoefs[k], 0, k, t.lambda, 0);
        break;
      case 'osc':
        n = put(m, n, t.cosCoef, -t.sinCoef, 0, t.sigma, t.omega);
        break;
      case 'quasi': {
        const len = Math.max(t.cosPoly.length, t.sinPoly.length);
        for (let k = 0; k < len; k++) n = put(m, n, t.cosPoly[k] ?? 0, -(t.sinPoly[k] ?? 0), k, t.sigma, t.omega);
        break;
      }
    }
  }
  return n;
}

function put(m: Monos, n: number, re: number, im: number, k: number, kr: number, ki: number): number {
  m.cre[n] = re;
  m.cim[n] = im;
  m.k[n] = k;
  m.kre[n] = kr;
  m.kim[n] = ki;
  return n + 1;
}

// output slots of powerExpIntegralInto (no allocation on the hot path)
let outRe = 0;
let outIm = 0;

// The series below with its divisions looked up: 1/m, and T/(j + 1) and T^(k+1) for the T of the
// last call (the pairs of one piece share it). The same numbers the divisions and powers give, so
// the same sums; the short pieces of a pulse train on a large circuit run millions of series.
const RECIP = Float64Array.from({ length: 256 }, (_, m) => 1 / m);
const SERIES = 60;
let tableT = NaN;
const stepOfT = new Float64Array(SERIES);
const powOfT = new Float64Array(64);

/** ∫0^T τ^k·e^(κτ) dτ into (outRe, outIm). */
function powerExpIntegralInto(k: number, kr: number, ki: number, T: number): void {
  const zr = kr * T;
  const zi = ki * T;
  if (zr * zr + zi * zi < 1) {
    if (T !== tableT) {
      tableT = T;
      for (let j = 0; j < SERIES; j++) stepOfT[j] = T / (j + 1);
      powOfT.fill(NaN);
    }
    // Σ_j κ^j·T^(k+j+1)/(j!·(k+j+1))
    let sr = 0;
    let si = 0;
    let tr = k < 64 ? powOfT[k] : T ** (k + 1);
    if (Number.isNaN(tr)) tr = powOfT[k] = T ** (k + 1);
    let ti = 0;
    for (let j = 0; j < SERIES; j++) {
      const f = k + j + 1 < 256 ? RECIP[k + j + 1] : 1 / (k + j + 1);
      const ar = tr * f;
      const ai = ti * f;
      sr += ar;
      si += ai;
      // |a| ≤ 1e-18·|s| (with the 1-norm, cheaper than hypot on this hot path)
      if (Math.abs(ar) + Math.abs(ai) <= 1e-18 * (Math.abs(sr) + Math.abs(si))) break;
      // term *= κ·T/(j+1)
      const nr = (tr * kr - ti * ki) * stepOfT[j];
      const ni = (tr * ki + ti * kr) * stepOfT[j];
      tr = nr;
      ti = ni;
    }
    outRe = sr;
    outIm = si;
    return;
  }
  // I_0 = (e^(κT) − 1)/κ,  I_j = (T^j·e^(κT) − j·I_(j−1))/κ; e^(κT) is exactly 0 in doubles below
  // e^(−746) (a fast mode over a long span: most pairs of a large circuit), so skip cos and sin
  const m = zr < -746 ? 0 : Math.exp(zr);
  const er = m === 0 ? 0 : m * Math.cos(zi);
  const ei = m === 0 ? 0 : m * Math.sin(zi);
  const den = kr * kr + ki * ki;
  const div = (ar: number, ai: number) => {
    outRe = (ar * kr + ai * ki) / den;
    outIm = (ai * kr - ar * ki) / den;
  };
  div(er - 1, ei);
  for (let j = 1; j <= k; j++) {
    const tj = T ** j;
    div(er * tj - j * outRe, ei * tj - j * outIm);
  }
}

/** ∫0^T τ^k·e^(κτ) dτ into out[at] (re) and out[at + 1] (im): no allocation (gram.ts fills big tables). */
export function powerExpIntegralTo(k: number, kr: number, ki: number, T: number, out: Float64Array, at: number): void {
  powerExpIntegralInto(k, kr, ki, T);
  out[at] = outRe;
  out[at + 1] = outIm;
}

/** ∫0^T τ^k·e^(κτ) dτ */
export function powerExpIntegral(k: number, kappa: C, T: number): C {
  powerExpIntegralInto(k, kappa.re, kappa.im, T);
  return { re: outRe, im: outIm };
}

export function integrateTerms(terms: Term[], T: number): number {
  const m = monomials(terms);
  let s = 0;
  for (let i = 0; i < m.k.length; i++) {
    powerExpIntegralInto(m.k[i], m.kre[i], m.kim[i], T);
    s += m.cre[i] * outRe - m.cim[i] * outIm;
  }
  return s;
}

/** ∫0^T f·g dτ for two sums of terms. */
export function integrateProduct(f: Term[], g: Term[], T: number): number {
  const a = monomials(f);
  // f·f: the pair (x, y) gives what (y, x) gives, so each pair once
  return f === g ? squareOf(a, T) : productOf(a, monomials(g), T);
}

function productOf(a: Monos, b: Monos, T: number): number {
  const ga = growths(a, T);
  const gb = growths(b, T);
  let s = 0;
  for (let x = 0; x < a.k.length; x++) {
    for (let y = 0; y < b.k.length; y++) s += pairIntegral(a, x, ga, b, y, gb, T);
  }
  return s;
}

function squareOf(a: Monos, T: number): number {
  const g = growths(a, T);
  const n = a.k.length;
  // a pair of real exponentials (most pairs of a large circuit) in one half: both halves of
  // pairIntegral are then the same number, and their mean is it exactly (the same operations)
  const real = new Uint8Array(n);
  for (let x = 0; x < n; x++) real[x] = a.k[x] === 0 && a.kim[x] === 0 && a.cim[x] === 0 && !Number.isNaN(g.er[x]) ? 1 : 0;
  const c = Float64Array.from(a.cre);
  const kr = Float64Array.from(a.kre);
  const er = g.er;
  let s = 0;
  for (let x = 0; x < n; x++) {
    s += pairIntegral(a, x, g, a, x, g, T);
    const rx = real[x] === 1;
    const cx = c[x];
    const kx = kr[x];
    const ex = er[x];
    for (let y = x + 1; y < n; y++) {
      if (rx && real[y] === 1) {
        const k = kx + kr[y];
        const z = k * T;
        if (!(z * z < 1)) {
          // powerExpIntegralWith's closed form with ki = 0 and e^(κT) real
          s += 2 * ((cx * c[y]) * (((ex * er[y] - 1) * k) / (k * k)));
          continue;
        }
      }
      s += 2 * pairIntegral(a, x, g, a, y, g, T);
    }
  }
  return s;
}

/**
 * e^(κT) of each monomial, so that a pair's e^((κ₁ + κ₂)T) and e^((κ₁ + κ̄₂)T) are two complex
 * products instead of an exp, a cos and a sin each (the O(m²) pairs of an RMS). A decayed one is
 * exactly 0 (below e^(−745), as is every pair's sum with it); a growing one is NaN, and its pairs
 * are computed directly (a product could leave the range of doubles where the sum does not).
 */
function growths(a: Monos, T: number, M = a.k.length): { er: Float64Array; ei: Float64Array } {
  const er = new Float64Array(M);
  const ei = new Float64Array(M);
  for (let x = 0; x < M; x++) {
    const zr = a.kre[x] * T;
    if (!(zr <= 0)) {
      er[x] = NaN;
      continue;
    }
    if (zr < -745) continue;
    const m = Math.exp(zr);
    er[x] = m * Math.cos(a.kim[x] * T);
    ei[x] = m * Math.sin(a.kim[x] * T);
  }
  return { er, ei };
}

/** ∫0^T Re[X]·Re[Y] dτ for two monomials X = c·τ^k·e^(κτ) (a's x-th and b's y-th). */
function pairIntegral(a: Monos, x: number, ga: { er: Float64Array; ei: Float64Array }, b: Monos, y: number, gb: { er: Float64Array; ei: Float64Array }, T: number): number {
  const ar = a.cre[x];
  const ai = a.cim[x];
  const br = b.cre[y];
  const bi = b.cim[y];
  const akr = a.kre[x];
  const aki = a.kim[x];
  const bkr = b.kre[y];
  const bki = b.kim[y];
  // Re[X]·Re[Y] = ½·Re[X·Y + X·conj(Y)]
  const k = a.k[x] + b.k[y];
  const pr = ar * br - ai * bi;
  const pi = ar * bi + ai * br;
  const xr = ga.er[x];
  const xi = ga.ei[x];
  const yr = gb.er[y];
  const yi = gb.ei[y];
  powerExpIntegralWith(k, akr + bkr, aki + bki, T, xr * yr - xi * yi, xr * yi + xi * yr);
  let re = pr * outRe - pi * outIm;
  const qr = ar * br + ai * bi;
  const qi = -ar * bi + ai * br;
  powerExpIntegralWith(k, akr + bkr, aki - bki, T, xr * yr + xi * yi, xi * yr - xr * yi);
  re += qr * outRe - qi * outIm;
  return 0.5 * re;
}

/**
 * powerExpIntegralInto with e^(κT) = er + j·ei given (NaN: not given). Near κT = 0 the series of
 * powerExpIntegralInto applies, which needs no exponential.
 */
function powerExpIntegralWith(k: number, kr: number, ki: number, T: number, er: number, ei: number): void {
  const zr = kr * T;
  const zi = ki * T;
  if (Number.isNaN(er) || zr * zr + zi * zi < 1) {
    powerExpIntegralInto(k, kr, ki, T);
    return;
  }
  const den = kr * kr + ki * ki;
  outRe = ((er - 1) * kr + ei * ki) / den;
  outIm = (ei * kr - (er - 1) * ki) / den;
  for (let j = 1; j <= k; j++) {
    const tj = T ** j;
    const ar = er * tj - j * outRe;
    const ai = ei * tj - j * outIm;
    outRe = (ar * kr + ai * ki) / den;
    outIm = (ai * kr - ar * ki) / den;
  }
}

/**
 * ∫0^T f and ∫0^T f² for many pieces of a few shapes (the cycles of a long pulse train). Pieces
 * of one length whose terms have the same exponents and powers (one "layout") differ only in
 * coefficients, mostly only in those of the free response: ∫f² is a quadratic form in the
 * coefficient vector c, ∫f a linear one, with matrices of monomial integrals fixed by the layout
 * (its Gram matrices, `Gram`, shared by every measurement that uses the same store). Per layout,
 * a measurement keeps its first piece's coefficients c0 and the set V of monomials seen to differ
 * from them; with F = c0 off V and d = c on V, ∫f² = Q(F) + 2·B(F, d) + Q(d), where Q(F) and the
 * vector of B(F, ·) are computed once: a piece then costs |V|² pair terms instead of all pairs. The
 * same sum as integrateProduct, regrouped (so equal to rounding). A term array seen before over
 * the same length gives its integrals again: term arrays are taken as unchanging (pieces share
 * them, see simulate/solve.ts).
 */
export class RepeatedIntegrals {
  /** results of the last `integrate` call */
  sum = 0;
  square = 0;
  private readonly scratch: Monos = { cre: [], cim: [], k: [], kre: [], kim: [] };
  /** this measurement's coefficients per Gram matrix it used */
  private readonly layouts = new Map<Gram, Layout>();

  // the periods of a steady tail share their term arrays: the same array and length, the same integrals
  private readonly seen = new Map<Term[], { T: number; sum: number; square: number }>();

  /** `grams`: the store of Gram matrices, shared with the other measurements of a run (sharedGrams) */
  constructor(private readonly grams: GramStore = new GramStore()) {}

  /** ∫0^T f dτ into `sum` and ∫0^T f² dτ into `square`. */
  integrate(terms: Term[], T: number): void {
    const hit = this.seen.get(terms);
    if (hit && hit.T === T) {
      this.sum = hit.sum;
      this.square = hit.square;
      return;
    }
    this.integrateNew(terms, T);
    if (this.seen.size < MAX_LAYOUTS) this.seen.set(terms, { T, sum: this.sum, square: this.square });
  }

  private integrateNew(terms: Term[], T: number): void {
    const m = this.scratch;
    const M = monomialsInto(terms, m);
    // the cycles of a pulse train have lengths that differ in their last bits (each is a difference
    // of two breakpoints): a layout of a length within a few ulps serves, and the piece's own range
    // [0, T] differs from the layout's [0, T0] by f(T0)·(T − T0) and f(T0)²·(T − T0) to first order
    // (the next term, f·f'·(T − T0)², is far below rounding)
    const T0 = this.grams.nearLength(T);
    // a large layout is built for a shape this measurement met before (a pulse train's cycles; a
    // step response's one piece never repeats); the other watches of the run then find it built
    const G = M > MAX_LAYOUT || this.layouts.size >= MAX_LAYOUTS ? null : this.grams.find(m, M, T0) ?? (M <= SMALL_LAYOUT || this.seenBefore(m, M, T0) ? this.grams.build(m, M, T0) : null);
    if (!G) {
      this.direct(terms, T);
      return;
    }
    let L = this.layouts.get(G);
    if (!L) this.layouts.set(G, (L = newLayout(G, m, M)));
    // widen V to every monomial whose coefficient differs from the layout's first piece
    let widened = false;
    for (let x = 0; x < M; x++) {
      if (!L.varying[x] && (m.cre[x] !== L.c0re[x] || m.cim[x] !== L.c0im[x])) {
        L.varying[x] = 1;
        widened = true;
      }
    }
    if (widened) fixedPart(L);
    let sum = L.fixedSum;
    let sq = L.fixedSquare;
    const V = L.vlist;
    const nv = V.length;
    const dre = L.dre;
    const dim = L.dim;
    for (let j = 0; j < nv; j++) {
      dre[j] = m.cre[V[j]!];
      dim[j] = m.cim[V[j]!];
    }
    const { Ire, Iim, G1re, G1im, G2re, G2im } = G;
    for (let i = 0; i < nv; i++) {
      const y = V[i]!;
      const dr = dre[i]!;
      const di = dim[i]!;
      sum += dr * Ire[y]! - di * Iim[y]!;
      sq += dr * L.wre[y]! - di * L.wim[y]!;
      // along row y (contiguous): G1[x][y] = G1[y][x] and G2[x][y] = conj(G2[y][x]), exact copies
      const row = y * M;
      for (let j = 0; j < nv; j++) {
        const xr = dre[j]!;
        const xi = dim[j]!;
        const at = row + V[j]!;
        // ½·Re[d_x·d_y·G1 + d_x·conj(d_y)·G2]
        const pr = xr * dr - xi * di;
        const pi = xr * di + xi * dr;
        const qr = xr * dr + xi * di;
        const qi = -xr * di + xi * dr;
        sq += 0.5 * (pr * G1re[at]! - pi * G1im[at]! + qr * G2re[at]! + qi * G2im[at]!);
      }
    }
    if (T !== T0) {
      const f = valueAt(m, M, T0);
      if (!Number.isFinite(f)) {
        this.direct(terms, T); // a growing term out of range at T0: no first-order step
        return;
      }
      sum += f * (T - T0);
      sq += f * f * (T - T0);
    }
    this.sum = sum;
    this.square = sq;
  }

  // the shapes of large pieces integrated directly once, by length (a second one builds the layout)
  private readonly firstSeen = new Map<number, Shape[]>();
  private firstSeenCount = 0;

  /** Whether a large piece of this shape and length came before; remembers it when not. */
  private seenBefore(m: Monos, M: number, T0: number): boolean {
    let list = this.firstSeen.get(T0);
    if (list?.some((l) => sameLayout(l, m, M))) return true;
    if (this.firstSeenCount < MAX_LAYOUTS) {
      if (!list) this.firstSeen.set(T0, (list = []));
      list.push({ k: m.k.slice(0, M), kre: m.kre.slice(0, M), kim: m.kim.slice(0, M) });
      this.firstSeenCount++;
      if (this.grams.directLengths.size < MAX_LAYOUTS) this.grams.directLengths.add(T0);
    }
    return false;
  }
  private direct(terms: Term[], T: number): void {
    this.sum = integrateTerms(terms, T);
    this.square = integrateProduct(terms, terms, T);
  }
}

/**
 * Gram matrices of layouts by length, within a memory budget (a large one costs several direct
 * integrations and 4·M² numbers).
 * One store serves all the measurements of a run (sharedGrams): the watches of a circuit share
 * their modes, so their pieces share layouts.
 */
export class GramStore {
  private readonly byLength = new Map<number, Gram[]>();
  private count = 0;
  /** pair integrals held by the large layouts (per array) */
  private entries = 0;
  /** lengths of pieces integrated directly (measurements note them: RepeatedIntegrals.seenBefore) */
  readonly directLengths = new Set<number>();

  /** A length already keyed within a few ulps of T, or T itself. */
  nearLength(T: number): number {
    if (this.byLength.has(T)) return T;
    for (const t of this.byLength.keys()) if (sameLength(t, T)) return t;
    for (const t of this.directLengths) if (sameLength(t, T)) return t;
    return T;
  }

  /** The Gram matrices of the first M monomials of m over [0, T0] when built, else undefined. */
  find(m: Monos, M: number, T0: number): Gram | undefined {
    const list = this.byLength.get(T0);
    if (list) for (const g of list) if (sameLayout(g, m, M)) return g;
    return undefined;
  }

  /** Builds them (not there yet), or null when over the budget: integrate directly. */
  build(m: Monos, M: number, T0: number): Gram | null {
    if (this.count >= MAX_LAYOUTS) return null;
    if (M > SMALL_LAYOUT) {
      if (this.entries + M * M > MAX_ENTRIES) return null;
      this.entries += M * M;
    }
    const g = makeGram(m, M, T0);
    let list = this.byLength.get(T0);
    if (!list) this.byLength.set(T0, (list = []));
    list.push(g);
    this.count++;
    return g;
  }


}

// A run's measurements share one store (opened by the pipeline: shareGrams … releaseGrams, keyed
// by the run's sample-time array); other callers get a store of their own
const gramsByKey = new WeakMap<object, GramStore>();

/** Lets the measurements keyed by `key` (a run's sample times) share their Gram matrices. */
export function shareGrams(key: object): void {
  if (!gramsByKey.has(key)) gramsByKey.set(key, new GramStore());
}

/** The store shared under `key` when shareGrams opened it, else a new one. */
export function sharedGrams(key: object | undefined): GramStore {
  return (key && gramsByKey.get(key)) || new GramStore();
}

/** Ends the sharing under `key` (its Gram matrices: up to 192 MB for a large pulse-train run). */
export function releaseGrams(key: object): void {
  gramsByKey.delete(key);
}

/** Two piece lengths within 8 ulps of each other (the rounding of two breakpoint differences). */
function sameLength(a: number, b: number): boolean {
  return Math.abs(a - b) <= 8 * Number.EPSILON * Math.max(Math.abs(a), Math.abs(b));
}

/** Re Σ c·τ^k·e^(κτ) at τ = t over the first M monomials. */
function valueAt(m: Monos, M: number, t: number): number {
  let y = 0;
  for (let x = 0; x < M; x++) {
    const e = Math.exp(m.kre[x] * t);
    if (e === 0) continue;
    const w = m.kim[x] * t;
    const p = m.k[x] === 0 ? e : e * t ** m.k[x];
    y += p * (m.cre[x] * Math.cos(w) - m.cim[x] * Math.sin(w));
  }
  return y;
}

/**
 * Largest layout (monomials) worth caching, and most layouts kept per store and per measurement.
 * The layouts above SMALL_LAYOUT monomials together hold at most MAX_ENTRIES pair integrals per
 * array (4 arrays of 48 MB per store): a mesh of a few hundred states under a pulse train then
 * integrates each cycle's pieces as quadratic forms instead of M²/2 pair integrals each.
 */
const MAX_LAYOUT = 2048;
const SMALL_LAYOUT = 32;
const MAX_LAYOUTS = 4096;
const MAX_ENTRIES = 6 * 2 ** 20;

/** A layout's shape: per monomial its power and exponent. */
interface Shape {
  k: number[];
  kre: number[];
  kim: number[];
}

/** The monomial integrals of a layout over [0, T] (shared). */
interface Gram extends Shape {
  /** ∫ τ^k·e^(κτ) per monomial */
  Ire: Float64Array;
  Iim: Float64Array;
  /** per pair (x·M + y): ∫ τ^(kx+ky)·e^((κx + κy)τ) and ∫ τ^(kx+ky)·e^((κx + conj κy)τ) */
  G1re: Float64Array;
  G1im: Float64Array;
  G2re: Float64Array;
  G2im: Float64Array;
}

/** One measurement's use of a Gram matrix: its first coefficients and the fixed part's integrals. */
interface Layout {
  gram: Gram;
  c0re: number[];
  c0im: number[];
  varying: Uint8Array;
  vlist: number[];
  /** scratch: the varying coefficients of the piece at hand, in vlist order */
  dre: Float64Array;
  dim: Float64Array;
  /** ∫F, ∫F² and w_y = Σ_x F_x·G1_xy + conj(F_x·G2_xy) for the fixed part F */
  fixedSum: number;
  fixedSquare: number;
  wre: Float64Array;
  wim: Float64Array;
}

function sameLayout(l: Shape, m: Monos, M: number): boolean {
  if (l.k.length !== M) return false;
  for (let x = 0; x < M; x++) if (l.k[x] !== m.k[x] || l.kre[x] !== m.kre[x] || l.kim[x] !== m.kim[x]) return false;
  return true;
}

function makeGram(m: Monos, M: number, T: number): Gram {
  const Ire = new Float64Array(M);
  const Iim = new Float64Array(M);
  for (let x = 0; x < M; x++) {
    powerExpIntegralInto(m.k[x], m.kre[x], m.kim[x], T);
    Ire[x] = outRe;
    Iim[x] = outIm;
  }
  const G1re = new Float64Array(M * M);
  const G1im = new Float64Array(M * M);
  const G2re = new Float64Array(M * M);
  const G2im = new Float64Array(M * M);
  if (M > SMALL_LAYOUT) largePairs(m, M, T, G1re, G1im, G2re, G2im);
  else {
    for (let x = 0; x < M; x++) {
      for (let y = 0; y < M; y++) {
        const k = m.k[x] + m.k[y];
        powerExpIntegralInto(k, m.kre[x] + m.kre[y], m.kim[x] + m.kim[y], T);
        G1re[x * M + y] = outRe;
        G1im[x * M + y] = outIm;
        powerExpIntegralInto(k, m.kre[x] + m.kre[y], m.kim[x] - m.kim[y], T);
        G2re[x * M + y] = outRe;
        G2im[x * M + y] = outIm;
      }
    }
  }
  return { k: m.k.slice(0, M), kre: m.kre.slice(0, M), kim: m.kim.slice(0, M), Ire, Iim, G1re, G1im, G2re, G2im };
}

/** A measurement's first use of `gram`, with the piece in `m` as its first coefficients. */
function newLayout(gram: Gram, m: Monos, M: number): Layout {
  const L: Layout = {
    gram,
    c0re: m.cre.slice(0, M),
    c0im: m.cim.slice(0, M),
    varying: new Uint8Array(M),
    vlist: [],
    dre: new Float64Array(M),
    dim: new Float64Array(M),
    fixedSum: 0,
    fixedSquare: 0,
    wre: new Float64Array(M),
    wim: new Float64Array(M),
  };
  fixedPart(L);
  return L;
}

/**
 * The pair integrals of a large layout the way squareOf takes them: each unordered pair once
 * (G1 is symmetric, G2[y][x] is the conjugate of G2[x][y], exactly: κy + conj κx = conj(κx + conj κy)),
 * with e^((κx ± κy)T) as products of the monomials' own e^(κT) instead of an exp, a cos and a sin
 * per pair (powerExpIntegralWith).
 */
function largePairs(m: Monos, M: number, T: number, G1re: Float64Array, G1im: Float64Array, G2re: Float64Array, G2im: Float64Array): void {
  // (the first M monomials: the scratch holds stale entries past them)
  const { er, ei } = growths(m, T, M);
  for (let x = 0; x < M; x++) {
    const xr = er[x];
    const xi = ei[x];
    for (let y = x; y < M; y++) {
      const k = m.k[x] + m.k[y];
      const kr = m.kre[x] + m.kre[y];
      const yr = er[y];
      const yi = ei[y];
      powerExpIntegralWith(k, kr, m.kim[x] + m.kim[y], T, xr * yr - xi * yi, xr * yi + xi * yr);
      G1re[x * M + y] = G1re[y * M + x] = outRe;
      G1im[x * M + y] = G1im[y * M + x] = outIm;
      powerExpIntegralWith(k, kr, m.kim[x] - m.kim[y], T, xr * yr + xi * yi, xi * yr - xr * yi);
      G2re[x * M + y] = G2re[y * M + x] = outRe;
      G2im[x * M + y] = outIm;
      G2im[y * M + x] = -outIm;
    }
  }
}

/** ∫F, ∫F² and w for the fixed part F of a layout (c0 off the varying set). */
function fixedPart(L: Layout): void {
  const M = L.c0re.length;
  L.vlist = [];
  for (let x = 0; x < M; x++) if (L.varying[x]) L.vlist.push(x);
  // F: c0 off the varying set
  const Fre = new Float64Array(M);
  const Fim = new Float64Array(M);
  for (let x = 0; x < M; x++) {
    if (L.varying[x]) continue;
    Fre[x] = L.c0re[x]!;
    Fim[x] = L.c0im[x]!;
  }
  const { Ire, Iim, G1re, G1im, G2re, G2im } = L.gram;
  let sum = 0;
  let sq = 0;
  for (let x = 0; x < M; x++) {
    const ar = Fre[x]!;
    const ai = Fim[x]!;
    sum += ar * Ire[x]! - ai * Iim[x]!;
    for (let y = 0; y < M; y++) {
      const br = Fre[y]!;
      const bi = Fim[y]!;
      const at = x * M + y;
      const pr = ar * br - ai * bi;
      const pi = ar * bi + ai * br;
      const qr = ar * br + ai * bi;
      const qi = -ar * bi + ai * br;
      sq += 0.5 * (pr * G1re[at]! - pi * G1im[at]! + qr * G2re[at]! - qi * G2im[at]!);
    }
  }
  L.fixedSum = sum;
  L.fixedSquare = sq;
  for (let y = 0; y < M; y++) {
    let wr = 0;
    let wi = 0;
    // along row y (contiguous): G1[x][y] = G1[y][x] and G2[x][y] = conj(G2[y][x]), exact copies
    const row = y * M;
    for (let x = 0; x < M; x++) {
      const ar = Fre[x]!;
      const ai = Fim[x]!;
      const at = row + x;
      // F_x·G1_xy + conj(F_x·G2_xy)
      wr += ar * G1re[at]! - ai * G1im[at]! + (ar * G2re[at]! + ai * G2im[at]!);
      wi += ar * G1im[at]! + ai * G1re[at]! - (-ar * G2im[at]! + ai * G2re[at]!);
    }
    L.wre[y] = wr;
    L.wim[y] = wi;
  }
}
