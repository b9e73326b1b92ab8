import { describe, expect, it } from 'vitest';
import { loadCircuit } from '../../src/circuit/load.js';
import { errors, lines } from './helpers.js';

/** The terms of a source on line 1 of a minimal circuit. */
function terms(wave: string, kind: 'voltage-source' | 'current-source' = 'voltage-source') {
  const c = loadCircuit(lines(`${kind} S x -> gnd ${wave}`, 'resistor R x -> gnd 1k', 'watch node x'), 'w.rdn');
  return c.parts[0]!.waveform!.terms;
}
/** The errors of a source on line 1, as [line, col, message]. */
function wrong(wave: string, kind: 'voltage-source' | 'current-source' = 'voltage-source') {
  return errors(lines(`${kind} S x -> gnd ${wave}`, 'resistor R x -> gnd 1k', 'watch node x')).map((d) => [d.loc?.line, d.loc?.col, d.message]);
}
/** Column of `part` in the line `voltage-source S x -> gnd ${wave}`. */
const col = (wave: string, part: string) => 'voltage-source S x -> gnd '.length + wave.indexOf(part) + 1;

describe('ramp', () => {
  it('reads at, rate and until in SI; until defaults to no end', () => {
    expect(terms('ramp at 1ms rate 2kV/s until 3ms')).toEqual([{ kind: 'ramp', at: 1e-3, slope: 2000, until: 3e-3 }]);
    expect(terms('ramp rate 5mA/s', 'current-source')).toEqual([{ kind: 'ramp', at: 0, slope: 5e-3, until: Infinity }]);
  });
  it('takes its keywords in any order', () => {
    expect(terms('ramp until 3ms rate 2kV/s at 1ms')).toEqual(terms('ramp at 1ms rate 2kV/s until 3ms'));
  });
  it('checks rate units against the source kind', () => {
    const w = 'ramp rate 2kA/s';
    expect(wrong(w)).toEqual([[1, col(w, '2kA/s'), "'rate' of S's ramp is given in amperes per second (A/s), but needs a voltage rate in volts per second (V/s)"]]);
    expect(wrong('ramp rate 2V/s', 'current-source')[0]![2]).toMatch(/needs a current rate in amperes per second/);
    expect(wrong('ramp rate 2kV')[0]![2]).toMatch(/given in volts \(V\)/);
  });
  it('refuses a space between the prefixed value and V/s', () => {
    expect(wrong('ramp rate 2k V/s')[0]).toEqual([1, col('ramp rate 2k V/s', '/'), "unexpected character '/'"]);
    expect(errors(lines('voltage-source S x -> gnd ramp rate 2k V/s'))[0]!.hint).toMatch(/such as 2kV\/s/);
  });
  it('needs rate, and until after at', () => {
    expect(wrong('ramp at 1ms')).toEqual([[1, 27, "a ramp needs 'rate'"]]);
    const w = 'ramp at 2ms rate 1V/s until 1ms';
    expect(wrong(w)).toEqual([[1, col(w, '1ms'), 'the ramp must end after it starts at 0.002 s (got \'until\' 0.001 s)']]);
  });
});

describe('approach', () => {
  it('reads from, to, at and tau; from and at default to 0', () => {
    expect(terms('approach from 1V to 5V at 2ms tau 500us')).toEqual([{ kind: 'approach', from: 1, to: 5, at: 2e-3, tau: 5e-4 }]);
    expect(terms('approach to 5V tau 1ms')).toEqual([{ kind: 'approach', from: 0, to: 5, at: 0, tau: 1e-3 }]);
  });
  it('needs to and a positive tau', () => {
    expect(wrong('approach tau 1ms')).toEqual([[1, 27, "an approach needs 'to'"]]);
    const w = 'approach to 5V tau 0s';
    expect(wrong(w)).toEqual([[1, col(w, '0s'), "'tau' must be greater than zero (got 0 s)"]]);
  });
});

describe('sine', () => {
  it('reads amplitude, freq, phase (stored in radians), at and decay', () => {
    expect(terms('sine amplitude 0.2V freq 100kHz phase 90deg at 1ms decay 10ms')).toEqual([
      { kind: 'sine', amplitude: 0.2, freq: 1e5, phase: (90 * Math.PI) / 180, at: 1e-3, decay: 1e-2 },
    ]);
  });
  it('defaults phase and at to 0 and decay to none', () => {
    expect(terms('sine amplitude 1V freq 50Hz')).toEqual([{ kind: 'sine', amplitude: 1, freq: 50, phase: 0, at: 0, decay: Infinity }]);
  });
  it('turns rms into amplitude, period into freq, and keeps rad as written', () => {
    expect(terms('sine rms 230V period 20ms phase 0.5rad')).toEqual([
      // peak = RMS·√2 for a sinusoid (circuits textbook, from memory); 90° = π/2 rad
      { kind: 'sine', amplitude: 230 * Math.SQRT2, freq: 1 / 0.02, phase: 0.5, at: 0, decay: Infinity },
    ]);
  });
  it('adds to a constant with +', () => {
    expect(terms('12V + sine amplitude 0.2V freq 100kHz')).toEqual([
      { kind: 'constant', value: 12 },
      { kind: 'sine', amplitude: 0.2, freq: 1e5, phase: 0, at: 0, decay: Infinity },
    ]);
  });
  it('needs one size and one rate, not both spellings', () => {
    expect(wrong('sine freq 1kHz')).toEqual([[1, 27, "a sine needs 'amplitude' or 'rms'"]]);
    expect(wrong('sine amplitude 1V')).toEqual([[1, 27, "a sine needs 'freq' or 'period'"]]);
    const w = 'sine amplitude 1V rms 1V freq 1kHz';
    expect(wrong(w)).toEqual([[1, col(w, 'rms'), "'rms' and 'amplitude' cannot both be given"]]);
  });
  it('checks units: Hz for freq, deg or rad for phase (a bare phase is refused)', () => {
    const w = 'sine amplitude 1V freq 1ms';
    expect(wrong(w)).toEqual([[1, col(w, '1ms'), "'freq' of S's sine is given in seconds (s), but needs a frequency in hertz (Hz)"]]);
    const p = 'sine amplitude 1V freq 1kHz phase 90';
    expect(wrong(p)).toEqual([[1, col(p, '90'), 'a phase needs its unit: deg or rad']]);
    expect(terms('sine amplitude 1V freq 1kHz phase 0')[0]).toMatchObject({ phase: 0 });
    expect(wrong('sine amplitude 1A freq 1kHz')[0]![2]).toMatch(/needs a voltage in volts/);
  });
  it('reports a missing value where the next keyword stands', () => {
    const w = 'sine amplitude freq 1kHz';
    expect(wrong(w)).toEqual([[1, col(w, 'freq'), "missing a value after 'amplitude'"]]);
  });
});

describe('pulse', () => {
  it('reads every keyword in SI', () => {
    expect(terms('pulse from 1V to 5V period 1ms width 200us rise 10us fall 20us start 2ms cycles 4')).toEqual([
      { kind: 'pulse', low: 1, high: 5, period: 1e-3, width: 2e-4, rise: 1e-5, fall: 2e-5, start: 2e-3, cycles: 4 },
    ]);
  });
  it('defaults from, rise, fall, start to 0 and cycles to unending', () => {
    expect(terms('pulse to 5V period 1ms width 200us')).toEqual([
      { kind: 'pulse', low: 0, high: 5, period: 1e-3, width: 2e-4, rise: 0, fall: 0, start: 0, cycles: Infinity },
    ]);
  });
  it('turns freq into period and duty into width', () => {
    expect(terms('pulse to 3.3V freq 1kHz duty 25%')[0]).toMatchObject({ period: 1e-3, width: 0.25 * 1e-3 });
    expect(terms('pulse to 3.3V period 1ms duty 100%')[0]).toMatchObject({ width: 1e-3 });
  });
  it('refuses edges and width longer than the period', () => {
    const w = 'pulse to 5V period 1ms width 900us rise 100us fall 1us';
    expect(wrong(w)).toEqual([[1, 27, 'rise + width + fall (0.001001 s) is longer than the period (0.001 s)']]);
  });
  it('checks duty, cycles and required keys', () => {
    const d = 'pulse to 5V period 1ms duty 150%';
    expect(wrong(d)).toEqual([[1, col(d, '150%'), 'the duty cycle must be more than 0% and at most 100% (got 150%)']]);
    const c = 'pulse to 5V period 1ms width 1us cycles 2.5';
    expect(wrong(c)).toEqual([[1, col(c, '2.5'), "'cycles' must be a whole number of at least 1 (got 2.5)"]]);
    expect(wrong('pulse to 5V width 1us')).toEqual([[1, 27, "a pulse needs 'period' or 'freq'"]]);
    expect(wrong('pulse to 5V period 1ms')).toEqual([[1, 27, "a pulse needs 'width' or 'duty'"]]);
    expect(wrong('pulse period 1ms width 1us')).toEqual([[1, 27, "a pulse needs 'to'"]]);
    const u = 'pulse to 5V period 1ms duty 50ms';
    expect(wrong(u)[0]![2]).toMatch(/'duty' of S's pulse is given in seconds \(s\), but needs a duty cycle in percent/);
  });
});

describe('table', () => {
  it('reads inline pairs in SI', () => {
    expect(terms('table 0 0V, 1ms 5V, 2.5ms -1V')).toEqual([
      { kind: 'table', points: [{ t: 0, v: 0 }, { t: 1e-3, v: 5 }, { t: 2.5e-3, v: -1 }] },
    ]);
  });
  it('needs strictly increasing times', () => {
    const w = 'table 0 0V, 1ms 5V, 1ms 4V';
    expect(wrong(w)).toEqual([[1, col(w, '1ms 4V'), 'table times must increase: 0.001 s does not come after 0.001 s']]);
  });
  it('checks the value unit against the source kind', () => {
    const w = 'table 0 0A, 1ms 5A';
    expect(wrong(w)[0]).toEqual([1, col(w, '0A'), "a value in S's table is given in amperes (A), but needs a voltage in volts (V)"]);
  });
  it('needs two points', () => {
    expect(wrong('table 0 1V')).toEqual([[1, 33, 'a table needs at least two points']]);
  });
});

describe('expression', () => {
  it('compiles once, with t in seconds and SI literals', () => {
    const [term] = terms('expression "5*sin(2*pi*50*t)*exp(-t/10m)"');
    expect(term).toMatchObject({ kind: 'expression', text: '5*sin(2*pi*50*t)*exp(-t/10m)' });
    const fn = (term as { fn: (t: number) => number }).fn;
    expect(fn(0)).toBe(0);
    expect(fn(1e-3)).toBeCloseTo(5 * Math.sin(2 * Math.PI * 50 * 1e-3) * Math.exp(-0.1), 12);
  });
  it('uses parameters declared above', () => {
    const c = loadCircuit(lines('param f = 1kHz', 'voltage-source S x -> gnd expression "sin(2*pi*f*t)"', 'resistor R x -> gnd 1k', 'watch node x'), 'w.rdn');
    const fn = (c.parts[0]!.waveform!.terms[0] as { fn: (t: number) => number }).fn;
    expect(fn(0.25e-3)).toBeCloseTo(1, 12);
  });
  it('rejects unknown names with did-you-mean, at the name inside the quotes', () => {
    const w = 'expression "5*sn(2*pi*50*t)"';
    const es = errors(lines(`voltage-source S x -> gnd ${w}`, 'resistor R x -> gnd 1k', 'watch node x'));
    expect(es).toHaveLength(1);
    expect(es[0]).toMatchObject({ message: "unknown name 'sn'", hint: "did you mean 'sin'?", loc: { line: 1, col: col(w, 'sn'), length: 2 } });
    expect(errors(lines('voltage-source S x -> gnd expression "2*tt"', 'resistor R x -> gnd 1k', 'watch node x'))[0]!.hint).toBe("did you mean 't'?");
  });
  it('must have a finite value at t = 0', () => {
    const w = 'expression "1/t"';
    expect(wrong(w)).toEqual([[1, col(w, '"'), 'this expression does not give a finite real number at t = 0 (got Infinity)']]);
  });
});

describe('delay', () => {
  it('shifts every kind of term', () => {
    expect(terms('step to 1V at 1ms delay 2ms')).toEqual([{ kind: 'step', from: 0, to: 1, at: 3e-3, rise: 0 }]);
    expect(terms('impulse 1mVs at 1ms delay 1ms')).toEqual([{ kind: 'impulse', area: 1e-3, at: 2e-3 }]);
    expect(terms('ramp at 1ms rate 1V/s until 2ms delay 1ms')).toEqual([{ kind: 'ramp', at: 2e-3, slope: 1, until: 3e-3 }]);
    expect(terms('approach to 1V tau 1ms delay 5ms')[0]).toMatchObject({ at: 5e-3 });
    expect(terms('sine amplitude 1V freq 1kHz delay 5ms')[0]).toMatchObject({ at: 5e-3 });
    expect(terms('pulse to 1V period 1ms width 1us start 1ms delay 1ms')[0]).toMatchObject({ start: 2e-3 });
    expect(terms('table 0 0V, 1ms 1V delay 1ms')).toEqual([{ kind: 'table', points: [{ t: 1e-3, v: 0 }, { t: 2e-3, v: 1 }] }]);
    const fn = (terms('expression "t" delay 2ms')[0] as { fn: (t: number) => number }).fn;
    expect(fn(5e-3)).toBeCloseTo(3e-3, 15);
  });
  it('is refused on a constant, and when negative', () => {
    const c = '5V delay 1ms';
    expect(wrong(c)).toEqual([[1, col(c, 'delay'), 'a constant level does not change in time, so it cannot be delayed']]);
    const n = 'step to 1V delay -1ms';
    expect(wrong(n)).toEqual([[1, col(n, '-1ms'), "'delay' cannot be negative (got -0.001 s)"]]);
  });
});

describe('waveform keywords: did-you-mean and misplacement', () => {
  const hint = (wave: string) => errors(lines(`voltage-source S x -> gnd ${wave}`, 'resistor R x -> gnd 1k', 'watch node x'))[0]!;
  it.each([
    ['rmap rate 1V/s', 'ramp', "unknown waveform term 'rmap'"],
    ['aproach to 1V tau 1ms', 'approach', "unknown waveform term 'aproach'"],
    ['sien amplitude 1V freq 1kHz', 'sine', "unknown waveform term 'sien'"],
    ['plse to 1V period 1ms width 1us', 'pulse', "unknown waveform term 'plse'"],
    ['tabel 0 0V, 1ms 1V', 'table', "unknown waveform term 'tabel'"],
    ['expresion "t"', 'expression', "unknown waveform term 'expresion'"],
    ['sine amplitude 1V frq 1kHz', 'freq', "unknown sine keyword 'frq'"],
    ['sine amplitude 1V freq 1kHz phsae 1rad', 'phase', "unknown sine keyword 'phsae'"],
    ['pulse to 1V period 1ms width 1us cylces 3', 'cycles', "unknown pulse keyword 'cylces'"],
    ['approach to 1V tua 1ms', 'tau', "unknown approach keyword 'tua'"],
    ['ramp rate 1V/s untill 1ms', 'until', "unknown ramp keyword 'untill'"],
    ['step to 1V dealy 1ms', 'delay', "unknown step keyword 'dealy'"],
  ])('%s', (wave, suggestion, message) => {
    const d = hint(wave);
    expect(d.message).toBe(message);
    expect(d.hint).toBe(`did you mean '${suggestion}'?`);
  });
  it('refuses a keyword given twice', () => {
    const w = 'sine amplitude 1V freq 1kHz freq 2kHz';
    expect(wrong(w)).toEqual([[1, col(w, 'freq 2kHz'), "'freq' is given twice in this sine"]]);
  });
});
