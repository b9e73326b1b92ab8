/**
 * Reference: scipy.signal.lsim golden data (first-order hold; cross-checked against
 * scipy.linalg.expm to ~1e-14 inside the script), produced by test/golden/make_golden.py from
 * state-space models written by hand from Kirchhoff's laws. The .rdn files in circuits/reference/
 * describe the same circuits in our language.
 *
 * Tolerance: 1e-9 relative to the signal's peak magnitude over the span (exact closed-form path).
 */
import { readFileSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { describe, expect, it } from 'vitest';

/** Imported lazily so the reference-only checks in this file run even when the solver is broken. */
const loadPipeline = () => import('../../src/pipeline.js');

const ROOT = join(dirname(fileURLToPath(import.meta.url)), '..', '..');
const REL_TOL = 1e-9;

interface Golden {
  name: string;
  rdn: string;
  span: number;
  samples: number;
  times: number[];
  signals: { label: string; peak: number; values: number[] }[];
}

const CASES = ['rc-ladder-12', 'lc-ladder-6', 'two-loop-rlc'];

function loadGolden(name: string): Golden {
  return JSON.parse(readFileSync(join(ROOT, 'test', 'golden', `${name}.json`), 'utf8')) as Golden;
}

describe('scipy.signal.lsim golden data', () => {
  for (const name of CASES) {
    it(`${name}: every sample within 1e-9 of the peak magnitude`, async () => {
      const golden = loadGolden(name);
      const file = join(ROOT, golden.rdn);
      const text = readFileSync(file, 'utf8');
      const { analyzeText } = await loadPipeline();
      const result = analyzeText(text, file, { span: golden.span, samples: golden.samples });

      expect(result.times.length).toBe(golden.samples);
      for (let i = 0; i < golden.samples; i++) {
        expect(Math.abs(result.times[i]! - golden.times[i]!)).toBeLessThanOrEqual(1e-12 * golden.span);
      }
      expect(result.traces.length).toBe(golden.signals.length);

      golden.signals.forEach((sig, j) => {
        const trace = result.traces[j]!;
        expect(trace.label).toBe(sig.label);
        expect(trace.values.length).toBe(golden.samples);
        let worst = 0;
        let worstAt = -1;
        for (let i = 0; i < golden.samples; i++) {
          const err = Math.abs(trace.values[i]! - sig.values[i]!) / sig.peak;
          if (!(err <= worst)) {
            worst = err;
            worstAt = i;
          }
        }
        expect(
          worst,
          `${name} ${sig.label}: worst relative error ${worst.toExponential(3)} at t = ${golden.times[worstAt]} ` +
            `(got ${trace.values[worstAt]}, expected ${sig.values[worstAt]})`,
        ).toBeLessThanOrEqual(REL_TOL);
      });
    });
  }

  it('the golden data itself is sane (independent of ringdown): known DC end points, Kirchhoff', () => {
    // RC ladder: no DC load, every node tends to the 5 V source (Kirchhoff, from memory).
    const rc = loadGolden('rc-ladder-12');
    // The slowest mode (τ ≈ 0.6 ms) has not quite died out after 3 ms.
    for (const s of rc.signals) expect(Math.abs(s.values.at(-1)! - 5)).toBeLessThan(0.1);
    // LC ladder: DC divider 5 Ω / (6·0.5 Ω + 5 Ω) of 10 V = 6.25 V; input current 10 V / 8 Ω.
    const lc = loadGolden('lc-ladder-6');
    expect(Math.abs(lc.signals[0]!.values.at(-1)! - 6.25)).toBeLessThan(1e-3);
    expect(Math.abs(lc.signals[1]!.values.at(-1)! - 1.25)).toBeLessThan(1e-3);
    // Two-loop: initial state as declared in the netlist.
    const tl = loadGolden('two-loop-rlc');
    expect(tl.signals.map((s) => s.values[0])).toEqual([3, 0, 0.5, -0.2]);
    // ... and the DC end point 10 V / (2 + 1 + 8) Ω through both inductors.
    const iDc = 10 / 11;
    const dc = [9 * iDc, 8 * iDc, iDc, iDc];
    tl.signals.forEach((s, j) => expect(Math.abs(s.values.at(-1)! - dc[j]!)).toBeLessThan(1e-3));
  });
});
