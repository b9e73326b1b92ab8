/**
 * Failures the random-circuit property (circuits.fuzz.test.ts) found, shrunk by fast-check to small
 * circuits, each written as the property it once broke (all fixed now; they stay as regression tests).
 * Source of the expectations: the same properties as circuits.fuzz.test.ts (a result or an
 * InputError; the in-run cross-check; Tellegen's energy balance, a textbook result from memory).
 */
import { describe, expect, it } from 'vitest';
import { InputError } from '../../src/diagnostics.js';
import { energyBalance } from '../../src/measure/energy.js';
import { analyzeText } from '../../src/pipeline.js';

const run = (text: string) => {
  try {
    return analyzeText(text, 'known.rdn');
  } catch (e) {
    if (e instanceof InputError) return undefined;
    throw e;
  }
};

describe('known failures found by the circuit fuzzer', () => {
  it('a current source stepping from 0 A to 0 A beside two inductors to gnd: a result', () => {
    const text = `capacitor C1 gnd -> n1 1e-3F
resistor R2 gnd -> n2 5.5e4ohm
resistor R3 gnd -> n3 1e0ohm
inductor L4 gnd -> n1 1e0H
resistor R5 n1 -> gnd 1.6e0ohm
inductor L6 gnd -> n2 1e-4H
current-source I1 gnd -> n1 step from 0A to 0A at 1e-3
watch node n1
samples 201
`;
    expect(() => run(text)).not.toThrow();
  });

  it('a sine source of zero amplitude with a switch opening at 1 ms: the cross-check passes', () => {
    const text = `inductor L1 gnd -> n1 1.2e0H
resistor R2 gnd -> n2 1e0ohm
resistor R3 gnd -> n3 1.3e2ohm
capacitor C4 gnd -> n4 7.1e-4F
inductor L5 gnd -> n5 1e0H
resistor R6 gnd -> n6 1e-1ohm
capacitor C7 gnd -> n7 1e-3F
capacitor C8 gnd -> n8 1e-3F
capacitor C9 n1 -> n9 7.5e-5F
resistor R10 gnd -> n1 1.4e0ohm
capacitor C11 gnd -> n1 1e-5F
voltage-source V1 n1 -> n3 sine amplitude 0V freq 1e1Hz phase 0deg at 1e-3
switch S1 n3 -> n4 on 9.9e0ohm opens 1e-3
watch node n1
samples 201
span 1e-2
`;
    expect(run(text)?.crossCheck.passed).toBe(true);
  });

  it('an inductor shorted through a switch and a voltage source: energy balances', () => {
    const text = `inductor L1 gnd -> n1 1e0H
resistor R2 gnd -> n2 1e0ohm
inductor L3 gnd -> n3 4.5e-2H
voltage-source V1 n3 -> gnd -1V
switch S1 gnd -> n3 on 1.3e1ohm opens 1e-3
watch node n1
samples 201
span 2.1e-5
`;
    const r = run(text)!;
    expect(r.crossCheck.passed).toBe(true);
    expect((r.events ?? []).every((e) => e.energyLost === 0)).toBe(true);
    expect(energyBalance(r.circuit, r.parts!).residual).toBeLessThan(1e-6);
  });

  // found with FUZZ_SEED=7: I1 feeds 30 A straight into V2 (1.1 kW, 1 J over the span) and nothing
  // else moves; the balance was taken relative to the net totals, which are round-off of zero, and
  // read 1.0. Tellegen's sum is now judged against the energy the parts moved in all.
  it('a current source feeding a voltage source, nothing else moving: energy balances, and a missing part still shows', () => {
    const text = `inductor L1 gnd -> n1 1.7e-1H
capacitor C2 gnd -> n2 9.7e-10F
inductor L3 n1 -> n3 9.3e-2H
resistor R4 n1 -> n3 1.5e0ohm
current-source I1 n2 -> n3 30A
voltage-source V2 n2 -> n3 -37V
switch S1 n1 -> gnd on 1e-2ohm off 1.4e5ohm opens 1e-6
watch node n1
samples 201
start settled
span 9.5e-4
`;
    const r = run(text)!;
    expect(r.crossCheck.passed).toBe(true);
    expect(energyBalance(r.circuit, r.parts!).residual).toBeLessThan(1e-9);
    // 30 A · 37 V · 0.95 ms = 1.05 J delivered by I1 (P = V·I, textbook) and absorbed by V2
    const e = energyBalance(r.circuit, r.parts!);
    const v2 = e.perPart.find((p) => p.part === 'V2')!.absorbed;
    expect(Math.abs(v2) / (30 * 37 * 9.5e-4)).toBeCloseTo(1, 9);
    expect(energyBalance(r.circuit, r.parts!.filter((p) => p.part !== 'V2')).residual).toBeGreaterThan(0.4);
  });

  // found with FUZZ_SEED=7 and 3: nothing moves while the coils hold 4 J (37 A through 5.9 mH) or a
  // capacitor holds 18 mJ (82 µF at 21 V); the ∫v·i of the parts are round-off of those energies
  // (1e-9 J, 1e-21 J) and were judged against each other. The balance now also counts the energy
  // stored at the ends of the span (½CV², ½LI², textbook) in its scale.
  for (const [what, text] of [
    ['37 A held in coils', 'inductor L1 gnd -> n1 9.5e-6H\ninductor L2 n1 -> n2 5.9e-3H\nresistor R3 n1 -> n3 5.7e-1ohm\ncapacitor C4 gnd -> n4 9.4e-5F\nresistor R5 n4 -> n5 9.9e4ohm\nresistor R6 n2 -> n6 1e1ohm\ninductor L7 n5 -> n3 6.5e0H\nresistor R8 n6 -> n2 6.4e1ohm\ninductor L9 n2 -> n6 4.8e-3H\ncurrent-source I1 gnd -> n2 -37A\nswitch S1 n4 -> n6 on 2.6e-2ohm off 1.6e6ohm opens 5.5e-5\nwatch node n6\nsamples 201\nstart settled\nspan 9.5e-3\n'],
    ['21 V held on 82 µF', 'inductor L1 gnd -> n1 6.6e-5H\nresistor R2 gnd -> n2 9.9e6ohm\ncapacitor C3 n2 -> n3 8.2e-5F\ncapacitor C4 gnd -> n2 3.6e-11F\nresistor R5 gnd -> n2 2.5e5ohm\ncurrent-source I1 n1 -> gnd ramp at 8.7e-3 rate 49kA/s until (8.7e-3+1.1e-4)\nvoltage-source V2 n3 -> gnd -21V\nswitch S1 gnd -> n1 on 5e-1ohm off 2.9e5ohm closes 9.1e-3\nwatch node n1\nsamples 201\nstart settled\nspan 1.6e-3\n'],
  ]) {
    it(`nothing moving, ${what}: energy balances against the stored energy`, () => {
      const r = run(text)!;
      expect(r.crossCheck.passed).toBe(true);
      expect(energyBalance(r.circuit, r.parts!).residual).toBeLessThan(1e-6);
    });
  }

  // found by the hostile-text fuzzer (hostile.fuzz.test.ts) and by hand: each ends in an exception
  // that is not an InputError (exit 1 instead of 2)
  const RC = 'voltage-source V1 in -> gnd step to 12V at 1us\nresistor R1 in -> out 1k\ncapacitor C1 out -> gnd 1uF\nwatch node out\nsamples 51\n';
  for (const [what, line] of [
    ['a resistance of 1e-320 ohm (conductance overflows)', 'resistor R2 out -> gnd 1e-320'],
    ['a span of 1e300 s', 'span 1e300'],
    ['a sine at 1e300 Hz', 'current-source I2 gnd -> out sine amplitude 1A freq 1e300Hz'],
    ['a huge but finite source expression', 'current-source I2 gnd -> out expression "1e306"'],
    ['an expression that overflows after t = 0', 'current-source I2 gnd -> out expression "exp(t*1e6)"'],
  ] as const) {
    it(`${what}: a result or an input error, nothing else`, () => {
      expect(() => run(RC + line + '\n')).not.toThrow();
    });
  }

  // Once broken: a loop of a 1.1 pF and a 0.41 nF capacitor with a voltage source, next to 26 nH and
  // 96 mH inductors. The general (rank-revealing) reduction reached only a relative residual of about
  // 2e-7 and eigenvalues off by 1e-3 (against the generalized eigenvalues of the circuit's own E and
  // A, scipy.linalg.eigvals, checked by hand); the energy balance was off by about 1e-4. Fixed by the
  // normal-tree state equations (src/model/reduce-tree.ts).
  it('a pF/nF capacitor loop with a source beside nH and 100 mH inductors: energy balances to 1e-6', () => {
    const text = `resistor R1 gnd -> n1 7.5e5ohm
inductor L2 n1 -> n2 2.6e-8H
resistor R3 n1 -> n3 4.6e0ohm
resistor R4 n1 -> n4 9.3e-2ohm
inductor L5 n4 -> n5 1.6e-6H
resistor R6 n2 -> n6 6.6e-1ohm
resistor R7 n5 -> n7 4e2ohm
capacitor C8 n2 -> n8 9.2e-9F
resistor R9 n8 -> n9 5.5e2ohm
resistor R10 n2 -> n10 6.4e1ohm
capacitor C11 n4 -> n9 1.1e-12F
capacitor C12 n8 -> n9 4.1e-10F
inductor L13 gnd -> n3 1e-2H
inductor L14 n2 -> n10 6.9e-7H
inductor L15 n3 -> n4 6.4e-7H
resistor R16 n4 -> n7 9.7e-1ohm
resistor R17 gnd -> n6 5.8e2ohm
inductor L18 n8 -> n9 9.6e-2H
voltage-source V1 n8 -> n4 32V
voltage-source V2 n10 -> gnd 5V
switch S1 n6 -> n7 on 1.4e0ohm off 8.3e5ohm opens 8.5e-3
watch node n9
samples 201
start rest
span 1e-4
`;
    const r = run(text)!;
    expect(r.crossCheck.passed).toBe(true);
    expect(energyBalance(r.circuit, r.parts!).residual).toBeLessThan(1e-6);
  });

  // Once broken: inductors whose only path runs through a 17 MΩ open switch next to a 1.3 pF
  // capacitor. The general reduction had the right number of states but chose i(L1) — zero by KCL
  // (L1, C2 and L8 in series to a dead end), nonzero only by round-off — as one of them, which
  // scaled the state matrix to 1e25; the eigenvalue snap then zeroed every mode and the closed form
  // became NaN (cross-check: Infinity, exit 3). The normal tree takes v(C2), v(C3), i(L5).
  it('inductors behind a 17 MΩ open switch beside 1.3 pF: the cross-check passes', () => {
    const text = `inductor L1 gnd -> n1 5.7e-1H
capacitor C2 n1 -> n2 5.9e-7F
capacitor C3 gnd -> n3 1.3e-12F
resistor R4 n1 -> n4 3.9e-2ohm
inductor L5 n3 -> n5 1.2e0H
resistor R6 gnd -> n6 1.3e1ohm
inductor L7 n6 -> n7 5.6e-5H
inductor L8 n2 -> n8 9.3e0H
inductor L9 gnd -> n9 1.4e-1H
current-source I1 n3 -> n9 sine amplitude 6A freq 4.6e4Hz phase 130deg at 1.4e-3
switch S1 n5 -> n9 on 7.1e1ohm off 1.7e7ohm closes 9.8e-4
watch node n7
samples 201
start rest
`;
    expect(run(text)!.crossCheck.passed).toBe(true);
  });

  // Found by a wider run of the circuit fuzzer (FUZZ_SEED=1, 300 runs, after the tree reduction).
  // Each had a mode far below 1e-12·‖A‖ that the modal stage snapped to zero although it was real.

  it('a 5.2 krad/s ring and a 26/s mode beside a 1.6e16/s one (73 MΩ off-resistance, 4.5 nH): finite, and the cross-check passes', () => {
    // Before: both folded into a "cluster of zeros" whose series exponential overflowed to NaN.
    const text = `capacitor C1 gnd -> n1 3.7e-4F
inductor L2 n1 -> n2 9.8e-5H
resistor R3 gnd -> n3 1.4e2ohm
inductor L4 n2 -> n4 7.6e-1H
capacitor C5 gnd -> n5 9.6e-5F
inductor L6 n3 -> n6 7.6e-3H
capacitor C7 n6 -> gnd 1.4e-10F
inductor L8 n5 -> gnd 5.6e-3H
resistor R9 n3 -> n6 2e-1ohm
inductor L10 gnd -> n3 1.9e-6H
inductor L11 n1 -> n4 4.5e-9H
capacitor C12 gnd -> n6 1.3e-5F
inductor L13 gnd -> n3 1.7e-2H
voltage-source V1 n3 -> n2 -47V
switch S1 n4 -> n2 on 3.9e-2ohm off 7.3e7ohm opens 8.1e-4
watch node n2
samples 201
start rest
span 9.9e-2

`;
    const r = run(text)!;
    expect(r.traces.every((t) => t.values.every(Number.isFinite))).toBe(true);
    expect(r.crossCheck.passed).toBe(true);
  });

  it('an LC ring no resistor touches, beside 7e9/s modes: lossless, and the span is set by the real decays', () => {
    // Before: a damping of 1.6e-13/s (round-off) on the 232 rad/s ring made the chosen span 4e13 s
    // and the cross-check overflow. The slowest real decay is 0.021/s: 7/0.021 s = 333 s.
    const text = `capacitor C1 gnd -> n1 1.5e-10F
inductor L2 gnd -> n2 8.4e-8H
resistor R3 n1 -> n3 1.4e3ohm
inductor L4 n2 -> n4 3.6e-7H
capacitor C5 n2 -> n5 9.8e-7F
capacitor C6 n3 -> n6 4.1e-6F
inductor L7 n5 -> n7 1.1e-7H
inductor L8 gnd -> n8 8.8e-6H
capacitor C9 n8 -> n9 2.8e-4F
inductor L10 n2 -> n10 7.8e-4H
capacitor C11 n9 -> n8 3.7e-12F
inductor L12 n1 -> n7 9.2e0H
inductor L13 n6 -> n9 4.6e0H
voltage-source V1 n3 -> n10 -47V
voltage-source V2 n7 -> n10 sine amplitude 32V freq 1e2Hz phase 131deg at 4.1e-3
watch node n1
samples 201
start rest

`;
    const r = run(text)!;
    expect(r.modes.some((m) => m.kind === 'oscillatory' && m.sigma === 0 && Math.abs(m.omegaD - 231.9255) < 1e-3)).toBe(true);
    expect(r.span).toBeLessThan(400);
    expect(r.traces.every((t) => t.values.every(Number.isFinite))).toBe(true);
  });

  it('a 1.44e3/s mode beside a 3.4e15/s one is kept, not zeroed', () => {
    // Reference: the eigenvalues of the run's own state matrix in 60-digit arithmetic (mpmath,
    // computed by hand once): −1441.515669/s (switch closed) and −1441.515659/s (open). Before,
    // the mode became part of a cluster of zeros and the watched voltage reached 4e14 V.
    const text = `inductor L1 gnd -> n1 6.4e-8H
inductor L2 n1 -> n2 2.1e-6H
inductor L3 n1 -> n3 9.1e-6H
capacitor C4 n1 -> n4 8.2e-8F
inductor L5 n1 -> n5 3.4e-1H
resistor R6 n2 -> n6 7.9e3ohm
capacitor C7 n6 -> n7 1.6e-9F
inductor L8 n1 -> n8 5.8e-7H
resistor R9 n6 -> n4 5.6e2ohm
resistor R10 n3 -> n1 8e-1ohm
inductor L11 n1 -> n5 2.8e-9H
capacitor C12 gnd -> n1 5.6e-3F
capacitor C13 n2 -> n8 5.2e-4F
resistor R14 n2 -> n5 9.4e6ohm
resistor R15 n4 -> n6 4.7e6ohm
resistor R16 n8 -> n1 4.1e6ohm
capacitor C17 n7 -> n6 1.5e-7F
current-source I1 n6 -> n2 step from 17A to -42A at 9.6e-5 rise 8.2e-6
voltage-source V2 gnd -> n3 ramp at 7.4e-6 rate -33kV/s until (7.4e-6+6.8e-3)
switch S1 n2 -> n8 on 1.6e-1ohm off 1.7e6ohm opens 4.9e-5
watch node n7
samples 201
start settled
span 9.9e-4

`;
    const r = run(text)!;
    const near = (lambda: number) => r.modes.some((m) => m.kind === 'real' && Math.abs(m.lambda - lambda) <= 1e-6 * Math.abs(lambda));
    expect(near(-1441.515669) || near(-1441.515659)).toBe(true);
  });

  it('a 0.055/s mode beside a 7.3e13/s one (9.9 nH) is refined, not left at the eigen-solver\'s 0.0625/s or zeroed', () => {
    // Reference: the eigenvalues of the run's own state matrix in 60-digit arithmetic (mpmath,
    // computed by hand once): −0.0553375196/s in both switch configurations, besides two zeros.
    const text = `inductor L1 gnd -> n1 1e-4H
inductor L2 gnd -> n2 2.2e-3H
inductor L3 gnd -> n3 9.9e-9H
resistor R4 gnd -> n4 1.6e1ohm
inductor L5 n1 -> n5 1.7e-2H
capacitor C6 n3 -> n6 1e-5F
resistor R7 n3 -> n7 1.3e4ohm
resistor R8 n6 -> n8 2.2e5ohm
resistor R9 gnd -> n9 1.6e6ohm
resistor R10 n1 -> n10 2.7e6ohm
inductor L11 n8 -> n11 4.5e-1H
inductor L12 n2 -> n7 1.5e-8H
capacitor C13 n9 -> n8 1.4e-3F
inductor L14 n4 -> gnd 1.5e-3H
inductor L15 n1 -> gnd 6.4e-3H
current-source I1 n6 -> n8 20A
current-source I2 n8 -> gnd step from 49A to 40A at 2.3e-3 rise 8e-6
switch S1 gnd -> n3 on 7.8e0ohm off 1.2e6ohm opens 5.9e-5
watch node n3
samples 201
start rest
span 9.8e-2
`;
    const r = run(text)!;
    expect(r.modes.some((m) => m.kind === 'real' && Math.abs(m.lambda + 0.0553375196) <= 1e-8)).toBe(true);
    expect(r.crossCheck.passed).toBe(true);
  });

  it('a decoupled 0.66/s mode beside a 3e12/s one: a result, not a singular modal matrix', () => {
    // Found with FUZZ_SEED=2. The refinement of slow modes met an exactly singular A − λI at the
    // solver's own (exact) value and took the mode for a zero; three "zeros" with two eigenvectors
    // made the modal matrix singular (an exception, exit 1). The true value (mpmath, 60 digits, of
    // the run's state matrix, computed by hand): −0.6578947368/s.
    const text = `resistor R1 gnd -> n1 9.4e4ohm
inductor L2 gnd -> n2 3.1e-5H
resistor R3 n1 -> n3 9.5e6ohm
inductor L4 n3 -> n4 5.6e-7H
inductor L5 n1 -> n5 1.4e-7H
capacitor C6 n1 -> n6 1.6e-7F
capacitor C7 n1 -> n7 1.9e-12F
resistor R8 n2 -> n8 2.7e6ohm
inductor L9 gnd -> n9 8.4e-5H
inductor L10 gnd -> n10 2.8e0H
resistor R11 n5 -> n11 9.3e0ohm
capacitor C12 n11 -> n7 4.8e-5F
inductor L13 n1 -> n8 1.2e-1H
inductor L14 n2 -> n5 1.9e-1H
capacitor C15 n5 -> n10 5e-9F
capacitor C16 gnd -> n5 3.1e-10F
resistor R17 gnd -> n5 8.8e2ohm
inductor L18 n2 -> gnd 1e-2H
voltage-source V1 n6 -> n3 49V
current-source I2 n3 -> n7 sine amplitude -14A freq 1.6e1Hz phase 126deg at 8.4e-4
switch S1 n1 -> n8 on 9.4e1ohm off 9.4e7ohm opens 1.5e-6
watch node n1
samples 201
start settled
span 9.8e-3

`;
    const r = run(text)!;
    expect(r.modes.some((m) => m.kind === 'real' && Math.abs(m.lambda + 0.6578947368) <= 1e-9)).toBe(true);
  });

  it('a 1e5 s mode (0.19 F behind a 530 kΩ off-resistance) that the eigen-solver returned as an exact 0 is found', () => {
    // Found with FUZZ_SEED=3 (wider part values). Reference: the eigenvalues of the run's state
    // matrix in 60-digit arithmetic (mpmath, by hand): −9.930480583e-6/s once the switch is open.
    // Also checked by hand against mpmath's matrix exponential of the hand-written state equations
    // (C1, C2 ∥ C6, C5, R7, L3, the switch, both sources): v(n1) within 4e-9 of its peak (before:
    // 6e-7, with every check passing).
    const text = `capacitor C1 gnd -> n1 1.9e-1F
capacitor C2 n1 -> n2 9.7e-8F
inductor L3 gnd -> n3 1.5e-8H
inductor L4 gnd -> n4 3.2e-6H
capacitor C5 gnd -> n2 7.9e3F
capacitor C6 n2 -> n1 1.8e-8F
resistor R7 gnd -> n2 1.3e-3ohm
current-source I1 gnd -> n2 -42A
current-source I2 n3 -> n2 step from 50A to 28A at 8.4e-6 rise 3.3e-3
switch S1 n1 -> n3 on 4.2e1ohm off 5.3e5ohm opens 1.5e-3
watch node n1
samples 201
start rest
span 3.4e-2

`;
    const r = run(text)!;
    expect(r.modes.some((m) => m.kind === 'real' && Math.abs(m.lambda + 9.930480583e-6) <= 1e-14)).toBe(true);
  });

  // Still open (found by the same run): a series RLC loop (15 H, 8.1 pF, 0.16 Ω) sharing its
  // capacitors with two dead-end ones, a current source charging one of them: four exact zero
  // modes and a ring at 9.07e4 rad/s with ζ = 6e-8. The model is right (odex on hand-written
  // state equations agrees with ringdown to 1.4e-9 of the peak; before the tree reduction the
  // damping was lost altogether: 3e-7, unflagged), but the closed forms miss the cross-check by
  // 1.4e-9: the zero cluster's basis (null space by SVD next to a 1.2e11 entry) is not clean enough.
  it.fails('four exact zero modes beside a 9e4 rad/s ring with ζ = 6e-8: the cross-check passes', () => {
    const text = `inductor L1 gnd -> n1 7.2e0H
capacitor C2 gnd -> n2 1e-8F
inductor L3 n1 -> n3 7.8e0H
resistor R4 gnd -> n4 9.3e-2ohm
capacitor C5 gnd -> n5 9.9e-7F
capacitor C6 n5 -> n6 2.6e-3F
capacitor C7 n5 -> n7 1.9e-4F
capacitor C8 n3 -> n8 8.1e-12F
current-source I1 n6 -> n5 -27A
switch S1 n6 -> n8 on 1.6e-1ohm off 1e5ohm opens 1.2e-4
watch node n3
samples 201
start rest
span 5.4e-5

`;
    expect(run(text)!.crossCheck.passed).toBe(true);
  });

  // Fixed: the cross-check itself ran out of digits. It steps e^(M·h) with ‖M‖·h ≤ 1, so a 1 s
  // mode beside a 1 ns one takes 3e9 steps (by repeated squaring), and the slow decay per step
  // (1 − 1e-9) kept only 7 digits: 8e-7 disagreement although the closed form matches the textbook
  // formula to 1e-15 (test/robust/degenerate.test.ts checks the values). The steps are now kept
  // as e^(M·h) − I.
  it('a 1 ns RC and a 10 s RL on one source (textbook first-order forms): the cross-check passes', () => {
    const text = `voltage-source V1 in -> gnd step from 0V to 1V at 0
resistor R1 in -> a 1kohm
capacitor C1 a -> gnd 1pF
resistor R2 in -> b 100mohm
inductor L2 b -> gnd 1H
watch current L2
watch node a
span 20
samples 11
`;
    const r = run(text)!;
    const i = r.traces.find((t) => t.label === 'i(L2)')!.values;
    // i = (V/R)·(1 − e^(−tR/L)) (textbook RL, from memory): right to round-off
    r.times.forEach((t, k) => expect(Math.abs(i[k] - 10 * -Math.expm1(-t / 10))).toBeLessThan(1e-13));
    expect(r.crossCheck.passed).toBe(true);
  });

  // Fixed: the cross-check judged each watch relative to its own size, and this one is exactly
  // 0 V at DC (n1 is tied to ground by L5 and L9; every voltage in the circuit is 0 while 6 A flow
  // through the coils); its closed form is round-off of the terms C_j·ξ_j that cancel (4e-13 V),
  // and the comparison of two round-offs read as a relative error of 1. Round-off of the
  // cancelling terms (1000 ε of their size) is now forgiven, nothing more.
  it('a watch that is 0 V at DC by topology: the cross-check passes', () => {
    const text = `resistor R1 gnd -> n1 2.6e-1ohm
resistor R2 n1 -> n2 7.8e0ohm
inductor L3 gnd -> n3 9.9e-3H
resistor R4 gnd -> n4 4.8e0ohm
inductor L5 n1 -> n5 1.4e-7H
resistor R6 n3 -> n6 7.3e1ohm
capacitor C7 n2 -> n7 9.3e-6F
resistor R8 n5 -> n8 1.6e1ohm
inductor L9 n5 -> gnd 6.7e0H
inductor L10 n8 -> n6 7.6e-7H
resistor R11 n6 -> n7 6.6e5ohm
capacitor C12 n6 -> n1 6.3e-7F
resistor R13 n3 -> n8 1.4e-1ohm
resistor R14 n7 -> gnd 3.5e5ohm
resistor R15 n7 -> n6 9.9e5ohm
inductor L16 n8 -> n1 5.2e-4H
inductor L17 n4 -> n3 1.6e-4H
current-source I1 n5 -> n3 step from 6A to -11A at 4.7e-4 rise 8.7e-6
switch S1 gnd -> n7 on 3.3e-1ohm off 1.1e5ohm opens 6e-4
watch node n1
samples 201
start settled
span 9.5e-5

`;
    const r = run(text)!;
    expect(Math.max(...r.traces[0].values.map(Math.abs))).toBeLessThan(1e-12);
    expect(r.crossCheck.passed).toBe(true);
  });
  // Still open (FUZZ_SEED=3 and 11, 300 runs): spans of minutes to a day (chosen from a 69 s and a
  // 1e5 s mode) beside nanosecond modes. A part's voltage read-out carries round-off of the
  // circuit's kilovolt-sized terms (4.4e-11 V across the 1.1 nH L10 here, whose true voltage at the
  // end is below 1e-15 V; v(L5) and v(I1) agree with each other by KVL), and ∫v·i over 481 s at
  // 15 A turns it into 3.2e-7 J of 5.2e-4 J moved: residual 3e-4. The closed forms of the watched
  // signals pass the cross-check (1e-15); the balance's own round-off grows with span × current.
  // (The 92 000 s span is given: a chosen span now stops at 10⁵ periods of its 36 kHz ringing.)
  for (const [what, text] of [
    ['1.1 nH beside a 69 s mode over 481 s', 'resistor R1 gnd -> n1 8.7e-2ohm\ninductor L2 n1 -> n2 4.9e-5H\nresistor R3 gnd -> n3 3.5e4ohm\ninductor L4 n2 -> n4 5.5e0H\ninductor L5 n1 -> n5 2.3e-6H\ninductor L6 gnd -> n6 5.6e-6H\ncapacitor C7 n3 -> n7 5.9e-4F\nresistor R8 n3 -> n8 1.4e-2ohm\ncapacitor C9 n6 -> n9 2e-12F\ninductor L10 n5 -> n10 1.1e-9H\ninductor L11 n8 -> n11 4.5e-2H\nresistor R12 n3 -> n7 2.4e2ohm\nresistor R13 n5 -> n7 3.8e0ohm\nresistor R14 n4 -> n10 8e-2ohm\ncapacitor C15 n7 -> n10 3.6e-4F\ncurrent-source I1 n1 -> n10 -15A\nwatch node n4\nsamples 201\nstart rest\n'],
    ['96 nH beside a 1e5 s mode over 92 000 s', 'capacitor C1 gnd -> n1 6.1e-3F\ninductor L2 gnd -> n2 5.2e-7H\ninductor L3 gnd -> n3 3.4e-2H\ncapacitor C4 n2 -> n4 3.1e-9F\ninductor L5 gnd -> n5 3.9e-1H\nresistor R6 n4 -> n6 3.6e2ohm\nresistor R7 n5 -> n7 2.1e3ohm\ninductor L8 gnd -> n8 9.6e-8H\ncapacitor C9 n5 -> n6 5e-11F\nvoltage-source V1 n8 -> n6 step from 50V to 41V at 6.1e-6 rise 6.6e-3\nswitch S1 n2 -> n8 on 8e0ohm off 4.2e6ohm closes 3.3e-6\nwatch node n4\nsamples 201\nstart settled\nspan 9.2e4\n'],
  ]) {
    it.fails(`${what}: energy balances to 1e-6`, () => {
      const r = run(text)!;
      expect(r.crossCheck.passed).toBe(true);
      expect(energyBalance(r.circuit, r.parts!).residual).toBeLessThan(1e-6);
    });
  }
});
