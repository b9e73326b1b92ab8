import type { Circuit, Waveform } from '../circuit/circuit.js';

/**
 * The instants at which something happens to the circuit: a source starts a step, ramp, edge,
 * approach, sine, table corner or impulse, or a switch changes state. Measurements use them to
 * group the closed form's intervals into events (a pulse edge with a rise time is one event).
 */
export function eventTimes(circuit: Circuit, span: number): number[] {
  // collected, sorted, then deduplicated (a set of 10⁴ float keys costs more); pushed straight into
  // the list (a long pulse train adds 2·10⁴ times: no callback per time)
  const all: number[] = [0];
  for (const p of circuit.parts) {
    if (p.waveform) waveformEvents(p.waveform, span, all);
    for (const e of p.switching?.events ?? []) if (e.t >= 0 && e.t <= span) all.push(e.t);
  }
  // (a single pulse train adds its edges in order, after the leading 0)
  let inOrder = true;
  for (let i = 1; i < all.length && inOrder; i++) inOrder = all[i - 1] <= all[i];
  const sorted = inOrder ? all : Float64Array.from(all).sort();
  const out = new Array<number>(sorted.length);
  let n = 0;
  // (−0 reads as 0, as in a set)
  for (let i = 0; i < sorted.length; i++) {
    const t = sorted[i];
    if (n === 0 || t !== out[n - 1]) out[n++] = t === 0 ? 0 : t;
  }
  out.length = n;
  return out;
}

function waveformEvents(w: Waveform, span: number, all: number[]): void {
  const add = (t: number) => {
    if (t >= 0 && t <= span) all.push(t);
  };
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
          const e = c + t.rise + t.width;
          if (c >= 0) all.push(c);
          if (e >= 0 && e <= span) all.push(e);
        }
        break;
      }
      case 'constant':
      case 'expression':
        break;
    }
  }
}
