/**
 * The power tables (measure/sweep.ts) shared by the watches of one run: every watch's metrics must
 * be what it gets measured alone, with tables of its own. The reference is the same metric code
 * without sharing (a consistency check; the metrics themselves are checked against closed forms
 * in metrics.test.ts and shape.test.ts).
 */
import { describe, expect, it } from 'vitest';
import { computeMetrics } from '../../src/measure/metrics.js';
import { PowerTables, releaseTables, shareTables, sharedTables } from '../../src/measure/sweep.js';
import { analyzeText } from '../../src/pipeline.js';
import { eventTimes } from '../../src/waveform/events.js';

describe('power tables shared by the watches of a run', () => {
  it('give every watch the metrics it gets alone', () => {
    // an RLC ladder of 12 sections with three watches: the same modes in every watch
    const lines = ['voltage-source V1 in -> gnd step to 5V at 10us', 'resistor R0 in -> n1 20'];
    for (let k = 1; k <= 12; k++) {
      lines.push(`capacitor C${k} n${k} -> gnd ${k % 3 === 0 ? '220n' : '100n'}`);
      if (k < 12) lines.push(`resistor R${k} n${k} -> x${k} ${1 + (k % 4)}`, `inductor L${k} x${k} -> n${k + 1} ${k % 2 ? '10u' : '22u'}`);
    }
    lines.push('resistor RL n12 -> gnd 50', 'watch node n1 above 4V', 'watch node n6', 'watch node n12', 'samples 3000');
    const r = analyzeText(lines.join('\n') + '\n', 'ladder.rdn', { partSignals: false });
    const events = eventTimes(r.circuit, r.span);
    r.traces.forEach((t, w) => {
      const alone = computeMetrics(r.times, t.values, t.pieces, r.circuit.analysis.settle, r.circuit.watches[w]!.threshold, events);
      expect(t.metrics).toEqual(alone);
    });
    expect(r.traces[0]!.metrics.timeAbove).toBeDefined();
  });

  it('are shared only inside a run’s scope', () => {
    const key = new Float64Array(4);
    expect(sharedTables(key)).not.toBe(sharedTables(key));
    shareTables(key);
    const t = sharedTables(key);
    expect(t).toBeInstanceOf(PowerTables);
    expect(sharedTables(key)).toBe(t);
    releaseTables(key);
    expect(sharedTables(key)).not.toBe(t);
  });
});
