import type { Circuit } from '../circuit/circuit.js';
import { productsFor } from '../lti/gram.js';
import { termsValue } from '../lti/term.js';
import type { Piece } from '../simulate/result.js';
import { sameEnd } from './repeat.js';

/**
 * Energy bookkeeping over the span from the exact closed forms (∫ v·i dt per piece, in closed form):
 * what the sources delivered, what the resistors (and switch resistances) turned into heat, how
 * much the capacitors and inductors gained. By Tellegen's theorem the three balance exactly:
 * delivered = dissipated + stored change; the relative residual is a consistency figure of the run.
 * Energy lost inside switching instants (charge sharing) happens between pieces and is reported by
 * the events; Dirac impulses are outside this bookkeeping.
 */
export interface EnergyBalance {
  delivered: number;
  dissipated: number;
  storedChange: number;
  /**
   * |delivered − dissipated − storedChange| over the circuit's energy scale: the largest of the
   * three totals, Σ|∫v·i dt| over the parts (one source feeding another can leave all three totals
   * near 0) and the energy stored at the start or the end of the span (a circuit holding 4 J in
   * its coils while nothing moves: the ∫v·i of its parts are round-off of that)
   */
  residual: number;
  /** per part: ∫ v·i dt over the span (positive: absorbed) */
  perPart: { part: string; absorbed: number }[];
}

export function energyBalance(circuit: Circuit, parts: { part: string; voltage: Piece[]; current: Piece[] }[]): EnergyBalance {
  let delivered = 0;
  let dissipated = 0;
  let storedChange = 0;
  // all parts share the run's exponents: one table of exponent integrals per piece length,
  // shared with the part stress (the same products, mostly)
  const products = productsFor(circuit);
  const byName = new Map(circuit.parts.map((q) => [q.name, q]));
  const perPart = parts.map((p) => {
    let absorbed = 0;
    // a pair of term arrays seen before over a length a few ulps away (a steady tail's periods,
    // repeat.ts): its integral plus v(b)·i(b)·d
    const seen = new Map<Piece['terms'], { i: Piece['terms']; b: number; fg: number; vb: number; ib: number }>();
    p.voltage.forEach((pv, k) => {
      const pi = p.current[k];
      const b = pv.t1 - pv.t0;
      const s = seen.get(pv.terms);
      if (s !== undefined && s.i === pi.terms && sameEnd(b, s.b, pv.t1)) {
        absorbed += s.fg + s.vb * s.ib * (b - s.b);
        return;
      }
      products.pair(pv.terms, pi.terms, b);
      absorbed += products.fg;
      if (s === undefined) seen.set(pv.terms, { i: pi.terms, b, fg: products.fg, vb: termsValue(pv.terms, b), ib: termsValue(pi.terms, b) });
    });
    const kind = byName.get(p.part)?.kind;
    if (kind === 'voltage-source' || kind === 'current-source') delivered -= absorbed;
    else if (kind === 'resistor' || kind === 'switch') dissipated += absorbed;
    else storedChange += absorbed;
    return { part: p.part, absorbed };
  });
  // a sum of terms carries round-off of the terms' sizes, not of the sum: two sources trading
  // 1 J with nothing else moving leave delivered ≈ 0, and a ratio to that would be round-off / round-off
  let moved = 0;
  for (const p of perPart) moved += Math.abs(p.absorbed);
  let heldFirst = 0;
  let heldLast = 0;
  for (const p of parts) {
    const part = byName.get(p.part);
    const x = part?.kind === 'capacitor' ? p.voltage : part?.kind === 'inductor' ? p.current : null;
    if (!part || !x || x.length === 0) continue;
    const first = termsValue(x[0]!.terms, 0);
    const last = x[x.length - 1]!;
    const end = termsValue(last.terms, last.t1 - last.t0);
    // ½·C·v² or ½·L·i² (textbook)
    if (Number.isFinite(first)) heldFirst += 0.5 * part.value * first * first;
    if (Number.isFinite(end)) heldLast += 0.5 * part.value * end * end;
  }
  const scale = Math.max(Math.abs(delivered), Math.abs(dissipated), Math.abs(storedChange), moved, heldFirst, heldLast);
  const residual = scale > 0 ? Math.abs(delivered - dissipated - storedChange) / scale : 0;
  return { delivered, dissipated, storedChange, residual, perPart };
}
