import { describe, expect, it } from 'vitest';
import { energyBalance } from '../../src/measure/energy.js';
import { analyzeCircuit } from '../../src/pipeline.js';
import { circuit, part, source, watchPart } from './build.js';

describe('energy from the exact closed forms', () => {
  it('charging C through R from a step: the resistor dissipates ½CV², half of what the source delivers (physics textbook, from memory)', () => {
    const R = 220;
    const C = 47e-6;
    const V = 15;
    const c = circuit(
      [source('voltage-source', 'V1', 'in', 'gnd', { kind: 'step', from: 0, to: V, at: 0, rise: 0 }), part('resistor', 'R1', 'in', 'out', R), part('capacitor', 'C1', 'out', 'gnd', C)],
      [watchPart('part-voltage', 'C1')],
      60 * R * C, // e^−60: the charge is complete to far below 1e-12
      11,
    );
    const r = analyzeCircuit(c);
    const e = energyBalance(c, r.parts!);
    const half = 0.5 * C * V * V;
    expect(Math.abs(e.perPart.find((p) => p.part === 'R1')!.absorbed - half) / half).toBeLessThan(1e-12);
    expect(Math.abs(e.delivered - 2 * half) / half).toBeLessThan(1e-12);
    expect(Math.abs(e.storedChange - half) / half).toBeLessThan(1e-12);
  });

  it('Tellegen: delivered = dissipated + stored change on a driven RLC with a sinusoid and a ramp', () => {
    const c = circuit(
      [
        source('voltage-source', 'V1', 'in', 'gnd', { kind: 'sine', amplitude: 5, freq: 3e3, phase: 0.4, at: 0, decay: 2e-3 }, { kind: 'ramp', at: 1e-4, slope: 1e3, until: 6e-4 }),
        part('resistor', 'R1', 'in', 'a', 4.7),
        part('inductor', 'L1', 'a', 'b', 220e-6),
        part('capacitor', 'C1', 'b', 'gnd', 10e-6),
        part('resistor', 'R2', 'b', 'gnd', 100),
      ],
      [watchPart('part-current', 'L1')],
      3e-3,
      11,
    );
    const r = analyzeCircuit(c);
    const e = energyBalance(c, r.parts!);
    expect(e.residual).toBeLessThan(1e-9);
    expect(e.delivered).toBeGreaterThan(0);
  });
});
