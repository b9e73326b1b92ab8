import type { Circuit, SettleBand, Waveform } from '../circuit/circuit.js';
import type { Readout, StateSpace } from '../model/state-space.js';
import { type Mat, type Vec, matvec } from '../linalg/dense.js';
import { solveSquare } from '../linalg/factor.js';
import { integrateProduct, integrateTerms } from '../lti/integrate.js';
import type { Modal } from '../lti/modal.js';
import { termsValue } from '../lti/term.js';
import { type InputSchedule, buildSchedule } from '../waveform/schedule.js';
import type { Piece } from './result.js';
import { solveExact } from './solve.js';

/**
 * The periodic steady state that a circuit driven by a repeating source settles into.
 *
 * Once every non-repeating event is over (from the first period boundary `from`), the state maps
 * period to period as ξ(k+1) = Φ·ξ(k) + γ with Φ = e^(A·P) and γ the response over one period from
 * rest, both exact. The periodic state is the fixed point ξ* = (I − Φ)⁻¹·γ; the waveform over one
 * period from ξ* is the steady state, as closed forms. The deviation after k periods is
 * C·e^(Aτ)·Φᵏ·(ξ(from) − ξ*), which gives the number of periods until the signal stays within the
 * settling band (ours: band around the steady waveform, relative to the transition from the initial
 * value to the steady-state mean, or absolute; checked at 64 points per period).
 */
export interface PeriodicSteadyState {
  period: number;
  from: number;
  watches: { label: string; min: number; max: number; mean: number; rms: number; pieces: Piece[]; settledAfterPeriods: number | null }[];
}

/** The common period of the sources from some time on, or null when they do not repeat. */
export function findPeriod(waves: Waveform[], switchTimes: number[]): { period: number; start: number; after: number } | null {
  let period = 0;
  let start = 0;
  let after = Math.max(0, ...switchTimes);
  for (const w of waves) {
    for (const t of w.terms) {
      switch (t.kind) {
        case 'constant':
          break;
        case 'pulse':
        case 'sine': {
          const isPulse = t.kind === 'pulse';
          if (isPulse ? Number.isFinite(t.cycles) : Number.isFinite(t.decay)) {
            // a finite train or a decaying sinusoid ends (or fades): not periodic for ever
            if (isPulse) after = Math.max(after, t.start + t.cycles * t.period);
            else return null;
            break;
          }
          const P = isPulse ? t.period : 1 / t.freq;
          const s0 = isPulse ? t.start : t.at;
          if (period === 0) {
            period = P;
            start = s0;
          } else if (Math.abs(P - period) > 1e-12 * period) return null;
          after = Math.max(after, s0);
          break;
        }
        case 'step':
          after = Math.max(after, t.at + t.rise);
          break;
        case 'impulse':
          after = Math.max(after, t.at);
          break;
        case 'table':
          after = Math.max(after, ...t.points.map((p) => p.t));
          break;
        case 'ramp':
          if (!Number.isFinite(t.until)) return null;
          after = Math.max(after, t.until);
          break;
        case 'approach':
        case 'expression':
          return null;
      }
    }
  }
  return period > 0 ? { period, start, after } : null;
}

export function periodicSteadyState(
  circuit: Circuit,
  ss: StateSpace,
  modal: Modal,
  readouts: Readout[],
  waves: Waveform[],
  from: number,
  period: number,
  xiFrom: Vec,
  known?: PeriodMap | null,
): PeriodicSteadyState | null {
  const map = known ?? periodMap(ss, modal, waves, from, period);
  if (!map) return null;
  const { Phi, xiStar, sched } = map;
  const steady = solveExact(ss, modal, readouts, sched, xiStar, period);
  // deviation rows C·e^(Aτ) at 64 points of a period: column i is the free response of the
  // read-outs from the unit state eᵢ, one closed form per state
  const taus = Array.from({ length: 64 }, (_, j) => (period * j) / 64);
  const n = ss.n;
  const free = freeSchedule(period);
  const rowsOf = readouts.map(() => taus.map(() => new Array<number>(n).fill(0)));
  for (let i = 0; i < n; i++) {
    const e = new Array<number>(n).fill(0);
    e[i] = 1;
    solveExact(ss, modal, readouts, free, e, period).pieces.forEach((ps, idx) => {
      const terms = ps[0].terms;
      taus.forEach((tau, j) => (rowsOf[idx][j][i] = termsValue(terms, tau)));
    });
  }
  const watches = circuit.watches.map((w, idx) => {
    const pieces = steady.pieces[idx];
    const { min, max } = extremes(pieces, from, period);
    const mean = pieces.reduce((s, p) => s + integrateTerms(p.terms, p.t1 - p.t0), 0) / period;
    const ms = pieces.reduce((s, p) => s + integrateProduct(p.terms, p.terms, p.t1 - p.t0), 0) / period;
    const rows = rowsOf[idx];
    const y0 = termsValue(pieces[0].terms, 0);
    const band = bandOf(circuit.analysis.settle, mean, y0, Math.max(Math.abs(min), Math.abs(max)), xiFrom, xiStar, readouts[idx]);
    return { label: w.label, min, max, mean, rms: Math.sqrt(Math.max(ms, 0)), pieces, settledAfterPeriods: periodsToSettle(Phi, rows, xiFrom.map((v, i) => v - xiStar[i]), band) };
  });
  return { period, from, watches };
}

/** One period of the drive as a map of the state: ξ(k+1) = Φ·ξ(k) + γ, and its fixed point ξ*. */
export interface PeriodMap {
  Phi: Mat;
  gamma: Vec;
  xiStar: Vec;
  /** the sources over one period from `from` */
  sched: InputSchedule;
}

/** null when a mode neither grows nor decays over a period (no unique periodic state). */
export function periodMap(ss: StateSpace, modal: Modal, waves: Waveform[], from: number, period: number): PeriodMap | null {
  const n = ss.n;
  const sched = buildSchedule(waves, from + period, from);
  const gamma = solveExact(ss, modal, [], sched, new Array(n).fill(0), period).final;
  const Phi = freePropagator(ss, modal, period);
  const IminusPhi = Phi.map((row, i) => row.map((v, j) => (i === j ? 1 : 0) - v));
  try {
    const xiStar = n ? solveSquare(IminusPhi, gamma.map((g) => [g])).map((r) => r[0]) : [];
    return { Phi, gamma, xiStar, sched };
  } catch {
    return null;
  }
}

/**
 * The number of periods after which Φᵏ·d, the distance from the periodic state, is below round-off
 * of `scale` (2⁻⁵⁶ of it), or null when that takes more than `limit` periods (slow decay, or none).
 */
export function periodsToRoundOff(Phi: Mat, d0: Vec, scale: number, limit: number): number | null {
  const tiny = 2 ** -56 * scale;
  let d = d0;
  for (let k = 0; k <= limit; k++) {
    if (d.every((v) => Math.abs(v) <= tiny)) return k;
    d = matvec(Phi, d);
  }
  return null;
}

/** No sources over [0, τ]. */
function freeSchedule(tau: number): InputSchedule {
  return { intervals: [{ t0: 0, t1: tau, components: [], slopes: [] }], diracs: [], jumps: [], outside: [], approximation: [] };
}

/** e^(A·τ) in the canonical state coordinates, from the modal blocks (exact). */
function freePropagator(ss: StateSpace, modal: Modal, tau: number): Mat {
  const n = ss.n;
  const zero = freeSchedule(tau);
  const cols = Array.from({ length: n }, (_, j) => {
    const e = new Array<number>(n).fill(0);
    e[j] = 1;
    return tau === 0 ? e : solveExact(ss, modal, [], zero, e, tau).final;
  });
  return Array.from({ length: n }, (_, i) => cols.map((c) => c[i]));
}

function bandOf(settle: SettleBand, mean: number, y0: number, size: number, _a: Vec, _b: Vec, _r: Readout): number {
  if (settle.kind === 'absolute') return settle.value;
  const transition = Math.abs(mean - y0);
  return settle.fraction * (transition > 0 ? transition : size);
}

function periodsToSettle(Phi: Mat, rows: Vec[], d0: Vec, band: number): number | null {
  let d = d0;
  const dev = (v: Vec) => Math.max(...rows.map((r) => Math.abs(r.reduce((s, c, i) => s + c * v[i], 0))));
  let inside = 0;
  for (let k = 0; k <= 1_000_000; k++) {
    if (dev(d) <= band) {
      inside++;
      if (inside >= 4) return k - 3;
    } else inside = 0;
    d = matvec(Phi, d);
    if (d.every((v) => v === 0)) return inside > 0 ? k - inside + 1 : k + 1;
  }
  return null;
}

/** Minimum and maximum over one period: dense samples refined by golden-section search on the closed form. */
function extremes(pieces: Piece[], from: number, period: number): { min: number; max: number } {
  const f = (t: number) => {
    let p = pieces[0];
    for (const q of pieces) if (q.t0 <= t) p = q;
    return termsValue(p.terms, t - p.t0);
  };
  const N = 2048;
  let iMax = 0;
  let iMin = 0;
  // (the sample times increase: the piece in force is found by walking, not by a scan per sample)
  const vals = new Array<number>(N + 1);
  for (let i = 0, j = 0; i <= N; i++) {
    const t = from + (period * i) / N;
    while (j + 1 < pieces.length && pieces[j + 1].t0 <= t) j++;
    const p = pieces[j].t0 <= t ? pieces[j] : pieces[0];
    vals[i] = termsValue(p.terms, t - p.t0);
  }
  vals.forEach((v, i) => {
    if (v > vals[iMax]) iMax = i;
    if (v < vals[iMin]) iMin = i;
  });
  const refine = (i: number, sign: number) => {
    let a = from + (period * Math.max(0, i - 1)) / N;
    let b = from + (period * Math.min(N, i + 1)) / N;
    const g = (t: number) => sign * f(t);
    const r = (Math.sqrt(5) - 1) / 2;
    for (let k = 0; k < 80; k++) {
      const c = b - r * (b - a);
      const d = a + r * (b - a);
      if (g(c) > g(d)) b = d;
      else a = c;
    }
    return Math.max(sign * g((a + b) / 2), sign * vals[i]) * sign === vals[i] * sign ? Math.max(g((a + b) / 2), sign * vals[i]) * sign : sign * Math.max(g((a + b) / 2), sign * vals[i]);
  };
  return { max: refine(iMax, 1), min: refine(iMin, -1) };
}
