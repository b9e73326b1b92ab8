import type { Piece, Term } from '../../src/simulate/result.js';

export function grid(start: number, end: number, n: number): Float64Array {
  const t = new Float64Array(n);
  for (let i = 0; i < n; i++) t[i] = start + ((end - start) * i) / (n - 1);
  return t;
}

export function piece(t0: number, t1: number, terms: Term[]): Piece {
  return { t0, t1, terms, impulseArea: 0 };
}

/** Unit step response of a second-order low-pass with natural frequency wn and damping ratio zeta < 1. */
export function underdampedStep(wn: number, zeta: number, amplitude = 1): Piece[] {
  const wd = wn * Math.sqrt(1 - zeta * zeta);
  return [
    piece(0, Infinity, [
      { kind: 'exp', lambda: 0, coef: amplitude },
      { kind: 'osc', sigma: -zeta * wn, omega: wd, cosCoef: -amplitude, sinCoef: (-amplitude * zeta) / Math.sqrt(1 - zeta * zeta) },
    ]),
  ];
}

export function sampleAll(pieces: Piece[], times: Float64Array, f: (p: Piece[], t: number) => number): Float64Array {
  return times.map((t) => f(pieces, t));
}
