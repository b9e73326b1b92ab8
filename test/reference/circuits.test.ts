/**
 * Every shipped example circuit loads and runs, and the scenarios with a first-order closed form
 * match it (first-order linear ODE solutions, textbook formula from memory) at 1e-9 relative to the
 * signal's peak magnitude.
 */
import { readFileSync, readdirSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { describe, expect, it } from 'vitest';
import type { RunResult } from '../../src/simulate/result.js';

const ROOT = join(dirname(fileURLToPath(import.meta.url)), '..', '..');
const REL_TOL = 1e-9;

async function runFile(rel: string): Promise<RunResult> {
  const { analyzeText } = await import('../../src/pipeline.js');
  const file = join(ROOT, rel);
  return analyzeText(readFileSync(file, 'utf8'), file);
}

function worst(values: Float64Array, times: Float64Array, f: (t: number) => number): number {
  const want = Array.from(times, f);
  const peak = Math.max(...want.map(Math.abs));
  let w = 0;
  want.forEach((x, i) => (w = Math.max(w, Math.abs(values[i]! - x) / peak)));
  return w;
}

const files = [
  ...readdirSync(join(ROOT, 'circuits')).filter((f) => f.endsWith('.rdn')).map((f) => `circuits/${f}`),
  ...readdirSync(join(ROOT, 'circuits', 'reference')).filter((f) => f.endsWith('.rdn')).map((f) => `circuits/reference/${f}`),
];

describe('example circuits', () => {
  for (const f of files) {
    it(`${f} loads and runs; every value finite, one trace per watch`, async () => {
      const res = await runFile(f);
      expect(res.traces.length).toBe(res.circuit.watches.length);
      expect(res.times.length).toBe(res.circuit.analysis.samples);
      for (const tr of res.traces) for (const v of tr.values) expect(Number.isFinite(v)).toBe(true);
    });
  }

  it('state counts: one per independent capacitor voltage or inductor current (Kirchhoff, from memory)', async () => {
    expect((await runFile('circuits/hotplug-inrush.rdn')).states.length).toBe(2);
    expect((await runFile('circuits/lc-input-filter.rdn')).states.length).toBe(3);
    expect((await runFile('circuits/reset-delay.rdn')).states.length).toBe(1);
    expect((await runFile('circuits/relay-freewheel.rdn')).states.length).toBe(1);
  });

  it('relay-freewheel: i = 50 mA·e^(−t/τ), τ = L/(Rcoil + Rfw); collector = 24 V + Rfw·i', async () => {
    const res = await runFile('circuits/relay-freewheel.rdn');
    const tau = 0.5 / 1480;
    const i = (t: number) => 0.05 * Math.exp(-t / tau);
    expect(worst(res.traces[0]!.values, res.times, i)).toBeLessThanOrEqual(REL_TOL);
    expect(worst(res.traces[1]!.values, res.times, (t) => 24 + 1000 * i(t))).toBeLessThanOrEqual(REL_TOL);
    expect(worst(res.traces[2]!.values, res.times, (t) => 1000 * i(t))).toBeLessThanOrEqual(REL_TOL);
  });

  it('reset-delay: RC with leakage driven by a 200 µs ramp to 3.3 V', async () => {
    const res = await runFile('circuits/reset-delay.rdn');
    // C v' = (u − v)/R − v/Rleak  →  v' = b·u − a·v,  b = 1/(RC), a = b + 1/(Rleak·C)
    const R = 100e3;
    const C = 100e-9;
    const Rleak = 10e6;
    const b = 1 / (R * C);
    const a = b + 1 / (Rleak * C);
    const tr = 200e-6;
    const k = 3.3 / tr;
    // ramp u = k·t: v = (b·k/a)·(t − (1 − e^(−a t))/a); after tr: v∞ + (v(tr) − v∞)·e^(−a(t − tr))
    const ramp = (t: number) => ((b * k) / a) * (t + Math.expm1(-a * t) / a);
    const vInf = (b * 3.3) / a;
    const v = (t: number) => (t <= tr ? ramp(t) : vInf + (ramp(tr) - vInf) * Math.exp(-a * (t - tr)));
    expect(worst(res.traces[0]!.values, res.times, v)).toBeLessThanOrEqual(REL_TOL);
    expect(worst(res.traces[1]!.values, res.times, (t) => (t < tr ? k * t : 3.3))).toBeLessThanOrEqual(REL_TOL);
    // the reset releases (0.7·Vdd, common practice for a CMOS input-high threshold) near 1.2·RC
    const idx = res.traces[0]!.values.findIndex((x) => x >= 0.7 * 3.3);
    expect(res.times[idx]!).toBeGreaterThan(11e-3);
    expect(res.times[idx]!).toBeLessThan(13e-3);
  });
});
