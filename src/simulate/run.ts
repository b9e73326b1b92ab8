import type { Circuit, Watch } from '../circuit/circuit.js';
import { currentProbe, voltageProbe } from '../model/descriptor.js';
import type { Model } from '../model/build.js';
import type { Readout } from '../model/state-space.js';
import { matvec } from '../linalg/dense.js';
import { modalDecomposition } from '../lti/modal.js';
import { chooseSpan, modesOf } from '../lti/modes.js';
import { termsValue } from '../lti/term.js';
import { breakpointsOf, buildSchedule } from '../waveform/schedule.js';
import { checkTimes, referenceValues } from './crosscheck.js';
import type { CrossCheck, Mode, PathResponse, Piece, StateInfo } from './result.js';
import { pathResponses, solveExact } from './solve.js';

export interface SimulateOptions {
  span?: number;
  samples?: number;
}

/** Everything the simulate stage produces, before measurement. */
export interface Simulation {
  states: StateInfo[];
  modes: Mode[];
  span: number;
  spanChosen: boolean;
  times: Float64Array;
  signals: { watch: Watch; values: Float64Array; pieces: Piece[]; paths: PathResponse[] }[];
  crossCheck: CrossCheck;
  notices: string[];
}

export const CROSS_CHECK_TOLERANCE = 1e-9;

export function simulate(circuit: Circuit, model: Model, opts: SimulateOptions = {}): Simulation {
  const { ss } = model;
  const notices: string[] = [];
  const readouts = circuit.watches.map((w) => readoutFor(circuit, model, w));
  const modal = modalDecomposition(ss.A);
  const modes = modesOf(modal.blocks);
  const sources = circuit.parts.filter((p) => p.waveform);
  const waves = ss.inputs.map((name) => sources.find((p) => p.name === name)!.waveform!);
  const lastEvent = Math.max(0, ...waves.flatMap(breakpointsOf));
  const spanGiven = opts.span ?? circuit.analysis.span;
  const span = spanGiven ?? chooseSpan(modes, lastEvent);
  const samples = Math.max(2, Math.floor(opts.samples ?? circuit.analysis.samples));
  const schedule = buildSchedule(waves, span);
  for (const o of schedule.outside) notices.push(`a source ${o.kind} at t = ${o.t} s lies outside the analysis span [0, ${span}] s and is ignored`);

  // consistent state at t = 0+, then an impulse at t = 0 acts on it
  const first = schedule.intervals[0];
  const init = model.initialState(first.u, first.slope);
  for (const j of init.jumps) {
    const what = j.kind === 'capacitor-voltage' ? `voltage of ${j.part}` : `current of ${j.part}`;
    notices.push(`at t = 0 the ${what} is forced from ${fmt(j.before)} to ${fmt(j.after)} (charge/flux shared between parts wired in a loop or cut-set with no resistance)`);
  }
  if (init.residual > 1e-9) notices.push(`initial charge/flux balance is off by ${init.residual.toExponential(2)} (relative)`);
  let xi0 = init.x.map((v, i) => v - ss.Bx1[i].reduce((s, b, j) => s + b * first.u[j], 0));
  const d0 = schedule.diracs.find((d) => d.t === 0);
  if (d0) xi0 = xi0.map((v, i) => v + ss.B[i].reduce((s, b, j) => s + b * d0.area[j], 0));

  const exact = solveExact(ss, modal, readouts, schedule, xi0, span);
  const times = new Float64Array(samples);
  for (let k = 0; k < samples; k++) times[k] = (span * k) / (samples - 1);
  const signals = circuit.watches.map((watch, w) => {
    const pieces = exact.pieces[w];
    const values = sampleLinearly(pieces, times);
    return { watch, values, pieces, paths: pathResponses(ss, modal, readouts[w], span) };
  });

  const ct = checkTimes(span, schedule);
  const ref = referenceValues(ss, readouts, schedule, xi0, ct);
  let maxRel = 0;
  signals.forEach((s, w) => {
    const scale = Math.max(1e-300, ...Array.from(s.values, Math.abs));
    ct.forEach((t, k) => {
      const ours = evaluateAt(s.pieces, t);
      const err = Math.abs(ours - ref[w][k]) / scale;
      maxRel = Math.max(maxRel, Number.isFinite(err) ? err : Infinity);
    });
  });
  const crossCheck: CrossCheck = {
    method: 'matrix exponential of the augmented state matrix (Padé 13, scaling and squaring), interval by interval',
    times: ct,
    maxRelError: maxRel,
    tolerance: CROSS_CHECK_TOLERANCE,
    passed: maxRel <= CROSS_CHECK_TOLERANCE,
  };
  const states: StateInfo[] = ss.states.map((s) => ({ name: s.name, part: s.part, kind: s.kind }));
  void matvec;
  return { states, modes, span, spanChosen: spanGiven === undefined, times, signals, crossCheck, notices };
}

function readoutFor(circuit: Circuit, model: Model, w: Watch): Readout {
  const d = model.descriptor;
  const t = w.target;
  switch (t.kind) {
    case 'node':
      return model.readout(voltageProbe(d, t.node, 'gnd'));
    case 'between':
      return model.readout(voltageProbe(d, t.a, t.b));
    case 'part-voltage': {
      const p = circuit.parts.find((q) => q.name === t.part)!;
      return model.readout(voltageProbe(d, p.a, p.b));
    }
    case 'part-current': {
      const p = circuit.parts.find((q) => q.name === t.part)!;
      return model.readout(currentProbe(d, p));
    }
  }
}

/** Piece index for time t: the last piece starting at or before t (right-continuous). */
function pieceIndex(pieces: Piece[], t: number): number {
  let lo = 0;
  let hi = pieces.length - 1;
  while (lo < hi) {
    const mid = (lo + hi + 1) >> 1;
    if (pieces[mid].t0 <= t) lo = mid;
    else hi = mid - 1;
  }
  return lo;
}

export function evaluateAt(pieces: Piece[], t: number): number {
  const p = pieces[pieceIndex(pieces, t)];
  return termsValue(p.terms, t - p.t0);
}

function sampleLinearly(pieces: Piece[], times: Float64Array): Float64Array {
  const out = new Float64Array(times.length);
  let k = 0;
  for (let i = 0; i < times.length; i++) {
    const t = times[i];
    while (k + 1 < pieces.length && pieces[k + 1].t0 <= t) k++;
    out[i] = termsValue(pieces[k].terms, t - pieces[k].t0);
  }
  return out;
}

function fmt(v: number): string {
  return Number(v.toPrecision(6)).toString();
}
