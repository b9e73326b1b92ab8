import { describe, expect, it } from 'vitest';
import { loadCircuit } from '../../src/circuit/load.js';
import { buildSchedule } from '../../src/waveform/schedule.js';

// A source jumps where its value is discontinuous (the definition of a jump discontinuity): a
// pulse with finite edges never does, one with zero-time edges does at every edge.
const waveOf = (source: string) => {
  const c = loadCircuit(`${source}\nresistor R1 a -> gnd 1k\nwatch node a\n`, 'jumps.rdn');
  return c.parts.find((p) => p.name === 'V1')!.waveform!;
};

describe('source jumps', () => {
  it('a pulse train with finite edges has none, though its edges end at rounding-size values', () => {
    const w = waveOf('voltage-source V1 a -> gnd pulse from 0.7V to 0V period 10us duty 42% rise 20ns fall 20ns');
    const s = buildSchedule([w], 1e-3);
    expect(s.intervals.length).toBeGreaterThan(390);
    expect(s.jumps).toEqual([]);
  });

  it('a pulse train with zero-time edges jumps at each of them, by the full swing', () => {
    const w = waveOf('voltage-source V1 a -> gnd pulse to 5V period 10us width 3us cycles 4');
    const s = buildSchedule([w], 100e-6);
    // edges at 0 (the start, not a jump between intervals), 3, 10, 13, 20, 23, 30, 33 µs
    expect(s.jumps.map((j) => Math.round(j.t * 1e7) / 10)).toEqual([3, 10, 13, 20, 23, 30, 33]);
    for (const j of s.jumps) expect(Math.abs(Math.abs(j.delta[0]) - 5)).toBeLessThan(1e-12);
  });
});
