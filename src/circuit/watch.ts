import type { Name, Statement } from '../netlist/ast.js';
import { raise, type DiagnosticSink } from '../netlist/errors.js';
import { didYouMean } from '../netlist/suggest.js';
import { GROUND, type Watch, type WatchTarget } from './circuit.js';

type WatchStatement = Extract<Statement, { kind: 'watch' }>;

/** Resolves a watch against the known nodes and parts; undefined (after raising) if it names unknowns. */
export function elaborateWatch(
  st: WatchStatement,
  nodes: readonly string[],
  /** Every designator declared, including parts whose values had errors. */
  parts: ReadonlySet<string>,
  sink: DiagnosticSink,
  /** Some part lines failed to parse: an unknown name may be on one of them, so stay quiet. */
  incomplete = false,
): Watch | undefined {
  const knownNode = (n: Name): boolean => {
    if (n.name === GROUND || nodes.includes(n.name)) return true;
    if (incomplete) return false;
    raise(sink, 'error', n.loc, `no part connects to a node named '${n.name}'`, {
      hint: didYouMean(n.name, [...nodes, GROUND]),
    });
    return false;
  };
  const knownPart = (n: Name): boolean => {
    if (parts.has(n.name)) return true;
    if (incomplete) return false;
    raise(sink, 'error', n.loc, `there is no part named '${n.name}'`, { hint: didYouMean(n.name, parts) });
    return false;
  };

  const t = st.target;
  let target: WatchTarget;
  let label: string;
  let unit: Watch['unit'] = 'V';
  switch (t.kind) {
    case 'node':
      if (!knownNode(t.node)) return undefined;
      target = { kind: 'node', node: t.node.name };
      label = `v(${t.node.name})`;
      break;
    case 'between': {
      const okA = knownNode(t.a);
      const okB = knownNode(t.b);
      if (!okA || !okB) return undefined;
      target = { kind: 'between', a: t.a.name, b: t.b.name };
      label = `v(${t.a.name},${t.b.name})`;
      break;
    }
    case 'part-voltage':
      if (!knownPart(t.part)) return undefined;
      target = { kind: 'part-voltage', part: t.part.name };
      label = `v(${t.part.name})`;
      break;
    case 'part-current':
      if (!knownPart(t.part)) return undefined;
      target = { kind: 'part-current', part: t.part.name };
      label = `i(${t.part.name})`;
      unit = 'A';
      break;
  }
  const watch: Watch = { target, label: st.label?.text ?? label, unit, loc: st.loc };
  if (st.threshold) {
    const th = st.threshold;
    if (th.unit !== null && th.unit !== unit) {
      raise(sink, 'error', th.loc, `the threshold '${th.text}' is in ${th.unit}, but this watch measures ${unit === 'V' ? 'a voltage (V)' : 'a current (A)'}`, {
        expected: `a level in ${unit}, such as above ${unit === 'V' ? '3V' : '2A'}`,
      });
      return undefined;
    }
    watch.threshold = th.value;
  }
  return watch;
}
