import type { Circuit, Part, Watch, Waveform } from '../circuit/circuit.js';
import { GROUND } from '../circuit/circuit.js';
import { InputError } from '../diagnostics.js';
import { checkWorkload } from '../circuit/workload.js';
import { currentProbe, emptyProbe, voltageProbe } from '../model/descriptor.js';
import { type Model, buildModel } from '../model/build.js';
import type { Readout } from '../model/state-space.js';
import { type Vec, dot } from '../linalg/dense.js';
import { type Modal, modalDecomposition } from '../lti/modal.js';
import { chooseSpan, modesOf } from '../lti/modes.js';
import { termsValue } from '../lti/term.js';
import { type InputSchedule, buildSchedule, inputSlopes, inputValues, lastEventOf } from '../waveform/schedule.js';
import { type Epoch, epochs, initialConfiguration, switchesOf } from './configure.js';
import { type DischargeInfo, dischargeTimes } from './discharge.js';
import { type PeriodMap, type PeriodicSteadyState, findPeriod, periodicSteadyState } from './periodic.js';
import { steadyTail } from './steady-tail.js';
import { checkTimes, referenceValues } from './crosscheck.js';
import { transformCheck, transformWeights } from './transform-check.js';
import type { CrossCheck, Mode, PathResponse, Piece, StateInfo } from './result.js';
import { sampleUniform } from './sample.js';
import { valuesBeforeStart } from './settled.js';
import { pathResponses, solveExact } from './solve.js';

export interface SimulateOptions {
  span?: number;
  samples?: number;
  /**
   * Closed forms of every part's voltage and current (for stress, energy and cautions). Default
   * true; a caller that only wants the watched samples (CSV) saves their cost with false.
   */
  partSignals?: boolean;
}

/** A switching event as the run saw it. */
export interface EventReport {
  t: number;
  closed: string[];
  jumps: { part: string; kind: 'capacitor-voltage' | 'inductor-current'; before: number; after: number }[];
  /** stored energy lost in the instant (charge sharing, interrupted current), joules */
  energyLost: number;
}

/** Everything the simulate stage produces, before measurement. */
export interface Simulation {
  states: StateInfo[];
  modes: Mode[];
  span: number;
  spanChosen: boolean;
  start: 'settled' | 'rest';
  times: Float64Array;
  signals: { watch: Watch; values: Float64Array; pieces: Piece[]; paths: PathResponse[] }[];
  /** closed forms of every part's voltage and current (passive sign convention, a -> b) */
  parts: { part: string; voltage: Piece[]; current: Piece[] }[];
  events: EventReport[];
  /** with switches: each distinct configuration (first used from `from`) with its own states and modes */
  configurations: Omit<Configuration, 'circuit'>[];
  /** capacitor discharge once the sources are removed at the end of the span */
  discharge: DischargeInfo[];
  /** the periodic steady state, when the sources repeat from some time on within the span */
  periodic: PeriodicSteadyState | null;
  crossCheck: CrossCheck;
  notices: string[];
}

export const CROSS_CHECK_TOLERANCE = 1e-9;
/** above this the matrix exponential (O(n³) per distinct interval shape) gives way to the Laplace-domain check */
export const TIME_DOMAIN_MAX_STATES = 32;

interface Configuration {
  circuit: Circuit;
  from: number;
  closed: string[];
  states: StateInfo[];
  modes: Mode[];
  /** per watch, per source */
  paths: PathResponse[][];
}

interface Prepared {
  model: Model;
  modal: Modal;
  readouts: Readout[];
  /** voltage and current of every part of the original circuit, in its order */
  partReadouts: Readout[];
}

export function simulate(circuit: Circuit, opts: SimulateOptions = {}): Simulation {
  const notices: string[] = [];
  const prepared = new Map<Circuit, Prepared>();
  const prepare = (c: Circuit): Prepared => {
    let p = prepared.get(c);
    if (!p) {
      const model = buildModel(c);
      if (model.reductionError > 1e-12) {
        notices.push(
          `the circuit's equations could be reduced only to a relative residual of ${model.reductionError.toExponential(1)} (parts of very different size in loops of capacitors and sources); results are accurate to about that, not to round-off`,
        );
      }
      const partReadouts = opts.partSignals === false ? [] : circuit.parts.flatMap((part) => [
        readoutFor(circuit, c, model, { ...pseudoWatch, target: { kind: 'part-voltage', part: part.name } }),
        readoutFor(circuit, c, model, { ...pseudoWatch, target: { kind: 'part-current', part: part.name } }),
      ]);
      p = { model, modal: modalDecomposition(model.ss.A), readouts: circuit.watches.map((w) => readoutFor(circuit, c, model, w)), partReadouts };
      prepared.set(c, p);
    }
    return p;
  };

  // the span: given, or from the slowest mode of the first configuration after the last event
  const waves = (c: Circuit): Waveform[] => prepare(c).model.ss.inputs.map((name) => c.parts.find((p) => p.name === name)!.waveform!);
  const allWaves = circuit.parts.filter((p) => p.waveform).map((p) => p.waveform!);
  const switchTimes = switchesOf(circuit).flatMap((p) => p.switching!.events.map((e) => e.t));
  const lastEvent = Math.max(lastEventOf(allWaves), ...switchTimes, 0);
  const spanGiven = opts.span ?? circuit.analysis.span;
  const first = epochs(circuit, Number.isFinite(lastEvent) && lastEvent > 0 ? lastEvent * 2 : 1);
  const allModes = [...new Set(first.map((e) => e.circuit))].flatMap((c) => modesOf(prepare(c).modal.blocks));
  const span = spanGiven ?? chooseSpan(allModes, lastEvent);
  // refused before any breakpoint list is built (a 1 ns pulse train over 1000 s has 10¹² corners)
  checkWorkload(circuit, span);
  const samples = Math.max(2, Math.floor(opts.samples ?? circuit.analysis.samples));
  const eps = epochs(circuit, span);
  // a repeating drive: the first period boundary after every other event, where the periodic
  // steady state analysis starts (it needs the state there, so it becomes a breakpoint)
  const periodic = findPeriod(allWaves, switchTimes);
  const psFrom = periodic ? periodic.start + Math.ceil(Math.max(0, periodic.after - periodic.start) / periodic.period - 1e-9) * periodic.period : NaN;
  const psWanted = periodic !== null && psFrom < span;
  const ps: { state: Vec | null; epoch: Epoch | null } = { state: null, epoch: null };
  let knownMap: PeriodMap | null = null;
  let tailFrom = NaN;

  // state before t = 0
  const pre = initialConfiguration(circuit);
  const before = valuesBeforeStart(circuit, pre.circuit, prepare(pre.circuit).model);
  if (before.note) notices.push(before.note);

  const approx = new Map<string, number>();
  const pieces: Piece[][] = circuit.watches.map(() => []);
  const partPieces: Piece[][] = circuit.parts.flatMap(() => [[], []]);
  const events: EventReport[] = [];
  let values = before.values;
  // cross-check errors are measured against each watched signal's largest magnitude
  const absErr = circuit.watches.map(() => 0);
  const refMax = circuit.watches.map(() => 0);
  // per watch, the largest Σ|C_j·ξ_j| + Σ|D_j·u_j| at an epoch's ends (round-off of a cancellation, below)
  const termSize = circuit.watches.map(() => 0);
  const checked: number[] = [];
  const transformed: number[] = [];
  eps.forEach((ep, k) => {
    const P = prepare(ep.circuit);
    const { ss } = P.model;
    // a long periodic drive: the sources only to one period past its start for now (steadyTail
    // below decides how far the step-by-step solution has to go)
    const tailTried = psWanted && periodic !== null && ep.t0 <= psFrom && (ep.t1 - psFrom) / periodic.period >= 64;
    const firstEnd = tailTried ? Math.min(ep.t1, psFrom + periodic!.period) : ep.t1;
    let schedule = scheduleOrInputError(circuit, ss.inputs, () => buildSchedule(waves(ep.circuit), firstEnd, ep.t0, psWanted ? [psFrom] : []));
    if (k === 0) for (const o of schedule.outside) notices.push(`a source impulse at t = ${o.t} s lies outside the analysis span and is ignored`);
    schedule.approximation.forEach((err, j) => {
      if (err > 0) approx.set(ss.inputs[j], Math.max(approx.get(ss.inputs[j]) ?? 0, err));
    });
    for (const n of ep.isolated) if (k === 0 || eps[k - 1].isolated.indexOf(n) < 0) notices.push(`from t = ${ep.t0} s node ${n} is cut off by an open switch; it reads as 0 V`);
    const iv0 = schedule.intervals[0];
    const u0 = inputValues(iv0, ss.m, 0);
    const init = P.model.initialState(values, u0, inputSlopes(iv0, ss.m, 0));
    const energyBefore = storedEnergy(ep.circuit, values);
    const after = new Map(values);
    for (const j of init.jumps) after.set(j.part, j.after);
    if (k > 0 || init.jumps.length) {
      events.push({ t: ep.t0, closed: ep.closed, jumps: init.jumps, energyLost: energyBefore - storedEnergy(ep.circuit, after) });
    }
    for (const j of init.jumps) {
      if (j.kind === 'inductor-current' && Math.abs(j.after) < Math.abs(j.before)) {
        notices.push(
          `at t = ${ep.t0} s the current of ${j.part} is interrupted (${fmt(j.before)} A forced to ${fmt(j.after)} A): an ideal model has no bounded voltage for this; real parts arc or avalanche. Add a freewheel path or a snubber.`,
        );
      }
    }
    if (init.residual > 1e-9) notices.push(`at t = ${ep.t0} s the charge/flux balance is off by ${init.residual.toExponential(2)} (relative)`);
    let xi0 = init.x.map((v, i) => v - ss.Bx1[i].reduce((s, b, j) => s + b * u0[j], 0));
    const d0 = schedule.diracs.find((d) => d.t === ep.t0);
    if (d0 && (k === 0 || ep.t0 > 0)) xi0 = xi0.map((v, i) => v + ss.B[i].reduce((s, b, j) => s + b * d0.area[j], 0));
    const readoutsAll = [...P.readouts, ...P.partReadouts];
    const tail = tailTried
      ? steadyTail({ ss, modal: P.modal, readouts: readoutsAll, waves: waves(ep.circuit), t0: ep.t0, t1: ep.t1, xi0, from: psFrom, period: periodic!.period, span })
      : null;
    if (tail) {
      schedule = tail.schedule;
      knownMap = tail.map;
      tailFrom = tail.cut;
    } else if (firstEnd < ep.t1) {
      schedule = scheduleOrInputError(circuit, ss.inputs, () => buildSchedule(waves(ep.circuit), ep.t1, ep.t0, psWanted ? [psFrom] : []));
    }
    const all = tail ? tail.solution : solveExact(ss, P.modal, readoutsAll, schedule, xi0, span, psWanted ? [psFrom] : []);
    const checkEnd = tail ? tail.checkEnd : ep.t1;
    if (psWanted && all.statesAt.has(psFrom)) {
      ps.state = all.statesAt.get(psFrom)!;
      ps.epoch = ep;
    } else if (psWanted && psFrom === ep.t0) {
      ps.state = xi0;
      ps.epoch = ep;
    }
    const nw = P.readouts.length;
    const exact = { pieces: all.pieces.slice(0, nw), final: all.final };
    // (the solution's own arrays for the first epoch; then a loop, not push(...): a long pulse
    // train has more pieces than a call can take arguments)
    exact.pieces.forEach((ps, w) => {
      if (pieces[w].length === 0) pieces[w] = ps;
      else for (const p of ps) pieces[w].push(p);
    });
    all.pieces.slice(nw).forEach((ps, q) => {
      if (partPieces[q].length === 0) partPieces[q] = ps;
      else for (const p of ps) partPieces[q].push(p);
    });

    P.readouts.forEach((r, w) => {
      for (const x of [xi0, all.final]) {
        let size = 0;
        for (let j = 0; j < x.length; j++) size += Math.abs(r.C[j] * x[j]);
        for (let j = 0; j < u0.length; j++) size += Math.abs(r.D[j] * u0[j]);
        if (Number.isFinite(size)) termSize[w] = Math.max(termSize[w], size);
      }
    });

    // independent check of this epoch: in the time domain while the matrix exponential is cheap,
    // in the Laplace domain (one LU per weight) for larger circuits
    if (ss.n <= TIME_DOMAIN_MAX_STATES) {
      const ct = checkTimes(ep.t0, checkEnd, schedule);
      const ref = referenceValues(ss, P.readouts, schedule, xi0, ct);
      exact.pieces.forEach((ps, w) => {
        ct.forEach((t, i) => {
          const err = Math.abs(evaluateAt(ps, t) - ref[w][i]);
          absErr[w] = Math.max(absErr[w], Number.isFinite(err) ? err : Infinity);
          refMax[w] = Math.max(refMax[w], Math.abs(ref[w][i]));
        });
      });
      checked.push(...ct);
    } else {
      const weights = transformWeights(ss, checkEnd - ep.t0);
      const tc = transformCheck({ ss, readouts: P.readouts, schedule, a: ep.t0, b: checkEnd, xiStart: xi0, xiEnd: tail ? tail.xiCheckEnd : all.final, pieces: exact.pieces }, weights);
      tc.absErr.forEach((err, w) => (absErr[w] = Math.max(absErr[w], err)));
      transformed.push(...weights);
    }

    // hand over every capacitor voltage and inductor current to the next epoch
    const last = schedule.intervals[schedule.intervals.length - 1];
    const uEnd = tail ? tail.uEnd : inputValues(last, ss.m, last.t1 - last.t0);
    values = new Map(values);
    for (const st of P.model.storage) {
      const r = st.readout;
      values.set(st.part.name, dot(r.C, exact.final) + dot(r.D, uEnd));
    }
  });

  for (const [source, err] of approx) {
    const unit = circuit.parts.find((p) => p.name === source)?.kind === 'current-source' ? 'A' : 'V';
    notices.push(
      `the expression of ${source} has no closed form: it is replaced by straight lines between adaptively chosen points, off by at most ${err.toPrecision(2)} ${unit}; the response to those lines is exact, so every result carries at most that input error times the path's gain`,
    );
  }
  const times = new Float64Array(samples);
  for (let k = 0; k < samples; k++) times[k] = (span * k) / (samples - 1);
  // one entry per distinct switch configuration, in order of first use; the headline states,
  // modes and path responses are those of the configuration in force at the end of the span
  const configurations: Configuration[] = [];
  for (const ep of eps) {
    if (configurations.some((c) => c.circuit === ep.circuit)) continue;
    const P = prepare(ep.circuit);
    configurations.push({
      circuit: ep.circuit,
      from: ep.t0,
      closed: ep.closed,
      states: P.model.ss.states.map((st) => ({ name: st.name, part: st.part, kind: st.kind })),
      modes: modesOf(P.modal.blocks),
      paths: P.readouts.map((r) => pathResponses(P.model.ss, P.modal, r, span)),
    });
  }
  const finalConfig = configurations.find((c) => c.circuit === eps[eps.length - 1].circuit)!;
  const signals = circuit.watches.map((watch, w) => ({
    watch,
    values: sampleUniform(pieces[w], times),
    pieces: pieces[w],
    paths: finalConfig.paths[w],
  }));
  // relative to the largest watched value of the same unit: a signal that is zero up to
  // round-off (the voltage across a coil carrying DC) is not judged against its own noise
  const peakOf = signals.map((s, w) => {
    let m = refMax[w];
    // (indexed: this runs once per call, unoptimized, and an iterator would box every sample)
    const vs = s.values;
    for (let i = 0; i < vs.length; i++) m = Math.max(m, Math.abs(vs[i]));
    return m;
  });
  // ... and never below the largest voltage (current) anywhere in the circuit at the starts of its
  // intervals: a watched node that only round-off reaches is judged against the circuit's scale
  const circuitScale = { V: 0, A: 0 };
  partPieces.forEach((ps, q) => {
    const unit = q % 2 === 0 ? 'V' : 'A';
    // (the periods of a steady tail share a few term arrays: each evaluated once)
    const recent: Piece['terms'][] = [];
    for (let i = 0; i < ps.length; i++) {
      const terms = ps[i].terms;
      if (recent.includes(terms)) continue;
      if (recent.length >= 8) recent.shift();
      recent.push(terms);
      circuitScale[unit] = Math.max(circuitScale[unit], Math.abs(termsValue(terms, 0)));
    }
  });
  // A watch that is zero by topology (every node it sees tied to ground by coils carrying current)
  // is a cancellation of terms Σ C_j·ξ_j: its closed form and its reference are both round-off of
  // those terms' size. So the scale is at least Σ|C_j·ξ_j| + Σ|D_j·u_j| times 1000 ε / tolerance:
  // a disagreement of 1000 ε of the cancelling terms reads as the tolerance, no more is forgiven
  // (an error of 1e-9 of a watch whose terms are of its own size stays one)
  let maxRel = 0;
  signals.forEach((s, w) => {
    const cancelling = (termSize[w] * 1e3 * Number.EPSILON) / CROSS_CHECK_TOLERANCE;
    const scale = Math.max(circuitScale[s.watch.unit], cancelling, ...signals.map((o, v) => (o.watch.unit === s.watch.unit ? peakOf[v] : 0)));
    const rel = scale > 0 ? absErr[w] / scale : absErr[w];
    maxRel = Math.max(maxRel, Number.isNaN(rel) ? Infinity : rel);
  });
  const methods = [
    checked.length ? 'matrix exponential of the state matrix augmented with the source generators (Padé 13, scaling and squaring), interval by interval' : '',
    transformed.length ? 'Laplace transforms of the closed forms against LU solutions of (sI − A)·X̂ = ξ(start) − e^(−sL)·ξ(end) + B·Û (weighted averages of the error, weights e^(−sτ))' : '',
  ].filter(Boolean);
  const crossCheck: CrossCheck = {
    method: methods.join('; and '),
    ...(Number.isFinite(tailFrom)
      ? { scope: `from t = ${fmt(tailFrom)} s the periodic drive repeats its steady period to round-off: checked up to one period beyond; later periods are copies of it` }
      : {}),
    times: checked,
    ...(transformed.length ? { transformWeights: transformed } : {}),
    maxRelError: maxRel,
    tolerance: CROSS_CHECK_TOLERANCE,
    passed: maxRel <= CROSS_CHECK_TOLERANCE,
  };
  const states = finalConfig.states;
  const modes = finalConfig.modes;
  const parts = opts.partSignals === false ? [] : circuit.parts.map((p, q) => ({ part: p.name, voltage: partPieces[2 * q], current: partPieces[2 * q + 1] }));
  // an auxiliary analysis: if the source-free circuit cannot be solved, say so and go on
  // (a per-part safety figure like the stresses: skipped with them when only the watched signals are wanted)
  let discharge: DischargeInfo[] = [];
  if (opts.partSignals !== false) {
    try {
      discharge = dischargeTimes(circuit, values, span);
    } catch (e) {
      notices.push(`the discharge time after the sources are removed could not be computed (${(e as Error).message})`);
    }
  }
  let steady: PeriodicSteadyState | null = null;
  if (periodic && ps.state && ps.epoch) {
    const P = prepare(ps.epoch.circuit);
    steady = periodicSteadyState(circuit, P.model.ss, P.modal, P.readouts, waves(ps.epoch.circuit), psFrom, periodic.period, ps.state, knownMap);
  }
  const configs = configurations.map(({ circuit: _c, ...rest }) => rest);
  return { states, modes, span, spanChosen: spanGiven === undefined, start: before.mode, times, signals, parts, events, configurations: configs, discharge, periodic: steady, crossCheck, notices };
}

/**
 * Source values the numbers cannot carry (an expression that overflows, amplitudes beyond
 * 1e100) are input errors located at the source, not internal failures.
 */
function scheduleOrInputError(circuit: Circuit, inputs: string[], build: () => InputSchedule): InputSchedule {
  const fail = (name: string | undefined, why: string): never => {
    const part = circuit.parts.find((p) => p.name === name) ?? circuit.parts.find((p) => p.waveform);
    throw new InputError([{ severity: 'error', message: why, loc: part?.loc, hint: 'keep source values and rates within ±1e100 in SI units' }]);
  };
  let schedule: InputSchedule;
  try {
    schedule = build();
  } catch (e) {
    if (e instanceof InputError) throw e;
    return fail(undefined, `a source cannot be evaluated: ${(e as Error).message}`);
  }
  for (const iv of schedule.intervals) {
    for (const k of iv.components) {
      if (!(Math.abs(k.re) <= 1e100 && Math.abs(k.im) <= 1e100 && Math.abs(k.sigma) <= 1e100 && Math.abs(k.omega) <= 1e100)) {
        fail(inputs[k.input], `source ${inputs[k.input]} reaches values or rates beyond what can be computed (at t = ${iv.t0} s)`);
      }
    }
  }
  return schedule;
}

function fmt(v: number): string {
  return Math.abs(v) < 1e-12 ? '0' : Number(v.toPrecision(4)).toString();
}

const pseudoWatch: Watch = { target: { kind: 'node', node: GROUND }, label: '', unit: 'V', loc: { file: '', line: 0, col: 0, length: 0 } };

function storedEnergy(c: Circuit, values: Map<string, number>): number {
  let e = 0;
  for (const p of c.parts) {
    if (p.kind === 'capacitor' || p.kind === 'inductor') e += 0.5 * p.value * (values.get(p.name) ?? 0) ** 2;
  }
  return e;
}

/**
 * A watched quantity in one switch configuration `c` of the circuit `orig`. A part removed from
 * the configuration (an open switch) still has a voltage across its terminals; its current is 0.
 */
function readoutFor(orig: Circuit, c: Circuit, model: Model, w: Watch): Readout {
  const d = model.descriptor;
  const t = w.target;
  const part = (name: string): Part | undefined => c.parts.find((q) => q.name === name) ?? orig.parts.find((q) => q.name === name);
  const present = (name: string) => c.parts.some((q) => q.name === name);
  switch (t.kind) {
    case 'node':
      return model.readout(voltageProbe(d, t.node, GROUND));
    case 'between':
      return model.readout(voltageProbe(d, t.a, t.b));
    case 'part-voltage': {
      const p = part(t.part);
      return model.readout(p ? voltageProbe(d, p.a, p.b) : emptyProbe(d));
    }
    case 'part-current': {
      const p = part(t.part);
      return model.readout(p && present(t.part) ? currentProbe(d, p) : emptyProbe(d));
    }
  }
}

/** Value at t on the piece that starts at or before t (right-continuous). */
export function evaluateAt(pieces: Piece[], t: number): number {
  let lo = 0;
  let hi = pieces.length - 1;
  while (lo < hi) {
    const mid = (lo + hi + 1) >> 1;
    if (pieces[mid].t0 <= t) lo = mid;
    else hi = mid - 1;
  }
  return termsValue(pieces[lo].terms, t - pieces[lo].t0);
}

export type { InputSchedule };
