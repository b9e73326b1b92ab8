import type { Mode } from '../simulate/result.js';
import type { Block } from './modal.js';

/** The natural modes in the trade's terms, slowest first. */
export function modesOf(blocks: Block[]): Mode[] {
  const modes: Mode[] = blocks.map((b): Mode => {
    if (b.kind === 'real') {
      const lambda = b.eig[0].re;
      return { kind: 'real', lambda, tau: lambda === 0 ? Infinity : -1 / lambda };
    }
    if (b.kind === 'pair') {
      const sigma = b.eig[0].re;
      const omegaD = Math.abs(b.eig[0].im);
      const wn = Math.hypot(sigma, omegaD);
      const zeta = -sigma / wn;
      return { kind: 'oscillatory', sigma, omegaD, wn, zeta, q: zeta > 0 ? 1 / (2 * zeta) : Infinity, ringingHz: omegaD / (2 * Math.PI) };
    }
    const lambda = b.eig.reduce((s, e) => s + e.re, 0) / b.eig.length;
    let spread = 0;
    for (const e of b.eig) for (const f of b.eig) spread = Math.max(spread, Math.hypot(e.re - f.re, e.im - f.im));
    return { kind: 'repeated', lambda, multiplicity: b.eig.length, tau: lambda === 0 ? Infinity : -1 / lambda, spread };
  });
  const decay = (m: Mode) => (m.kind === 'oscillatory' ? -m.sigma : -m.lambda);
  return modes.sort((a, b) => decay(a) - decay(b));
}

/**
 * Periods of ringing the chosen span shows at most: a lightly damped mode (Q of 10⁶: 2·10⁶ periods
 * in seven time constants) would otherwise make every measurement walk millions of periods.
 */
export const CHOSEN_SPAN_MAX_PERIODS = 100_000;

/**
 * A span long enough to see the slowest mode settle (seven time constants: e^−7 < 0.1 %) after
 * the last source event, but no more than CHOSEN_SPAN_MAX_PERIODS periods of a ringing mode; for
 * undamped ringing, ten periods of the slowest oscillation.
 */
export function chooseSpan(modes: Mode[], lastEvent: number): number {
  let tail = 0;
  for (const m of modes) {
    const sigma = m.kind === 'oscillatory' ? -m.sigma : -m.lambda;
    if (sigma > 0 && m.kind === 'oscillatory') tail = Math.max(tail, Math.min(7 / sigma, (CHOSEN_SPAN_MAX_PERIODS * 2 * Math.PI) / m.omegaD));
    else if (sigma > 0) tail = Math.max(tail, 7 / sigma);
    else if (m.kind === 'oscillatory') tail = Math.max(tail, (10 * 2 * Math.PI) / m.omegaD);
  }
  if (tail === 0 || !Number.isFinite(tail)) tail = Math.max(lastEvent, 1e-3);
  return lastEvent + tail;
}
