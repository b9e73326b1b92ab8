import type { Waveform } from '../circuit/circuit.js';
import type { Readout, StateSpace } from '../model/state-space.js';
import type { Vec } from '../linalg/dense.js';
import type { Modal } from '../lti/modal.js';
import { type InputSchedule, breakpointTimes, buildSchedule, inputValues } from '../waveform/schedule.js';
import { type PeriodMap, periodMap, periodsToRoundOff } from './periodic.js';
import { type ExactSolution, solveExact } from './solve.js';
import type { Piece } from './result.js';

/**
 * A long periodic drive (a PWM signal for thousands of periods) brings the state to the periodic
 * state ξ* geometrically: after k periods from `from` it is ξ* + Φᵏ·(ξ(from) − ξ*). Once that
 * distance is below round-off of the state's size (2⁻⁵⁶), every further period is the steady period
 * to the last bit a step-by-step solution could carry, so its closed forms are the steady ones,
 * shifted: they are solved once and shared (the same term arrays) instead of once per period.
 * The schedule and the exact solution then stop one period after that point, which is what the
 * cross-check covers (the head, and one steady period against the reference carried there).
 */
export interface SteadyTail {
  /** the sources up to `checkEnd` */
  schedule: InputSchedule;
  solution: ExactSolution;
  /** the inputs just before the epoch's end */
  uEnd: number[];
  /** the exact step-by-step part ends here; replicated steady periods follow */
  cut: number;
  /** one steady period after `cut` (or the epoch's end) */
  checkEnd: number;
  /** ξ at checkEnd (ξ* up to round-off) */
  xiCheckEnd: Vec;
  map: PeriodMap;
}

export interface TailRequest {
  ss: StateSpace;
  modal: Modal;
  readouts: Readout[];
  waves: Waveform[];
  t0: number;
  t1: number;
  /** ξ just after t0 */
  xi0: Vec;
  from: number;
  period: number;
  span: number;
}

/** null when it does not pay or does not apply (fewer than 64 periods, slow or no decay, an impulse at `from`). */
export function steadyTail(q: TailRequest): SteadyTail | null {
  const { ss, modal, readouts, waves, t0, t1, xi0, from, period: T, span } = q;
  const periods = Math.floor((t1 - from) / T);
  if (periods < 64) return null;
  const n = ss.n;
  // the state at `from` (before anything happening there)
  let xiFrom = xi0;
  if (from > t0) {
    const head = buildSchedule(waves, from, t0);
    if (head.diracs.some((d) => d.t === from)) return null;
    xiFrom = solveExact(ss, modal, [], head, xi0, span).final;
  }
  const map = periodMap(ss, modal, waves, from, T);
  if (!map) return null;
  // a drive with a single formula per period (a sinusoid) is one piece anyway
  if (map.sched.intervals.length < 2 || map.sched.diracs.some((d) => d.t === from)) return null;
  let scale = 0;
  for (let i = 0; i < n; i++) scale = Math.max(scale, Math.abs(map.xiStar[i]), Math.abs(xiFrom[i]));
  const limit = Math.min(periods - 3, Math.floor(2e7 / (n * n + 1)));
  const K = periodsToRoundOff(map.Phi, xiFrom.map((v, i) => v - map.xiStar[i]), scale, limit);
  if (K === null) return null;
  // the schedule to one period past the cut; the cut on its own breakpoint nearest from + K·T
  const probeEnd = Math.min(t1, from + (K + 1) * T);
  const schedule = buildSchedule(waves, probeEnd, t0, [from]);
  const target = from + K * T;
  let cut = t0;
  for (const iv of schedule.intervals) if (Math.abs(iv.t0 - target) < Math.abs(cut - target)) cut = iv.t0;
  if (Math.abs(cut - target) > 1e-9 * T) return null;
  const checkEnd = probeEnd;
  const exact = solveExact(ss, modal, readouts, { ...schedule, intervals: schedule.intervals.filter((iv) => iv.t0 < cut) }, xi0, span, [from]);
  if (from === t0) exact.statesAt.set(from, xi0);
  const steady = solveExact(ss, modal, readouts, map.sched, map.xiStar, span).pieces;
  // the steady pieces laid on the sources' own breakpoints from the cut on (the same times a full
  // schedule would have, bit for bit: later stages match events by time)
  const times = breakpointTimes(waves, t1, cut);
  const lengths = steady[0]?.map((p) => p.t1 - p.t0) ?? map.sched.intervals.map((iv) => iv.t1 - iv.t0);
  if (!phasesFit(times, lengths, T)) return null;
  const pieces = exact.pieces.map((own, r) => layPeriods(own, steady[r], times));
  // the state at t1: the steady state at t1's phase of the period
  const whole = Math.floor((t1 - cut) / T + 1e-9);
  const phase = t1 - (cut + whole * T);
  const partial = phase <= 1e-12 * T ? map.sched : buildSchedule(waves, from + phase, from);
  const final = phase <= 1e-12 * T ? map.xiStar.slice() : solveExact(ss, modal, [], partial, map.xiStar, span).final;
  const last = partial.intervals[partial.intervals.length - 1];
  const uEnd = inputValues(last, ss.m, last.t1 - last.t0);
  return { schedule, solution: { pieces, statesAt: exact.statesAt, final }, uEnd, cut, checkEnd, xiCheckEnd: map.xiStar.slice(), map };
}

// The two loops over every breakpoint of the tail, as functions of their own: this runs once per
// call, and a loop inside the long function above would run unoptimized (or be deoptimized) there.

/** Whether every interval between the times is the steady one of its phase (the last may be cut short). */
function phasesFit(times: number[], lengths: number[], T: number): boolean {
  const P = lengths.length;
  for (let k = 0, j = 0; k + 1 < times.length; k++) {
    const len = times[k + 1] - times[k];
    const want = lengths[j];
    if (Math.abs(len - want) > 1e-9 * T && !(k + 2 === times.length && len < want)) return false;
    if (++j === P) j = 0;
  }
  return true;
}

/** Appends to `out` the steady phases' pieces laid on the times (sharing their term arrays); returns `out`. */
function layPeriods(out: Piece[], phases: Piece[], times: number[]): Piece[] {
  const P = phases.length;
  for (let k = 0, j = 0; k + 1 < times.length; k++) {
    const p = phases[j];
    out.push({ t0: times[k], t1: times[k + 1], terms: p.terms, impulseArea: p.impulseArea });
    if (++j === P) j = 0;
  }
  return out;
}
