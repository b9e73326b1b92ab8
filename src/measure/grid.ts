import type { Piece, Term } from '../simulate/result.js';
import { derivativeTerm } from './evaluate.js';
import { searchGrid } from './peak.js';
import { findRoot } from './root.js';

/**
 * Fast evaluation of closed forms on a search grid, for the extremum searches of the part stress
 * and the cautions.
 *
 * Every term of a piece is a linear combination of a few basis functions of τ = t − t0:
 * τᵏ·e^(λτ), τᵏ·e^(στ)·cos ωτ and τᵏ·e^(στ)·sin ωτ. All parts of a run share the natural modes,
 * so they share these basis functions: a `GridBasis` computes each basis function once on the
 * grid (one exponential per grid time and mode, for the whole run), and a signal on the grid is
 * then a sum of coefficient × precomputed array (a multiply-add per term and time). The grid only
 * brackets the roots of the derivative; every candidate is then refined by Brent's method on the
 * exact closed form, and every reported value is the exact closed form at that time. So the search
 * is the full root search of peak.ts, only without evaluating exponentials over and over.
 */
export class GridBasis {
  /** grid times (absolute), increasing, first = lo, last = hi */
  readonly ts: Float64Array;
  private readonly tau: Float64Array;
  private readonly cache = new Map<string, Float64Array>();

  constructor(ts: Float64Array, t0: number) {
    this.ts = ts;
    this.tau = ts.map((t) => t - t0);
  }

  get length(): number {
    return this.ts.length;
  }

  /** τᵏ·e^(aτ)·(cos ωτ | sin ωτ | 1), cached. */
  private basis(kind: 'e' | 'c' | 's', a: number, w: number, k: number): Float64Array {
    const key = `${kind}${a},${w},${k}`;
    const hit = this.cache.get(key);
    if (hit) return hit;
    const n = this.tau.length;
    const out = new Float64Array(n);
    if (k > 0) {
      const b = this.basis(kind, a, w, 0);
      const tau = this.tau;
      for (let j = 0; j < n; j++) out[j] = b[j]! * tau[j]! ** k;
    } else {
      const tau = this.tau;
      for (let j = 0; j < n; j++) {
        const x = tau[j]!;
        const env = a === 0 ? 1 : Math.exp(a * x);
        out[j] = kind === 'e' ? env : kind === 'c' ? env * Math.cos(w * x) : env * Math.sin(w * x);
      }
    }
    this.cache.set(key, out);
    return out;
  }

  private add(out: Float64Array, c: number, kind: 'e' | 'c' | 's', a: number, w: number, k: number): void {
    if (c === 0) return;
    const b = this.basis(kind, a, w, k);
    for (let j = 0; j < out.length; j++) out[j] += c * b[j]!;
  }

  /** Σ terms(τ) at every grid time. */
  sum(terms: readonly Term[]): Float64Array {
    const out = new Float64Array(this.tau.length);
    for (const t of terms) {
      switch (t.kind) {
        case 'exp':
          this.add(out, t.coef, 'e', t.lambda, 0, 0);
          break;
        case 'poly-exp':
          t.polyCoefs.forEach((c, k) => this.add(out, c, 'e', t.lambda, 0, k));
          break;
        case 'osc':
          this.add(out, t.cosCoef, 'c', t.sigma, t.omega, 0);
          if (t.omega !== 0) this.add(out, t.sinCoef, 's', t.sigma, t.omega, 0);
          break;
        case 'quasi':
          t.cosPoly.forEach((c, k) => this.add(out, c, 'c', t.sigma, t.omega, k));
          if (t.omega !== 0) t.sinPoly.forEach((c, k) => this.add(out, c, 's', t.sigma, t.omega, k));
          break;
      }
    }
    return out;
  }
}

/**
 * The search grids of a run, shared by every signal evaluated over the same stretch of time:
 * keyed by the piece start, the stretch and the time scales the grid must resolve.
 */
export class GridSet {
  private readonly grids = new Map<string, GridBasis>();
  constructor(private readonly extra?: ArrayLike<number>) {}

  get(t0: number, lo: number, hi: number, omega: number, rate: number): GridBasis {
    const key = `${t0}|${lo}|${hi}|${omega}|${rate}`;
    const hit = this.grids.get(key);
    if (hit) return hit;
    const ts = hi > lo ? searchGrid({ lo, hi, omega, rate, extra: this.extra }) : [lo];
    // drop repeated times (sample times that coincide with grid points)
    const uniq: number[] = [];
    for (const t of ts) if (uniq.length === 0 || t !== uniq[uniq.length - 1]) uniq.push(t);
    const g = new GridBasis(Float64Array.from(uniq), t0);
    this.grids.set(key, g);
    return g;
  }
}

const derivatives = new WeakMap<Piece, Term[]>();

/** The derivative terms of a piece (cached per piece). */
export function derivativeTerms(piece: Piece): Term[] {
  let d = derivatives.get(piece);
  if (!d) {
    d = piece.terms.map(derivativeTerm);
    derivatives.set(piece, d);
  }
  return d;
}

export interface Located {
  value: number;
  time: number;
}

/** Values this close (relative) are a tie: the earlier time stays. */
const TIE = 1e-12;

/**
 * Largest |f| on [ts[0], ts[last]]: the two ends and every root of f' bracketed by a sign change
 * of `dfs` (f' on the grid), refined by Brent's method on the exact `df`, evaluated with the exact `f`.
 */
export function peakOnGrid(ts: Float64Array, dfs: Float64Array, f: (t: number) => number, df: (t: number) => number): Located {
  const n = ts.length;
  const lo = ts[0]!;
  const best: Located = { value: Math.abs(f(lo)), time: lo };
  const consider = (t: number) => {
    const y = Math.abs(f(t));
    if (y > best.value * (1 + TIE) || (Number.isNaN(best.value) && !Number.isNaN(y))) {
      best.value = y;
      best.time = t;
    }
  };
  if (n < 2) return best;
  let prevD = dfs[0]!;
  for (let k = 1; k < n; k++) {
    const d = dfs[k]!;
    if (prevD !== 0 && d !== 0 && (prevD < 0) !== (d < 0)) {
      const a = ts[k - 1]!;
      const b = ts[k]!;
      // a root on a grid point (to rounding) comes back as that end: it is a candidate all the same
      consider(Math.min(Math.max(findRoot(df, a, b, 1e-14, prevD, d), a), b));
    } else if (d === 0 && k < n - 1) {
      consider(ts[k]!);
    }
    prevD = d;
  }
  consider(ts[n - 1]!);
  return best;
}

/**
 * Largest and smallest value of f on [ts[0], ts[last]]: the ends and every root of f' bracketed by
 * a sign change of `dfs` (f' on the grid) and refined by Brent's method on the exact `df`, each
 * evaluated with the exact `f`. The earliest time wins a tie.
 */
export function extremaOnGrid(ts: Float64Array, dfs: Float64Array, f: (t: number) => number, df: (t: number) => number): { max: Located; min: Located } {
  const n = ts.length;
  const max: Located = { value: -Infinity, time: ts[0]! };
  const min: Located = { value: Infinity, time: ts[0]! };
  const consider = (t: number) => {
    const y = f(t);
    if (y > max.value) {
      max.value = y;
      max.time = t;
    }
    if (y < min.value) {
      min.value = y;
      min.time = t;
    }
  };
  consider(ts[0]!);
  for (let k = 1; k < n; k++) {
    const a = ts[k - 1]!;
    const b = ts[k]!;
    const da = dfs[k - 1]!;
    const db = dfs[k]!;
    if (da !== 0 && db !== 0 && (da < 0) !== (db < 0)) {
      consider(Math.min(Math.max(findRoot(df, a, b, 1e-14, da, db), a), b));
    } else if (db === 0 || k === n - 1) {
      consider(b);
    }
  }
  return { max, min };
}
