import type { Circuit } from '../circuit/circuit.js';
import type { Piece, Term } from '../simulate/result.js';

type PartForms = { part: string; voltage: Piece[]; current: Piece[] };

function scaleTerm(t: Term, k: number): Term {
  switch (t.kind) {
    case 'exp':
      return { ...t, coef: k * t.coef };
    case 'osc':
      return { ...t, cosCoef: k * t.cosCoef, sinCoef: k * t.sinCoef };
    case 'poly-exp':
      return { ...t, polyCoefs: t.polyCoefs.map((c) => k * c) };
    case 'quasi':
      return { ...t, cosPoly: t.cosPoly.map((c) => k * c), sinPoly: t.sinPoly.map((c) => k * c) };
  }
}

/**
 * The voltage across each switch and current source by Kirchhoff's voltage law: the sum of the
 * voltages of the resistors, capacitors, inductors and voltage sources along a path from one end
 * to the other (so an inductor's kick reaches the switch that cut its current). This holds whether the
 * switch is open or closed, and stays right for an open switch whose own voltage is not carried by
 * the per-part forms (there it would read 0). Switches whose ends are not joined through other
 * parts keep their own forms. The per-part lists share their piece boundaries.
 */
export function switchVoltagesByKVL(circuit: Circuit, parts: readonly PartForms[]): PartForms[] {
  const byName = new Map(parts.map((p) => [p.part, p]));
  const kinds = new Map(circuit.parts.map((p) => [p.name, p]));
  // potential of each node relative to the root of its tree: Σ coef·v(part)
  const pot = new Map<string, Map<string, number>>();
  const adj = new Map<string, { to: string; part: string; sign: number }[]>();
  const link = (n: string, e: { to: string; part: string; sign: number }) => {
    const list = adj.get(n);
    if (list) list.push(e);
    else adj.set(n, [e]);
  };
  for (const p of circuit.parts) {
    if (p.kind === 'switch' || p.kind === 'current-source' || !byName.has(p.name)) continue;
    // v(p) = pot(a) − pot(b): pot(b) = pot(a) − v(p), pot(a) = pot(b) + v(p)
    link(p.a, { to: p.b, part: p.name, sign: -1 });
    link(p.b, { to: p.a, part: p.name, sign: 1 });
  }
  const component = new Map<string, string>();
  for (const root of adj.keys()) {
    if (pot.has(root)) continue;
    pot.set(root, new Map());
    component.set(root, root);
    const queue = [root];
    while (queue.length > 0) {
      const n = queue.shift()!;
      for (const e of adj.get(n) ?? []) {
        if (pot.has(e.to)) continue;
        const next = new Map(pot.get(n)!);
        next.set(e.part, (next.get(e.part) ?? 0) + e.sign);
        pot.set(e.to, next);
        component.set(e.to, root);
        queue.push(e.to);
      }
    }
  }

  return parts.map((forms) => {
    const part = kinds.get(forms.part);
    if (!part || (part.kind !== 'switch' && part.kind !== 'current-source')) return forms;
    const ra = component.get(part.a);
    if (ra === undefined || ra !== component.get(part.b)) return forms;
    const combo = new Map(pot.get(part.a)!);
    for (const [name, k] of pot.get(part.b)!) combo.set(name, (combo.get(name) ?? 0) - k);
    const used = [...combo].filter(([, k]) => k !== 0);
    const voltage = forms.voltage.map((piece, i) => ({
      t0: piece.t0,
      t1: piece.t1,
      terms: used.flatMap(([name, k]) => (byName.get(name)!.voltage[i]?.terms ?? []).map((t) => scaleTerm(t, k))),
      impulseArea: used.reduce((s, [name, k]) => s + k * (byName.get(name)!.voltage[i]?.impulseArea ?? 0), 0),
    }));
    return { ...forms, voltage };
  });
}

type RunEvent = { t: number; jumps: { part: string; kind: 'capacitor-voltage' | 'inductor-current'; before: number; after: number }[] };

/**
 * The Dirac impulses behind the state jumps of switching instants (and of t = 0), added to the
 * per-part forms: a capacitor's voltage jump Δv is a current impulse C·Δv in it, and in the
 * voltage sources joined to it through capacitors and voltage sources (the loop that charged it
 * at once); an inductor's current jump Δi is a voltage impulse L·Δi across it (switches and
 * current sources get theirs by `switchVoltagesByKVL`). Returns new forms; the input is untouched.
 */
export function withJumpImpulses(circuit: Circuit, parts: readonly PartForms[], events: readonly RunEvent[]): PartForms[] {
  const out = parts.map((p) => ({ part: p.part, voltage: [...p.voltage], current: [...p.current] }));
  const index = new Map(out.map((p, i) => [p.part, i]));
  const add = (name: string, which: 'voltage' | 'current', t: number, area: number) => {
    const forms = out[index.get(name) ?? -1];
    if (!forms || !(area !== 0) || !Number.isFinite(area)) return;
    const list = forms[which];
    const k = list.findIndex((p) => p.t0 === t);
    if (k < 0) return;
    list[k] = { ...list[k]!, impulseArea: list[k]!.impulseArea + area };
  };
  // groups of nodes joined by capacitors and voltage sources
  const root = new Map<string, string>();
  const find = (n: string): string => {
    let r = n;
    while (root.has(r) && root.get(r) !== r) r = root.get(r)!;
    return r;
  };
  for (const p of circuit.parts) {
    if (p.kind !== 'capacitor' && p.kind !== 'voltage-source') continue;
    const a = find(p.a);
    const b = find(p.b);
    root.set(a, a);
    if (a !== b) root.set(b, a);
  }
  for (const e of events) {
    const charged = new Set<string>();
    for (const j of e.jumps) {
      const part = circuit.parts.find((p) => p.name === j.part);
      if (!part) continue;
      const delta = j.after - j.before;
      if (!(Math.abs(delta) > 1e-12 * Math.max(Math.abs(j.before), Math.abs(j.after)))) continue;
      if (j.kind === 'capacitor-voltage') {
        add(part.name, 'current', e.t, part.value * delta);
        charged.add(find(part.a));
      } else {
        add(part.name, 'voltage', e.t, part.value * delta);
      }
    }
    for (const p of circuit.parts) {
      // the source's share is not known part by part: mark it with the largest capacitor impulse
      if (p.kind === 'voltage-source' && charged.has(find(p.a))) {
        const area = Math.max(...e.jumps.filter((j) => j.kind === 'capacitor-voltage').map((j) => Math.abs((circuit.parts.find((q) => q.name === j.part)?.value ?? 0) * (j.after - j.before))));
        add(p.name, 'current', e.t, area);
      }
    }
  }
  return out;
}
