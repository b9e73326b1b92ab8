import { InputError, type Diagnostic } from '../diagnostics.js';
import type { Circuit, WaveTerm } from './circuit.js';
import { MAX_SOURCE_CORNERS } from './limits.js';

/**
 * How many intervals a run over `span` would cut the sources into, counted from the waveform
 * parameters alone (no breakpoint list is built: a 1 ns pulse train over 1000 s has 10¹² of
 * them), and the refusal when that passes MAX_SOURCE_CORNERS.
 */

/** Upper bound of the corners of one waveform term within [0, span]. */
export function termCorners(term: WaveTerm, span: number): number {
  switch (term.kind) {
    case 'pulse':
      return term.start <= span ? 4 * pulseCycles(term, span) + 1 : 1;
    case 'table':
      return term.points.length;
    default:
      // steps, ramps, approaches, sines, impulses: at most two corners each; an expression's own
      // pieces are bounded where it is sampled
      return 2;
  }
}

/** Periods of a pulse train begun within [0, span] (its start at most span). */
function pulseCycles(term: Extract<WaveTerm, { kind: 'pulse' }>, span: number): number {
  const started = Math.floor((span - term.start) / term.period) + 1;
  return Math.min(term.cycles, Number.isFinite(started) ? started : Infinity);
}

const count = (n: number): string => (n < 1e7 ? String(n) : n.toExponential(1).replace('e+', 'e'));

/** Refuses a run whose sources and switches would cut `span` into more than MAX_SOURCE_CORNERS intervals. */
export function checkWorkload(circuit: Circuit, span: number): void {
  let total = 0;
  let worst: { corners: number; diagnostic: Diagnostic } | undefined;
  for (const part of circuit.parts) {
    let corners = part.switching ? part.switching.events.filter((e) => e.t <= span).length : 0;
    let pulse: Extract<WaveTerm, { kind: 'pulse' }> | undefined;
    for (const term of part.waveform?.terms ?? []) {
      corners += termCorners(term, span);
      if (term.kind === 'pulse' && (!pulse || termCorners(term, span) > termCorners(pulse, span))) pulse = term;
    }
    total += corners;
    if (!worst || corners > worst.corners) {
      worst = {
        corners,
        diagnostic: {
          severity: 'error',
          message: pulse
            ? `the pulse train of ${part.name} has ${count(pulseCycles(pulse, span))} periods within the span of ${span} s`
            : `${part.name} changes ${count(corners)} times within the span of ${span} s`,
          loc: part.loc,
          hint: pulse
            ? 'shorten the span or give the train fewer cycles: the periodic steady state is reported from a few hundred periods on'
            : 'shorten the span, or use fewer table points or switch events',
        },
      };
    }
  }
  if (total <= MAX_SOURCE_CORNERS || !worst) return;
  const d = worst.diagnostic;
  d.message = `${d.message}: the sources and switches would cut the run into ${count(total)} intervals, more than the ${MAX_SOURCE_CORNERS} ringdown follows in one run`;
  throw new InputError([d]);
}

