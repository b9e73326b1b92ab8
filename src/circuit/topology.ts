import { raise, type DiagnosticSink } from '../netlist/errors.js';
import type { SourceLocation } from '../netlist/location.js';
import { closest } from '../netlist/suggest.js';
import { GROUND, type Part } from './circuit.js';
import { UnionFind } from './union-find.js';

/**
 * Structural checks that make the network solvable at all. Capacitor loops and inductor
 * cut-sets are fine (they only constrain initial conditions); ideal-source loops and
 * cut-sets are not, because they force two sources to agree exactly.
 */

/** Where each part's two node names were written, for pointing at a node rather than the line. */
export type TerminalLocs = ReadonlyMap<string, readonly [SourceLocation, SourceLocation]>;

export function checkTopology(parts: readonly Part[], sink: DiagnosticSink, terminals?: TerminalLocs): void {
  const floating = checkGroundPaths(parts, sink);
  checkSourceLoops(parts, sink);
  checkSourceCutSets(parts, floating, sink);
  warnDanglingNodes(parts, sink, terminals);
}

const list = (names: readonly string[]): string => names.map((n) => `'${n}'`).join(', ');
const plural = (n: number, one: string, many: string): string => (n === 1 ? one : many);

/** (a) Every node must reach gnd through some chain of parts. Returns the nodes that do not. */
function checkGroundPaths(parts: readonly Part[], sink: DiagnosticSink): Set<string> {
  const uf = new UnionFind();
  for (const p of parts) uf.union(p.a, p.b);
  const islands = new Map<string, { nodes: string[]; parts: Part[] }>();
  for (const p of parts) {
    const root = uf.find(p.a);
    if (uf.connected(root, GROUND)) continue;
    const island = islands.get(root) ?? { nodes: [], parts: [] };
    islands.set(root, island);
    island.parts.push(p);
    for (const n of [p.a, p.b]) if (!island.nodes.includes(n)) island.nodes.push(n);
  }
  const floating = new Set<string>();
  const groundUsed = parts.some((p) => p.a === GROUND || p.b === GROUND);
  for (const island of islands.values()) {
    island.nodes.forEach((n) => floating.add(n));
    const names = island.parts.map((p) => p.name);
    const message = groundUsed
      ? `${plural(island.nodes.length, 'node', 'nodes')} ${list(island.nodes)} (${list(names)}) ${plural(island.nodes.length, 'has', 'have')} no connection to gnd`
      : `nothing connects to gnd: ${plural(island.nodes.length, 'node', 'nodes')} ${list(island.nodes)} ${plural(island.nodes.length, 'has', 'have')} no reference`;
    raise(sink, 'error', island.parts[0]!.loc, message, {
      hint: groundUsed
        ? 'join this group to the rest of the circuit through a part (a large resistor will do)'
        : groundLookalike(island.nodes) ?? 'gnd is the 0 V reference node; connect one of these nodes to gnd',
    });
  }
  return floating;
}

/** (b) A loop made only of voltage sources would force their voltages to sum to zero exactly. */
function checkSourceLoops(parts: readonly Part[], sink: DiagnosticSink): void {
  const uf = new UnionFind();
  const edges: Part[] = [];
  for (const p of parts) {
    if (p.kind !== 'voltage-source') continue;
    if (uf.union(p.a, p.b)) {
      edges.push(p);
      continue;
    }
    const order = (q: Part): number => parts.indexOf(q);
    const loop = [...pathBetween(edges, p.a, p.b), p].sort((x, y) => order(x) - order(y));
    const names = loop.map((q) => q.name);
    raise(sink, 'error', p.loc, `voltage sources ${list(names)} form a loop with no other part in it`, {
      hint: 'ideal voltage sources in a loop fight each other; put a resistor in series with one of them',
    });
  }
}

/** The parts along the unique path from `from` to `to` in a forest of edges. */
function pathBetween(edges: readonly Part[], from: string, to: string): Part[] {
  const via = new Map<string, Part | null>([[from, null]]);
  const queue = [from];
  while (queue.length > 0) {
    const n = queue.shift()!;
    if (n === to) break;
    for (const e of edges) {
      const other = e.a === n ? e.b : e.b === n ? e.a : undefined;
      if (other !== undefined && !via.has(other)) {
        via.set(other, e);
        queue.push(other);
      }
    }
  }
  const path: Part[] = [];
  for (let n = to, e = via.get(n); e; e = via.get(n)) {
    path.unshift(e);
    n = e.a === n ? e.b : e.a;
  }
  return path;
}

/**
 * (c) Nodes tied to the rest only through current sources: the sources' currents would have to
 * cancel exactly at that group, which ideal sources cannot promise.
 */
function checkSourceCutSets(parts: readonly Part[], floating: ReadonlySet<string>, sink: DiagnosticSink): void {
  const uf = new UnionFind();
  for (const p of parts) if (p.kind !== 'current-source') uf.union(p.a, p.b);
  const groups = new Map<string, { nodes: string[]; sources: Part[] }>();
  for (const p of parts) {
    for (const n of [p.a, p.b]) {
      if (floating.has(n) || uf.connected(n, GROUND)) continue;
      const root = uf.find(n);
      const g = groups.get(root) ?? { nodes: [], sources: [] };
      groups.set(root, g);
      if (!g.nodes.includes(n)) g.nodes.push(n);
      if (p.kind === 'current-source' && !g.sources.includes(p) && !uf.connected(p.a, p.b)) g.sources.push(p);
    }
  }
  for (const g of groups.values()) {
    if (g.sources.length === 0) continue;
    const names = g.sources.map((p) => p.name);
    raise(
      sink,
      'error',
      g.sources[0]!.loc,
      `${plural(g.nodes.length, 'node', 'nodes')} ${list(g.nodes)} ${plural(g.nodes.length, 'is', 'are')} reached only through current ${plural(names.length, 'source', 'sources')} ${list(names)}`,
      {
        hint:
          names.length === 1
            ? `the current of ${names[0]} has nowhere to go; give it a path, e.g. a resistor from ${g.nodes[0]} to gnd`
            : 'the source currents would have to cancel exactly; give the nodes a path to gnd through a resistor',
      },
    );
  }
}

/** (d) A node with a single terminal on it carries no current: usually a typo in a node name. */
function warnDanglingNodes(parts: readonly Part[], sink: DiagnosticSink, terminals?: TerminalLocs): void {
  const touches = new Map<string, { part: Part; end: 0 | 1 }[]>();
  for (const p of parts) {
    ([p.a, p.b] as const).forEach((n, end) => {
      if (n === GROUND) return;
      const t = touches.get(n) ?? [];
      touches.set(n, t);
      t.push({ part: p, end: end as 0 | 1 });
    });
  }
  const names = [...touches.keys(), GROUND];
  let suggested = 0;
  for (const [node, t] of touches) {
    if (t.length !== 1) continue;
    const { part, end } = t[0]!;
    if (part.kind === 'current-source') continue; // already an error from the cut-set check
    const loc = terminals?.get(part.name)?.[end] ?? part.loc;
    // Looking for a near name costs a pass over every node: done for the first few only, so a
    // large generated file full of open ends stays fast.
    const hint = suggested++ < MAX_SUGGESTIONS ? suggestion(node, names) : 'this end of the part is left open';
    raise(sink, 'warning', loc, `node '${node}' is connected only to ${part.name}, so ${part.name} carries no current`, { hint });
  }
}

const MAX_SUGGESTIONS = 20;

function suggestion(node: string, names: string[]): string {
  const near = closest(node, names);
  return near ? `did you mean '${near}'? otherwise this end is left open` : 'this end of the part is left open';
}

/** A hint for a node that was meant as the reference but is spelt otherwise ('GND', 'ground', '0'). */
function groundLookalike(nodes: readonly string[]): string | undefined {
  const meant = nodes.find((n) => /^(gnd|ground|agnd|dgnd|0|vss|com)$/i.test(n));
  return meant === undefined ? undefined : `the reference node is written gnd (lower case); '${meant}' is an ordinary node name: write gnd instead`;
}
