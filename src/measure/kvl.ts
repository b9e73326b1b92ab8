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
 * The voltage across each switch by Kirchhoff's voltage law: the sum of the voltages of the other
 * (non-switch) parts along a path from one end of the switch to the other. This holds whether the
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
    if (p.kind === 'switch' || !byName.has(p.name)) continue;
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
    if (!part || part.kind !== 'switch') return forms;
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
