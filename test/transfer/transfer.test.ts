/**
 * H(s) rebuilt from the closed-form impulse responses, checked against an independent evaluation
 * of C·(sI − A)⁻¹·B + D + D1·s on the state-space model, and against textbook transfer functions
 * (series RLC: H(s) = ω₀²/(s² + (R/L)s + ω₀²), ω₀² = 1/(LC); RC low-pass: 1/(1 + sRC)).
 */
import { readFileSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { describe, expect, it } from 'vitest';
import { GROUND, type Circuit } from '../../src/circuit/circuit.js';
import { loadCircuit } from '../../src/circuit/load.js';
import type { C } from '../../src/lti/complex.js';
import { evaluateRational, pathTransfers, stateSpaceTransferAt } from '../../src/lti/transfer.js';
import { buildModel } from '../../src/model/build.js';
import { currentProbe, voltageProbe } from '../../src/model/descriptor.js';
import { analyzeCircuit } from '../../src/pipeline.js';
import { configure } from '../../src/simulate/configure.js';
import { formatTransfer, formatTransfers } from '../../src/report/transfer.js';

const ROOT = join(dirname(fileURLToPath(import.meta.url)), '..', '..');
const REL = 1e-9;

/** Deterministic pseudo-random numbers (a linear congruential generator), so failures repeat. */
function rng(seed: number) {
  let x = seed >>> 0;
  return () => {
    x = (Math.imul(x, 1664525) + 1013904223) >>> 0;
    return x / 2 ** 32;
  };
}

function readoutFor(c: Circuit, model: ReturnType<typeof buildModel>, label: string) {
  const w = c.watches.find((x) => x.label === label)!;
  const d = model.descriptor;
  const t = w.target;
  const part = (n: string) => c.parts.find((p) => p.name === n)!;
  switch (t.kind) {
    case 'node':
      return model.readout(voltageProbe(d, t.node, GROUND));
    case 'between':
      return model.readout(voltageProbe(d, t.a, t.b));
    case 'part-voltage':
      return model.readout(voltageProbe(d, part(t.part).a, part(t.part).b));
    case 'part-current':
      return model.readout(currentProbe(d, part(t.part)));
  }
}

function rel(a: C, b: C): number {
  return Math.hypot(a.re - b.re, a.im - b.im) / Math.hypot(b.re, b.im);
}

/** Checks every path of the circuit's final configuration at 40 random complex s, away from poles. */
function checkAgainstStateSpace(text: string, file: string, closed?: string[]) {
  const circuit = loadCircuit(text, file);
  const result = analyzeCircuit(circuit);
  const final = closed ? configure(circuit, new Set(closed)).circuit : circuit;
  const model = buildModel(final);
  const transfers = pathTransfers(result);
  expect(transfers.length).toBeGreaterThan(0);
  const poles = result.modes.map((m) => (m.kind === 'oscillatory' ? m.wn : Math.abs(m.lambda))).filter((x) => x > 0);
  const scale = poles.length ? Math.exp(poles.reduce((a, p) => a + Math.log(p), 0) / poles.length) : 1;
  const rand = rng(12345);
  let checked = 0;
  for (const t of transfers) {
    const r = readoutFor(final, model, t.watch);
    const j = model.ss.inputs.indexOf(t.source);
    for (let k = 0; k < 40; k++) {
      const s = { re: scale * (4 * rand() - 2), im: scale * (4 * rand() - 2) };
      const want = stateSpaceTransferAt(model.ss, r, j, s);
      if (Math.hypot(want.re, want.im) === 0) continue;
      expect(rel(evaluateRational(t.h, s), want), `${t.watch} from ${t.source} at s = ${s.re}+j${s.im}`).toBeLessThan(REL);
      checked++;
    }
  }
  expect(checked).toBeGreaterThan(0);
  return { result, transfers };
}

const file = (name: string) => {
  const p = join(ROOT, 'circuits', name);
  return { text: readFileSync(p, 'utf8'), path: p };
};

describe('transfer functions from the closed forms', () => {
  for (const name of ['textbook-series-rlc.rdn', 'textbook-critical-rlc.rdn', 'lc-input-filter.rdn', 'reset-delay.rdn', 'relay-freewheel.rdn', 'hotplug-inrush.rdn', 'rail-load-step.rdn']) {
    it(`${name}: every path agrees with C(sI − A)⁻¹B + D to 1e-9`, () => {
      const f = file(name);
      checkAgainstStateSpace(f.text, f.path);
    });
  }

  it('a capacitor straight across a source (derivative feed-through) and an integrating current source', () => {
    const text = [
      'voltage-source V1 a -> gnd step from 0V to 1V',
      'capacitor C1 a -> gnd 1uF',
      'resistor R1 a -> b 1k',
      'capacitor C2 b -> gnd 100nF',
      'current-source I1 gnd -> c step from 0A to 1mA',
      'capacitor C3 c -> gnd 1uF',
      'resistor R3 c -> b 10k',
      'watch current C1',
      'watch node c',
      'watch node b',
      'span 5ms',
    ].join('\n');
    const { transfers } = checkAgainstStateSpace(text, 'mixed.rdn');
    // i(C1) from V1 contains C1·s: the numerator has a degree above the denominator's
    const ic = transfers.find((t) => t.watch === 'i(C1)' && t.source === 'V1')!;
    expect(ic.h.num.length).toBeGreaterThan(ic.h.den.length);
  });

  it('series RLC matches the textbook second-order form ω₀²/(s² + (R/L)s + ω₀²)', () => {
    const f = file('textbook-series-rlc.rdn');
    const { transfers } = checkAgainstStateSpace(f.text, f.path);
    const h = transfers[0]!.h;
    // R = 10 Ω, L = 1 mH, C = 10 µF (from the file): R/L = 1e4, 1/(LC) = 1e8
    const n = h.den.length - 1;
    expect(n).toBe(2);
    expect(h.den[1]).toBeCloseTo(1e4, 3);
    expect(Math.abs(h.den[0]! - 1e8) / 1e8).toBeLessThan(1e-9);
    expect(Math.abs(h.num[0]! - 1e8) / 1e8).toBeLessThan(1e-9);
    expect(formatTransfer(transfers[0]!)).toContain('H(s) = 1e8 / (s² + 1e4·s + 1e8)');
  });

  it('critically damped RLC: the double pole comes out as (s + ω₀)², degree 2', () => {
    const f = file('textbook-critical-rlc.rdn');
    const { transfers } = checkAgainstStateSpace(f.text, f.path);
    const h = transfers[0]!.h;
    // ω₀ = 1/√(LC) = 1e4 rad/s: (s + 1e4)² = s² + 2e4·s + 1e8
    expect(h.den.length).toBe(3);
    expect(Math.abs(h.den[1]! - 2e4) / 2e4).toBeLessThan(1e-6);
    expect(Math.abs(h.den[0]! - 1e8) / 1e8).toBeLessThan(1e-6);
  });

  it('RC low-pass: 1/(1 + sRC), written with units', () => {
    const text = 'voltage-source V1 in -> gnd step from 0V to 5V\nresistor R1 in -> out 1k\ncapacitor C1 out -> gnd 1uF\nwatch node out\nwatch current R1\nspan 5ms';
    const { transfers } = checkAgainstStateSpace(text, 'rc.rdn');
    const v = transfers.find((t) => t.watch === 'v(out)')!;
    expect(formatTransfer(v)).toContain('H(s) = 1000 / (s + 1000)');
    expect(formatTransfer(v)).toContain('V/V');
    const i = transfers.find((t) => t.watch === 'i(R1)')!;
    // i(R1) = V/(R + 1/(sC)) = (1/R)·s/(s + 1/(RC)): units A/V
    expect(formatTransfer(i)).toContain('A/V');
    expect(formatTransfer(i)).toMatch(/H\(s\) = 0\.001·s \/ \(s \+ 1000\)/);
    expect(formatTransfers(pathTransfers(analyzeCircuit(loadCircuit(text, 'rc.rdn')))).join('\n')).toContain('v(out)');
  });

  it('circuit with switches: the configuration in force at the end (switch closed at 1 ms)', () => {
    const text = 'voltage-source V1 in -> gnd 10V\nswitch S1 in -> a on 1ohm off open closes 1ms\nresistor R1 a -> out 999ohm\ncapacitor C1 out -> gnd 1uF\nwatch node out\nspan 5ms';
    const { transfers } = checkAgainstStateSpace(text, 'sw.rdn', ['S1']);
    expect(transfers.every((t) => t.from === 1e-3)).toBe(true);
    // R = 1 Ω + 999 Ω, C = 1 µF: 1/(RC) = 1000
    expect(formatTransfer(transfers[0]!)).toContain('H(s) = 1000 / (s + 1000)');
  });

  it('a source cut off by an open switch has H(s) = 0', () => {
    const f = file('bleeder-discharge.rdn');
    const transfers = pathTransfers(analyzeCircuit(loadCircuit(f.text, f.path)));
    for (const t of transfers) expect(formatTransfer(t)).toContain('H(s) = 0');
  });
});
