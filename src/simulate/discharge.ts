import type { Circuit } from '../circuit/circuit.js';
import { buildModel } from '../model/build.js';
import { modalDecomposition } from '../lti/modal.js';
import { groupTerms, termsValue, type Groups } from '../lti/term.js';
import type { InputSchedule } from '../waveform/schedule.js';
import { configure, isClosedAt, switchesOf } from './configure.js';
import { solveExact } from './solve.js';

/**
 * How long each capacitor takes to fall below a safe voltage once the sources are removed at the
 * end of the span (voltage and current sources become open circuits; switches stay as they are):
 * the zero-input response from the capacitor voltages and inductor currents at that moment, in
 * closed form, and its last crossing of the safe level found by bisection on the closed form.
 */
export interface DischargeInfo {
  part: string;
  /** capacitor voltage when the sources are removed */
  from: number;
  safeVoltage: number;
  /** seconds until |v| stays below safeVoltage; 0 when already below; null when it never gets there */
  time: number | null;
}

/** 60 V DC: a commonly used safe-to-touch level for DC (common practice, from memory). */
export const SAFE_DC_VOLTAGE = 60;

export function dischargeTimes(circuit: Circuit, values: Map<string, number>, span: number, safeVoltage = SAFE_DC_VOLTAGE): DischargeInfo[] {
  const caps = circuit.parts.filter((p) => p.kind === 'capacitor');
  if (caps.length === 0) return [];
  // A passive source-free circuit never gains energy, so a capacitor C can never again exceed
  // √(2E/C), E the energy stored when the sources go: below the level already and unable to get
  // above it means a time of 0 without any analysis
  let stored = 0;
  for (const p of circuit.parts) {
    if (p.kind === 'capacitor' || p.kind === 'inductor') stored += 0.5 * p.value * (values.get(p.name) ?? 0) ** 2;
  }
  const canExceed = (c: { name: string; value: number }) => Math.abs(values.get(c.name) ?? 0) >= safeVoltage || Math.sqrt((2 * stored) / c.value) >= safeVoltage;
  if (!caps.some(canExceed)) return caps.map((c) => ({ part: c.name, from: values.get(c.name) ?? 0, safeVoltage, time: 0 }));
  const closed = new Set(switchesOf(circuit).filter((p) => isClosedAt(p, span)).map((p) => p.name));
  const withSwitches = configure(circuit, closed).circuit;
  const parts = withSwitches.parts.filter((p) => p.kind !== 'voltage-source' && p.kind !== 'current-source');
  const used = new Set(parts.flatMap((p) => [p.a, p.b]));
  const bare: Circuit = { ...withSwitches, parts, nodes: withSwitches.nodes.filter((n) => used.has(n)) };
  let model;
  try {
    model = buildModel(bare);
  } catch {
    return caps.map((c) => ({ part: c.name, from: values.get(c.name) ?? 0, safeVoltage, time: null }));
  }
  const init = model.initialState(values, [], []);
  const modal = modalDecomposition(model.ss.A);
  const slowest = Math.max(0, ...modal.blocks.flatMap((b) => b.eig.map((e) => (e.re < 0 ? -1 / e.re : Infinity))));
  const readouts = model.storage.filter((s) => s.kind === 'capacitor-voltage');
  const fromOf = (name: string) => values.get(name) ?? 0;
  if (!Number.isFinite(slowest)) return readouts.map((st) => ({ part: st.part.name, from: fromOf(st.part.name), safeVoltage, time: null }));
  // the horizon: long enough for the slowest mode to take any voltage below the level
  const vmax = Math.max(...readouts.map((st) => Math.abs(fromOf(st.part.name))), Math.sqrt((2 * stored) / Math.min(...caps.map((c) => c.value))));
  const horizon = slowest * Math.max(1, Math.log((vmax * 1e3 + 1) / safeVoltage)) * 4;
  const sched: InputSchedule = { intervals: [{ t0: 0, t1: horizon, components: [], slopes: [] }], diracs: [], jumps: [], outside: [], approximation: [] };
  const needed = readouts.filter((st) => canExceed({ name: st.part.name, value: st.part.value }));
  // one exact solution for every capacitor that needs one
  const solved = solveExact(model.ss, modal, needed.map((st) => st.readout), sched, init.x, horizon).pieces;
  const N = 4096;
  const ys = new Float64Array(N + 1);
  return readouts.map((st) => {
    const from = fromOf(st.part.name);
    const q = needed.indexOf(st);
    if (q < 0) return { part: st.part.name, from, safeVoltage, time: 0 };
    const terms = solved[q][0].terms;
    const v = (t: number) => termsValue(terms, t);
    if (Math.abs(v(horizon)) >= safeVoltage) return { part: st.part.name, from, safeVoltage, time: null };
    // last time |v| ≥ level: scan backwards on a fine grid, then bisect
    scanGrid(groupTerms(terms), horizon, N, ys);
    let hi = 0;
    let lo = 0;
    for (let k = N; k >= 0; k--) {
      const t = (horizon * k) / N;
      if (Math.abs(ys[k]!) >= safeVoltage) {
        lo = t;
        hi = Math.min(horizon, (horizon * (k + 1)) / N);
        break;
      }
    }
    for (let k = 0; k < 200 && hi - lo > 1e-15 * hi; k++) {
      const mid = (lo + hi) / 2;
      if (Math.abs(v(mid)) >= safeVoltage) lo = mid;
      else hi = mid;
    }
    return { part: st.part.name, from, safeVoltage, time: hi };
  });
}

/**
 * Σ groups at t_k = horizon·k/N, k = 0 … N, into out: each group's e^(κ·t) advanced by one complex
 * multiplication per point, from an exact e^(κ·t_k) every 32 points (as sample.ts), not one
 * exponential per term and point. Only the bracket of the last crossing comes from these values;
 * the crossing itself is bisected on the closed form.
 */
function scanGrid(g: Groups, horizon: number, N: number, out: Float64Array): void {
  out.fill(0);
  const h = horizon / N;
  for (let q = 0; q < g.n; q++) {
    const a = g.kr[q]!;
    const w = g.ki[q]!;
    const o0 = g.off[q]!;
    const o1 = g.off[q + 1]!;
    const m = Math.exp(a * h);
    const zr = m * Math.cos(w * h);
    const zi = m * Math.sin(w * h);
    let er = 1;
    let ei = 0;
    for (let k = 0; k <= N; k++) {
      const t = (horizon * k) / N;
      if (k % 32 === 0) {
        const e = Math.exp(a * t);
        er = e * Math.cos(w * t);
        ei = e * Math.sin(w * t);
      }
      let pr = 0;
      let pi = 0;
      for (let i = o1 - 1; i >= o0; i--) {
        pr = pr * t + g.cr[i]!;
        pi = pi * t + g.ci[i]!;
      }
      out[k] += pr * er - pi * ei;
      const nr = er * zr - ei * zi;
      ei = er * zi + ei * zr;
      er = nr;
    }
  }
}
