import type { Piece, Term } from '../simulate/result.js';

/**
 * Exact evaluation of a closed-form signal (a list of pieces) and of its time derivative.
 * Impulses (`impulseArea`) carry no finite value and are left out: these functions give the
 * ordinary part of the signal.
 */

// one evaluator of terms for the whole program (lti/term.ts), under the names this stage uses
import { termSlope as termDerivative, termValue } from '../lti/term.js';
export { termDerivative, termValue };

/** Value of a piece at absolute time t (no check that t lies inside it). */
export function pieceValue(piece: Piece, t: number): number {
  const tau = t - piece.t0;
  let sum = 0;
  for (const term of piece.terms) sum += termValue(term, tau);
  return sum;
}

/** Time derivative of a piece at absolute time t. */
export function pieceDerivative(piece: Piece, t: number): number {
  const tau = t - piece.t0;
  let sum = 0;
  for (const term of piece.terms) sum += termDerivative(term, tau);
  return sum;
}

/**
 * Index of the piece that holds t: the last piece with t0 ≤ t (so a time on a boundary belongs
 * to the later piece; times past the end use the last piece, times before the start the first).
 * -1 when there are no pieces.
 */
export function pieceIndexAt(pieces: readonly Piece[], t: number): number {
  if (pieces.length === 0) return -1;
  let lo = 0;
  let hi = pieces.length - 1;
  if (t < pieces[0]!.t0) return 0;
  while (lo < hi) {
    const mid = (lo + hi + 1) >> 1;
    if (pieces[mid]!.t0 <= t) lo = mid;
    else hi = mid - 1;
  }
  return lo;
}

/** The signal at time t (the right-hand value at a piece boundary). 0 when there are no pieces. */
export function evaluatePieces(pieces: readonly Piece[], t: number): number {
  const i = pieceIndexAt(pieces, t);
  return i < 0 ? 0 : pieceValue(pieces[i]!, t);
}

/** The time derivative of the signal at t (right-hand derivative at a boundary). */
export function evaluatePiecesDerivative(pieces: readonly Piece[], t: number): number {
  const i = pieceIndexAt(pieces, t);
  return i < 0 ? 0 : pieceDerivative(pieces[i]!, t);
}

/** The left-hand limit of the signal at t: at a boundary, the value the earlier piece approaches. */
export function evaluatePiecesBefore(pieces: readonly Piece[], t: number): number {
  let i = pieceIndexAt(pieces, t);
  if (i < 0) return 0;
  while (i > 0 && pieces[i]!.t0 >= t) i--;
  return pieceValue(pieces[i]!, t);
}

/** Largest angular frequency among the oscillatory terms of a piece (0 if none). */
export function maxOmega(piece: Piece): number {
  let w = 0;
  for (const term of piece.terms) if (term.kind === 'osc' || term.kind === 'quasi') w = Math.max(w, Math.abs(term.omega));
  return w;
}

/** d/dτ of a term, as a term of the same kind. */
export function derivativeTerm(t: Term): Term {
  switch (t.kind) {
    case 'exp':
      return { kind: 'exp', lambda: t.lambda, coef: t.lambda === 0 ? 0 : t.coef * t.lambda };
    case 'osc':
      return {
        kind: 'osc',
        sigma: t.sigma,
        omega: t.omega,
        cosCoef: t.sigma * t.cosCoef + t.omega * t.sinCoef,
        sinCoef: t.sigma * t.sinCoef - t.omega * t.cosCoef,
      };
    case 'poly-exp': {
      const c = t.polyCoefs;
      return { kind: 'poly-exp', lambda: t.lambda, polyCoefs: c.map((v, k) => t.lambda * v + (k + 1 < c.length ? (k + 1) * c[k + 1]! : 0)) };
    }
    case 'quasi': {
      const n = Math.max(t.cosPoly.length, t.sinPoly.length);
      const P = (k: number) => t.cosPoly[k] ?? 0;
      const S = (k: number) => t.sinPoly[k] ?? 0;
      const cosPoly: number[] = [];
      const sinPoly: number[] = [];
      for (let k = 0; k < n; k++) {
        cosPoly.push(t.sigma * P(k) + (k + 1) * P(k + 1) + t.omega * S(k));
        sinPoly.push(t.sigma * S(k) + (k + 1) * S(k + 1) - t.omega * P(k));
      }
      return { kind: 'quasi', sigma: t.sigma, omega: t.omega, cosPoly, sinPoly };
    }
  }
}
