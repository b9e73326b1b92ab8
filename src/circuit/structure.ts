import { GROUND, type Circuit, type Part } from './circuit.js';
import { UnionFind } from './union-find.js';

/**
 * Structural diagnostics of a validated circuit, from its graph alone (no values, no matrices):
 * capacitor loops, inductor cut-sets, dangling nodes and the number of states the exact solution
 * will carry.
 *
 * The count is the order of complexity of an RLC network (a textbook result, from memory):
 *
 *     states = #C + #L − (independent loops of capacitors and voltage sources only)
 *                      − (independent cut-sets of inductors and current sources only)
 *
 * Found with one spanning forest (a "normal tree"): Kruskal's union-find over the parts taken in
 * the order voltage sources, capacitors, resistors and switches, inductors, current sources. A
 * capacitor left out of the forest closes a loop made of voltage sources and capacitors only (its
 * fundamental loop), so its voltage is fixed by the others; an inductor taken into the forest is
 * the branch of a cut-set made of inductors and current sources only (its fundamental cut-set), so
 * its current is fixed by the others. The listed loops and cut-sets are these fundamental ones: an
 * independent set, as many as there are states lost, not every loop of the circuit.
 *
 * Switches are taken in their positions at a chosen time: closed, or open with a finite off
 * resistance, a switch is a resistor; open with `off open` it is absent. Loops made only of voltage
 * sources and cut-sets made only of current sources are input errors (src/circuit/topology.ts) and
 * are not listed here.
 */

export interface StructureLoop {
  /** The parts around the loop, in the order met walking around it. */
  parts: string[];
  /** The capacitor whose voltage the others fix (the one the state count leaves out). */
  dependent: string;
  /** One sentence saying so, for a report. */
  explanation: string;
}

export interface StructureCutSet {
  /** The parts the cut-set is made of: the dependent inductor first, then the others in circuit order. */
  parts: string[];
  /** The inductor whose current the others fix (the one the state count leaves out). */
  dependent: string;
  /** The nodes on one side of the cut (the side without gnd, when gnd is involved). */
  side: string[];
  explanation: string;
}

export interface StructureReport {
  /** The switch positions the graph was taken with. */
  switches: { at: number; closed: string[]; open: string[]; absent: string[] };
  capacitors: number;
  inductors: number;
  /** An independent set of loops made only of capacitors, or capacitors and voltage sources. */
  capacitorLoops: StructureLoop[];
  /** An independent set of cut-sets made only of inductors, or inductors and current sources. */
  inductorCutSets: StructureCutSet[];
  /** Nodes (gnd excepted) touched by a single part terminal, counting every part as written. */
  danglingNodes: { node: string; part: string }[];
  /** capacitors + inductors − capacitorLoops.length − inductorCutSets.length */
  expectedStates: number;
  /** A choice of state variables achieving that count: v(C) of capacitors in the forest, i(L) of inductors outside it. */
  stateNames: string[];
  /** e.g. "3 capacitors + 2 inductors − 1 capacitor loop − 0 inductor cut-sets = 4 states" */
  summary: string;
}

export interface StructureOptions {
  /**
   * Take the switches in their positions at this time (seconds): after every event at or before
   * it. Default 0, i.e. the positions before the first event; Infinity gives the positions at the
   * end, which are those of `RunResult.states`.
   */
  at?: number;
}

const RANK: Record<Part['kind'], number> = {
  'voltage-source': 0,
  capacitor: 1,
  resistor: 2,
  switch: 2,
  inductor: 3,
  'current-source': 4,
};

/** Whether a switch is closed at time `at` (after every event at or before it). */
export function switchClosedAt(part: Part, at: number): boolean {
  const sw = part.switching;
  if (!sw) return false;
  let closed = sw.initiallyClosed;
  for (const e of sw.events) if (e.t <= at) closed = e.closed;
  return closed;
}

export function describeStructure(circuit: Circuit, options: StructureOptions = {}): StructureReport {
  const at = options.at ?? 0;
  const switches: StructureReport['switches'] = { at, closed: [], open: [], absent: [] };
  const present: Part[] = [];
  for (const p of circuit.parts) {
    if (p.kind === 'switch') {
      const closed = switchClosedAt(p, at);
      if (closed) switches.closed.push(p.name);
      else if (Number.isFinite(p.switching?.offResistance ?? Infinity)) switches.open.push(p.name);
      else {
        switches.absent.push(p.name);
        continue;
      }
    }
    present.push(p);
  }

  // Kruskal in rank order; a stable sort keeps circuit order within a rank.
  const ordered = present.map((p, i) => ({ p, i })).sort((x, y) => RANK[x.p.kind] - RANK[y.p.kind] || x.i - y.i).map((x) => x.p);
  const uf = new UnionFind();
  const tree: Part[] = [];
  const links: Part[] = [];
  for (const p of ordered) (uf.union(p.a, p.b) ? tree : links).push(p);
  const forest = adjacency(tree);

  const capacitorLoops: StructureLoop[] = links
    .filter((p) => p.kind === 'capacitor')
    .map((c) => {
      const loop = [...pathBetween(forest, c.b, c.a).map((q) => q.name), c.name];
      const others = loop.filter((n) => n !== c.name);
      return {
        parts: loop,
        dependent: c.name,
        explanation: `${names(loop)} form a loop of ${hasKind(present, loop, 'voltage-source') ? 'capacitors and voltage sources' : 'capacitors'} only: the voltage of ${c.name} is fixed by ${names(others)}, so the circuit has one state fewer`,
      };
    });

  const inductorCutSets: StructureCutSet[] = tree
    .filter((p) => p.kind === 'inductor')
    .map((l) => {
      const side = reach(forest, l.a, l);
      const crossing = links.filter((q) => side.has(q.a) !== side.has(q.b));
      const sideNodes = side.has(GROUND) ? [...reach(forest, l.b, l)] : [...side];
      const parts = [l.name, ...crossing.map((q) => q.name)];
      const others = parts.slice(1);
      const kinds = hasKind(present, parts, 'current-source') ? 'inductors and current sources' : 'inductors';
      const where = `${sideNodes.length === 1 ? 'node' : 'nodes'} ${sideNodes.map((n) => `'${n}'`).join(', ')} ${sideNodes.length === 1 ? 'meets' : 'meet'} the rest of the circuit only through ${others.length > 0 ? 'them' : l.name}`;
      const explanation =
        others.length > 0
          ? `${names(parts)} form a cut-set of ${kinds} only (${where}): the current of ${l.name} is fixed by ${names(others)}, so the circuit has one state fewer`
          : `${l.name} alone forms a cut-set (${where}): its current is held at zero, so the circuit has one state fewer`;
      return { parts, dependent: l.name, side: sideNodes, explanation };
    });

  const capacitors = present.filter((p) => p.kind === 'capacitor').length;
  const inductors = present.filter((p) => p.kind === 'inductor').length;
  const expectedStates = capacitors + inductors - capacitorLoops.length - inductorCutSets.length;
  const stateNames = [
    ...tree.filter((p) => p.kind === 'capacitor').map((p) => `v(${p.name})`),
    ...links.filter((p) => p.kind === 'inductor').map((p) => `i(${p.name})`),
  ];
  const count = (n: number, one: string): string => `${n} ${one}${n === 1 ? '' : 's'}`;
  const summary = `${count(capacitors, 'capacitor')} + ${count(inductors, 'inductor')} − ${count(capacitorLoops.length, 'capacitor loop')} − ${count(inductorCutSets.length, 'inductor cut-set')} = ${count(expectedStates, 'state')}`;

  return { switches, capacitors, inductors, capacitorLoops, inductorCutSets, danglingNodes: dangling(circuit.parts), expectedStates, stateNames, summary };
}

const names = (ns: readonly string[]): string => (ns.length === 1 ? ns[0]! : `${ns.slice(0, -1).join(', ')} and ${ns[ns.length - 1]}`);

function hasKind(parts: readonly Part[], ns: readonly string[], kind: Part['kind']): boolean {
  return parts.some((p) => p.kind === kind && ns.includes(p.name));
}

type Adjacency = Map<string, { part: Part; other: string }[]>;

function adjacency(edges: readonly Part[]): Adjacency {
  const adj: Adjacency = new Map();
  const add = (n: string, part: Part, other: string): void => {
    const list = adj.get(n) ?? [];
    adj.set(n, list);
    list.push({ part, other });
  };
  for (const e of edges) {
    add(e.a, e, e.b);
    add(e.b, e, e.a);
  }
  return adj;
}

/** The parts along the unique forest path from `from` to `to` (both in one tree), in walking order. */
function pathBetween(adj: Adjacency, from: string, to: string): Part[] {
  const via = new Map<string, { part: Part; prev: string } | null>([[from, null]]);
  const queue = [from];
  for (let k = 0; k < queue.length && !via.has(to); k++) {
    const n = queue[k]!;
    for (const { part, other } of adj.get(n) ?? []) {
      if (via.has(other)) continue;
      via.set(other, { part, prev: n });
      queue.push(other);
    }
  }
  const path: Part[] = [];
  for (let n = to, step = via.get(n); step; n = step.prev, step = via.get(n)) path.unshift(step.part);
  return path;
}

/** The nodes reachable from `start` in the forest without crossing `skip`. */
function reach(adj: Adjacency, start: string, skip: Part): Set<string> {
  const seen = new Set([start]);
  const queue = [start];
  for (let k = 0; k < queue.length; k++) {
    for (const { part, other } of adj.get(queue[k]!) ?? []) {
      if (part === skip || seen.has(other)) continue;
      seen.add(other);
      queue.push(other);
    }
  }
  return seen;
}

/** Nodes other than gnd that exactly one part terminal touches (every part counts, as written). */
function dangling(parts: readonly Part[]): { node: string; part: string }[] {
  const touches = new Map<string, string[]>();
  for (const p of parts) {
    for (const n of [p.a, p.b]) {
      if (n === GROUND) continue;
      const t = touches.get(n) ?? [];
      touches.set(n, t);
      t.push(p.name);
    }
  }
  return [...touches].filter(([, t]) => t.length === 1).map(([node, t]) => ({ node, part: t[0]! }));
}
