/**
 * Exit code 5 (a danger caution), its order against 4 (rating over the derated limit), and --plot,
 * on real circuits. Expected cautions from their thresholds: 120 V ripple-free DC is the upper edge
 * of extra-low voltage (IEC 61140 / IEC 60449 voltage bands, from memory); ½·C·v² from physics.
 */
import { existsSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { EXIT_CROSS_CHECK, EXIT_DANGER, EXIT_RATING, exitPriority } from '../../src/cli/exit.js';
import { main } from '../../src/cli/main.js';
import { capture } from '../helpers/capture.js';

let dir = '';
const write = (name: string, lines: string[]) => {
  const f = join(dir, name);
  writeFileSync(f, lines.join('\n') + '\n');
  return f;
};
beforeAll(() => (dir = mkdtempSync(join(tmpdir(), 'ringdown-danger-'))));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

const rc = (volts: string, rated = '') => [
  `voltage-source V1 in -> gnd step from 0V to ${volts}`,
  'resistor R1 in -> out 1k',
  `capacitor C1 out -> gnd 1uF ${rated}`,
  'watch node out',
  'span 20ms',
  'samples 201',
];

describe('exit code 5: a danger caution', () => {
  it('150 V on a capacitor (above 120 V DC) exits 5 and names the caution on standard error', async () => {
    const c = capture();
    const code = await main(['node', 'ringdown', 'run', write('hv.rdn', rc('150V')), '--no-chart'], c);
    expect(code).toBe(EXIT_DANGER);
    expect(c.err()).toContain('DANGER: Voltage above extra-low voltage');
    expect(c.out()).toContain('Cautions');
    expect(c.out()).toContain('[DANGER]');
  });
  it('12 V exits 0', async () => {
    const c = capture();
    expect(await main(['node', 'ringdown', 'run', write('lv.rdn', rc('12V')), '--no-chart'], c)).toBe(0);
  });
  it('a danger caution wins over a rating over its derated limit (5 before 4), and both are announced', async () => {
    const c = capture();
    const code = await main(['node', 'ringdown', 'run', write('both.rdn', rc('150V', 'rated 160V')), '--format', 'numbers'], c);
    expect(code).toBe(EXIT_DANGER);
    expect(c.err()).toContain('RATING EXCEEDED');
    expect(c.err()).toContain('DANGER');
  });
  it('a rating alone still exits 4', async () => {
    const c = capture();
    expect(await main(['node', 'ringdown', 'run', write('rating.rdn', rc('12V', 'rated 13V')), '--format', 'numbers'], c)).toBe(EXIT_RATING);
  });
  it('the order is 3, then 5, then 4', () => {
    expect(exitPriority([EXIT_RATING, EXIT_DANGER, EXIT_CROSS_CHECK])).toBe(EXIT_CROSS_CHECK);
    expect(exitPriority([EXIT_RATING, EXIT_DANGER])).toBe(EXIT_DANGER);
    expect(exitPriority([EXIT_RATING, 0])).toBe(EXIT_RATING);
    expect(exitPriority([0])).toBe(0);
  });
});

describe('--plot FILE.svg', () => {
  it('writes the SVG figure besides the chosen report', async () => {
    const c = capture();
    const svg = join(dir, 'fig.svg');
    const code = await main(['node', 'ringdown', 'run', write('plot.rdn', rc('12V')), '--format', 'csv', '--plot', svg], c);
    expect(code).toBe(0);
    expect(c.out().split('\n')[0]).toMatch(/^time_s,/);
    expect(existsSync(svg)).toBe(true);
    const text = readFileSync(svg, 'utf8');
    expect(text.startsWith('<svg')).toBe(true);
    expect(text).toContain('v(out)');
  });
  it('an unwritable plot file is an input problem (exit 2)', async () => {
    const c = capture();
    const code = await main(['node', 'ringdown', 'run', write('plot2.rdn', rc('12V')), '--plot', join(dir, 'no', 'such', 'dir', 'x.svg'), '--no-chart'], c);
    expect(code).toBe(2);
    expect(c.err()).toContain('cannot write');
  });
});
