/**
 * Undershoot and per-event overshoot / undershoot in the text, JSON and numbers outputs
 * (doc/OUTPUT.md). Series RLC, R = 20 Ω, L = 1 mH, C = 1 µF: ζ = (R/2)·√(C/L) ≈ 0.316, so each
 * step of the capacitor voltage overshoots by exp(−πζ/√(1−ζ²)) (second-order step response,
 * control textbook, from memory); the source steps up 1 V at 0 and back down at 2 ms.
 */
import { describe, expect, it } from 'vitest';
import { analyzeText } from '../../src/pipeline.js';
import { formatJSON } from '../../src/report/json.js';
import { formatNumbers } from '../../src/report/numbers.js';
import { formatTextReport } from '../../src/report/text.js';

const rlc = analyzeText(
  ['voltage-source V1 in -> gnd step to 1V + step to -1V at 2ms', 'resistor R1 in -> a 20', 'inductor L1 a -> out 1mH', 'capacitor C1 out -> gnd 1uF', 'watch node out', 'span 4ms'].join('\n'),
  'rlc.rdn',
);
const zeta = 10 * Math.sqrt(1e-6 / 1e-3);
const expected = 100 * Math.exp((-Math.PI * zeta) / Math.sqrt(1 - zeta * zeta));
const rel = (a: number, b: number) => Math.abs(a - b) / Math.abs(b);

interface Ev { t: number; from: number; to: number; overshootPct: number; undershootPct: number }

describe('per-event overshoot in the reports', () => {
  it('JSON: metrics.events, one per step, each overshooting by exp(−πζ/√(1−ζ²))', () => {
    const m = (JSON.parse(formatJSON(rlc)) as { traces: { metrics: { events: Ev[]; undershootPct: number | null } }[] }).traces[0]!.metrics;
    expect(m.events).toHaveLength(2);
    expect(m.events[1]!.t).toBeCloseTo(2e-3, 12);
    for (const e of m.events) {
      expect(rel(e.overshootPct, expected)).toBeLessThan(1e-6); // the step has settled to ~1e-9 by the next one
      expect(e.undershootPct).toBe(0);
    }
    expect(m.undershootPct).toBeNull(); // the signal returns to 0: no single transition
  });

  it('numbers: LABEL.events and LABEL.event.K.* keys', () => {
    const kv = new Map(formatNumbers(rlc).trimEnd().split('\n').map((l) => l.split('=') as [string, string]));
    expect(kv.get('v(out).events')).toBe('2');
    expect(Number(kv.get('v(out).event.2.time'))).toBeCloseTo(2e-3, 12);
    expect(rel(Number(kv.get('v(out).event.2.overshoot_pct')), expected)).toBeLessThan(1e-6);
    expect(kv.get('v(out).event.1.undershoot_pct')).toBe('0');
    expect(kv.has('v(out).undershoot_pct')).toBe(false);
  });

  it('text: a compact table with the event time, from, to, overshoot and undershoot', () => {
    const text = formatTextReport(rlc, { chart: false });
    expect(text).toMatch(/event at\s+from\s+to\s+overshoot\s+undershoot/);
    expect(text).toMatch(/t = 2\.000 ms\s+1\.000 V\s+-?\d[\d.]* nV\s+35\.09 %\s+0 %/);
    expect(text).toContain('undershoot (before 50 %)');
  });

  it('a pulse train with more than 8 events lists the first 8 and counts the rest', () => {
    const pulses = analyzeText(
      ['voltage-source V1 in -> gnd pulse from 0V to 5V period 1ms width 400us rise 1us fall 1us cycles 12', 'resistor R1 in -> out 1k', 'capacitor C1 out -> gnd 100nF', 'watch node out', 'span 14ms'].join('\n'),
      'pulses.rdn',
    );
    const n = pulses.traces[0]!.metrics.events!.length;
    expect(n).toBeGreaterThan(8);
    const text = formatTextReport(pulses, { chart: false });
    const table = text.slice(text.indexOf('event at'));
    expect(table.split('\n').slice(1).filter((l) => /^\s+t = /.test(l)).length).toBe(8);
    expect(text).toContain(`… and ${n - 8} more events`);
    const json = (JSON.parse(formatJSON(pulses)) as { traces: { metrics: { events: Ev[] } }[] }).traces[0]!.metrics.events;
    expect(json).toHaveLength(n);
  });

  it('an RC step: undershoot 0 in the text, and no event table for a single event', () => {
    const rc = analyzeText('voltage-source V1 in -> gnd step to 12V\nresistor R1 in -> out 1k\ncapacitor C1 out -> gnd 1uF\nwatch node out\nspan 5ms\n', 'rc.rdn');
    const text = formatTextReport(rc, { chart: false });
    expect(text).toMatch(/undershoot \(before 50 %\)\s+0 %/);
    expect(text).not.toContain('event at');
    expect(rc.traces[0]!.metrics.events).toHaveLength(1);
  });
});
