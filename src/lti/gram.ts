import type { Term } from '../simulate/result.js';
import { integrateProduct, powerExpIntegralTo } from './integrate.js';

/**
 * ∫0^T f·g dτ for many pairs of closed forms that share their exponents: every part voltage and
 * current of a run is a combination of the same natural modes and source components. Each sum of
 * terms is written in one real basis shared by all of them, φ = τᵏ·e^(στ) for a real exponent and
 * τᵏ·e^(στ)·cos ωτ, τᵏ·e^(στ)·sin ωτ for a complex one; then ∫ f·g = aᵀ·H·b with the Gram matrix
 * H_xy = ∫0^T φx·φy, computed once per length T and reused by every pair: a pair costs n²
 * multiply-adds and no exponentials (instead of n² exponent integrals). The entries are the
 * exponent integrals of integrateProduct (Re X·Re Y = ½·Re[X·Y + X·conj Y] and its siblings), so
 * the result is that same sum, regrouped: equal to rounding.
 * Term arrays are taken as unchanging (their coordinates are cached by identity, as in
 * RepeatedIntegrals).
 */
export class ProductIntegrals {
  /** results of the last `pair` call: ∫ f·g and ∫ g² */
  fg = 0;
  gg = 0;

  // the basis: per function its power, exponent, and whether it is the sin (Im) part
  private readonly bk: number[] = [];
  private readonly bkr: number[] = [];
  private readonly bki: number[] = [];
  private readonly bim: number[] = [];
  /** exponent re → im → per power: index of the Re function (the Im one follows it) */
  private readonly index = new Map<number, Map<number, number[]>>();
  private readonly coords = new WeakMap<Term[], Coords>();
  private readonly results = new WeakMap<Term[], WeakMap<Term[], Map<number, [number, number]>>>();
  private readonly tables = new Map<number, Table>();
  private stored = 0;
  private w = new Float64Array(64);
  private mark = new Int32Array(64);
  private stamp = 0;
  private readonly scratch = new Float64Array(4);
  private dense = new Float64Array(64);

  /** ∫0^T f·g dτ into `fg` and ∫0^T g² dτ into `gg`. */
  pair(f: Term[], g: Term[], T: number): void {
    // the same pair over the same length again (stress, then the energy balance): the same results
    let byG = this.results.get(f);
    if (!byG) this.results.set(f, (byG = new WeakMap()));
    let byT = byG.get(g);
    if (!byT) byG.set(g, (byT = new Map()));
    const hit = byT.get(T);
    if (hit) {
      this.fg = hit[0];
      this.gg = hit[1];
      return;
    }
    this.compute(f, g, T);
    if (byT.size < 16) byT.set(T, [this.fg, this.gg]);
  }

  private compute(f: Term[], g: Term[], T: number): void {
    const A = this.coordsOf(f);
    const B = f === g ? A : this.coordsOf(g);
    const n = Math.max(A.top, B.top);
    const tab = n > MAX_BASIS ? undefined : this.table(T, n);
    if (!tab) {
      // too large to tabulate: term pair by term pair
      this.fg = integrateProduct(f, g, T);
      this.gg = f === g ? this.fg : integrateProduct(g, g, T);
      return;
    }
    const { H, cap } = tab;
    if (this.w.length < this.bk.length) {
      this.w = new Float64Array(2 * this.bk.length);
      this.mark = new Int32Array(2 * this.bk.length);
      this.stamp = 0;
    }
    const w = this.w;
    const mark = this.mark;
    const s = ++this.stamp;
    // g as a dense vector over the functions 0 … top−1 when it holds most of them (a contiguous
    // dot product per row, no gather)
    const top = B.top;
    // (only where every entry is finite: 0·∞ would make a NaN the sum by pairs never forms)
    const dense = tab.finite && 4 * B.idx.length >= top;
    if (dense) {
      if (this.dense.length < top) this.dense = new Float64Array(2 * top);
      this.dense.fill(0, 0, top);
      for (let j = 0; j < B.idx.length; j++) this.dense[B.idx[j]!] = B.c[j]!;
    }
    const bd = this.dense;
    // w = H·b on the functions of f and g (one row per function, shared by both sums)
    const row = (x: number) => {
      if (mark[x] === s) return;
      mark[x] = s;
      const at = x * cap;
      let acc = 0;
      if (dense) {
        let a1 = 0;
        let y = 0;
        for (; y + 1 < top; y += 2) {
          acc += H[at + y]! * bd[y]!;
          a1 += H[at + y + 1]! * bd[y + 1]!;
        }
        if (y < top) acc += H[at + y]! * bd[y]!;
        acc += a1;
      } else {
        for (let j = 0; j < B.idx.length; j++) acc += H[at + B.idx[j]!]! * B.c[j]!;
      }
      w[x] = acc;
    };
    let gg = 0;
    for (let j = 0; j < B.idx.length; j++) {
      row(B.idx[j]!);
      gg += B.c[j]! * w[B.idx[j]!]!;
    }
    let fg = gg;
    if (A !== B) {
      fg = 0;
      for (let j = 0; j < A.idx.length; j++) {
        row(A.idx[j]!);
        fg += A.c[j]! * w[A.idx[j]!]!;
      }
    }
    this.fg = fg;
    this.gg = gg;
  }

  /** The coordinates of a sum of terms in the shared basis (zero coefficients left out). */
  private coordsOf(terms: Term[]): Coords {
    const hit = this.coords.get(terms);
    if (hit) return hit;
    const acc = new Map<number, number>();
    const add = (x: number, c: number) => {
      if (c !== 0) acc.set(x, (acc.get(x) ?? 0) + c);
    };
    // c·τᵏ·e^(κτ) contributes Re[c·X] = cr·Re X − ci·Im X (X = τᵏ·e^(κτ))
    const mono = (cr: number, ci: number, k: number, kr: number, ki: number) => {
      if (cr === 0 && ci === 0) return;
      const x = this.functionOf(k, kr, ki);
      add(x, cr);
      if (ki !== 0) add(x + 1, -ci);
    };
    for (const t of terms) {
      switch (t.kind) {
        case 'exp':
          mono(t.coef, 0, 0, t.lambda, 0);
          break;
        case 'poly-exp':
          t.polyCoefs.forEach((a, k) => mono(a, 0, k, t.lambda, 0));
          break;
        case 'osc':
          // e^(στ)(a cos ωτ + b sin ωτ) = Re[(a − jb)·e^((σ + jω)τ)]
          mono(t.cosCoef, -t.sinCoef, 0, t.sigma, t.omega);
          break;
        case 'quasi': {
          const n = Math.max(t.cosPoly.length, t.sinPoly.length);
          for (let k = 0; k < n; k++) mono(t.cosPoly[k] ?? 0, -(t.sinPoly[k] ?? 0), k, t.sigma, t.omega);
          break;
        }
      }
    }
    const idx = Int32Array.from(acc.keys());
    const c = Float64Array.from(acc.values());
    let top = 0;
    for (const x of idx) top = Math.max(top, x + 1);
    const out: Coords = { idx, c, top };
    this.coords.set(terms, out);
    return out;
  }

  /** Index of the Re function of τᵏ·e^(κτ) (its Im function, when κ is complex, is the next). */
  private functionOf(k: number, kr: number, ki: number): number {
    let byIm = this.index.get(kr);
    if (!byIm) this.index.set(kr, (byIm = new Map()));
    let byK = byIm.get(ki);
    if (!byK) byIm.set(ki, (byK = []));
    let x = byK[k];
    if (x === undefined) {
      x = this.bk.length;
      byK[k] = x;
      for (let p = 0; p < (ki === 0 ? 1 : 2); p++) {
        this.bk.push(k);
        this.bkr.push(kr);
        this.bki.push(ki);
        this.bim.push(p);
      }
    }
    return x;
  }

  /** The Gram matrix for length T, filled for the first n functions (undefined: over the memory budget). */
  private table(T: number, n: number): Table | undefined {
    let tab = this.tables.get(T);
    if (!tab) {
      tab = { cap: 0, n: 0, H: new Float64Array(0), finite: true };
      this.tables.set(T, tab);
    }
    if (n <= tab.n) return tab;
    if (n > tab.cap) {
      const cap = Math.max(n, Math.min(MAX_BASIS, 2 * tab.cap));
      if (this.stored + cap * cap - tab.cap * tab.cap > MAX_STORED) {
        // start over rather than hold more (results do not depend on what is kept)
        this.tables.clear();
        this.stored = 0;
        tab.n = 0;
        tab.cap = 0;
        tab.H = new Float64Array(0);
        tab.finite = true;
        this.tables.set(T, tab);
        if (cap * cap > MAX_STORED) return undefined;
      }
      const H = new Float64Array(cap * cap);
      for (let x = 0; x < tab.n; x++) H.set(tab.H.subarray(x * tab.cap, x * tab.cap + tab.n), x * cap);
      this.stored += cap * cap - tab.cap * tab.cap;
      tab.H = H;
      tab.cap = cap;
    }
    const { H, cap } = tab;
    for (let x = tab.n; x < n; x++) {
      for (let y = 0; y <= x; y++) {
        const h = this.entry(x, y, T);
        H[x * cap + y] = h;
        H[y * cap + x] = h;
        if (!Number.isFinite(h)) tab.finite = false;
      }
    }
    tab.n = n;
    return tab;
  }

  /** ∫0^T φx·φy dτ from G1 = ∫ τ^(kx+ky)·e^((κx+κy)τ) and G2 = ∫ τ^(kx+ky)·e^((κx+conj κy)τ). */
  private entry(x: number, y: number, T: number): number {
    const k = this.bk[x]! + this.bk[y]!;
    const kr = this.bkr[x]! + this.bkr[y]!;
    const ax = this.bki[x]!;
    const ay = this.bki[y]!;
    const g = this.scratch;
    powerExpIntegralTo(k, kr, ax + ay, T, g, 0);
    // both real: G2 = G1
    if (ax === 0 && ay === 0) return g[0]!;
    powerExpIntegralTo(k, kr, ax - ay, T, g, 2);
    const ix = this.bim[x]!;
    const iy = this.bim[y]!;
    // Re X·Re Y = ½Re[G1 + G2], Im X·Im Y = ½Re[G2 − G1], Re X·Im Y = ½Im[G1 − G2], Im X·Re Y = ½Im[G1 + G2]
    if (ix === 0 && iy === 0) return 0.5 * (g[0]! + g[2]!);
    if (ix === 1 && iy === 1) return 0.5 * (g[2]! - g[0]!);
    if (ix === 0) return 0.5 * (g[1]! - g[3]!);
    return 0.5 * (g[1]! + g[3]!);
  }
}

interface Coords {
  /** basis function indices and coefficients */
  idx: Int32Array;
  c: Float64Array;
  /** 1 + the largest index */
  top: number;
}

interface Table {
  /** row length of H, and how many functions are filled in */
  cap: number;
  n: number;
  H: Float64Array;
  /** whether every entry filled in is finite */
  finite: boolean;
}

/** Most basis functions tabulated (beyond: pair by pair), and most table entries held at once (128 MB). */
const MAX_BASIS = 4096;
const MAX_STORED = 16_000_000;

const shared = new WeakMap<object, ProductIntegrals>();

/**
 * The ProductIntegrals of one owner (a run's circuit): the part stress, the energy balance and the
 * cautions integrate products of the same closed forms, and share tables and results through it.
 */
export function productsFor(owner: object): ProductIntegrals {
  let p = shared.get(owner);
  if (!p) shared.set(owner, (p = new ProductIntegrals()));
  return p;
}
