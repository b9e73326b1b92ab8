/**
 * The shared-grid extremum search (grid.ts) against the per-signal search of peak.ts, which
 * evaluates every term at every grid time: same peaks, same times, on a switched RLC with pulses.
 * Reference: peak.ts itself (the search it replaces on the stress path), to 1e-12 relative.
 */
import { describe, expect, it } from 'vitest';
import { pieceDerivative, pieceValue } from '../../src/measure/evaluate.js';
import { clipPieces, peakMagnitude, termsOmega, termsRate } from '../../src/measure/peak.js';
import { peakOfPieces } from '../../src/measure/stress.js';
import { analyzeText } from '../../src/pipeline.js';
import type { Piece } from '../../src/simulate/result.js';

function reference(pieces: Piece[], start: number, end: number, times: Float64Array) {
  const best = { value: 0, time: start };
  for (const { piece, lo, hi } of clipPieces(pieces, start, end)) {
    const p = peakMagnitude({ f: (t) => pieceValue(piece, t), df: (t) => pieceDerivative(piece, t), lo, hi, omega: termsOmega(piece.terms), rate: termsRate(piece.terms), extra: times });
    if (p.value > best.value * (1 + 1e-12)) Object.assign(best, p);
  }
  return best;
}

describe('shared-grid peak search equals the dense per-signal search', () => {
  const r = analyzeText(
    [
      'voltage-source V1 in -> gnd pulse from 0V to 10V period 200us width 60us cycles 4',
      'resistor R1 in -> a 5ohm',
      'inductor L1 a -> b 1mH',
      'capacitor C1 b -> gnd 1uF',
      'watch voltage C1',
      'span 1ms',
      'samples 301',
    ].join('\n'),
    'rlc.rdn',
  );
  const start = r.times[0]!;
  const end = r.times[r.times.length - 1]!;
  for (const p of r.parts!) {
    for (const which of ['voltage', 'current'] as const) {
      it(`${which} of ${p.part}`, () => {
        const a = peakOfPieces(p[which], start, end, r.times);
        const b = reference(p[which], start, end, r.times);
        expect(Math.abs(a.value - b.value)).toBeLessThanOrEqual(1e-12 * Math.max(b.value, 1e-300));
        expect(Math.abs(a.time - b.time)).toBeLessThanOrEqual(1e-12 * end);
      });
    }
  }
});
