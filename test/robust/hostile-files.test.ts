/**
 * Circuit files a reviewer would write to break the run: sources that would cut the span into
 * billions of intervals, expression sources over long spans, a check report that must explain its
 * state reduction by part and line. Each must end in a result or one located input error, in
 * bounded time and memory. The limits are our own choice (src/circuit/limits.ts; common practice:
 * refuse early and say why); the numbers checked against come from the textbook formulas named
 * beside them (from memory).
 */
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { main } from '../../src/cli/main.js';
import { parseSamplesOption } from '../../src/cli/options.js';
import { MAX_FILE_BYTES, MAX_PART_VALUE, MAX_SAMPLES, MIN_PART_VALUE } from '../../src/circuit/limits.js';
import { capture } from '../helpers/capture.js';
import { loadCircuit } from '../../src/circuit/load.js';
import { MAX_SOURCE_CORNERS } from '../../src/circuit/limits.js';
import { termCorners } from '../../src/circuit/workload.js';
import { InputError } from '../../src/diagnostics.js';
import { analyzeText } from '../../src/pipeline.js';
import { formatCheck } from '../../src/report/check.js';

const RC = (source: string, span: string): string =>
  `voltage-source V1 in -> gnd ${source}\nresistor R1 in -> a 1k\ncapacitor C1 a -> gnd 1uF\nwatch node a\nspan ${span}\nsamples 101\n`;

function refusal(text: string, opts = {}): InputError {
  try {
    analyzeText(text, 'hostile.rdn', opts);
  } catch (e) {
    if (e instanceof InputError) return e;
    throw e;
  }
  throw new Error('the circuit was accepted');
}

describe('source corners within the span are limited before any list of them is built', () => {
  it('a 1 GHz pulse train over 1000 s (10¹² periods, which exhausted the memory) is refused at its line', () => {
    const t0 = Date.now();
    const e = refusal(RC('pulse to 5V freq 1GHz duty 50%', '1000s'));
    expect(Date.now() - t0).toBeLessThan(5000);
    expect(e.diagnostics).toHaveLength(1);
    expect(e.diagnostics[0]).toMatchObject({
      message: `the pulse train of V1 has 1.0e12 periods within the span of 1000 s: the sources and switches would cut the run into 4.0e12 intervals, more than the ${MAX_SOURCE_CORNERS} ringdown follows in one run`,
      loc: { line: 1, col: 1 },
    });
    expect(e.diagnostics[0]!.hint).toContain('shorten the span');
  });

  it('the same train with 10¹² cycles given, and a --span override, are refused the same way', () => {
    expect(refusal(RC('pulse from 0V to 5V period 1ns width 0.5ns cycles 1000000000000', '1000s')).diagnostics[0]!.message).toMatch(/^the pulse train of V1 has 1\.0e12 periods/);
    expect(refusal(RC('pulse to 5V freq 1GHz duty 50%', '1us'), { span: 1 }).diagnostics[0]!.message).toMatch(/^the pulse train of V1 has 1\.0e9 periods within the span of 1 s/);
  });

  it('a train inside the limit runs, and one cycle more than the limit allows is refused', () => {
    // corners: 4 per period started within the span, + 1 (termCorners is an upper bound)
    const periods = Math.floor((MAX_SOURCE_CORNERS - 1 - 2) / 4);
    const span = (n: number) => `${n - 0.5}us`; // n periods of 1 µs started within the span
    const term = (n: number) => loadCircuit(RC('pulse to 5V period 1us width 0.5us', span(n)), 'x.rdn').parts[0]!.waveform!.terms[0]!;
    expect(termCorners(term(periods), (periods - 0.5) * 1e-6)).toBe(4 * periods + 1);
    // the pulse train alone, no switches: just past the limit
    expect(refusal(RC('pulse to 5V period 1us width 0.5us', span(periods + 1))).diagnostics[0]!.message).toContain(`more than the ${MAX_SOURCE_CORNERS}`);
  });

  it('a 10⁴-period train (the README PWM case is of that size) still runs: v(a) after the train from the RC closed form', () => {
    // 10 µs period, 5 µs high, 10⁴ cycles then low; RC = 1 ms: after the train the capacitor
    // discharges from its value at the end with τ = RC (textbook RC, from memory)
    const r = analyzeText(RC('pulse to 5V period 10us width 5us cycles 10000', '110ms'), 'pwm.rdn', { partSignals: false });
    expect(r.crossCheck.passed).toBe(true);
    const v = r.traces[0]!.values;
    // the last pulse ends at 0.1 s − 5 µs; from the first sample after it on, each sample is the
    // one before times e^(−Δt/RC)
    const iEnd = r.times.findIndex((t) => t >= 0.1);
    expect(iEnd).toBeGreaterThan(0);
    expect(v[iEnd]!).toBeGreaterThan(1);
    for (let i = iEnd + 1; i < r.times.length; i++) {
      const want = v[iEnd]! * Math.exp(-(r.times[i]! - r.times[iEnd]!) / 1e-3);
      expect(Math.abs(v[i]! - want) / 5).toBeLessThanOrEqual(1e-9);
    }
  });
});

describe('expression sources over long spans', () => {
  it('a 1 kHz sine written as an expression over 10 ms ends in bounded time and reports its input error', () => {
    // 200 000 interpolation pieces took more than 100 s and 2.4 GB; it is now held to 20 000
    const t0 = Date.now();
    const r = analyzeText(RC('expression "sin(2*pi*1e3*t)"', '10ms'), 'expr.rdn');
    expect(Date.now() - t0).toBeLessThan(60_000);
    expect(r.crossCheck.passed).toBe(true);
    const note = r.notices.find((n) => n.startsWith('the expression of V1 has no closed form'));
    expect(note).toBeDefined();
    // the reported input error: the straight-line interpolant between 20 000 points of a 1 kHz sine
    // over 10 ms deviates by about (ω·h)²/8 = (2π·1e3·5e-7)²/8 ≈ 1.2e-6 of the amplitude
    const off = Number(/off by at most ([0-9.e+-]+) V/.exec(note!)![1]);
    expect(off).toBeGreaterThan(1e-7);
    expect(off).toBeLessThan(1e-5);
    // and the response follows the sine's own RC response to that accuracy: steady state of
    // v' = (sin ωt − v)/RC from rest, v = (sin ωt − ωRC·cos ωt + ωRC·e^(−t/RC))/(1 + (ωRC)²)
    const w = 2 * Math.PI * 1e3;
    const k = w * 1e-3;
    r.times.forEach((t, i) => {
      const want = (Math.sin(w * t) - k * Math.cos(w * t) + k * Math.exp(-t / 1e-3)) / (1 + k * k);
      expect(Math.abs(r.traces[0]!.values[i]! - want)).toBeLessThan(2 * off);
    });
  }, 90_000);
});

describe('check explains the state reduction by part and line', () => {
  it('a capacitor loop with a voltage source and an inductor cut-set with a current source', () => {
    const text = [
      'voltage-source V1 in -> gnd step to 10V at 1us',
      'capacitor C1 in -> a 1nF',
      'capacitor C2 a -> gnd 3nF',
      'resistor R1 a -> gnd 1k',
      'current-source I1 gnd -> b step to 1A',
      'inductor L1 b -> gnd 1mH',
      'inductor L2 b -> c 3mH',
      'resistor R2 c -> gnd 10ohm',
      'watch node a',
    ].join('\n');
    const out = formatCheck(loadCircuit(text, 'loops.rdn'));
    expect(out).toContain('2 capacitors + 2 inductors − 1 capacitor loop − 1 inductor cut-set = 2 states');
    expect(out).toMatch(/- loop V1 \(line 1\) → C1 \(line 2\) → C2 \(line 3\): V1, C1 and C2 form a loop of capacitors and voltage sources only: the voltage of C2 is fixed by V1 and C1/);
    expect(out).toMatch(/- cut-set L1 \(line 6\), L2 \(line 7\), I1 \(line 5\): .*the current of L1 is fixed by L2 and I1/);
  });
});

describe('inputs that never end or are far too large', () => {
  let dir = '';
  beforeAll(() => {
    dir = mkdtempSync(join(tmpdir(), 'ringdown-endless-'));
  });
  afterAll(() => rmSync(dir, { recursive: true, force: true }));
  const argv = (...args: string[]) => ['node', 'ringdown', ...args];

  it('a device as the circuit file (/dev/zero filled 7 GB in 20 s) is refused after 5 MB, exit 2', async () => {
    const io = capture();
    expect(await main(argv('check', '/dev/zero'), io)).toBe(2);
    expect(io.err()).toBe('ringdown: cannot read /dev/zero: it goes on, more than the 5 MB a circuit file may have (is this the right file?)\n');
  });

  it('a regular file over the limit is refused from its size, before it is read', async () => {
    const file = join(dir, 'big.rdn');
    writeFileSync(file, '#'.repeat(MAX_FILE_BYTES + 10));
    const io = capture();
    expect(await main(argv('run', file), io)).toBe(2);
    expect(io.err()).toContain(`cannot read ${file}: it is 5.00 MB, more than the 5 MB a circuit file may have`);
  });

  it('a table file that is a device (/dev/urandom: 16 GB and no end) or larger than 5 MB is a located error', () => {
    const e = refusal(RC('table file "/dev/urandom"', '1ms'));
    expect(e.diagnostics[0]).toMatchObject({ message: "cannot read table file '/dev/urandom': it is not a regular file (a device, pipe or socket)", loc: { line: 1, col: 40 } });
    const csv = join(dir, 'big.csv');
    writeFileSync(csv, '0,0\n'.repeat(Math.ceil(MAX_FILE_BYTES / 4) + 4));
    const big = refusal(RC(`table file "${csv}"`, '1ms'));
    expect(big.diagnostics[0]!.message).toMatch(/^table file '.*big\.csv' is 5\.0 MB, more than the 5 MB a table file may have$/);
  });

  it('--samples is held to the same limit as the samples line', () => {
    expect(parseSamplesOption(String(MAX_SAMPLES))).toBe(MAX_SAMPLES);
    expect(() => parseSamplesOption(String(MAX_SAMPLES + 1))).toThrow(`at most ${MAX_SAMPLES}`);
  });
});

describe('report layout on very wide cells', () => {
  it('check on a switch with 9000 toggles (one 100 000-column cell) takes well under a second, not 22 s', () => {
    // the table's trailing-space trim was a /\s+$/ regular expression: quadratic in a padded row
    const text = `voltage-source V1 in -> gnd 5V\nswitch S1 in -> a on 1ohm off 1k toggles ${Array.from({ length: 9000 }, (_, k) => `${k + 1}us`).join(', ')}\nresistor R1 a -> gnd 1k\ncapacitor C1 a -> gnd 1nF\nwatch node a\n`;
    const c = loadCircuit(text, 'toggles.rdn');
    const t0 = Date.now();
    const out = formatCheck(c);
    expect(Date.now() - t0).toBeLessThan(2000);
    expect(out).toContain('starts open, closes at 1 µs, opens at 2 µs');
  });
});

describe('part values at and past the edge of the range', () => {
  const divider = (R: string, C: string) => `voltage-source V1 in -> gnd step to 1V\nresistor R1 in -> a ${R}\ncapacitor C1 a -> gnd ${C}F\nwatch node a\n`;

  it(`values of ${MIN_PART_VALUE} and ${MAX_PART_VALUE} run: RC step v = 1 − e^(−t/RC) to 1e-9 (textbook)`, () => {
    for (const [R, C] of [['1e-24', '1e-24'], ['1e24', '1e24'], ['1e-24', '1e24'], ['1e24', '1e-24']]) {
      const r = analyzeText(divider(R!, C!), 'edge.rdn');
      expect(r.crossCheck.passed).toBe(true);
      const tau = Number(R) * Number(C);
      r.times.forEach((t, i) => expect(Math.abs(r.traces[0]!.values[i]! + Math.expm1(-t / tau))).toBeLessThanOrEqual(1e-9));
    }
  });

  it('a value past the range is a located error that says the range (1e-300 Ω beside 1e300 F never finished)', () => {
    const e = refusal(divider('1e-300', '1e300'));
    expect(e.diagnostics.map((d) => [d.message, d.loc?.line, d.loc?.col])).toEqual([
      ['the value of resistor R1, 1e-300 Ω, is outside the range ringdown computes with (1e-24 to 1e+24 Ω)', 2, 21],
      ['the value of capacitor C1, 1e+300 F, is outside the range ringdown computes with (1e-24 to 1e+24 F)', 3, 23],
    ]);
    expect(e.diagnostics[0]!.hint).toBe('check the exponent and the prefix');
  });

  it("a switch's off resistance past the range points at 'off open'; an initial value of 1e300 V (infinite stored energy) is refused", () => {
    const sw = refusal('voltage-source V1 in -> gnd 5V\nswitch S1 in -> a on 1ohm off 1e30 closes 1ms\ncapacitor C1 a -> gnd 1uF\nwatch node a\n');
    expect(sw.diagnostics[0]).toMatchObject({ loc: { line: 2, col: 31 }, hint: "for a switch that carries nothing when open, write 'off open'" });
    const init = refusal('voltage-source V1 in -> gnd 5V\nresistor R1 in -> a 1k\ncapacitor C1 a -> gnd 1uF initial 1e300V\nwatch node a\n');
    expect(init.diagnostics[0]).toMatchObject({ message: 'the initial value of C1, 1e+300 V, is larger than ringdown computes with (at most 1e+24 V in size)', loc: { line: 3, col: 35 } });
  });
});

describe('a reference node spelt otherwise', () => {
  it("'GND' gets a hint that the reference is written gnd", () => {
    const e = refusal('voltage-source V1 in -> GND step to 5V\nresistor R1 in -> a 1k\ncapacitor C1 a -> GND 1uF\nwatch node a\n');
    expect(e.diagnostics[0]!.message).toBe("nothing connects to gnd: nodes 'in', 'GND', 'a' have no reference");
    expect(e.diagnostics[0]!.hint).toBe("the reference node is written gnd (lower case); 'GND' is an ordinary node name: write gnd instead");
  });
});

describe('watches that cannot be told apart', () => {
  it('two watches with one label draw a located warning, and the run still goes ahead', () => {
    const text = 'voltage-source V1 in -> gnd step to 5V\nresistor R1 in -> a 1k\ncapacitor C1 a -> gnd 1uF\nwatch node a\nwatch node a\nwatch node a as "v(a)"\nwatch node a as "other"\n';
    const c = loadCircuit(text, 'dup.rdn');
    expect(c.watches).toHaveLength(4);
    expect((c.warnings ?? []).map((w) => [w.message, w.loc?.line])).toEqual([
      ["this watch has the same label 'v(a)' as the watch on line 4", 5],
      ["this watch has the same label 'v(a)' as the watch on line 4", 6],
    ]);
  });
});
