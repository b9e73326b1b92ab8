import type { Circuit } from './circuit/circuit.js';
import { loadCircuit } from './circuit/load.js';
import { MAX_STATES } from './circuit/limits.js';
import { describeStructure } from './circuit/structure.js';
import { InputError } from './diagnostics.js';
import { computeMetrics } from './measure/metrics.js';
import { releaseTables, shareTables } from './measure/sweep.js';
import { releaseGrams, shareGrams } from './lti/integrate.js';
import { ReductionError } from './model/build.js';
import type { RunResult } from './simulate/result.js';
import { simulate } from './simulate/run.js';
import { eventTimes } from './waveform/events.js';

export interface AnalyzeOptions {
  samples?: number;
  span?: number;
  /** compute every part's closed forms (stress, energy, cautions, discharge times); default true */
  partSignals?: boolean;
  /** told which stage starts, for a progress line on long runs (the CLI on a terminal) */
  progress?: (stage: string) => void;
}

/** circuit → model → exact solution → metrics: the whole run as one value. */
export function analyzeCircuit(circuit: Circuit, opts: AnalyzeOptions = {}): RunResult {
  // the state limit, from the circuit graph alone, before any matrix is built
  let states = 0;
  for (const at of circuit.parts.some((p) => p.kind === 'switch') ? [0, Infinity] : [0]) {
    const st = describeStructure(circuit, { at });
    states = Math.max(states, st.expectedStates);
    if (st.expectedStates > MAX_STATES) {
      throw new InputError([
        {
          severity: 'error',
          message: `the circuit has ${st.expectedStates} states (${st.summary}); ringdown computes at most ${MAX_STATES}`,
          loc: circuit.parts[0]?.loc,
          hint: 'split the network, or lump sections of a long ladder together',
        },
      ]);
    }
  }
  const samples = opts.samples ?? circuit.analysis.samples;
  opts.progress?.(`solving ${states} state${states === 1 ? '' : 's'} (modes, closed forms, ${samples} samples, cross-check)`);
  let sim;
  try {
    sim = simulate(circuit, opts);
  } catch (e) {
    if (e instanceof ReductionError) {
      throw new InputError([{ severity: 'error', message: `the circuit has no unique solution: ${e.message}`, loc: { file: circuit.file, line: 1, col: 1, length: 0 } }]);
    }
    throw e;
  }
  const events = eventTimes(circuit, sim.span);
  opts.progress?.(`measuring ${sim.signals.length} watched signal${sim.signals.length === 1 ? '' : 's'}`);
  // the watches' measurements share their power tables (measure/sweep.ts) and the Gram matrices of
  // their RMS integrals (lti/integrate.ts) for this call
  shareTables(sim.times);
  shareGrams(sim.times);
  const traces = sim.signals.map((s) => ({
    label: s.watch.label,
    unit: s.watch.unit,
    values: s.values,
    pieces: s.pieces,
    paths: s.paths,
    metrics: computeMetrics(sim.times, s.values, s.pieces, circuit.analysis.settle, s.watch.threshold, events),
  }));
  releaseTables(sim.times);
  releaseGrams(sim.times);
  return {
    circuit,
    states: sim.states,
    modes: sim.modes,
    span: sim.span,
    spanChosen: sim.spanChosen,
    times: sim.times,
    traces,
    start: sim.start,
    events: sim.events,
    parts: opts.partSignals === false ? undefined : sim.parts,
    configurations: sim.configurations,
    discharge: sim.discharge,
    periodic: sim.periodic,
    crossCheck: sim.crossCheck,
    notices: sim.notices,
  };
}

export function analyzeText(text: string, file: string, opts: AnalyzeOptions = {}): RunResult {
  return analyzeCircuit(loadCircuit(text, file), opts);
}
