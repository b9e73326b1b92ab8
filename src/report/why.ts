import { lastIntervalTerms, type WeightedTerm, WEIGHT_FLOOR } from '../measure/shape.js';
import type { Mode, Trace } from '../simulate/result.js';
import { formatPlain, formatSI } from './si.js';

/** Relative agreement for a term's exponent to be recognised as one of the natural modes. */
const MATCH = 1e-6;

/** The natural mode (1-based number and the mode) a term of the closed form comes from; null for a drive term. */
export function modeOfTerm(w: WeightedTerm, modes: readonly Mode[]): { n: number; mode: Mode } | null {
  const t = w.term;
  const close = (a: number, b: number) => Math.abs(a - b) <= MATCH * Math.max(Math.abs(a), Math.abs(b), 1e-300);
  for (let i = 0; i < modes.length; i++) {
    const m = modes[i]!;
    if (w.omega > 0) {
      if (m.kind === 'oscillatory' && close(m.omegaD, w.omega) && close(m.sigma, (t as { sigma: number }).sigma)) return { n: i + 1, mode: m };
    } else if ((m.kind === 'real' || m.kind === 'repeated') && (t.kind === 'exp' || t.kind === 'poly-exp') && close(m.lambda, t.lambda)) {
      return { n: i + 1, mode: m };
    }
  }
  return null;
}

/**
 * One sentence on why a signal looks the way it does, from the terms of its closed form in force at
 * the end of the span (those of non-negligible weight: at least 0.1 % of the signal's excursion)
 * and the natural modes they come from. The slowest term sets the character: an underdamped mode
 * rings, a real mode gives a plain exponential approach, a repeated one the critically damped
 * approach, an undamped term keeps swinging. Our wording; a guide for reading the report, not a
 * measurement.
 */
export function explainSignal(trace: Trace, modes: readonly Mode[], start: number, end: number): string {
  const m = trace.metrics;
  if (trace.pieces.length === 0) return 'no closed form for this signal, so no modes to explain it by';
  const floor = Math.max(WEIGHT_FLOOR * (m.peak.value - m.valley.value), 1e-12 * Math.max(Math.abs(m.peak.value), Math.abs(m.valley.value)));
  const terms = lastIntervalTerms(trace.pieces, start, end, floor);
  if (terms.length === 0) {
    return 'no natural mode shows in its last interval: it follows its sources at once (a resistive path from them)';
  }
  const last = trace.pieces.filter((p) => p.t0 <= end).pop() ?? trace.pieces[0]!;
  const lastT0 = Math.max(start, last.t0);
  const after = lastT0 > start ? ` after t = ${formatSI(lastT0, 's', { digits: 3, trim: true })}` : '';
  const settles = (tau: number, what: string): string => {
    const s = m.settlingTime;
    if (s === null || s === undefined || !(tau > 0) || !Number.isFinite(tau) || s < lastT0) return '';
    const n = (s - lastT0) / tau;
    if (n < 0.05) return '';
    return `; settles in about ${formatPlain(n, 2)} ${what} (${formatSI(s - lastT0, 's', { digits: 3, trim: true })}${after})`;
  };
  const slow = terms[0]!;
  const src = modeOfTerm(slow, modes);
  const tag = src ? `mode ${src.n}` : 'from the drive, not a natural mode';
  const hz = (w: WeightedTerm) => formatSI(w.omega / (2 * Math.PI), 'Hz', { digits: 3, trim: true });
  const damping = (w: WeightedTerm) => {
    const sigma = (w.term as { sigma: number }).sigma;
    const zeta = -sigma / Math.hypot(sigma, w.omega);
    return `ζ = ${formatPlain(zeta, 2)}, Q = ${zeta > 0 ? formatPlain(1 / (2 * zeta), 2) : '∞'}`;
  };
  // a faster ringing term that still carries weight: worth a mention after a non-ringing slowest term
  const fasterRing = terms.slice(1).find((w) => w.omega > 0 && w.rate > 0);
  const early = fasterRing ? `; rings at ${hz(fasterRing)} early on (a faster mode, ${damping(fasterRing)})` : '; no ringing';

  if (slow.omega > 0 && slow.rate > 0) {
    const tau = 1 / slow.rate;
    const what = src ? 'its slowest mode is underdamped' : 'the drive itself rings';
    return `rings at ${hz(slow)} because ${what} (${tag}, ${damping(slow)}); envelope time constant ${formatSI(tau, 's', { digits: 3, trim: true })}${settles(tau, 'envelope time constants')}`;
  }
  if (slow.omega > 0) {
    const rest = terms.find((w) => w.rate > 0);
    const transient = rest ? `; the start-up transient decays with ${formatSI(1 / rest.rate, 's', { digits: 3, trim: true })}` : '';
    return src
      ? `keeps ringing at ${hz(slow)}: ${tag} is undamped (ζ = 0), nothing in its loop dissipates energy`
      : `follows its ${hz(slow)} sinusoidal drive (the forced response)${transient}`;
  }
  if (slow.rate === 0) return 'keeps ramping: a ramp drive, or a steady drive into a path that integrates (no decay)';
  const tau = 1 / slow.rate;
  const tauText = formatSI(tau, 's', { digits: 3, trim: true });
  if (slow.term.kind === 'poly-exp' || src?.mode.kind === 'repeated') {
    return `critically damped: a repeated real mode (${tag}, τ = ${tauText}) gives the fastest approach without overshoot${settles(tau, 'time constants')}`;
  }
  const kind = src ? `${tag}, real: R·C- or L/R-like` : 'a decaying drive, not a natural mode';
  return `slow because of the ${tauText} time constant (${kind})${early}${settles(tau, 'time constants')}`;
}
