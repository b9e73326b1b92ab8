import { describe, expect, it } from 'vitest';
import { computeMetrics, isPeriodicSignal } from '../../src/measure/metrics.js';
import { evaluatePieces } from '../../src/measure/evaluate.js';
import { checkRating, runRatings } from '../../src/measure/ratings.js';
import { runStress, type PartStress } from '../../src/measure/stress.js';
import { analyzeText } from '../../src/pipeline.js';
import { grid, piece, sampleAll } from './helpers.js';

const rel = (a: number, b: number) => Math.abs(a - b) / Math.abs(b);

function stressOf(text: string, part: string): PartStress {
  const s = runStress(analyzeText(text, 'test.rdn')).find((x) => x.part === part);
  if (!s) throw new Error(`no stress for ${part}`);
  return s;
}

describe('RC charge from a 12 V step (R = 1 kΩ, C = 1 µF, τ = 1 ms), span T = 5 ms', () => {
  const V = 12;
  const R = 1000;
  const C = 1e-6;
  const tau = R * C;
  const T = 5e-3;
  const text = `voltage-source V1 in -> gnd step to 12V\nresistor R1 in -> out 1k\ncapacitor C1 out -> gnd 1uF\nwatch node out\nspan 5ms\nsamples 51\n`;
  const r = stressOf(text, 'R1');
  const c = stressOf(text, 'C1');
  const fade = 1 - Math.exp((-2 * T) / tau);

  it('resistor heat is ½CV² over a whole charge (physics textbook, from memory); over the span ½CV²·(1 − e^(−2T/RC))', () => {
    expect(rel(r.energy!, 0.5 * C * V * V * fade)).toBeLessThan(1e-9);
    // and within e^(−10) of the textbook ½CV² for this 5 τ span
    expect(rel(r.energy!, 0.5 * C * V * V)).toBeLessThan(5e-5);
  });

  it('I²t = V²C/(2R)·(1 − e^(−2T/RC)), the closed form of ∫(V/R)²e^(−2t/RC)dt over [0, T]', () => {
    expect(rel(r.i2t, ((V * V * C) / (2 * R)) * fade)).toBeLessThan(1e-9);
    expect(rel(c.i2t, ((V * V * C) / (2 * R)) * fade)).toBeLessThan(1e-9); // same current in C1
  });

  it('peak current V/R at t = 0+, peak dissipation V²/R there too', () => {
    expect(rel(r.current.value, V / R)).toBeLessThan(1e-12);
    expect(r.current.time).toBe(0);
    expect(rel(r.power.value, (V * V) / R)).toBeLessThan(1e-12);
    expect(r.power.time).toBe(0);
    expect(rel(r.voltage.value, V)).toBeLessThan(1e-12);
  });

  it('capacitor: peak |v| at the end of the span, V(1 − e^(−T/τ)); peak stored ½C·v²; no heat', () => {
    const vT = V * (1 - Math.exp(-T / tau));
    expect(rel(c.voltage.value, vT)).toBeLessThan(1e-12);
    expect(c.voltage.time).toBe(T);
    expect(rel(c.storedPeak!, 0.5 * C * vT * vT)).toBeLessThan(1e-12);
    expect(c.energy).toBeNull();
    expect(c.unbounded).toEqual([]);
  });

  it('capacitor charging power v·i peaks where v = V/2, t = τ·ln 2, at V²/(4R) (maximum power transfer, from memory)', () => {
    expect(rel(c.power.time, tau * Math.log(2))).toBeLessThan(1e-9);
    expect(rel(c.power.value, (V * V) / (4 * R))).toBeLessThan(1e-12);
  });
});

describe('series RLC step, 10 V into R = 10 Ω, L = 1 mH, C = 1 µF (underdamped)', () => {
  const text = `voltage-source V1 in -> gnd step to 10V\nresistor R1 in -> a 10ohm\ninductor L1 a -> b 1mH\ncapacitor C1 b -> gnd 1uF\nwatch voltage C1\nspan 2ms\nsamples 201\n`;
  const s = stressOf(text, 'C1');
  it('peak capacitor voltage V·(1 + e^(−πζ/√(1−ζ²))) at t = π/ωd (second-order overshoot, control textbook, from memory)', () => {
    const wn = 1 / Math.sqrt(1e-3 * 1e-6);
    const zeta = (10 / 2) * Math.sqrt(1e-6 / 1e-3);
    const wd = wn * Math.sqrt(1 - zeta * zeta);
    expect(rel(s.voltage.value, 10 * (1 + Math.exp((-Math.PI * zeta) / Math.sqrt(1 - zeta * zeta))))).toBeLessThan(1e-10);
    expect(rel(s.voltage.time, Math.PI / wd)).toBeLessThan(1e-9);
  });
  it('peak inductor current V/(L·ωd)·e^(−σ·t) at ωd·t = atan(ωd/σ) (from i = C·dv/dt of the same response)', () => {
    const L = stressOf(text, 'L1');
    const sigma = 10 / (2 * 1e-3);
    const wd = Math.sqrt(1 / (1e-3 * 1e-6) - sigma * sigma);
    const t = Math.atan(wd / sigma) / wd;
    expect(rel(L.current.time, t)).toBeLessThan(1e-9);
    expect(rel(L.current.value, (10 / (1e-3 * wd)) * Math.exp(-sigma * t) * Math.sin(wd * t))).toBeLessThan(1e-10);
  });
});

describe('a switch cutting an inductor current with no other path', () => {
  const text = `voltage-source V1 in -> gnd 10V\nresistor R1 in -> a 10ohm\ninductor L1 a -> d 1mH\nswitch S1 d -> gnd on 1mohm off open starts closed opens 1ms\nwatch current L1\nspan 2ms\nsamples 201\n`;
  it('the inductor and the switch see an unbounded voltage at the opening (an ideal kick), the resistor does not', () => {
    const res = analyzeText(text, 'k.rdn');
    const s = runStress(res);
    const sw = s.find((x) => x.part === 'S1')!;
    const l = s.find((x) => x.part === 'L1')!;
    expect(l.voltage).toEqual({ value: Infinity, time: 1e-3 });
    expect(sw.voltage).toEqual({ value: Infinity, time: 1e-3 });
    expect(sw.unbounded).toContain('voltage');
    expect(s.find((x) => x.part === 'R1')!.unbounded).toEqual([]);
  });
});

describe('a switch opening an inductor current into a parallel resistor', () => {
  // 10 V through 10 Ω and 1 mH; S1 shorts node d to ground until 1 ms; 100 Ω stays across S1.
  const text = `voltage-source V1 in -> gnd 10V\nresistor R1 in -> a 10ohm\ninductor L1 a -> d 1mH\nswitch S1 d -> gnd on 1mohm off open starts closed opens 1ms\nresistor Rp d -> gnd 100ohm\nwatch node d\nspan 2ms\nsamples 201\n`;
  const sw = stressOf(text, 'S1');
  const rp = stressOf(text, 'Rp');
  it('the open switch sees the voltage of the resistor across it, kick 1 A × 100 Ω at the opening', () => {
    expect(rel(sw.voltage.value, rp.voltage.value)).toBeLessThan(1e-9);
    // just before the opening the inductor carries ≈ 10 V / 10.001 Ω; then all of it flows in Rp
    expect(rel(sw.voltage.value, (10 / (10 + 1e-3 * 100 / 100.001)) * 100)).toBeLessThan(1e-3);
    expect(sw.voltage.time).toBe(1e-3);
  });
});

describe('a Dirac impulse makes figures unbounded, not made-up numbers', () => {
  // a capacitor straight across a step voltage source: i = C·ΔV·δ(t)
  const text = `voltage-source V1 a -> gnd step to 5V\ncapacitor C1 a -> gnd 1uF\nresistor R1 a -> gnd 1k\nwatch node a\nspan 1ms\nsamples 11\nstart rest\n`;
  it('capacitor and source current, I²t and power unbounded; voltage finite', () => {
    const c = stressOf(text, 'C1');
    expect(stressOf(text, 'V1').current.value).toBe(Infinity);
    expect(c.current.value).toBe(Infinity);
    expect(c.i2t).toBe(Infinity);
    expect(c.power.value).toBe(Infinity);
    expect(c.unbounded).toEqual(expect.arrayContaining(['current', 'i2t', 'power']));
    expect(c.unbounded).not.toContain('voltage');
    expect(rel(c.voltage.value, 5)).toBeLessThan(1e-12);
  });
  it('the resistor beside it has no impulse: finite figures, heat V²/R·T', () => {
    const r = stressOf(text, 'R1');
    expect(r.unbounded).toEqual([]);
    expect(rel(r.energy!, (25 / 1000) * 1e-3)).toBeLessThan(1e-9);
  });
});

describe('ratings: the flag flips exactly at the derated limit', () => {
  it('stress equal to the limit passes; one unit in the last place more is over (derate 100 %)', () => {
    const stress = 12.345;
    expect(checkRating('R1', 'voltage', stress, stress, 0, 1).overLimit).toBe(false);
    expect(checkRating('R1', 'voltage', stress * (1 - 2 ** -52), stress, 0, 1).overLimit).toBe(true);
    expect(checkRating('R1', 'voltage', stress * (1 - 2 ** -52), stress, 0, 1).overRating).toBe(true);
  });

  it('over the derated limit but within the rating: overLimit only; margin and used', () => {
    const c = checkRating('R1', 'current', 1, 0.9, 0, 0.8);
    expect(c).toMatchObject({ overLimit: true, overRating: false, limit: 0.8 });
    expect(c.margin).toBeCloseTo(-0.1, 15);
    expect(c.usedPct).toBeCloseTo(90, 12);
  });

  const rc = (rating: string, derate = '') =>
    runRatings(analyzeText(`voltage-source V1 in -> gnd step to 12V\nresistor R1 in -> out 1k rated ${rating}\ncapacitor C1 out -> gnd 1uF\nwatch node out\nspan 5ms\nsamples 11\n${derate}`, 't.rdn'));

  it('on a real RC: 12 V across R1 at t = 0+ against a rating just above and just below (derate 100 %)', () => {
    const above = rc('12.000001V', 'derate 100%\n');
    const below = rc('11.999999V', 'derate 100%\n');
    expect(above.checks[0]).toMatchObject({ rating: 'voltage', overLimit: false, overRating: false });
    expect(below.checks[0]).toMatchObject({ rating: 'voltage', overLimit: true, overRating: true });
    expect(above.overLimit).toBe(0);
    expect(below.overLimit).toBe(1);
  });

  it('the default derating 80 %: 15.000001 V passes, 14.999999 V is over the limit but not the rating', () => {
    const a = rc('15.000001V');
    const b = rc('14.999999V');
    expect(a.derating).toBe(0.8);
    expect(a.checks[0]!.overLimit).toBe(false);
    expect(b.checks[0]).toMatchObject({ overLimit: true, overRating: false });
  });

  it('power and pulse energy compare the peak dissipation V²/R and the heat over the span', () => {
    const r = rc('144.0001mW 36uJ');
    const power = r.checks.find((c) => c.rating === 'power')!;
    const pulse = r.checks.find((c) => c.rating === 'pulseEnergy')!;
    expect(power.overLimit).toBe(true); // 144 mW > 80 % of 144.0001 mW
    expect(power.overRating).toBe(false);
    expect(rel(power.stress, 0.144)).toBeLessThan(1e-12);
    expect(rel(pulse.stress, 0.5 * 1e-6 * 144 * (1 - Math.exp(-10)))).toBeLessThan(1e-9);
    expect(pulse.overRating).toBe(true); // ≈ 72 µJ > 36 µJ
  });
});

describe('metrics: rounding-noise times and periodic signals', () => {
  it('an extremum within 1e-12 of the span from t = 0 is reported at t = 0; a later one keeps its time', () => {
    const span = 1e-3;
    const times = grid(0, span, 101);
    // y = (t − t*)², valley at t*
    const at = (ts: number) => [piece(0, Infinity, [{ kind: 'poly-exp', lambda: 0, polyCoefs: [ts * ts, -2 * ts, 1] }])];
    const noise = at(5e-16);
    const m = computeMetrics(times, sampleAll(noise, times, evaluatePieces), noise, { kind: 'relative', fraction: 0.02 });
    expect(m.valley.time).toBe(0);
    const real = at(1e-9);
    const k = computeMetrics(times, sampleAll(real, times, evaluatePieces), real, { kind: 'relative', fraction: 0.02 });
    expect(rel(k.valley.time, 1e-9)).toBeLessThan(1e-3);
  });

  it('an undamped sinusoid in the last piece: no overshoot, rise or settling', () => {
    const text = `voltage-source V1 in -> gnd sine amplitude 1V freq 1kHz\nresistor R1 in -> out 1k\ncapacitor C1 out -> gnd 100nF\nwatch node out\nspan 5ms\nsamples 501\n`;
    const res = analyzeText(text, 's.rdn');
    const tr = res.traces[0]!;
    expect(isPeriodicSignal(res.times, tr.values, tr.pieces, res.circuit.analysis.settle)).toBe(true);
    expect(tr.metrics).toMatchObject({ overshootPct: null, riseTime: null, settlingTime: null });
  });

  it('a step response is not periodic and keeps its overshoot', () => {
    const res = analyzeText(`voltage-source V1 in -> gnd step to 10V\nresistor R1 in -> a 10ohm\ninductor L1 a -> b 1mH\ncapacitor C1 b -> gnd 1uF\nwatch voltage C1\nspan 2ms\nsamples 201\n`, 'x.rdn');
    const tr = res.traces[0]!;
    expect(isPeriodicSignal(res.times, tr.values, tr.pieces, res.circuit.analysis.settle)).toBe(false);
    expect(tr.metrics.overshootPct).toBeGreaterThan(50);
  });

  it('a PWM-driven LC filter: the inductor current keeps swinging (periodic), the output voltage settles', () => {
    // ripple: about 6 A peak to peak in Lf, about 80 mV in the output (inside its ±2 % band)
    const text = `voltage-source Vsw sw -> gnd pulse from 0V to 12V freq 100kHz duty 40% rise 20ns fall 20ns\ninductor Lf sw -> x 4.7uH\nresistor RL x -> out 20mohm\ncapacitor Cf out -> gnd 100uF\nresistor Rload out -> gnd 1ohm\nwatch node out\nwatch current Lf\nspan 3ms\nsamples 2001\n`;
    const res = analyzeText(text, 'pwm.rdn');
    const [out, il] = res.traces;
    const band = res.circuit.analysis.settle;
    expect(isPeriodicSignal(res.times, il!.values, il!.pieces, band)).toBe(true);
    expect(il!.metrics.overshootPct).toBeNull();
    expect(isPeriodicSignal(res.times, out!.values, out!.pieces, band)).toBe(false);
    expect(out!.metrics.overshootPct).toBeGreaterThan(0);
  });
});
