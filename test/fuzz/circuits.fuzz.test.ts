/**
 * Property-based runs of whole random circuits (fast-check, fixed seed so a failure reproduces):
 * connected RLC graphs of 3–12 nodes and 3–20 parts with values spread over many decades, one or
 * two sources (steps, ramps, sines) and sometimes a switch, written as .rdn text and run through
 * analyzeText (src/pipeline.ts). Each run must end with a result or an InputError — never another
 * exception — and a result must pass its own cross-check (the matrix exponential of the augmented
 * state matrix, src/simulate/crosscheck.ts, an independent method) and balance its energy.
 *
 * The energy bound. By Tellegen's theorem the energy the sources deliver equals the heat in the
 * resistors plus the change of stored energy, exactly (a textbook result, from memory); every
 * integral in energyBalance is taken in closed form, so the residual is rounding only, a few
 * hundred ulps once delivered and dissipated energy cancel over a span that covers modes many
 * decades apart. 1e-6 leaves that room and still catches any wrong coefficient, which shows up at
 * order one. Two things are outside that bookkeeping by construction (src/measure/energy.ts) and
 * are skipped: energy lost inside a switching instant (events with energyLost > 0, e.g. charge
 * sharing between capacitors) and Dirac impulses (pieces with impulseArea ≠ 0, e.g. a step across
 * a capacitor loop). Runs whose notices state a reduced accuracy are skipped for the energy bound
 * too (they still must pass the cross-check); see known-failures.test.ts.
 */
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { InputError } from '../../src/diagnostics.js';
import { energyBalance } from '../../src/measure/energy.js';
import { analyzeText } from '../../src/pipeline.js';
import type { RunResult } from '../../src/simulate/result.js';

const ENERGY_RESIDUAL = 1e-6;

/** A value of 10^e with a mantissa in [1, 10), written plainly so the text is what is tested. */
const decades = (lo: number, hi: number): fc.Arbitrary<string> =>
  fc.tuple(fc.integer({ min: lo, max: hi }), fc.integer({ min: 10, max: 99 })).map(([e, m]) => `${m / 10}e${e}`);

/** Exponent ranges of the part values: resistance Ω, capacitance F, inductance H, switch on-resistance Ω. */
export interface Ranges {
  r: [number, number];
  c: [number, number];
  l: [number, number];
  on: [number, number];
  switches: boolean;
}
type PassiveKind = 'resistor' | 'capacitor' | 'inductor';
const passiveKind = fc.constantFrom<PassiveKind>('resistor', 'capacitor', 'inductor');

const time = decades(-6, -3);
const level = fc.integer({ min: -50, max: 50 }).map(String);
const waveform = (unit: 'V' | 'A'): fc.Arbitrary<string> =>
  fc.oneof(
    fc.tuple(level, level, time, fc.option(time, { nil: undefined })).map(
      ([a, b, at, rise]) => `step from ${a}${unit} to ${b}${unit} at ${at}${rise ? ` rise ${rise}` : ''}`,
    ),
    fc.tuple(time, level, fc.option(time, { nil: undefined })).map(([at, rate, until]) => `ramp at ${at} rate ${rate}k${unit}/s${until ? ` until (${at}+${until})` : ''}`),
    fc.tuple(level, decades(1, 6), fc.integer({ min: -180, max: 180 }), time).map(
      ([amp, f, ph, at]) => `sine amplitude ${amp}${unit} freq ${f}Hz phase ${ph}deg at ${at}`,
    ),
    level.map((v) => `${v}${unit}`),
  );

interface Edge {
  a: number;
  b: number;
}

/** Random connected graph on nodes 0 (gnd) .. n−1: a random spanning tree plus extra edges. */
export const circuitText = (ranges: Ranges) => fc
  .integer({ min: 3, max: 12 })
  .chain((n) =>
    fc.record({
      n: fc.constant(n),
      tree: fc.tuple(...Array.from({ length: n - 1 }, (_, k) => fc.integer({ min: 0, max: k }))),
      extra: fc.array(fc.tuple(fc.integer({ min: 0, max: n - 1 }), fc.integer({ min: 0, max: n - 1 })), { maxLength: 20 - (n - 1) }),
      kinds: fc.array(passiveKind, { minLength: 20, maxLength: 20 }),
      values: fc.array(fc.tuple(decades(...ranges.r), decades(...ranges.c), decades(...ranges.l)), { minLength: 20, maxLength: 20 }),
      sources: fc.array(
        fc.record({
          kind: fc.constantFrom('voltage-source', 'current-source'),
          a: fc.integer({ min: 0, max: n - 1 }),
          b: fc.integer({ min: 0, max: n - 1 }),
          v: waveform('V'),
          i: waveform('A'),
        }),
        { minLength: 1, maxLength: 2 },
      ),
      sw: !ranges.switches ? fc.constant(undefined) : fc.option(
        fc.record({
          a: fc.integer({ min: 0, max: n - 1 }),
          b: fc.integer({ min: 0, max: n - 1 }),
          on: decades(...ranges.on),
          off: fc.option(decades(5, 8), { nil: undefined }),
          closes: fc.boolean(),
          at: time,
        }),
        { nil: undefined },
      ),
      span: fc.option(decades(-5, -2), { nil: undefined }),
      watch: fc.integer({ min: 1, max: n - 1 }),
      start: fc.constantFrom('settled', 'rest'),
    }),
  )
  .map((g) => {
    const node = (k: number): string => (k === 0 ? 'gnd' : `n${k}`);
    const edges: Edge[] = [...g.tree.map((p, k) => ({ a: p, b: k + 1 })), ...g.extra.map(([a, b]) => ({ a, b }))].filter((e) => e.a !== e.b);
    const lines = edges.map((e, k) => {
      const kind = g.kinds[k]!;
      const [r, c, l] = g.values[k]!;
      const value = kind === 'resistor' ? `${r}ohm` : kind === 'capacitor' ? `${c}F` : `${l}H`;
      return `${kind} ${kind === 'inductor' ? 'L' : kind[0]!.toUpperCase()}${k + 1} ${node(e.a)} -> ${node(e.b)} ${value}`;
    });
    g.sources.forEach((s, k) => {
      const b = s.a === s.b ? (s.a + 1) % g.n : s.b;
      lines.push(`${s.kind} ${s.kind === 'voltage-source' ? 'V' : 'I'}${k + 1} ${node(s.a)} -> ${node(b)} ${s.kind === 'voltage-source' ? s.v : s.i}`);
    });
    if (g.sw) {
      const b = g.sw.a === g.sw.b ? (g.sw.a + 1) % g.n : g.sw.b;
      lines.push(`switch S1 ${node(g.sw.a)} -> ${node(b)} on ${g.sw.on}ohm${g.sw.off ? ` off ${g.sw.off}ohm` : ''} ${g.sw.closes ? 'closes' : 'opens'} ${g.sw.at}`);
    }
    lines.push(`watch node ${node(g.watch)}`, 'samples 201', `start ${g.start}`);
    if (g.span) lines.push(`span ${g.span}`);
    return lines.join('\n') + '\n';
  });

type Outcome = { kind: 'input-error'; error: InputError } | { kind: 'result'; result: RunResult };

function run(text: string): Outcome {
  try {
    return { kind: 'result', result: analyzeText(text, 'fuzz.rdn') };
  } catch (e) {
    if (e instanceof InputError) return { kind: 'input-error', error: e };
    throw new Error(`analyzeText threw ${e instanceof Error ? `${e.name}: ${e.message}` : String(e)} for\n${text}`);
  }
}

/** Whether the run has energy outside the closed-form bookkeeping (see the header). */
function outsideBookkeeping(r: RunResult): boolean {
  if ((r.events ?? []).some((e) => e.energyLost > 0)) return true;
  // a run that states a reduced accuracy (its equations could not be reduced to round-off) is
  // judged by that statement, not by the round-off bound; known-failures.test.ts keeps one such case
  if (r.notices.some((n) => n.includes('could be reduced only to a relative residual'))) return true;
  return (r.parts ?? []).some((p) => [...p.voltage, ...p.current].some((piece) => piece.impulseArea !== 0));
}

/** Values over wide decades, as boards have them: 10 mΩ–10 MΩ, 1 pF–10 mF, 1 nH–10 H; an optional switch. */
const WIDE: Ranges = { r: [-2, 6], c: [-12, -3], l: [-9, 0], on: [-2, 1], switches: true };

// FUZZ_SEED and FUZZ_RUNS widen a local search (e.g. FUZZ_SEED=7 FUZZ_RUNS=600); CI keeps these.
// FUZZ_SEED=7 with 300 runs flags 14 (4.7 %; 14 % before the cross-check kept e^(M·h) − I and
// judged cancelling watches by their terms); seeds 3 and 11 stop at energy balances whose round-off
// grows with span × current (spans of minutes to a day beside nanosecond modes, kept open in
// known-failures.test.ts). Each flagged run says so, none is silent.
const PARAMS = { numRuns: Number(process.env.FUZZ_RUNS ?? 60), seed: Number(process.env.FUZZ_SEED ?? 20250301), endOnFailure: true } as const;

describe('fuzz: random RLC circuits run exactly', () => {
  it(
    'end with a result or an InputError; no run passes its cross-check with a wrong energy balance',
    () => {
      const tally = { results: 0, inputErrors: 0, balanced: 0, flagged: 0 };
      fc.assert(
        fc.property(circuitText(WIDE), (text) => {
          const o = run(text);
          if (o.kind === 'input-error') {
            tally.inputErrors++;
            return;
          }
          tally.results++;
          const r = o.result;
          // The product's promise is "no silent wrong answer": a run whose cross-check fails says
          // so (exit code 3) and is counted; a run that claims to pass must balance its energy.
          if (!r.crossCheck.passed) {
            tally.flagged++;
            return;
          }
          if (outsideBookkeeping(r) || !r.parts) return;
          const balance = energyBalance(r.circuit, r.parts);
          expect(balance.residual, `energy residual for\n${text}`).toBeLessThan(ENERGY_RESIDUAL);
          tally.balanced++;
        }),
        PARAMS,
      );
      // the generator must mostly produce circuits that run, or the property says little
      expect(tally.results).toBeGreaterThan(PARAMS.numRuns / 2);
      expect(tally.balanced).toBeGreaterThan(PARAMS.numRuns / 4);
      // and flagged failures stay the exception (known-failures.test.ts keeps the ones found)
      expect(tally.flagged).toBeLessThan(PARAMS.numRuns / 10);
    },
    Math.max(180_000, Number(process.env.FUZZ_RUNS ?? 0) * 3_000),
  );
});
