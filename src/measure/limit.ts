import type { Piece, Term } from '../simulate/result.js';

/** Limit of one term as τ → ∞; null when it grows or keeps oscillating. */
function termLimit(term: Term): number | null {
  switch (term.kind) {
    case 'exp':
      if (term.coef === 0 || term.lambda < 0) return 0;
      return term.lambda === 0 ? term.coef : null;
    case 'osc':
      if ((term.cosCoef === 0 && term.sinCoef === 0) || term.sigma < 0) return 0;
      return null;
    case 'poly-exp': {
      if (term.lambda < 0) return 0;
      const higher = term.polyCoefs.slice(1).some((c) => c !== 0);
      if (term.lambda === 0 && !higher) return term.polyCoefs[0] ?? 0;
      return term.polyCoefs.every((c) => c === 0) ? 0 : null;
    }
    case 'quasi': {
      if (term.sigma < 0) return 0;
      const all = [...term.cosPoly, ...term.sinPoly];
      if (all.every((c) => c === 0)) return 0;
      if (term.sigma === 0 && term.omega === 0 && term.sinPoly.every((c) => c === 0) && term.cosPoly.slice(1).every((c) => c === 0)) {
        return term.cosPoly[0] ?? 0;
      }
      return null;
    }
  }
}

/**
 * The value the signal tends to as t → ∞ under its last piece (the steady state), or null when
 * it has none (a ramp, an undamped oscillation, a growing mode) or there are no pieces.
 */
export function steadyStateLimit(pieces: readonly Piece[]): number | null {
  const last = pieces[pieces.length - 1];
  return last ? lastLimit(last) : null;
}

function lastLimit(piece: Piece): number | null {
  let sum = 0;
  for (const term of piece.terms) {
    const l = termLimit(term);
    if (l === null) return null;
    sum += l;
  }
  return sum;
}
