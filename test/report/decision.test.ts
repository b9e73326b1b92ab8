/** The decision report: part stress and ratings in text, JSON and numbers; exit codes on real circuits. */
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { main } from '../../src/cli/main.js';
import { visibleWidth } from '../../src/report/color.js';
import { capture } from '../helpers/capture.js';

// RC charge from 12 V: R1 sees 12 V and 12 mA at t = 0+, C1 reaches 12(1 − e^(−5)) V at 5 ms.
const rc = (rated: string, extra = '') =>
  `voltage-source V1 in -> gnd step to 12V\nresistor R1 in -> out 1k ${rated}\ncapacitor C1 out -> gnd 1uF rated 25V\nwatch node out\nspan 5ms\nsamples 51\n${extra}`;

let dir = '';
const file = (name: string, text: string) => {
  const p = join(dir, name);
  writeFileSync(p, text);
  return p;
};
beforeAll(() => {
  dir = mkdtempSync(join(tmpdir(), 'ringdown-decision-'));
});
afterAll(() => rmSync(dir, { recursive: true, force: true }));

const run = async (path: string, ...args: string[]) => {
  const io = capture();
  const code = await main(['node', 'ringdown', 'run', path, ...args], io);
  return { code, out: io.out(), err: io.err() };
};

describe('exit codes on real circuits', () => {
  it('0: every stress within its derated limit (15.1 V × 80 % = 12.08 V > 12 V)', async () => {
    const r = await run(file('ok.rdn', rc('rated 15.1V 20mA')), '--no-chart');
    expect(r.code).toBe(0);
    expect(r.out).toContain('Ratings: PASS');
    expect(r.err).toBe('');
  });

  it('4: over the derated limit (14.9 V × 80 % < 12 V), in every format, named on standard error', async () => {
    const path = file('over.rdn', rc('rated 14.9V'));
    for (const format of ['text', 'json', 'csv', 'numbers']) {
      const r = await run(path, '--format', format);
      expect(r.code).toBe(4);
      expect(r.out.length).toBeGreaterThan(0);
      expect(r.err).toContain('RATING EXCEEDED: R1 voltage 12.00 V is above the limit 11.92 V (80 % of 14.90 V)');
    }
  });

  it('4 with derate 100 %: only above the rating itself counts', async () => {
    expect((await run(file('d100ok.rdn', rc('rated 12.001V', 'derate 100%\n')))).code).toBe(0);
    const over = await run(file('d100.rdn', rc('rated 11.999V', 'derate 100%\n')));
    expect(over.code).toBe(4);
    expect(over.err).toContain('above the rating itself');
  });

  it('2: a problem in the input (a power rating on a capacitor), nothing computed', async () => {
    const r = await run(file('bad.rdn', rc('rated 15V').replace('rated 25V', 'rated 2W')));
    expect(r.code).toBe(2);
    expect(r.out).toBe('');
  });
});

describe('text report', () => {
  it('Part stress and Ratings tables within 80 columns, with PASS / OVER LIMIT / OVER RATING marks', async () => {
    const r = await run(file('marks.rdn', rc('rated 14.9V 11mA 1W')), '--no-chart');
    const lines = r.out.split('\n');
    expect(lines.filter((l) => visibleWidth(l) > 80)).toEqual([]);
    const at = lines.indexOf('Ratings');
    const table = lines.slice(at, at + 12).join('\n');
    expect(table).toMatch(/R1 +14\.90 V +12\.00 V +11\.92 V +-80\.00 mV +80\.54 % +OVER LIMIT/);
    expect(table).toMatch(/R1 +11\.00 mA +12\.00 mA +8\.800 mA +-3\.200 mA +109\.1 % +OVER RATING/);
    expect(table).toMatch(/R1 +1\.000 W +144\.0 mW +800\.0 mW +\+656\.0 mW +14\.40 % +PASS/);
    expect(table).toContain('80 % of each rating (the default, a common-practice margin)');
    expect(r.out).toMatch(/Ratings: OVER, 2 of 4 above 80 % of their rating, 1 above the rating itself/);
    const stress = lines.slice(lines.indexOf('Part stress (peaks over the span, from the closed forms)')).join('\n');
    expect(stress).toMatch(/R1 +12\.00 V at 0 s +12\.00 mA at 0 s +144\.0 mW at 0 s/);
    expect(stress).toMatch(/R1 +72\.00 µJ +7\.2e-8 A²s/); // ½CV²(1 − e^(−10)), V²C/(2R)(1 − e^(−10))
  });

  it('a sinusoidal steady state: no single transition instead of overshoot, rise and settling', async () => {
    const text = 'voltage-source V1 in -> gnd sine amplitude 1V freq 1kHz\nresistor R1 in -> out 1k\ncapacitor C1 out -> gnd 100nF\nwatch node out\nspan 5ms\nsamples 201\n';
    const r = await run(file('sine.rdn', text), '--no-chart');
    expect(r.code).toBe(0);
    expect(r.out).toContain('no single transition (periodic)');
    expect(r.out).not.toMatch(/overshoot +\d/);
    expect(r.out).not.toMatch(/rise time/);
  });

  it('a peak at t = 0 is printed at 0 s, not at a rounding-noise time', async () => {
    const r = await run(file('zero.rdn', rc('')), '--no-chart');
    expect(r.out).toMatch(/valley +0 V at t = 0 s/);
    expect(r.out).not.toMatch(/e-\d\d s/);
  });
});

describe('machine formats', () => {
  it('--format numbers: key=value lines, round-trip numbers', async () => {
    const r = await run(file('num.rdn', rc('rated 15V')), '--format', 'numbers');
    const map = new Map(r.out.trimEnd().split('\n').map((l) => [l.slice(0, l.indexOf('=')), l.slice(l.indexOf('=') + 1)] as const));
    for (const line of r.out.trimEnd().split('\n')) expect(line).toMatch(/^[^=\s]+=(-?[0-9.e+-]+|inf|-inf|nan)$/);
    const vEnd = 12 * (1 - Math.exp(-5));
    expect(Math.abs(Number(map.get('v(out).peak')) - vEnd) / vEnd).toBeLessThan(1e-12);
    expect(Math.abs(Number(map.get('C1.voltage.peak')) - vEnd) / vEnd).toBeLessThan(1e-12);
    expect(Number(map.get('C1.voltage.peak.time'))).toBe(5e-3);
    const heat = 0.5 * 1e-6 * 144 * (1 - Math.exp(-10));
    expect(Math.abs(Number(map.get('R1.energy')) - heat) / heat).toBeLessThan(1e-9);
    expect(Math.abs(Number(map.get('rating.R1.voltage.used')) - 80)).toBeLessThan(1e-9);
    expect(map.get('rating.R1.voltage.over_limit')).toBe('0');
    expect(map.get('ratings.over_limit')).toBe('0');
    expect(map.has('C1.energy')).toBe(false); // no heat figure for a capacitor
  });

  it('JSON carries stress and ratings; unbounded figures are null and listed', async () => {
    const text = 'voltage-source V1 a -> gnd step to 5V\ncapacitor C1 a -> gnd 1uF rated 3A\nresistor R1 a -> gnd 1k\nwatch node a\nspan 1ms\nsamples 11\nstart rest\n';
    const r = await run(file('imp.rdn', text), '--format', 'json');
    expect(r.code).toBe(4); // an ideal charging impulse is above any current rating
    const j = JSON.parse(r.out) as { stress: { part: string; current: { value: number | null }; i2t: number | null; unbounded: string[] }[]; ratings: { checks: { part: string; stress: number | null; overRating: boolean }[] } };
    const c1 = j.stress.find((s) => s.part === 'C1')!;
    expect(c1.current.value).toBeNull();
    expect(c1.i2t).toBeNull();
    expect(c1.unbounded).toEqual(expect.arrayContaining(['current', 'i2t']));
    expect(j.ratings.checks[0]).toMatchObject({ part: 'C1', stress: null, overRating: true });
  });
});
