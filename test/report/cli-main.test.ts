import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { main } from '../../src/cli/main.js';
import { parseSamplesOption, parseSpanOption } from '../../src/cli/options.js';
import { capture } from '../helpers/capture.js';

const RC = 'title "RC"\nvoltage-source V1 in -> gnd step to 12V\nresistor R1 in -> out 1k\ncapacitor C1 out -> gnd 1uF\nwatch node out\nspan 5ms\nsamples 51\n';
let dir = '';
beforeAll(() => {
  dir = mkdtempSync(join(tmpdir(), 'ringdown-main-'));
  writeFileSync(join(dir, 'rc.rdn'), RC);
  writeFileSync(join(dir, 'bad.rdn'), RC.replace('1uF', '1uH'));
});
afterAll(() => rmSync(dir, { recursive: true, force: true }));

const argv = (...args: string[]) => ['node', 'ringdown', ...args];

describe('main', () => {
  it('run: text report, exit 0', async () => {
    const io = capture();
    expect(await main(argv('run', join(dir, 'rc.rdn')), io)).toBe(0);
    expect(io.out()).toContain('v(out) = 12 V − 12 V·e^(−t/1.00 ms)');
    expect(io.out()).toContain('Safety');
  });

  it('run -: reads standard input; csv; --samples and --span override the file', async () => {
    const io = capture(RC);
    expect(await main(argv('run', '-', '--format', 'csv', '--samples', '11', '--span', '2ms'), io)).toBe(0);
    const lines = io.out().trimEnd().split('\n');
    expect(lines[0]).toBe('time_s,v(out) (V)');
    expect(lines.length).toBe(12);
    expect(Number(lines[11]!.split(',')[0])).toBeCloseTo(2e-3, 15);
  });

  it('--out writes the file; json carries the schema', async () => {
    const io = capture();
    const file = join(dir, 'r.json');
    expect(await main(argv('run', join(dir, 'rc.rdn'), '--format', 'json', '--out', file), io)).toBe(0);
    expect(io.out()).toBe('');
    expect(JSON.parse(readFileSync(file, 'utf8')).schema).toBe('ringdown-result/1');
  });

  it('input errors: every diagnostic on stderr with file:line:col, exit 2, no stack', async () => {
    const io = capture();
    expect(await main(argv('run', join(dir, 'bad.rdn')), io)).toBe(2);
    expect(io.err()).toMatch(/bad\.rdn:4:\d+/);
    expect(io.err()).not.toMatch(/^\s+at /m);
    expect(io.out()).toBe('');
  });

  it('a missing file, a bad option value and an unknown option are input errors', async () => {
    expect(await main(argv('run', join(dir, 'nope.rdn')), capture())).toBe(2);
    expect(await main(argv('run', join(dir, 'rc.rdn'), '--span', '2mF'), capture())).toBe(2);
    expect(await main(argv('run', join(dir, 'rc.rdn'), '--format', 'xml'), capture())).toBe(2);
    expect(await main(argv('run', join(dir, 'rc.rdn'), '--colour'), capture())).toBe(2);
  });

  it('check prints the circuit as read', async () => {
    const io = capture();
    expect(await main(argv('check', join(dir, 'rc.rdn')), io)).toBe(0);
    expect(io.out()).toContain('1 µF');
    expect(io.out()).toContain('samples: 51');
  });

  it('--help exits 0 with examples', async () => {
    const io = capture();
    expect(await main(argv('--help'), io)).toBe(0);
    expect(io.out()).toContain('Examples:');
    const sub = capture();
    expect(await main(argv('run', '--help'), sub)).toBe(0);
    expect(sub.out()).toContain('--span');
  });
});

describe('option parsers', () => {
  it('--span accepts SI times', () => {
    expect(parseSpanOption('2ms')).toBeCloseTo(2e-3, 18);
    expect(parseSpanOption('500u')).toBeCloseTo(5e-4, 18);
    expect(parseSpanOption('1.5')).toBe(1.5);
    expect(() => parseSpanOption('-1ms')).toThrow();
    expect(() => parseSpanOption('fast')).toThrow();
  });
  it('--samples wants a whole number ≥ 2', () => {
    expect(parseSamplesOption('401')).toBe(401);
    expect(() => parseSamplesOption('1')).toThrow();
    expect(() => parseSamplesOption('2.5')).toThrow();
  });
});
