import type { Circuit } from '../../src/circuit/circuit.js';
import { computeMetrics } from '../../src/measure/metrics.js';
import { evaluatePieces } from '../../src/measure/evaluate.js';
import type { Piece, RunResult } from '../../src/simulate/result.js';

const loc = (line: number) => ({ file: 'rc.rdn', line, col: 1, length: 1 });

/** A hand-built result: 12 V step into R = 1 kΩ, C = 1 µF (τ = 1 ms), watching v(out) and the resistor current. */
export function rcResult(): RunResult {
  const circuit: Circuit = {
    title: 'RC, 12 V step',
    file: 'rc.rdn',
    nodes: ['in', 'out'],
    parts: [
      { kind: 'voltage-source', name: 'V1', a: 'in', b: 'gnd', value: 0, waveform: { terms: [{ kind: 'step', from: 0, to: 12, at: 0, rise: 0 }] }, loc: loc(1) },
      { kind: 'resistor', name: 'R1', a: 'in', b: 'out', value: 1000, loc: loc(2) },
      { kind: 'capacitor', name: 'C1', a: 'out', b: 'gnd', value: 1e-6, initial: 0, loc: loc(3) },
    ],
    watches: [
      { target: { kind: 'node', node: 'out' }, label: 'v(out)', unit: 'V', loc: loc(4) },
      { target: { kind: 'part-current', part: 'R1' }, label: 'i(R1), "charge"', unit: 'A', loc: loc(5) },
    ],
    analysis: { span: 5e-3, samples: 101, settle: { kind: 'relative', fraction: 0.02 }, start: 'settled', derating: 0.8 },
    params: {},
  };
  const n = 101;
  const times = new Float64Array(n).map((_, i) => (5e-3 * i) / (n - 1));
  const band = circuit.analysis.settle;
  const vPieces: Piece[] = [{ t0: 0, t1: Infinity, impulseArea: 0, terms: [{ kind: 'exp', lambda: 0, coef: 12 }, { kind: 'exp', lambda: -1000, coef: -12 }] }];
  const iPieces: Piece[] = [{ t0: 0, t1: Infinity, impulseArea: 0, terms: [{ kind: 'exp', lambda: -1000, coef: 0.012 }] }];
  const vValues = times.map((t) => evaluatePieces(vPieces, t));
  const iValues = times.map((t) => evaluatePieces(iPieces, t));
  return {
    circuit,
    states: [{ name: 'v(C1)', part: 'C1', kind: 'capacitor-voltage' }],
    modes: [{ kind: 'real', lambda: -1000, tau: 1e-3 }],
    span: 5e-3,
    spanChosen: false,
    times,
    traces: [
      {
        label: 'v(out)',
        unit: 'V',
        values: vValues,
        pieces: vPieces,
        paths: [
          {
            source: 'V1',
            impulse: { terms: [{ kind: 'exp', lambda: -1000, coef: 1000 }], directArea: 0, derivArea: 0 },
            step: { terms: [{ kind: 'exp', lambda: 0, coef: 1 }, { kind: 'exp', lambda: -1000, coef: -1 }], stepImpulseArea: 0 },
            dcGain: 1,
          },
        ],
        metrics: computeMetrics(times, vValues, vPieces, band),
      },
      {
        label: 'i(R1), "charge"',
        unit: 'A',
        values: iValues,
        pieces: iPieces,
        paths: [
          {
            source: 'V1',
            impulse: { terms: [{ kind: 'exp', lambda: -1000, coef: -1 }], directArea: 1e-3, derivArea: 0 },
            step: { terms: [{ kind: 'exp', lambda: -1000, coef: 1e-3 }], stepImpulseArea: 0 },
            dcGain: 0,
          },
        ],
        metrics: computeMetrics(times, iValues, iPieces, band),
      },
    ],
    crossCheck: { method: 'matrix exponential', times: [1e-3, 2e-3], maxRelError: 3e-15, tolerance: 1e-9, passed: true },
    notices: [],
  };
}
