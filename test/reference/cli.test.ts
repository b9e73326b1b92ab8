/**
 * The real command-line program, as a user runs it: `node bin/ringdown.js ...` on the built dist/.
 * Expected numbers come from the series RLC step closed form (control-engineering textbook, from
 * memory), compared at 1e-9 relative to the signal's peak magnitude.
 */
import { execSync, spawnSync } from 'node:child_process';
import { existsSync, mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';

const ROOT = join(dirname(fileURLToPath(import.meta.url)), '..', '..');
const REL_TOL = 1e-9;
let tmp = '';

function ringdown(...args: string[]) {
  const r = spawnSync(process.execPath, [join(ROOT, 'bin', 'ringdown.js'), ...args], {
    cwd: ROOT,
    encoding: 'utf8',
    timeout: 60_000,
  });
  return { code: r.status, stdout: r.stdout ?? '', stderr: r.stderr ?? '' };
}

beforeAll(() => {
  if (!existsSync(join(ROOT, 'dist', 'cli', 'main.js'))) {
    execSync('npm run build', { cwd: ROOT, stdio: 'pipe' });
  }
  tmp = mkdtempSync(join(tmpdir(), 'ringdown-cli-'));
}, 180_000);

afterAll(() => {
  if (tmp) rmSync(tmp, { recursive: true, force: true });
});

/** Rows of numbers; a header line or '#' comment lines (anything not numeric) are skipped. */
function parseCsv(text: string): number[][] {
  const rows: number[][] = [];
  for (const line of text.split(/\r?\n/)) {
    if (line.trim() === '' || line.startsWith('#')) continue;
    const fields = line.split(',').map((f) => f.trim().replace(/^"|"$/g, ''));
    const nums = fields.map((f) => (f === '' ? NaN : Number(f)));
    if (nums.some((x) => Number.isNaN(x))) continue; // header
    rows.push(nums);
  }
  return rows;
}

const noStackTrace = (out: string) => out.split(/\r?\n/).filter((l) => /^\s*at\s/.test(l));

describe('ringdown CLI', () => {
  it('run --format csv: every sample of the series RLC step matches the closed form', () => {
    const r = ringdown('run', 'circuits/textbook-series-rlc.rdn', '--format', 'csv');
    expect(r.code, r.stderr).toBe(0);
    const rows = parseCsv(r.stdout);
    // the file says `span 2ms` and `samples 401`
    expect(rows.length).toBe(401);
    // 12 V step, R = 10 Ω, L = 1 mH, C = 10 µF: α = 5000/s, ω0 = 10 krad/s, ωd = √(ω0² − α²)
    const alpha = 5000;
    const wd = Math.sqrt(1e8 - alpha * alpha);
    const v = (t: number) => 12 * (1 - Math.exp(-alpha * t) * (Math.cos(wd * t) + (alpha / wd) * Math.sin(wd * t)));
    const peak = 12 * (1 + Math.exp(-Math.PI * alpha / wd)); // the first overshoot is the largest value
    rows.forEach((row, i) => {
      const t = row[0]!;
      expect(Math.abs(t - (2e-3 * i) / 400)).toBeLessThanOrEqual(1e-12 * 2e-3);
      expect(Math.abs(row[1]! - v(t)) / peak, `t = ${t}: got ${row[1]}, expected ${v(t)}`).toBeLessThanOrEqual(REL_TOL);
    });
  });

  const malformed: { name: string; text: string; line: number; cols: [number, number] }[] = [
    {
      name: 'capacitor given in henries',
      text: 'voltage-source V1 in -> gnd step to 12V\nresistor R1 in -> out 1k\ncapacitor C1 out -> gnd 10mH\nwatch node out\n',
      line: 3,
      cols: [25, 28], // the value `10mH` starts at column 25; its unit at 28
    },
    {
      name: 'misspelt part kind',
      text: 'voltage-source V1 in -> gnd step to 12V\nresistr R1 in -> out 1k\ncapacitor C1 out -> gnd 10uF\nwatch node out\n',
      line: 2,
      cols: [1, 1],
    },
  ];
  for (const m of malformed) {
    it(`malformed input (${m.name}): exit code 2, file:line:col message, no stack trace`, () => {
      const file = join(tmp, 'bad.rdn');
      writeFileSync(file, m.text);
      const r = ringdown('run', file, '--format', 'csv');
      expect(r.code).toBe(2);
      const out = r.stderr + r.stdout;
      const hit = /bad\.rdn:(\d+):(\d+)/.exec(out);
      expect(hit, out).not.toBeNull();
      expect(Number(hit![1])).toBe(m.line);
      expect(Number(hit![2])).toBeGreaterThanOrEqual(m.cols[0]);
      expect(Number(hit![2])).toBeLessThanOrEqual(m.cols[1]);
      expect(noStackTrace(out), out).toEqual([]);
    });
  }

  it('--help exits 0 and prints usage', () => {
    const r = ringdown('--help');
    expect(r.code).toBe(0);
    expect(r.stdout.length).toBeGreaterThan(0);
    expect(noStackTrace(r.stdout + r.stderr)).toEqual([]);
  });
});
