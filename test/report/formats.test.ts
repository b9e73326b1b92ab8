import type { Piece, Term } from '../../src/simulate/result.js';
import { describe, expect, it } from 'vitest';
import { csvNumber, formatCSV } from '../../src/report/csv.js';
import { JSON_SCHEMA, formatJSON } from '../../src/report/json.js';
import { formatTextReport } from '../../src/report/text.js';
import { formatCheck } from '../../src/report/check.js';
import { chartWidth } from '../../src/report/chart.js';
import { rcResult } from './fixture.js';

describe('CSV', () => {
  const csv = formatCSV(rcResult());
  const lines = csv.trimEnd().split('\n');

  it('has a time column and one column per watch, in declaration order, labels quoted when needed', () => {
    expect(lines[0]).toBe('time_s,v(out) (V),"i(R1), ""charge"" (A)"');
    expect(lines.length).toBe(102);
  });

  it('keeps at least 12 significant digits', () => {
    const r = rcResult();
    lines.slice(1).forEach((line, i) => {
      const [t, v] = line.split(',').map(Number);
      expect(Math.abs(t! - r.times[i]!)).toBeLessThanOrEqual(1e-12 * Math.abs(r.times[i]!));
      expect(Math.abs(v! - r.traces[0]!.values[i]!)).toBeLessThanOrEqual(1e-12 * Math.abs(r.traces[0]!.values[i]!));
    });
    expect(csvNumber(Math.PI)).toBe('3.14159265358979');
    expect(csvNumber(0.1 + 0.2)).toBe('0.3');
    expect(csvNumber(1.234567890123456e-9)).toBe('1.23456789012346e-9');
    expect(csvNumber(NaN)).toBe('');
  });
});

describe('JSON', () => {
  it('round-trips: schema tag, typed arrays as arrays, non-finite as null', () => {
    const r = rcResult();
    r.traces[0]!.paths[0]!.dcGain = Infinity;
    const back = JSON.parse(formatJSON(r));
    expect(back.schema).toBe(JSON_SCHEMA);
    expect(Object.keys(back)[0]).toBe('schema');
    expect(back.times).toEqual(Array.from(r.times));
    expect(back.traces[1].values).toEqual(Array.from(r.traces[1]!.values));
    expect(back.traces[0].pieces[0].t1).toBeNull();
    expect(back.traces[0].paths[0].dcGain).toBeNull();
    expect(back.traces[0].metrics.riseTime).toBeCloseTo(r.traces[0]!.metrics.riseTime!, 15);
    expect(back.circuit.parts[2].value).toBe(1e-6);
    expect(back.crossCheck.passed).toBe(true);
  });
});

describe('text report', () => {
  const text = formatTextReport(rcResult());

  it('writes the closed form readably', () => {
    expect(text).toContain('v(out) = 12 V − 12 V·e^(−t/1.00 ms)');
    expect(text).toContain('s(t) = 1 − e^(−t/1.00 ms)');
  });

  it('has every section, the cross-check and the safety notice, within 80 columns', () => {
    for (const s of ['Circuit (rc.rdn)', 'Natural modes', 'Signal v(out) (V)', 'rise time', 'Cross-check', 'PASS', 'Safety', 'ESR', 'kickback']) {
      expect(text).toContain(s);
    }
    expect(text).toContain('1 kΩ');
    expect(text).toContain('12 mA·e^(−t/1.00 ms)');
    expect(text).toMatch(/rise time \(10 → 90 %\) +2\.\d{3} ms/);
    expect(chartWidth(text.split('Signal v(out)')[1]!.split('measurements')[1]!)).toBeLessThanOrEqual(80);
  });

  it('makes a failed cross-check loud', () => {
    const r = rcResult();
    r.crossCheck = { ...r.crossCheck, maxRelError: 2e-3, passed: false };
    const t = formatTextReport(r, { chart: false });
    expect(t).toContain('CROSS-CHECK FAILED');
    expect(t).not.toContain('└');
  });
});

describe('check printout', () => {
  it('lists nodes, parts in SI with directions, sources with terms, watches and settings', () => {
    const t = formatCheck(rcResult().circuit);
    for (const s of ['in, out, gnd', '1 kΩ', '1 µF', 'initial 0 V', 'step 0 V → 12 V at 0 s', 'current through R1', 'span: 5 ms', 'samples: 101', '±2 %']) {
      expect(t).toContain(s);
    }
  });
});

describe('JSON layout', () => {
  it('keeps number arrays on one line and stays valid JSON', () => {
    const text = formatJSON(rcResult());
    const timesLine = text.split('\n').find((l) => l.includes('"times"'))!;
    expect(timesLine).toMatch(/^\s*"times": \[0,0\.00005,0\.0001,/);
    expect(text.split('\n').length).toBeLessThan(400);
    expect(() => JSON.parse(text)).not.toThrow();
  });
});

describe('notices and warnings', () => {
  it('lists the circuit warnings and the run notices', () => {
    const r = rcResult();
    r.circuit.warnings = [{ severity: 'warning', message: "node 'x' has one connection", loc: { file: 'rc.rdn', line: 7, col: 3, length: 1 }, hint: 'connect it' }];
    r.notices = ['the capacitor voltage jumps at t = 0'];
    const t = formatTextReport(r, { chart: false });
    expect(t).toContain("warning: line 7: node 'x' has one connection (connect it)");
    expect(t).toContain('- the capacitor voltage jumps at t = 0');
  });
});

describe('switching', () => {
  it('lists events with jumps and lost energy, and modes per configuration', () => {
    const r = rcResult();
    r.events = [{ t: 1e-3, closed: ['S1'], jumps: [{ part: 'C1', kind: 'capacitor-voltage', before: 5, after: 2.5 }], energyLost: 1.25e-6 }];
    r.configurations = [
      { from: 0, closed: [], states: r.states, modes: [{ kind: 'real', lambda: -1000, tau: 1e-3 }], paths: [] },
      { from: 1e-3, closed: ['S1'], states: r.states, modes: [{ kind: 'real', lambda: -2000, tau: 5e-4 }], paths: [] },
    ];
    const t = formatTextReport(r, { chart: false });
    expect(t).toContain('t = 1.000 ms: closed switches: S1');
    expect(t).toContain('voltage of C1 jumps from 5.000 V to 2.500 V');
    expect(t).toContain('energy lost in the instant: 1.250 µJ');
    expect(t).toContain('Natural modes from t = 1 ms (S1 closed)');
    expect(t).toContain('500.0 µs');
  });
});

describe('80 columns', () => {
  it('every line of the text report fits, long titles and formulas included', () => {
    const r = rcResult();
    r.circuit.title = 'A very long title that goes on and on about the inrush current of a hot-plugged board with bulk capacitance';
    r.traces[0]!.pieces = [
      {
        t0: 0,
        t1: Infinity,
        impulseArea: 0,
        terms: [
          { kind: 'exp', lambda: 0, coef: 23.97 },
          { kind: 'osc', sigma: -1e4, omega: 3.1e4, cosCoef: 3.1, sinCoef: -24.2 },
          { kind: 'exp', lambda: -3e3, coef: 1.5 },
          { kind: 'poly-exp', lambda: -7e3, polyCoefs: [1, 2e3, 3e6] },
        ],
      },
    ];
    const text = formatTextReport(r);
    const long = text.split('\n').filter((l) => [...l].length > 80);
    expect(long).toEqual([]);
  });
});

describe('check printout with ratings', () => {
  it('shows what a part is rated for', () => {
    const c = rcResult().circuit;
    c.parts[2]!.ratings = { voltage: 16, pulseEnergy: 0.5 };
    const t = formatCheck(c);
    expect(t).toContain('rated 16 V, 500 mJ per pulse');
    expect(t).toContain('derating: parts flagged above 80 % of a rating');
  });
});

describe('wrapping keeps indentation', () => {
  it('indents the first line as given', async () => {
    const { wrapWords } = await import('../../src/report/wrap.js');
    expect(wrapWords('  nodes: a, b', 80, '    ')).toEqual(['  nodes: a, b']);
    expect(wrapWords('  one two three', 10, '    ')).toEqual(['  one two', '    three']);
  });
});

describe('energy', () => {
  it('balances the RC charge: the source delivers C·V², half is heat, half is stored (circuits textbook, from memory)', () => {
    const r = rcResult();
    // over [0, ∞) a 12 V step into 1 µF through 1 kΩ: delivered 144 µJ, heat 72 µJ, stored 72 µJ
    const tau = 1e-3;
    const forever = 1; // 1000 τ: e^(−1000) is nothing
    const piece = (terms: Term[]): Piece[] => [{ t0: 0, t1: forever, impulseArea: 0, terms }];
    r.parts = [
      { part: 'V1', voltage: piece([{ kind: 'exp', lambda: 0, coef: 12 }]), current: piece([{ kind: 'exp', lambda: -1 / tau, coef: -0.012 }]) },
      { part: 'R1', voltage: piece([{ kind: 'exp', lambda: -1 / tau, coef: 12 }]), current: piece([{ kind: 'exp', lambda: -1 / tau, coef: 0.012 }]) },
      {
        part: 'C1',
        voltage: piece([{ kind: 'exp', lambda: 0, coef: 12 }, { kind: 'exp', lambda: -1 / tau, coef: -12 }]),
        current: piece([{ kind: 'exp', lambda: -1 / tau, coef: 0.012 }]),
      },
    ];
    const t = formatTextReport(r, { chart: false });
    expect(t).toMatch(/delivered by the sources\s+144\.0 µJ/);
    expect(t).toMatch(/turned into heat\s+72\.00 µJ/);
    expect(t).toMatch(/change in stored energy\s+72\.00 µJ/);
  });
});
