import { termValue } from '../lti/term.js';
import type { Piece } from './result.js';

/** Samples between anchors: each recurrence step adds about one rounding error, so at most this many. */
const ANCHOR_EVERY = 32;

/**
 * The closed forms sampled on a uniform grid (times[k] = t_first + k·h). On a piece that holds many
 * samples, an exponential or damped sinusoid is advanced from sample to sample by one multiplication
 * with e^(λh) instead of a fresh exp, cos and sin, and re-evaluated directly every ANCHOR_EVERY
 * samples so that the rounding of the recurrence stays within a few dozen ulps of each term.
 */
export function sampleUniform(pieces: Piece[], times: Float64Array): Float64Array {
  const out = new Float64Array(times.length);
  if (!times.length || !pieces.length) return out;
  const h = times.length > 1 ? (times[times.length - 1] - times[0]) / (times.length - 1) : 0;
  let i = 0;
  for (let p = 0; p < pieces.length && i < times.length; p++) {
    const piece = pieces[p];
    // samples on this piece: from i up to (not including) the next piece's start
    const next = p + 1 < pieces.length ? pieces[p + 1].t0 : Infinity;
    let end = i;
    while (end < times.length && times[end] < next) end++;
    if (end - i < 8 || h === 0) {
      for (let k = i; k < end; k++) {
        const tau = times[k] - piece.t0;
        let v = 0;
        for (const term of piece.terms) v += termValue(term, tau);
        out[k] = v;
      }
    } else {
      // a decaying term stops once it is below 1e-22 of the piece's largest coefficient: far
      // below the rounding of the sum it belongs to
      let big = 0;
      for (const term of piece.terms) big = Math.max(big, termSize(term));
      for (const term of piece.terms) addTerm(out, times, i, end, h, piece.t0, term, 1e-22 * big);
    }
    i = end;
  }
  return out;
}

function termSize(term: Piece['terms'][number]): number {
  switch (term.kind) {
    case 'exp':
      return Math.abs(term.coef);
    case 'osc':
      return Math.abs(term.cosCoef) + Math.abs(term.sinCoef);
    default:
      return 0;
  }
}

function addTerm(out: Float64Array, times: Float64Array, from: number, to: number, h: number, t0: number, term: Piece['terms'][number], negligible: number): void {
  if (term.kind === 'exp') {
    if (term.lambda === 0) {
      for (let k = from; k < to; k++) out[k] += term.coef;
      return;
    }
    const r = Math.exp(term.lambda * h);
    let v = 0;
    for (let k = from; k < to; k++) {
      if ((k - from) % ANCHOR_EVERY === 0) {
        v = term.coef * Math.exp(term.lambda * (times[k] - t0));
        if (term.lambda < 0 && Math.abs(v) < negligible) return;
      }
      out[k] += v;
      v *= r;
    }
    return;
  }
  if (term.kind === 'osc') {
    // Re[(a − jb)·e^((σ + jω)τ)] = e^(στ)(a cos ωτ + b sin ωτ)
    const m = Math.exp(term.sigma * h);
    const rr = m * Math.cos(term.omega * h);
    const ri = m * Math.sin(term.omega * h);
    let zr = 0;
    let zi = 0;
    for (let k = from; k < to; k++) {
      if ((k - from) % ANCHOR_EVERY === 0) {
        const tau = times[k] - t0;
        const e = Math.exp(term.sigma * tau);
        const c = Math.cos(term.omega * tau);
        const s = Math.sin(term.omega * tau);
        zr = e * (term.cosCoef * c + term.sinCoef * s);
        zi = e * (term.cosCoef * s - term.sinCoef * c);
        if (term.sigma < 0 && e * (Math.abs(term.cosCoef) + Math.abs(term.sinCoef)) < negligible) return;
      }
      out[k] += zr;
      const nr = zr * rr - zi * ri;
      zi = zr * ri + zi * rr;
      zr = nr;
    }
    return;
  }
  for (let k = from; k < to; k++) out[k] += termValue(term, times[k] - t0);
}
