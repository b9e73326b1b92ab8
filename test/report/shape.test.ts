/**
 * Delay, ringing, steepest slope, average, RMS and the one-line "why" through the whole run, on
 * circuits whose answers are textbook closed forms (first- and second-order step responses,
 * circuits textbook, from memory; the average is an integral worked by hand).
 */
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { main } from '../../src/cli/main.js';
import type { CliIO } from '../../src/cli/io.js';
import { visibleWidth } from '../../src/report/color.js';

let dir = '';
beforeAll(() => {
  dir = mkdtempSync(join(tmpdir(), 'ringdown-shape-'));
});
afterAll(() => rmSync(dir, { recursive: true, force: true }));

async function run(name: string, text: string, ...args: string[]) {
  const path = join(dir, name);
  writeFileSync(path, text);
  let out = '';
  const io: CliIO = {
    stdout: { write: (s: string) => (out += s), isTTY: false },
    stderr: { write: () => undefined, isTTY: false },
    readStdin: async () => '',
    env: {},
  };
  const code = await main(['node', 'ringdown', 'run', path, ...args], io);
  return { code, out };
}

const numbers = (out: string) => new Map(out.trim().split('\n').map((l) => [l.slice(0, l.indexOf('=')), Number(l.slice(l.indexOf('=') + 1))] as const));
const rel = (a: number, b: number) => Math.abs(a - b) / Math.abs(b);

// RC charge from 12 V through 1 kΩ into 1 µF: τ = 1 ms, over a span of T = 5τ
const RC = 'voltage-source V1 in -> gnd step to 12V\nresistor R1 in -> out 1k\ncapacitor C1 out -> gnd 1uF\nwatch node out\nspan 5ms\nsamples 51\n';
const tau = 1e-3;
const T = 5e-3;
const V = 12;

// series RLC: ωn = 1/√(LC) = 10 krad/s, ζ = (R/2)·√(C/L) = 0.5
const RLC = 'voltage-source V1 in -> gnd step from 0V to 12V at 0\nresistor R1 in -> a 10ohm\ninductor L1 a -> out 1mH\ncapacitor C1 out -> gnd 10uF\nwatch voltage C1 as "v(C1)"\nspan 2ms\nsamples 401\n';
const wn = 1e4;
const zeta = 0.5;
const wd = wn * Math.sqrt(1 - zeta * zeta);

describe('--format numbers', () => {
  it('RC charge: 50 % delay, steepest slope V/τ at 0+, average V(1 − (τ/T)(1 − e^(−T/τ)))', async () => {
    const r = await run('rc.rdn', RC, '--format', 'numbers');
    expect(r.code).toBe(0);
    const n = numbers(r.out);
    // the transition ends at the end-of-span value V(1 − e^(−5)); its half is reached at
    // t = −τ·ln(1 − ½(1 − e^(−5))) (τ·ln 2 for a span long enough to settle)
    expect(rel(n.get('v(out).delay_50')!, -tau * Math.log(1 - 0.5 * (1 - Math.exp(-T / tau))))).toBeLessThan(1e-12);
    expect(rel(n.get('v(out).max_slope')!, V / tau)).toBeLessThan(1e-12);
    expect(n.get('v(out).max_slope.time')).toBe(0);
    expect(rel(n.get('v(out).average')!, V * (1 - (tau / T) * (1 - Math.exp(-T / tau))))).toBeLessThan(1e-12);
    expect(n.has('v(out).ringing_hz')).toBe(false);
    expect(n.has('v(out).log_decrement')).toBe(false);
    expect(n.get('v(out).rms')!).toBeGreaterThan(n.get('v(out).average')!);
  });

  it('series RLC, ζ = 0.5: ringing ωd/2π and logarithmic decrement 2πζ/√(1−ζ²)', async () => {
    const n = numbers((await run('rlc.rdn', RLC, '--format', 'numbers')).out);
    expect(rel(n.get('v(C1).ringing_hz')!, wd / (2 * Math.PI))).toBeLessThan(1e-12);
    expect(rel(n.get('v(C1).log_decrement')!, (2 * Math.PI * zeta) / Math.sqrt(1 - zeta * zeta))).toBeLessThan(1e-12);
    // steepest slope of the capacitor voltage: y' = (V·ωn/√(1−ζ²))·e^(−ζωn·t)·sin ωd·t, largest at ωd·t = acos ζ
    const t = Math.acos(zeta) / wd;
    expect(rel(n.get('v(C1).max_slope.time')!, t)).toBeLessThan(1e-9);
    expect(rel(n.get('v(C1).max_slope')!, ((12 * wn) / Math.sqrt(1 - zeta * zeta)) * Math.exp(-zeta * wn * t) * Math.sin(wd * t))).toBeLessThan(1e-12);
  });
});

describe('JSON', () => {
  it('the new metrics and the explanation of each trace', async () => {
    const j = JSON.parse((await run('rc.rdn', RC, '--format', 'json')).out);
    const tr = j.traces[0];
    expect(tr.metrics).toMatchObject({ ringingHz: null, logDecrement: null, maxSlope: { time: 0 } });
    expect(typeof tr.metrics.delay50).toBe('number');
    expect(typeof tr.metrics.average).toBe('number');
    expect(typeof tr.metrics.rms).toBe('number');
    expect(tr.why).toMatch(/^slow because of the 1 ms time constant \(mode 1, real/);
    const rlc = JSON.parse((await run('rlc.rdn', RLC, '--format', 'json')).out);
    expect(rlc.traces[0].why).toMatch(/^rings at 1\.38 kHz because its slowest mode is underdamped \(mode 1, ζ = 0\.5, Q = 1\)/);
  });
});

describe('text report', () => {
  it('measurement rows and the why line, within 80 columns', async () => {
    const r = await run('rlc.rdn', RLC, '--no-chart');
    const lines = r.out.split('\n');
    expect(lines.filter((l) => visibleWidth(l) > 80 && /delay|ringing|slope|RMS|why/.test(l))).toEqual([]);
    expect(r.out).toMatch(/50 % delay +\d/);
    expect(r.out).toMatch(/ringing \(from its mode\) +1\.378 kHz, log decrement 3\.628/);
    expect(r.out).toMatch(/steepest slope \|dy\/dt\| +\S+ kV\/s at t = /);
    expect(r.out).toMatch(/average, RMS \(span\) +\S+ V, \S+ V/);
    expect(r.out).toContain('  why: rings at 1.38 kHz because its slowest mode is underdamped');
  });

  it('a signal that follows its source through resistors alone has no mode to explain it', async () => {
    const text = 'voltage-source V1 in -> gnd step to 10V\nresistor R1 in -> out 1k\nresistor R2 out -> gnd 1k\ncapacitor C1 in -> gnd 1uF\nwatch node out\nspan 1ms\n';
    const r = await run('div.rdn', text, '--no-chart');
    expect(r.out).toContain('why: no natural mode shows in its last interval');
  });
});
