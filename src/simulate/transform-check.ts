import type { Readout, StateSpace } from '../model/state-space.js';
import type { Vec } from '../linalg/dense.js';
import { balanceScale } from '../linalg/balance.js';
import { bandFactor, bandMatrix, bandSolve } from '../linalg/band.js';
import { stateOrder } from './band-order.js';
import { powerExpIntegral } from '../lti/integrate.js';
import type { Component } from '../waveform/component.js';
import type { InputSchedule } from '../waveform/schedule.js';
import type { Piece, Term } from './result.js';

/**
 * Independent check of one epoch [a, b) in the Laplace domain, for circuits too large for the
 * matrix-exponential check. For a real s > 0 the ODE ξ' = A·ξ + B·u gives, exactly,
 *
 *   (sI − A)·X̂ = ξ(a⁺) − e^(−sL)·ξ(b⁻) + B·(Û + Σ_d e^(−s(t_d − a))·area_d),   L = b − a,
 *
 * with X̂ = ∫0^L e^(−sτ)·ξ(a + τ) dτ, Û the same transform of the inputs (their regular part, in
 * closed form per interval) and the sum over the impulses inside the epoch. One LU factorization
 * of sI − A per s then gives the transform of every read-out, Ŷ = C·X̂ + D·Û + D1·Û′, without the
 * eigen-decomposition. The closed forms' own transforms are exact integrals of their terms. Both
 * sides weigh the epoch with e^(−sτ); divided by the weights' mass (1 − e^(−sL))/s the difference
 * is a weighted average of the pointwise error, so it can only understate the largest error:
 * several s from 1/L up to the fastest rate of the circuit spread the weight over the epoch.
 * Passive circuits have no pole in Re s > 0, so sI − A is never singular there.
 */
export interface EpochData {
  ss: StateSpace;
  readouts: Readout[];
  schedule: InputSchedule;
  a: number;
  b: number;
  /** ξ just after a (impulses at a included) and just before b */
  xiStart: Vec;
  xiEnd: Vec;
  /** per read-out, the closed forms covering [a, b) */
  pieces: Piece[][];
}

export interface TransformCheckResult {
  /** the s values used, 1/s */
  s: number[];
  /** per read-out, the largest weighted-average absolute difference over the s values */
  absErr: number[];
}

/** s from 0.5/L (the whole epoch) up to the circuit's fastest rate (its first instants), geometrically. */
export function transformWeights(ss: StateSpace, L: number, count = 5): number[] {
  const { rate } = balanced(ss);
  const lo = 0.5 / L;
  const hi = Math.max(lo, Math.min(rate, 1e6 / L));
  const out: number[] = [];
  for (let k = 0; k < count; k++) out.push(lo * (hi / lo) ** (count > 1 ? k / (count - 1) : 0));
  return [...new Set(out)];
}

export function transformCheck(e: EpochData, weights: number[]): TransformCheckResult {
  const { ss, readouts, schedule, a, b } = e;
  const n = ss.n;
  const m = ss.m;
  const L = b - a;
  const absErr = readouts.map(() => 0);
  const { d, entries, kl, ku, pos } = balanced(ss);
  const inner = schedule.diracs.filter((x) => x.t > a && x.t < b);
  // one band storage for every s (refilled: the factorization overwrites it)
  const M = n ? bandMatrix(n, kl, ku) : null;
  for (const s of weights) {
    const U = transformInputs(schedule.intervals, m, a, s, 'components');
    const dU = transformInputs(schedule.intervals, m, a, s, 'slopes');
    const kick = U.slice();
    for (const x of inner) {
      const w = Math.exp(-s * (x.t - a));
      for (let j = 0; j < m; j++) kick[j] += w * x.area[j];
    }
    const tail = Math.exp(-s * L);
    let X: number[] = [];
    if (n) {
      // (sI − D⁻¹AD)·(D⁻¹X̂) = D⁻¹·rhs, by an LU within the band (a ladder is tridiagonal), the
      // states renumbered (state i is row pos[i]) to narrow the band of a mesh
      const rhs = new Float64Array(n);
      for (let i = 0; i < n; i++) {
        let r = e.xiStart[i] - tail * e.xiEnd[i];
        const Bi = ss.B[i];
        for (let j = 0; j < m; j++) r += Bi[j] * kick[j];
        rhs[pos[i]] = r / d[i];
      }
      // sI − D⁻¹AD in band storage (O(n) for a ladder), from the nonzeros gathered once
      const { a, off } = M!;
      a.fill(0);
      for (let q = 0; q < entries.i.length; q++) a[off[entries.i[q]] + entries.j[q]] = -entries.v[q];
      for (let i = 0; i < n; i++) a[off[i] + i] += s;
      const f = bandFactor(M!);
      if (f.singular) throw new Error(`transform check: sI − A is singular at s = ${s}`);
      const y = bandSolve(f, rhs);
      X = new Array<number>(n);
      for (let i = 0; i < n; i++) X[i] = y[pos[i]] * d[i];
    }
    const mass = -Math.expm1(-s * L) / s;
    readouts.forEach((r, w) => {
      let ref = 0;
      for (let i = 0; i < n; i++) ref += r.C[i] * X[i];
      for (let j = 0; j < m; j++) ref += r.D[j] * U[j] + r.D1[j] * dU[j];
      let ours = 0;
      for (const p of e.pieces[w]) {
        if (p.t1 <= a || p.t0 >= b) continue;
        const shift = Math.exp(-s * (p.t0 - a));
        if (shift === 0) continue;
        ours += shift * termsTransform(p.terms, s, p.t1 - p.t0);
      }
      const err = Math.abs(ours - ref) / mass;
      absErr[w] = Math.max(absErr[w], Number.isFinite(err) ? err : Infinity);
    });
  }
  return { s: weights, absErr };
}

interface Balanced {
  d: number[];
  rate: number;
  /** the nonzeros of D⁻¹·A·D, row by row, at their renumbered rows and columns */
  entries: { i: Int32Array; j: Int32Array; v: Float64Array };
  /** state i's row and column in the renumbered matrix (band-order.ts) */
  pos: Int32Array;
  /** its lower and upper bandwidths, renumbered */
  kl: number;
  ku: number;
}

// balancing keeps sI − A well scaled when volts sit next to nanohenry currents; once per model
const balancedOf = new WeakMap<StateSpace, Balanced>();
function balanced(ss: StateSpace): Balanced {
  let b = balancedOf.get(ss);
  if (!b) {
    const d = ss.n ? balanceScale(ss.A) : [];
    // ‖A‖∞ of the balanced matrix bounds every |λ|; its entries as balance() forms them
    let rate = 0;
    const I: number[] = [];
    const J: number[] = [];
    const V: number[] = [];
    ss.A.forEach((row, i) => {
      let sum = 0;
      for (let j = 0; j < row.length; j++) {
        const a = row[j];
        const v = a === 0 || i === j ? a : (a * d[j]) / d[i];
        sum += Math.abs(v);
        if (v === 0) continue;
        I.push(i);
        J.push(j);
        V.push(v);
      }
      rate = Math.max(rate, sum);
    });
    const { pos } = stateOrder(ss);
    const ri = Int32Array.from(I, (i) => pos[i]);
    const rj = Int32Array.from(J, (j) => pos[j]);
    let kl = 0;
    let ku = 0;
    for (let q = 0; q < ri.length; q++) {
      kl = Math.max(kl, ri[q] - rj[q]);
      ku = Math.max(ku, rj[q] - ri[q]);
    }
    b = { d, rate, entries: { i: ri, j: rj, v: Float64Array.from(V) }, pos, kl, ku };
    balancedOf.set(ss, b);
  }
  return b;
}

/** Per input, Σ over the intervals of e^(−s(t0 − a))·∫0^len e^(−sτ)·u(τ) dτ (or of u′). */
function transformInputs(intervals: InputSchedule['intervals'], m: number, a: number, s: number, which: 'components' | 'slopes'): number[] {
  const out = new Array<number>(m).fill(0);
  for (const iv of intervals) {
    const shift = Math.exp(-s * (iv.t0 - a));
    if (shift === 0) continue;
    const len = iv.t1 - iv.t0;
    for (const k of iv[which]) out[k.input] += shift * componentTransform(k, s, len);
  }
  return out;
}

/** ∫0^T e^(−sτ)·Re[(re + j·im)·τ^p·e^((σ + jω)τ)] dτ */
function componentTransform(k: Component, s: number, T: number): number {
  const I = powerExpIntegral(k.power, { re: k.sigma - s, im: k.omega }, T);
  return k.re * I.re - k.im * I.im;
}

/** ∫0^T e^(−sτ)·(Σ terms)(τ) dτ, term by term in closed form. */
export function termsTransform(terms: Term[], s: number, T: number): number {
  let sum = 0;
  for (const t of terms) {
    switch (t.kind) {
      case 'exp':
        if (t.coef !== 0) sum += t.coef * powerExpIntegral(0, { re: t.lambda - s, im: 0 }, T).re;
        break;
      case 'poly-exp':
        t.polyCoefs.forEach((c, k) => {
          if (c !== 0) sum += c * powerExpIntegral(k, { re: t.lambda - s, im: 0 }, T).re;
        });
        break;
      case 'osc': {
        // e^(στ)(a cos ωτ + b sin ωτ) = Re[(a − jb)·e^((σ + jω)τ)]
        const I = powerExpIntegral(0, { re: t.sigma - s, im: t.omega }, T);
        sum += t.cosCoef * I.re + t.sinCoef * I.im;
        break;
      }
      case 'quasi': {
        const len = Math.max(t.cosPoly.length, t.sinPoly.length);
        for (let k = 0; k < len; k++) {
          const a = t.cosPoly[k] ?? 0;
          const b = t.sinPoly[k] ?? 0;
          if (a === 0 && b === 0) continue;
          const I = powerExpIntegral(k, { re: t.sigma - s, im: t.omega }, T);
          sum += a * I.re + b * I.im;
        }
        break;
      }
    }
  }
  return sum;
}
