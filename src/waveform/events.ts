import type { Circuit, Waveform } from '../circuit/circuit.js';

/**
 * The instants at which something happens to the circuit: a source starts a step, ramp, edge,
 * approach, sine, table corner or impulse, or a switch changes state. Measurements use them to
 * group the closed form's intervals into events (a pulse edge with a rise time is one event).
 */
export function eventTimes(circuit: Circuit, span: number): number[] {
  const out = new Set<number>([0]);
  const add = (t: number) => {
    if (t >= 0 && t <= span) out.add(t);
  };
  for (const p of circuit.parts) {
    if (p.waveform) waveformEvents(p.waveform, span, add);
    for (const e of p.switching?.events ?? []) add(e.t);
  }
  return [...out].sort((a, b) => a - b);
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
