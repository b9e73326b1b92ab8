import type { Circuit, Part } from '../circuit/circuit.js';
import { GROUND } from '../circuit/circuit.js';

/**
 * Switches turn one circuit into a sequence of LTI circuits. An epoch is a stretch of time with
 * every switch in a fixed state; its circuit has each closed switch as its on-resistance and each
 * open one as its off-resistance, or removed when truly open.
 */
export interface Epoch {
  t0: number;
  t1: number;
  closed: string[];
  circuit: Circuit;
  /** nodes left with no part at all in this configuration */
  isolated: string[];
}

export function switchesOf(circuit: Circuit): Part[] {
  return circuit.parts.filter((p) => p.kind === 'switch');
}

export function epochs(circuit: Circuit, span: number): Epoch[] {
  const sw = switchesOf(circuit);
  const times = [...new Set(sw.flatMap((p) => p.switching!.events.map((e) => e.t)).filter((t) => t > 0 && t < span))].sort((a, b) => a - b);
  const bounds = [0, ...times, span];
  const out: Epoch[] = [];
  const cache = new Map<string, { circuit: Circuit; isolated: string[] }>();
  for (let k = 0; k + 1 < bounds.length; k++) {
    const closed = sw.filter((p) => isClosedAt(p, bounds[k])).map((p) => p.name);
    const key = closed.join('\u0000');
    if (!cache.has(key)) cache.set(key, configure(circuit, new Set(closed)));
    const c = cache.get(key)!;
    out.push({ t0: bounds[k], t1: bounds[k + 1], closed, circuit: c.circuit, isolated: c.isolated });
  }
  return out;
}

/** The switch configuration before t = 0 (for the settled initial state). */
export function initialConfiguration(circuit: Circuit): { circuit: Circuit; closed: string[] } {
  const closed = switchesOf(circuit).filter((p) => p.switching!.initiallyClosed).map((p) => p.name);
  return { circuit: configure(circuit, new Set(closed)).circuit, closed };
}

/** State at time t (after any event at exactly t). */
export function isClosedAt(p: Part, t: number): boolean {
  let closed = p.switching!.initiallyClosed;
  for (const e of p.switching!.events) if (e.t <= t) closed = e.closed;
  return closed;
}

const memo = new WeakMap<Circuit, Map<string, { circuit: Circuit; isolated: string[] }>>();

/** The circuit of one switch configuration; the same configuration always gives the same object. */
export function configure(circuit: Circuit, closed: Set<string>): { circuit: Circuit; isolated: string[] } {
  const key = [...closed].sort().join('\u0000');
  let byKey = memo.get(circuit);
  if (!byKey) memo.set(circuit, (byKey = new Map()));
  let hit = byKey.get(key);
  if (!hit) byKey.set(key, (hit = build(circuit, closed)));
  return hit;
}

function build(circuit: Circuit, closed: Set<string>): { circuit: Circuit; isolated: string[] } {
  const parts: Part[] = [];
  for (const p of circuit.parts) {
    if (p.kind !== 'switch') {
      parts.push(p);
      continue;
    }
    const s = p.switching!;
    const r = closed.has(p.name) ? s.onResistance : s.offResistance;
    // an ideal (0 Ω) closed switch is a 0 V source: it ties its nodes and carries a branch current
    if (r === 0) parts.push({ ...p, kind: 'voltage-source', value: 0, waveform: { terms: [{ kind: 'constant', value: 0 }] } });
    else if (Number.isFinite(r)) parts.push({ ...p, kind: 'resistor', value: r });
  }
  const used = new Set(parts.flatMap((p) => [p.a, p.b]));
  const nodes = circuit.nodes.filter((n) => n === GROUND || used.has(n));
  const isolated = circuit.nodes.filter((n) => n !== GROUND && !used.has(n));
  return { circuit: { ...circuit, parts, nodes }, isolated };
}
