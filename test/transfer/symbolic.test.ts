/**
 * Symbolic transfer functions in the part names, each checked against the numeric H(s) (the
 * Rational rebuilt from the closed forms, and C·(sI − A)⁻¹·B + D on the state-space model) at
 * random complex s to 1e-9, with the textbook forms written from memory:
 *   series RLC, capacitor voltage: 1/(L·C·s² + R·C·s + 1)
 *   RC low-pass: 1/(R·C·s + 1)        RL high-pass: L·s/(L·s + R)
 */
import { readFileSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { describe, expect, it } from 'vitest';
import { GROUND, type Circuit } from '../../src/circuit/circuit.js';
import { loadCircuit } from '../../src/circuit/load.js';
import type { C } from '../../src/lti/complex.js';
import { evaluateSymbolic, formatSymbolic, symbolicTransfer, type SymbolicTransfer, verifiedSymbolicText, verifySymbolic } from '../../src/lti/symbolic.js';
import { evaluateRational, pathTransfers, stateSpaceTransferAt } from '../../src/lti/transfer.js';
import { buildModel } from '../../src/model/build.js';
import { currentProbe, voltageProbe } from '../../src/model/descriptor.js';
import { analyzeCircuit } from '../../src/pipeline.js';
import { formatTransfers, frequencyScale } from '../../src/report/transfer.js';

const ROOT = join(dirname(fileURLToPath(import.meta.url)), '..', '..');

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

/** Every path: symbolic H verified against the numeric Rational and, independently, the state-space model. */
function symbolicPaths(text: string, file = 'test.rdn') {
  const circuit = loadCircuit(text, file);
  const result = analyzeCircuit(circuit);
  const model = buildModel(circuit);
  const out: { watch: string; source: string; text: string; h: SymbolicTransfer }[] = [];
  for (const t of pathTransfers(result)) {
    const h = symbolicTransfer(circuit, t.watch, t.source);
    expect(h, `${t.watch} from ${t.source}`).not.toBeNull();
    const scale = frequencyScale(t.h.den);
    expect(verifySymbolic(h!, circuit, (s) => evaluateRational(t.h, s), scale, 12), `${t.watch} from ${t.source} vs Rational`).toBe(true);
    const r = readoutFor(circuit, model, t.watch);
    const j = model.ss.inputs.indexOf(t.source);
    expect(verifySymbolic(h!, circuit, (s: C) => stateSpaceTransferAt(model.ss, r, j, s), scale, 12), `${t.watch} from ${t.source} vs state space`).toBe(true);
    out.push({ watch: t.watch, source: t.source, text: formatSymbolic(h!), h: h! });
  }
  return { circuit, result, out };
}

describe('symbolic transfer functions', () => {
  it('series RLC, capacitor voltage: 1/(L1·C1·s² + R1·C1·s + 1)', () => {
    const p = join(ROOT, 'circuits', 'textbook-series-rlc.rdn');
    const { out } = symbolicPaths(readFileSync(p, 'utf8'), p);
    expect(out[0]!.text).toBe('H(s) = 1 / (L1·C1·s² + R1·C1·s + 1)');
  });

  it('RC low-pass: 1/(R1·C1·s + 1); the resistor current R1-free of G: C1·s/(R1·C1·s + 1)', () => {
    const text = 'voltage-source V1 in -> gnd step from 0V to 5V\nresistor R1 in -> out 1k\ncapacitor C1 out -> gnd 1uF\nwatch node out\nwatch current R1\nspan 5ms';
    const { out } = symbolicPaths(text);
    expect(out.find((x) => x.watch === 'v(out)')!.text).toBe('H(s) = 1 / (R1·C1·s + 1)');
    expect(out.find((x) => x.watch === 'i(R1)')!.text).toBe('H(s) = C1·s / (R1·C1·s + 1)');
  });

  it('RL high-pass: L1·s/(L1·s + R1)', () => {
    const text = 'voltage-source V1 in -> gnd step from 0V to 1V\nresistor R1 in -> out 100ohm\ninductor L1 out -> gnd 10mH\nwatch node out\nspan 1ms';
    const { out } = symbolicPaths(text);
    expect(out[0]!.text).toBe('H(s) = L1·s / (L1·s + R1)');
  });

  it('current source, capacitor current and two sources: every path verified', () => {
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
      'watch current V1',
      'span 5ms',
    ].join('\n');
    const { out } = symbolicPaths(text, 'mixed.rdn');
    expect(out.length).toBeGreaterThanOrEqual(6);
    // i(C1) from V1 is C1·s exactly (the capacitor sits straight across the source)
    expect(out.find((x) => x.watch === 'i(C1)' && x.source === 'V1')!.text).toBe('H(s) = C1·s');
  });

  it('the verification rejects a deliberately wrong expression', () => {
    const text = 'voltage-source V1 in -> gnd step from 0V to 12V\nresistor R1 in -> a 10ohm\ninductor L1 a -> out 1mH\ncapacitor C1 out -> gnd 10uF\nwatch voltage C1 as "v(C1)"\nspan 2ms';
    const { circuit, result, out } = symbolicPaths(text);
    const right = out[0]!.h;
    const t = pathTransfers(result)[0]!;
    const numeric = (s: C) => evaluateRational(t.h, s);
    const scale = frequencyScale(t.h.den);
    expect(verifySymbolic(right, circuit, numeric, scale)).toBe(true);
    // wrong: the R·C·s term doubled (2·R1·C1·s), which a textbook slip could produce
    const wrongDen = new Map(right.den);
    const rcKey = [...wrongDen.keys()].find((k) => k.startsWith('1,'))!;
    wrongDen.set(rcKey, 2 * wrongDen.get(rcKey)!);
    const wrong: SymbolicTransfer = { ...right, den: wrongDen };
    expect(formatSymbolic(wrong)).toBe('H(s) = 1 / (L1·C1·s² + 2·R1·C1·s + 1)');
    expect(verifySymbolic(wrong, circuit, numeric, scale)).toBe(false);
    // wrong by a relative 1e-7 only (a perturbed numeric reference) is still caught at 1e-9
    expect(verifySymbolic(right, circuit, (s) => {
      const v = numeric(s);
      return { re: v.re * (1 + 1e-7), im: v.im * (1 + 1e-7) };
    }, scale)).toBe(false);
    // and an expression that disagrees is never printed
    expect(verifiedSymbolicText(circuit, 'v(C1)', 'V1', (s) => ({ re: 2 * numeric(s).re, im: 2 * numeric(s).im }), scale)).toBeNull();
    expect(evaluateSymbolic(right, circuit, { re: 0, im: 0 }).re).toBeCloseTo(1, 12);
  });

  it('report: a symbolic line under the numeric one, only with the circuit, none for switches or big circuits', () => {
    const text = 'voltage-source V1 in -> gnd step from 0V to 5V\nresistor R1 in -> out 1k\ncapacitor C1 out -> gnd 1uF\nwatch node out\nspan 5ms';
    const circuit = loadCircuit(text, 'rc.rdn');
    const transfers = pathTransfers(analyzeCircuit(circuit));
    const lines = formatTransfers(transfers, circuit);
    const i = lines.findIndex((l) => l.includes('H(s) = 1000 / (s + 1000)'));
    expect(i).toBeGreaterThan(0);
    expect(lines[i + 1]).toBe('    in symbols: H(s) = 1 / (R1·C1·s + 1)');
    expect(formatTransfers(transfers).join('\n')).not.toContain('in symbols');

    const sw = 'voltage-source V1 in -> gnd 10V\nswitch S1 in -> a on 1ohm off open closes 1ms\nresistor R1 a -> out 999ohm\ncapacitor C1 out -> gnd 1uF\nwatch node out\nspan 5ms';
    const swc = loadCircuit(sw, 'sw.rdn');
    expect(formatTransfers(pathTransfers(analyzeCircuit(swc), { allConfigurations: true }), swc).join('\n')).not.toContain('in symbols');

    // five reactive parts: over the limit
    const ladder = ['voltage-source V1 n0 -> gnd step from 0V to 1V'];
    for (let k = 1; k <= 5; k++) ladder.push(`resistor R${k} n${k - 1} -> n${k} 1k`, `capacitor C${k} n${k} -> gnd 1uF`);
    ladder.push('watch node n5', 'span 50ms');
    const lc = loadCircuit(ladder.join('\n'), 'ladder.rdn');
    expect(symbolicTransfer(lc, 'v(n5)', 'V1')).toBeNull();
    expect(formatTransfers(pathTransfers(analyzeCircuit(lc)), lc).join('\n')).not.toContain('in symbols');
  });
});
