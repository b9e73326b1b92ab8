import type { Circuit, Waveform } from '../circuit/circuit.js';

/**
 * The instants at which something happens to the circuit: a source starts a step, ramp, edge,
 * approach, sine, table corner or impulse, or a switch changes state. Measurements use them to
 * group the closed form's intervals into events (a pulse edge with a rise time is one event).
 */
export function eventTimes(circuit: Circuit, span: number): number[] {
  // collected, sorted, then deduplicated (a set of 10⁴ float keys costs more)
  const all: number[] = [0];
  const add = (t: number) => {
    if (t >= 0 && t <= span) all.push(t);
  };
  for (const p of circuit.parts) {
    if (p.waveform) waveformEvents(p.waveform, span, add);
    for (const e of p.switching?.events ?? []) add(e.t);
  }
  // (a single pulse train adds its edges in order, after the leading 0)
  let inOrder = true;
  for (let i = 1; i < all.length && inOrder; i++) inOrder = all[i - 1] <= all[i];
  const sorted = inOrder ? all : Float64Array.from(all).sort();
  const out: number[] = [];
  // (−0 reads as 0, as in a set)
  for (const t of sorted) if (out.length === 0 || t !== out[out.length - 1]) out.push(t === 0 ? 0 : t);
  return out;
}

function waveformEvents(w: Waveform, span: number, add: (t: number) => void): void {
  for (const t of w.terms) {
    switch (t.kind) {
      case 'step':
      case 'impulse':
      case 'approach':
      case 'sine':
        add(t.at);
        break;
      case 'ramp':
        add(t.at);
        if (Number.isFinite(t.until)) add(t.until);
        break;
      case 'table':
        for (const q of t.points) add(q.t);
        break;
      case 'pulse': {
        const cycles = Math.min(t.cycles, Math.ceil((span - t.start) / t.period) + 1);
        for (let k = 0; k < cycles; k++) {
          const c = t.start + k * t.period;
          if (c > span) break;
          add(c);
          add(c + t.rise + t.width);
        }
        break;
      }
      case 'constant':
      case 'expression':
        break;
    }
  }
}
