// One benchmark case in its own process (bench/run.js kills it when it runs too long).
// Prints progress lines "STAGE <name> <seconds>" as stages finish, then "RESULT <json>".
//   node bench/case.js circuit <case> <states> <samples> <runs> <outJson>
//   node bench/case.js pwm <file.rdn> <runs> <outJson>
//   node bench/case.js eig <n> <runs> <outJson> [ml]
// The pipeline is timed as analyzeText(text, file, { partSignals: false }): samples and the watched
// signals' closed forms only, without the per-part closed forms that only the text report needs.
// The first call in the fresh process is reported on its own (firstCallSeconds: JIT warm-up
// included); then 3 warm-up calls (shown as stages, not counted); oursSeconds is the median of the
// `runs` calls after those.
import { readFileSync, writeFileSync } from 'node:fs';
import { performance } from 'node:perf_hooks';
import { CASES, randomMatrix } from './circuits.js';

const dist = new URL('../dist/', import.meta.url);
const load = (p) => import(new URL(p, dist).href);
const median = (xs) => {
  const s = [...xs].sort((a, b) => a - b);
  return s.length % 2 ? s[(s.length - 1) / 2] : (s[s.length / 2 - 1] + s[s.length / 2]) / 2;
};
const stage = (name, seconds) => console.log(`STAGE ${name} ${seconds.toFixed(4)}`);
const timed = (name, f) => {
  const t0 = performance.now();
  const v = f();
  stage(name, (performance.now() - t0) / 1000);
  return v;
};

/**
 * Writes the model ringdown built, for the reference: A, B, and per watched node C and D, with our
 * samples. The references assume ξ = x and no impulse in the read-outs (Bx1 = 0, D1 = 0).
 */
function exportModel(out, circuit, model, result, voltageProbe, extra) {
  const { ss } = model;
  const readouts = circuit.watches.map((w) => model.readout(voltageProbe(model.descriptor, w.target.node, 'gnd')));
  const bx1 = ss.Bx1.flat().some((v) => Math.abs(v) > 1e-9);
  const d1 = readouts.some((r) => r.D1.some((v) => Math.abs(v) > 1e-9));
  if (bx1 || d1) throw new Error('bench circuits must have Bx1 = 0 and D1 = 0 (a resistor between source and storage)');
  const data = { A: ss.A, B: ss.B, C: readouts.map((r) => r.C), D: readouts.map((r) => r.D), ...extra };
  writeFileSync(out, JSON.stringify({ ...data, times: Array.from(result.times), ours: result.traces.map((t) => Array.from(t.values)) }));
}

const [kind, ...args] = process.argv.slice(2);
/** untimed calls after the first one, while V8's optimizing compiler catches up */
const WARMUP = 3;

if (kind === 'circuit') {
  const [name, statesS, samplesS, runsS, out] = args;
  const states = Number(statesS);
  const samples = Number(samplesS);
  const runs = Number(runsS);
  const text = CASES[name](states, samples);
  const { loadCircuit } = await load('circuit/load.js');
  const { buildModel } = await load('model/build.js');
  const { modalDecomposition } = await load('lti/modal.js');
  const { voltageProbe } = await load('model/descriptor.js');
  const { analyzeText } = await load('pipeline.js');
  const { simulate } = await load('simulate/run.js');

  // the first call in this fresh process (what a single command-line run pays, JIT warm-up included)
  const c0 = performance.now();
  analyzeText(text, `${name}.rdn`, { partSignals: false });
  const firstCall = (performance.now() - c0) / 1000;
  stage('firstCall', firstCall);
  // stage by stage, once (the current simulate() builds the model and modal form itself again)
  const circuit = timed('loadCircuit', () => loadCircuit(text, `${name}.rdn`));
  const model = timed('buildModel', () => buildModel(circuit));
  const { ss } = model;
  console.log(`STATES ${ss.n}`);
  timed('modalDecomposition', () => modalDecomposition(ss.A));
  // simulate(circuit) in the current pipeline builds the model and the modal form itself
  timed('simulate', () => simulate(circuit, { partSignals: false }));
  // whole pipeline (load → model → modal → exact solution → cross-check → metrics): WARMUP calls
  // while the JIT settles (timed and shown, not counted), then `runs` timed calls
  for (let k = 0; k < WARMUP; k++) timed(`warmup#${k + 1}`, () => analyzeText(text, `${name}.rdn`, { partSignals: false }));
  const totals = [];
  let result;
  for (let k = 0; k < runs; k++) {
    const t0 = performance.now();
    result = analyzeText(text, `${name}.rdn`, { partSignals: false });
    totals.push((performance.now() - t0) / 1000);
    stage(`analyzeText#${k + 1}`, totals[k]);
  }
  // the eigen-decomposition of this circuit's state matrix alone, as the modal stage calls it
  const { eig } = await load('linalg/eig.js');
  const eigTimes = [];
  // untimed warm-up calls, as for the pipeline (the general route is not always the one the
  // pipeline's modal stage took, so it may still be cold here)
  for (let k = 0; k < WARMUP; k++) eig(ss.A);
  for (let k = 0; k < Math.max(runs, 3); k++) {
    const t0 = performance.now();
    eig(ss.A);
    eigTimes.push((performance.now() - t0) / 1000);
  }
  stage('eigOfStateMatrix', median(eigTimes));
  // export the same model for the reference: ξ' = Aξ + Bu, y = Cξ + Du, ξ(0) = 0, u = 1 for t > 0
  exportModel(out, circuit, model, result, voltageProbe, {});
  console.log(`RESULT ${JSON.stringify({ states: ss.n, samples: result.times.length, oursSeconds: median(totals), firstCallSeconds: firstCall, eigSeconds: median(eigTimes), crossCheck: result.crossCheck?.maxRelError })}`);
} else if (kind === 'pwm') {
  // one pulse-train source into a small filter; the reference needs the pulse itself, not only the model
  const [file, runsS, out] = args;
  const runs = Number(runsS);
  const text = readFileSync(file, 'utf8');
  const { loadCircuit } = await load('circuit/load.js');
  const { buildModel } = await load('model/build.js');
  const { voltageProbe } = await load('model/descriptor.js');
  const { analyzeText } = await load('pipeline.js');
  const c0 = performance.now();
  analyzeText(text, file, { partSignals: false });
  const firstCall = (performance.now() - c0) / 1000;
  stage('firstCall', firstCall);
  const circuit = loadCircuit(text, file);
  const model = buildModel(circuit);
  const { ss } = model;
  console.log(`STATES ${ss.n}`);
  for (let k = 0; k < WARMUP; k++) timed(`warmup#${k + 1}`, () => analyzeText(text, file, { partSignals: false }));
  const totals = [];
  let result;
  for (let k = 0; k < runs; k++) {
    const t0 = performance.now();
    result = analyzeText(text, file, { partSignals: false });
    totals.push((performance.now() - t0) / 1000);
    stage(`analyzeText#${k + 1}`, totals[k]);
  }
  const pulses = ss.inputs.map((name) => {
    const terms = circuit.parts.find((p) => p.name === name)?.waveform?.terms ?? [];
    if (terms.length !== 1 || terms[0].kind !== 'pulse') throw new Error(`bench pwm: source ${name} must be one pulse term`);
    const { low, high, period, width, rise, fall, start, cycles } = terms[0];
    return { low, high, period, width, rise, fall, start, cycles: Number.isFinite(cycles) ? cycles : null };
  });
  exportModel(out, circuit, model, result, voltageProbe, { pulses });
  console.log(`RESULT ${JSON.stringify({ states: ss.n, samples: result.times.length, oursSeconds: median(totals), firstCallSeconds: firstCall, crossCheck: result.crossCheck?.maxRelError })}`);
} else if (kind === 'eig') {
  const [nS, runsS, out, withMl] = args;
  const n = Number(nS);
  const runs = Number(runsS);
  const { eig } = await load('linalg/eig.js');
  const A = randomMatrix(n);
  const times = [];
  let r;
  // untimed warm-up calls (JIT), as for the pipeline; numpy gets one untimed call too
  for (let k = 0; k < WARMUP; k++) eig(A);
  for (let k = 0; k < runs; k++) {
    const t0 = performance.now();
    r = eig(A);
    times.push((performance.now() - t0) / 1000);
    stage(`eig#${k + 1}`, times[k]);
  }
  let mlSeconds = null;
  if (withMl === 'ml') {
    const { EigenvalueDecomposition, Matrix } = await import('ml-matrix');
    const mt = [];
    for (let k = 0; k < Math.min(runs, 3); k++) {
      const t0 = performance.now();
      new EigenvalueDecomposition(new Matrix(A), { assumeSymmetric: false });
      mt.push((performance.now() - t0) / 1000);
      stage(`ml-matrix#${k + 1}`, mt[k]);
    }
    mlSeconds = median(mt);
  }
  // residual ‖AV − VD‖_F/‖A‖_F
  let num = 0;
  let na = 0;
  for (let i = 0; i < n; i++) {
    const Ai = A[i];
    for (let j = 0; j < n; j++) {
      na += Ai[j] * Ai[j];
      let av = 0;
      for (let k = 0; k < n; k++) av += Ai[k] * r.V[k][j];
      let vd = r.V[i][j] * r.re[j];
      if (r.im[j] > 0) vd -= r.V[i][j + 1] * r.im[j];
      else if (r.im[j] < 0) vd -= r.V[i][j - 1] * r.im[j];
      num += (av - vd) ** 2;
    }
  }
  writeFileSync(out, JSON.stringify({ A, re: r.re, im: r.im }));
  console.log(`RESULT ${JSON.stringify({ states: n, oursSeconds: median(times), mlSeconds, residual: Math.sqrt(num / na) })}`);
} else {
  console.error('usage: node bench/case.js circuit|pwm|eig ...');
  process.exit(2);
}
