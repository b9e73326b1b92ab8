/**
 * The time above a watch's `above` level in the text, JSON and numbers outputs (doc/OUTPUT.md).
 * RC charge from 0 to 12 V, τ = 1 ms: it crosses 6 V at t = τ·ln 2 (first-order step response,
 * circuits textbooks, from memory), so over a 5 ms span it is above 6 V for 5 ms − τ·ln 2.
 */
import { describe, expect, it } from 'vitest';
import { analyzeText } from '../../src/pipeline.js';
import { formatCheck } from '../../src/report/check.js';
import { formatJSON } from '../../src/report/json.js';
import { formatNumbers } from '../../src/report/numbers.js';
import { formatTextReport } from '../../src/report/text.js';

const text = [
  'voltage-source V1 in -> gnd step to 12V',
  'resistor R1 in -> out 1k',
  'capacitor C1 out -> gnd 1uF',
  'watch node out above 6V as "out"',
  'watch current R1',
  'span 5ms',
  'samples 51',
].join('\n');
const result = analyzeText(text, 'rc.rdn');
const crossing = 1e-3 * Math.LN2;
const total = 5e-3 - crossing;
const rel = (a: number, b: number) => Math.abs(a - b) / Math.abs(b);

describe('time above in the reports', () => {
  it('JSON: metrics.timeAbove, null for a watch without a level', () => {
    const traces = (JSON.parse(formatJSON(result)) as { traces: { metrics: { timeAbove: unknown } }[] }).traces;
    const a = traces[0]!.metrics.timeAbove as { threshold: number; total: number; first: number; last: number };
    expect(a.threshold).toBe(6);
    expect(rel(a.total, total)).toBeLessThan(1e-12);
    expect(rel(a.first, crossing)).toBeLessThan(1e-12);
    expect(a.last).toBe(a.first);
    expect(traces[1]!.metrics.timeAbove).toBeNull();
  });

  it('numbers: time_above keys for the watch with a level only', () => {
    const kv = new Map(formatNumbers(result).trimEnd().split('\n').map((l) => l.split('=') as [string, string]));
    expect(Number(kv.get('out.time_above.threshold'))).toBe(6);
    expect(rel(Number(kv.get('out.time_above')), total)).toBeLessThan(1e-12);
    expect(rel(Number(kv.get('out.time_above.first')), crossing)).toBeLessThan(1e-12);
    expect(rel(Number(kv.get('out.time_above.last')), crossing)).toBeLessThan(1e-12);
    expect([...kv.keys()].filter((k) => k.includes('time_above'))).toHaveLength(4);
  });

  it('text: one row in the measurements block', () => {
    const report = formatTextReport(result, { chart: false });
    expect(report).toMatch(/\n {4}time above 6 V +4\.307 ms, crosses at t = 693\.1 µs\n/);
    expect(report.match(/time above/g)).toHaveLength(1);
  });

  it('text: a level never crossed', () => {
    const r = analyzeText(text.replace('above 6V', 'above 20V'), 'rc.rdn');
    expect(formatTextReport(r, { chart: false })).toMatch(/time above 20 V +0 s, no crossing\n/);
  });

  it('check: the level on the watch row', () => {
    expect(formatCheck(result.circuit)).toMatch(/out +\(V\) +voltage of node out against ground, time above 6 V\n/);
  });
});
