import type { Readout, StateSpace } from '../model/state-space.js';
import type { PathResponse, RunResult, Term } from '../simulate/result.js';
import { type C, c, cadd, cdiv, cmul, csub } from './complex.js';

/**
 * Transfer functions H(s) = N(s)/D(s) of source-to-signal paths, rebuilt from the closed-form
 * impulse responses. Each term of h(t) is a residue/pole sum with a known Laplace transform:
 *
 *   c·e^(λt)                         → c/(s − λ)
 *   e^(σt)(a·cos ωt + b·sin ωt)      → (a(s − σ) + bω)/((s − σ)² + ω²)
 *   cₖ·tᵏ·e^(λt)                     → cₖ·k!/(s − λ)^(k+1)
 *   e^(σt)(Σ pₖtᵏ cos ωt + qₖtᵏ sin ωt) → Re-parts of k!/(s − σ ∓ jω)^(k+1)
 *   directArea·δ(t) + derivArea·δ'(t) → directArea + derivArea·s
 *
 * and the sum is multiplied out to one numerator and one monic denominator with real coefficients.
 */

/** A ratio of polynomials in s; coefficients in ascending powers (num[k] multiplies sᵏ), den monic. */
export interface Rational {
  num: number[];
  den: number[];
}

/** Real polynomial helpers (ascending coefficients). */
function pmul(a: readonly number[], b: readonly number[]): number[] {
  if (a.length === 0 || b.length === 0) return [];
  const out = new Array<number>(a.length + b.length - 1).fill(0);
  for (let i = 0; i < a.length; i++) for (let j = 0; j < b.length; j++) out[i + j]! += a[i]! * b[j]!;
  return out;
}

function padd(a: readonly number[], b: readonly number[], k = 1): number[] {
  const out = new Array<number>(Math.max(a.length, b.length)).fill(0);
  a.forEach((v, i) => (out[i]! += v));
  b.forEach((v, i) => (out[i]! += k * v));
  return out;
}

function ppow(a: readonly number[], n: number): number[] {
  let out = [1];
  for (let i = 0; i < n; i++) out = pmul(out, a);
  return out;
}

/** Complex polynomial product. */
function cpmul(a: readonly C[], b: readonly C[]): C[] {
  const out: C[] = Array.from({ length: a.length + b.length - 1 }, () => c(0));
  for (let i = 0; i < a.length; i++) for (let j = 0; j < b.length; j++) out[i + j] = cadd(out[i + j]!, cmul(a[i]!, b[j]!));
  return out;
}

function cppow(a: readonly C[], n: number): C[] {
  let out: C[] = [c(1)];
  for (let i = 0; i < n; i++) out = cpmul(out, a);
  return out;
}

/** One group of poles: N_g(s)/D_g(s), both real. */
interface Group {
  num: number[];
  den: number[];
}

function factorial(k: number): number {
  let f = 1;
  for (let i = 2; i <= k; i++) f *= i;
  return f;
}

/** c·tᵏ·e^(κt) pieces of Re[…] for one term. */
interface Mono {
  coef: C;
  k: number;
  kappa: C;
}

function monomials(t: Term): Mono[] {
  const out: Mono[] = [];
  const push = (coef: C, k: number, kappa: C) => {
    if (coef.re !== 0 || coef.im !== 0) out.push({ coef, k, kappa });
  };
  switch (t.kind) {
    case 'exp':
      push(c(t.coef), 0, c(t.lambda));
      break;
    case 'poly-exp':
      t.polyCoefs.forEach((a, k) => push(c(a), k, c(t.lambda)));
      break;
    case 'osc':
      push(c(t.cosCoef, -t.sinCoef), 0, c(t.sigma, Math.abs(t.omega)));
      if (t.omega < 0) out[out.length - 1]!.coef = c(t.cosCoef, t.sinCoef);
      break;
    case 'quasi': {
      const n = Math.max(t.cosPoly.length, t.sinPoly.length);
      const sgn = t.omega < 0 ? -1 : 1;
      for (let k = 0; k < n; k++) push(c(t.cosPoly[k] ?? 0, -sgn * (t.sinPoly[k] ?? 0)), k, c(t.sigma, Math.abs(t.omega)));
      break;
    }
  }
  return out;
}

/**
 * A poly-exp term from a cluster of nearly equal poles is a (possibly truncated) series
 * Σ mⱼ/(s − μ)^(j+1), mⱼ = cⱼ·j!. When the moments obey a short linear recurrence (the cluster's
 * own characteristic polynomial), the series is that exact low-order rational function.
 */
function clusterGroup(lambda: number, coefs: readonly number[]): Group | null {
  const m = coefs.map((v, j) => v * factorial(j));
  const rho = Math.abs(lambda) > 0 ? Math.abs(lambda) : Math.max(1, ...m.slice(1).map((v, j) => (Math.abs(v) / (Math.abs(m[0]!) || 1)) ** (1 / (j + 1))));
  const ms = m.map((v, j) => v / rho ** j);
  const scale = Math.max(...ms.map(Math.abs));
  if (!(scale > 0)) return null;
  // trailing moments at rounding level (a Jordan block that is nilpotent up to rounding) add
  // nothing at the cluster's own frequency scale: drop them
  while (ms.length > 1 && Math.abs(ms[ms.length - 1]!) <= 1e-13 * scale) ms.pop();
  const L = ms.length;
  if (L < coefs.length && L <= 2) {
    // an exact double (or simple) pole: Σ m_j/(s − λ)^(j+1) over (s − λ)^L
    const lin = [-lambda, 1];
    let num: number[] = [];
    for (let j = 0; j < L; j++) num = padd(num, ppow(lin, L - j - 1).map((v) => v * m[j]!));
    return { num, den: ppow(lin, L) };
  }
  for (let r = 1; 2 * r + 1 <= L && r <= 6; r++) {
    // Σ_{i<r} a_i·m̃_{j+i} = m̃_{j+r}, j = 0..r−1
    const H = Array.from({ length: r }, (_, j) => Array.from({ length: r }, (_, i) => ms[j + i]!));
    const rhs = Array.from({ length: r }, (_, j) => ms[j + r]!);
    const a = solveReal(H, rhs);
    if (!a) continue;
    let ok = true;
    for (let j = 0; j + r < L && ok; j++) {
      let pred = 0;
      for (let i = 0; i < r; i++) pred += a[i]! * ms[j + i]!;
      if (Math.abs(pred - ms[j + r]!) > 1e-11 * scale) ok = false;
    }
    if (!ok) continue;
    // Q(x̃) = x̃^r − Σ a_i x̃^i ;  P(x̃) = polynomial part of Q(x̃)·Σ m̃_j x̃^−(j+1)
    const Q = [...a.map((v) => -v), 1];
    const P = new Array<number>(r).fill(0);
    for (let d = 0; d < r; d++) {
      // coefficient of x̃^d in Q·Σ m̃_j x̃^(−j−1): Σ_{i} Q_i·m̃_{i−d−1}
      let s = 0;
      for (let i = d + 1; i <= r; i++) s += Q[i]! * ms[i - d - 1]!;
      P[d] = s;
    }
    // back to s: x̃ = (s − λ)/ρ ; N/D = P(x̃)/Q(x̃) with both scaled so that D is monic in s
    const xs = [-lambda / rho, 1 / rho];
    let num: number[] = [];
    let den: number[] = [];
    for (let i = 0; i <= r; i++) den = padd(den, ppow(xs, i).map((v) => v * Q[i]!));
    for (let i = 0; i < r; i++) num = padd(num, ppow(xs, i).map((v) => v * P[i]!));
    // P/Q in x̃ equals Σ m̃_j x̃^(−j−1) = Σ m_j ρ^(−j) ρ^(j+1) (s − λ)^(−j−1) = ρ·H: divide by ρ
    const lead = den[den.length - 1]!;
    return { num: num.map((v) => v / lead / rho), den: den.map((v) => v / lead) };
  }
  return null;
}

function solveReal(A: number[][], b: number[]): number[] | null {
  const n = b.length;
  const M = A.map((row, i) => [...row, b[i]!]);
  for (let k = 0; k < n; k++) {
    let p = k;
    for (let i = k + 1; i < n; i++) if (Math.abs(M[i]![k]!) > Math.abs(M[p]![k]!)) p = i;
    if (M[p]![k] === 0) return null;
    [M[k], M[p]] = [M[p]!, M[k]!];
    for (let i = k + 1; i < n; i++) {
      const f = M[i]![k]! / M[k]![k]!;
      for (let j = k; j <= n; j++) M[i]![j]! -= f * M[k]![j]!;
    }
  }
  const x = new Array<number>(n).fill(0);
  for (let i = n - 1; i >= 0; i--) {
    let s = M[i]![n]!;
    for (let j = i + 1; j < n; j++) s -= M[i]![j]! * x[j]!;
    x[i] = s / M[i]![i]!;
  }
  return x.every(Number.isFinite) ? x : null;
}

/** Poles closer than this (relative) are the same pole. */
const SAME_POLE = 1e-12;

/** H(s) of one path from its impulse response (terms for t > 0 plus the impulse and its derivative at 0). */
export function transferOfImpulse(impulse: PathResponse['impulse']): Rational {
  const groups: Group[] = [];
  const simple: { kappa: C; monos: Mono[] }[] = [];
  for (const t of impulse.terms) {
    if (t.kind === 'poly-exp' && t.polyCoefs.length > 2) {
      const g = clusterGroup(t.lambda, t.polyCoefs);
      if (g) {
        groups.push(g);
        continue;
      }
    }
    for (const m of monomials(t)) {
      const hit = simple.find((g) => Math.hypot(g.kappa.re - m.kappa.re, g.kappa.im - m.kappa.im) <= SAME_POLE * Math.max(Math.hypot(m.kappa.re, m.kappa.im), 1e-300));
      if (hit) hit.monos.push(m);
      else simple.push({ kappa: m.kappa, monos: [m] });
    }
  }
  for (const g of simple) {
    const mult = Math.max(...g.monos.map((m) => m.k)) + 1;
    const kap = g.kappa;
    if (kap.im === 0) {
      const lin = [-kap.re, 1];
      let num: number[] = [];
      for (const m of g.monos) num = padd(num, ppow(lin, mult - m.k - 1).map((v) => v * m.coef.re * factorial(m.k)));
      groups.push({ num, den: ppow(lin, mult) });
    } else {
      // ½[c·k!/(s − κ)^(k+1) + c̄·k!/(s − κ̄)^(k+1)] over (s − κ)^m (s − κ̄)^m: numerator Re[c·k!·(s − κ)^(m−k−1)(s − κ̄)^m]
      const lin: C[] = [csub(c(0), kap), c(1)];
      const linc: C[] = [c(-kap.re, kap.im), c(1)];
      let num: number[] = [];
      for (const m of g.monos) {
        const p = cpmul(cppow(lin, mult - m.k - 1), cppow(linc, mult));
        const f = factorial(m.k);
        num = padd(num, p.map((z) => cmul(z, m.coef).re * f));
      }
      const quad = [kap.re * kap.re + kap.im * kap.im, -2 * kap.re, 1];
      groups.push({ num, den: ppow(quad, mult) });
    }
  }
  // Σ_i num_i·Π_(j≠i) den_j accumulated group by group (acc·den_k + num_k·Π_(j<k) den_j): one pass,
  // O(order²), instead of a product over the other groups for each group (O(order³))
  let den = [1];
  let acc: number[] = [];
  for (const g of groups) {
    acc = padd(pmul(acc, g.den), pmul(g.num, den));
    den = pmul(den, g.den);
  }
  let num = padd(pmul([impulse.directArea, impulse.derivArea], den), acc);
  while (num.length > 1 && num[num.length - 1] === 0) num.pop();
  return { num, den };
}

function cpoly(p: readonly number[], s: C): C {
  let out = c(0);
  for (let k = p.length - 1; k >= 0; k--) out = cadd(cmul(out, s), c(p[k]!));
  return out;
}

/** N(s)/D(s) at a complex s. */
export function evaluateRational(h: Rational, s: C): C {
  return cdiv(cpoly(h.num, s), cpoly(h.den, s));
}

/**
 * The same transfer function straight from the state-space model: C·(sI − A)⁻¹·B[:, input] + D + D1·s.
 * An independent evaluation (complex Gaussian elimination), for checking.
 */
export function stateSpaceTransferAt(ss: StateSpace, r: Readout, input: number, s: C): C {
  const n = ss.n;
  const M: C[][] = ss.A.map((row, i) => [...row.map((v, j) => c((i === j ? s.re : 0) - v, i === j ? s.im : 0)), c(ss.B[i]![input]!)]);
  for (let k = 0; k < n; k++) {
    let p = k;
    for (let i = k + 1; i < n; i++) if (Math.hypot(M[i]![k]!.re, M[i]![k]!.im) > Math.hypot(M[p]![k]!.re, M[p]![k]!.im)) p = i;
    [M[k], M[p]] = [M[p]!, M[k]!];
    for (let i = k + 1; i < n; i++) {
      const f = cdiv(M[i]![k]!, M[k]![k]!);
      for (let j = k; j <= n; j++) M[i]![j] = csub(M[i]![j]!, cmul(f, M[k]![j]!));
    }
  }
  const x: C[] = new Array(n);
  for (let i = n - 1; i >= 0; i--) {
    let acc = M[i]![n]!;
    for (let j = i + 1; j < n; j++) acc = csub(acc, cmul(M[i]![j]!, x[j]!));
    x[i] = cdiv(acc, M[i]![i]!);
  }
  let y = c(r.D[input] ?? 0);
  y = cadd(y, cmul(c(r.D1[input] ?? 0), s));
  for (let i = 0; i < n; i++) y = cadd(y, cmul(c(r.C[i]!), x[i]!));
  return y;
}

/** A watched signal's transfer function from one source. */
export interface PathTransfer {
  /** the watch label, e.g. "v(out)" */
  watch: string;
  unit: 'V' | 'A';
  source: string;
  sourceUnit: 'V' | 'A';
  h: Rational;
  /** H(0) as the run computed it (NaN/Infinity when the path integrates) */
  dcGain: number;
  /** the switch configuration the path belongs to (its start time); undefined without switches */
  from?: number;
}

/**
 * Every source → watch transfer function of a run, for the configuration in force at the end of the
 * span (the top-level paths), and, with switches, for every other configuration too.
 */
export function pathTransfers(result: RunResult, opts: { allConfigurations?: boolean } = {}): PathTransfer[] {
  const unitOf = (name: string): 'V' | 'A' => (result.circuit.parts.find((p) => p.name === name)?.kind === 'current-source' ? 'A' : 'V');
  const out: PathTransfer[] = [];
  const configs = result.configurations ?? [];
  const withSwitches = configs.length > 1;
  const sets: { from?: number; paths: PathResponse[][] }[] = opts.allConfigurations && withSwitches ? configs.map((k) => ({ from: k.from, paths: k.paths })) : [{ from: withSwitches ? configs[configs.length - 1]!.from : undefined, paths: result.traces.map((t) => t.paths) }];
  for (const set of sets) {
    result.traces.forEach((trace, i) => {
      for (const p of set.paths[i] ?? []) {
        out.push({ watch: trace.label, unit: trace.unit, source: p.source, sourceUnit: unitOf(p.source), h: transferOfImpulse(p.impulse), dcGain: p.dcGain, ...(set.from !== undefined ? { from: set.from } : {}) });
      }
    });
  }
  return out;
}
