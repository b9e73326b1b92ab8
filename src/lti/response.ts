import type { Term } from '../simulate/result.js';
import type { Vec } from '../linalg/dense.js';
import { solveSquare } from '../linalg/factor.js';
import { blockExp, blockTerms } from './block.js';
import { type C, c, cabs, cadd, cdiv, cmul, cscale, csub } from './complex.js';
import type { Block } from './modal.js';
import { project, projectC, scalarModes } from './scalar-modes.js';

/**
 * Exact response of one modal block on an interval where the forcing is a sum of
 * g·τ^p·e^(sτ) terms (g a complex vector over the block, the real part taken at the end):
 *
 *   ξ(τ) = Re Σ_q Σ_j vecs[q][j]·τʲ·e^(κ_q τ)   (+ e^(Tτ)·clusterFree for cluster blocks)
 *
 * For each scalar mode λ and forcing (p, s): if s is well away from λ the particular solution is
 * e^(sτ)·Σ_j q_j τʲ with q_p = g/(s − λ), q_j = −(j+1)·q_(j+1)/(s − λ); close to resonance
 * (|s − λ|·span < 0.01) it is g·e^(λτ)·Σ_k (s − λ)^k τ^(p+k+1)/(k!(p+k+1)), which is exact and
 * continuous through s = λ (the secular t·e^(λt) growth of a circuit driven at its own mode).
 */
export interface Forcing {
  power: number;
  s: C;
  /** complex forcing vector over the block's coordinates */
  g: C[];
}

export interface VQuasi {
  kappa: C;
  vecs: C[][];
  /** true for the free (homogeneous) part of a scalar mode */
  free?: boolean;
}

export interface BlockSolution {
  quasi: VQuasi[];
  clusterFree: Vec | null;
}

/** Below this |s − λ|·horizon the particular solution is written as the series (see above). */
export const RESONANCE = 1e-2;

/**
 * The particular part of a block's response to its forcing, independent of the block's state, so
 * that it can be computed once per interval shape and reused (a pulse train repeats the same few).
 */
export interface Particular {
  /** scalar modes: per mode, the particular quasi-polynomials and their value at τ = 0 */
  modes: { quasi: VQuasi[]; at0: C }[] | null;
  /** cluster blocks: particular quasi-polynomials and their (real) value at τ = 0 */
  cluster: { quasi: VQuasi[]; at0: Vec } | null;
}

export function particularOf(b: Block, forcings: Forcing[], horizon: number, seriesBelow = RESONANCE): Particular {
  const modes = scalarModes(b);
  if (modes) {
    return {
      cluster: null,
      modes: modes.map((m) => {
        const quasi: VQuasi[] = [];
        let at0 = c(0);
        for (const f of forcings) {
          const G = projectC(m.left, f.g);
          if (G.re === 0 && G.im === 0) continue;
          const part = scalarParticular(m.lambda, f.power, f.s, G, horizon, seriesBelow);
          at0 = cadd(at0, part.coefs[0] ?? c(0));
          quasi.push({ kappa: part.kappa, vecs: part.coefs.map((q) => m.right.map((r) => cmul(r, q))) });
        }
        return { quasi, at0 };
      }),
    };
  }
  const k = b.T.length;
  const quasi: VQuasi[] = [];
  const at0 = new Array<number>(k).fill(0);
  for (const f of forcings) {
    const vecs = clusterParticular(b, f, horizon);
    quasi.push({ kappa: f.s, vecs });
    vecs[0]?.forEach((v, i) => (at0[i] += v.re));
  }
  return { modes: null, cluster: { quasi, at0 } };
}

/** The free part that makes particular + free start from ξ0, as a full block solution. */
export function withFree(b: Block, part: Particular, xi0: Vec): BlockSolution {
  if (part.modes) {
    const modes = scalarModes(b)!;
    const quasi: VQuasi[] = [];
    part.modes.forEach((pm, i) => {
      const m = modes[i];
      quasi.push(...pm.quasi);
      const eta = csub(project(m.left, xi0), pm.at0);
      quasi.push({ kappa: m.lambda, vecs: [m.right.map((r) => cmul(r, eta))], free: true });
    });
    return { quasi, clusterFree: null };
  }
  const cl = part.cluster!;
  return { quasi: cl.quasi, clusterFree: xi0.map((v, i) => v - cl.at0[i]) };
}

export function solveBlockForced(b: Block, xi0: Vec, forcings: Forcing[], horizon: number, seriesBelow = RESONANCE): BlockSolution {
  return withFree(b, particularOf(b, forcings, horizon, seriesBelow), xi0);
}

function scalarParticular(lambda: C, p: number, s: C, G: C, span: number, seriesBelow: number): { kappa: C; coefs: C[] } {
  const d = csub(s, lambda);
  // seriesBelow < 0 means: as accurate as needed and no more. The closed particular form loses
  // about ε/(|s − λ|·τ)^(p+1) to cancellation against the free part; keep that below 1e-12 and
  // use the (longer to read) series only where it would not be.
  const limit = seriesBelow < 0 ? Math.pow(2.3e-4, 1 / (p + 1)) : seriesBelow;
  if (cabs(d) * span < limit) {
    // ∫0^τ e^(λ(τ−u))·G·u^p·e^(su) du = G·e^(λτ)·Σ_k d^k τ^(p+k+1) / (k!·(p+k+1))
    const coefs: C[] = new Array(p + 1).fill(c(0));
    let dk = c(1);
    let fact = 1;
    for (let kk = 0; kk < 40; kk++) {
      coefs.push(cscale(cmul(G, dk), 1 / (fact * (p + kk + 1))));
      const size = (cabs(dk) * span ** (kk + 1)) / fact;
      if (kk > 2 && size < 1e-20 * span) break;
      dk = cmul(dk, d);
      fact *= kk + 1;
    }
    return { kappa: lambda, coefs };
  }
  const coefs: C[] = new Array(p + 1);
  coefs[p] = cdiv(G, d);
  for (let j = p - 1; j >= 0; j--) coefs[j] = cscale(cdiv(coefs[j + 1], d), -(j + 1));
  return { kappa: s, coefs };
}

/**
 * A source at (or near) the rate of a cluster's poles, e.g. a constant current charging two
 * capacitors that nothing discharges: with N = T − sI (small or nilpotent there),
 *   ∫0^τ e^(T(τ−u))·g·u^p·e^(su) du = e^(sτ)·Σ_j Nʲ·g·τ^(j+p+1)·p!/(j+p+1)!
 * (the beta integral ∫0^τ (τ−u)ʲ·u^p du = τ^(j+p+1)·j!·p!/(j+p+1)!), summed until negligible.
 */
function clusterResonant(b: Block, f: Forcing, horizon: number): C[][] {
  const k = b.T.length;
  const Nre = b.T.map((row, i) => row.map((v, j) => v - (i === j ? f.s.re : 0)));
  const Nim = f.s.im;
  // N·v for complex v, N = Nre − j·Nim·I
  const apply = (v: C[]): C[] =>
    Nre.map((row, i) => {
      let re = 0;
      let im = 0;
      for (let j = 0; j < k; j++) {
        re += row[j] * v[j].re;
        im += row[j] * v[j].im;
      }
      return c(re + Nim * v[i].im, im - Nim * v[i].re);
    });
  const vecs: C[][] = Array.from({ length: f.power + 1 }, () => b.T.map(() => c(0)));
  let v = f.g.slice();
  let denom = 1; // (j+p+1)!/p!, built up as j grows
  const size0 = Math.max(...v.map((z) => Math.hypot(z.re, z.im)), 1e-300);
  for (let j = 0; j < 80; j++) {
    denom = j === 0 ? factorialRatio(f.power) : denom * (j + f.power + 1);
    vecs.push(v.map((z) => cscale(z, 1 / denom)));
    v = apply(v);
    const size = Math.max(...v.map((z) => Math.hypot(z.re, z.im)));
    if (size === 0 || (j >= k && (size * horizon ** (j + 1)) / (denom * (j + f.power + 2)) < 1e-18 * size0)) break;
  }
  return vecs;
}

/** (p+1)!/p! = p + 1: the first denominator of the resonant series. */
function factorialRatio(p: number): number {
  return p + 1;
}

/** (sI − T)·q_p = g;  (sI − T)·q_j = −(j+1)·q_(j+1). */
function clusterParticular(b: Block, f: Forcing, horizon: number): C[][] {
  const k = b.T.length;
  const near = Math.min(...b.eig.map((e) => Math.hypot(e.re - f.s.re, e.im - f.s.im)));
  if (near * horizon < 1) return clusterResonant(b, f, horizon);
  // real 2k×2k form of (sI − T) acting on [Re q; Im q]
  const M: number[][] = [];
  for (let i = 0; i < k; i++) {
    M.push([...b.T[i].map((v, j) => (i === j ? f.s.re : 0) - v), ...b.T[i].map((_, j) => (i === j ? -f.s.im : 0))]);
  }
  for (let i = 0; i < k; i++) {
    M.push([...b.T[i].map((_, j) => (i === j ? f.s.im : 0)), ...b.T[i].map((v, j) => (i === j ? f.s.re : 0) - v)]);
  }
  const solve = (rhs: C[]): C[] => {
    const x = solveSquare(M, [...rhs.map((z) => [z.re]), ...rhs.map((z) => [z.im])]).map((r) => r[0]);
    return Array.from({ length: k }, (_, i) => c(x[i], x[k + i]));
  };
  const vecs: C[][] = new Array(f.power + 1);
  vecs[f.power] = solve(f.g);
  for (let j = f.power - 1; j >= 0; j--) vecs[j] = solve(vecs[j + 1].map((z) => cscale(z, -(j + 1))));
  return vecs;
}

/** Block state at τ. */
export function blockStateAt(b: Block, sol: BlockSolution, tau: number): Vec {
  const k = b.T.length;
  const out = sol.clusterFree ? blockExp(b, tau, sol.clusterFree) : new Array<number>(k).fill(0);
  for (const q of sol.quasi) {
    const e = cexpScaled(q.kappa, tau);
    let pw = 1;
    for (const v of q.vecs) {
      const f = cscale(e, pw);
      for (let i = 0; i < k; i++) out[i] += v[i].re * f.re - v[i].im * f.im;
      pw *= tau;
    }
  }
  return out;
}

function cexpScaled(k: C, tau: number): C {
  const m = Math.exp(k.re * tau);
  return k.im === 0 ? c(m) : c(m * Math.cos(k.im * tau), m * Math.sin(k.im * tau));
}

/** Terms of γ·ξ(τ) for an output row γ restricted to the block. */
export function blockSolutionTerms(b: Block, sol: BlockSolution, gamma: Vec, span: number): Term[] {
  const terms: Term[] = [];
  for (const q of sol.quasi) {
    const coefs = q.vecs.map((v) => v.reduce((acc: C, z, i) => cadd(acc, cscale(z, gamma[i])), c(0)));
    terms.push(quasiTerm(q.kappa, coefs));
  }
  if (sol.clusterFree) terms.push(...blockTerms(b, gamma, sol.clusterFree, span));
  return terms;
}

/** Re[(Σ coefs_j τʲ)·e^(κτ)] as a term with ω ≥ 0. */
export function quasiTerm(kappa: C, coefs: C[]): Term {
  const flip = kappa.im < 0 ? -1 : 1;
  return {
    kind: 'quasi',
    sigma: kappa.re,
    omega: Math.abs(kappa.im),
    cosPoly: coefs.map((z) => z.re),
    sinPoly: coefs.map((z) => -z.im * flip),
  };
}
