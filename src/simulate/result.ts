import type { Circuit } from '../circuit/circuit.js';

/**
 * What a run produces: the data every report format is made from.
 * Times in seconds, values in SI units (V or A).
 */

/** A natural mode of the network (one eigenvalue, or a conjugate pair, of the state matrix). */
export type Mode =
  /** e^(λt), λ ≤ 0 real; tau = −1/λ (Infinity when λ = 0). */
  | { kind: 'real'; lambda: number; tau: number }
  /** e^(σt)·cos(ωd·t + φ): natural frequency wn, damping ratio zeta, quality factor q. */
  | { kind: 'oscillatory'; sigma: number; omegaD: number; wn: number; zeta: number; q: number; ringingHz: number }
  /** a real pole of multiplicity ≥ 2 (or two poles closer than the solver's cluster tolerance). */
  | { kind: 'repeated'; lambda: number; multiplicity: number; tau: number; spread: number };

/** One term of a closed-form signal, in τ = t − t0 of its interval. */
export type Term =
  /** coef·e^(λτ) (λ = 0: a constant) */
  | { kind: 'exp'; lambda: number; coef: number }
  /** e^(στ)·(cosCoef·cos(ωτ) + sinCoef·sin(ωτ)) */
  | { kind: 'osc'; sigma: number; omega: number; cosCoef: number; sinCoef: number }
  /** polyCoefs[k]·τ^k·e^(λτ), k = 0.. (a repeated pole; λ = 0 gives a plain polynomial) */
  | { kind: 'poly-exp'; lambda: number; polyCoefs: number[] }
  /** e^(στ)·(Σ cosPoly[k]·τ^k·cos(ωτ) + Σ sinPoly[k]·τ^k·sin(ωτ)): the general form (a mode driven by a ramp or sinusoid) */
  | { kind: 'quasi'; sigma: number; omega: number; cosPoly: number[]; sinPoly: number[] };

/** y(t) = Σ terms(t − t0) for t0 ≤ t < t1, plus a Dirac impulse of area `impulseArea` at t0 when nonzero. */
export interface Piece {
  t0: number;
  t1: number;
  terms: Term[];
  impulseArea: number;
}

/** Impulse and step response of one source-to-signal path, as sums of mode terms (τ = t). */
export interface PathResponse {
  source: string;
  /** h(t) for t > 0, plus directArea·δ(t) (and derivArea·δ'(t), rare: a capacitor straight across a source). */
  impulse: { terms: Term[]; directArea: number; derivArea: number };
  /** step response s(t) for t > 0 (s(0+) includes the direct feed-through), plus stepImpulseArea·δ(t). */
  step: { terms: Term[]; stepImpulseArea: number };
  /** H(0): the DC gain (Infinity/NaN when the path integrates). */
  dcGain: number;
}

export interface Metrics {
  initial: number;      // value at t = 0+
  final: number;        // value at the end of the span (or the analytic limit when it exists)
  finalIsLimit: boolean;
  peak: { value: number; time: number };
  valley: { value: number; time: number };
  /** percent, relative to the last transition; null when no transition */
  overshootPct: number | null;
  riseTime: number | null;     // 10 % → 90 % of the transition
  settlingTime: number | null; // last time outside the band
}

export interface Trace {
  label: string;
  unit: 'V' | 'A';
  values: Float64Array;
  pieces: Piece[];
  paths: PathResponse[];
  metrics: Metrics;
}

export interface CrossCheck {
  method: string;        // e.g. "matrix exponential (Padé 13, scaling and squaring)"
  times: number[];
  /** what part of the run the check covers, when not all of it directly */
  scope?: string;
  /** the s values (1/s) of the Laplace-domain check, when it was used */
  transformWeights?: number[];
  maxRelError: number;
  tolerance: number;
  passed: boolean;
}

export interface StateInfo {
  name: string;   // e.g. "v(C1)" or "i(L1)"
  part: string;
  kind: 'capacitor-voltage' | 'inductor-current';
}

export interface RunResult {
  circuit: Circuit;
  states: StateInfo[];
  modes: Mode[];
  span: number;
  spanChosen: boolean;   // true when the span came from the slowest mode
  times: Float64Array;
  traces: Trace[];
  /** how the state before t = 0 was chosen */
  start?: 'settled' | 'rest';
  /** switching instants (and t = 0 when the state had to jump there) */
  events?: {
    t: number;
    closed: string[];
    jumps: { part: string; kind: 'capacitor-voltage' | 'inductor-current'; before: number; after: number }[];
    energyLost: number;
  }[];
  /**
   * Each distinct switch configuration in order of first use (one entry when there are no switches).
   * The top-level states, modes and traces[].paths are those of the configuration in force at the end.
   */
  configurations?: { from: number; closed: string[]; states: StateInfo[]; modes: Mode[]; paths: PathResponse[][] }[];
  /** closed forms of every part's voltage v(a) − v(b) and current a → b, same piece boundaries as the traces */
  parts?: { part: string; voltage: Piece[]; current: Piece[] }[];
  /** per capacitor: time to fall below a safe voltage once the sources are removed at the end of the span */
  discharge?: { part: string; from: number; safeVoltage: number; time: number | null }[];
  /**
   * When the sources repeat from some time on: the periodic steady state (one period of closed forms
   * per watch, with min, max, mean, RMS) and how many periods each signal takes to stay in its band.
   */
  periodic?: {
    period: number;
    from: number;
    watches: { label: string; min: number; max: number; mean: number; rms: number; pieces: Piece[]; settledAfterPeriods: number | null }[];
  } | null;
  crossCheck: CrossCheck;
  notices: string[];     // non-fatal remarks (state jumps at t = 0, inconsistent initial values, ...)
}
