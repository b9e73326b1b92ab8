import { InputError } from '../diagnostics.js';
import type { Name, Statement } from '../netlist/ast.js';
import { errorCount, raise, type DiagnosticSink } from '../netlist/errors.js';
import type { SourceLocation } from '../netlist/location.js';
import { parseNetlist } from '../netlist/parse.js';
import type { Quantity } from '../netlist/quantity.js';
import { elaborateAnalysis } from './analysis.js';
import { GROUND, type Circuit, type Part } from './circuit.js';
import { evaluateValue, isReservedName, type EvalContext } from './evaluate.js';
import { elaboratePart } from './parts.js';
import { checkTopology } from './topology.js';
import { elaborateWatch } from './watch.js';

type Of<K extends Statement['kind']> = Extract<Statement, { kind: K }>;

/**
 * Reads a circuit file into a validated Circuit with every value in SI.
 * Throws InputError carrying every error found (and the warnings alongside them).
 */
export function loadCircuit(text: string, file: string): Circuit {
  const sink: DiagnosticSink = [];
  const netlist = parseNetlist(text, file, sink);
  const statements = netlist.statements;

  const declaredLater = new Map<string, number>();
  for (const st of statements) if (st.kind === 'param' && !declaredLater.has(st.name.name)) declaredLater.set(st.name.name, st.loc.line);
  const ctx: EvalContext = { sink, params: new Map(), declaredLater };

  let title: string | undefined;
  let titleLoc: SourceLocation | undefined;
  const parts = new Map<string, Part>();
  const declaredParts = new Set<string>();
  const nodes: string[] = [];
  const terminals = new Map<string, readonly [SourceLocation, SourceLocation]>();
  // Shape only (kind, name, nodes): topology is checked even when a value had an error.
  const structure: Part[] = [];
  const watchStatements: Of<'watch'>[] = [];
  const analysisStatements: Of<'span' | 'samples' | 'settle' | 'derate' | 'start'>[] = [];

  // File order matters: a parameter is visible only to the lines after it.
  for (const st of statements) {
    switch (st.kind) {
      case 'title':
        if (titleLoc) raise(sink, 'error', st.loc, 'the title is given twice', { hint: `the first title is on line ${titleLoc.line}` });
        else [title, titleLoc] = [st.text, st.loc];
        break;
      case 'param':
        declareParam(st, ctx);
        break;
      case 'part': {
        for (const n of [st.a, st.b]) if (n.name !== GROUND && !nodes.includes(n.name)) nodes.push(n.name);
        const part = elaboratePart(st, parts, ctx);
        if (!declaredParts.has(st.name.name) && st.a.name !== st.b.name) {
          terminals.set(st.name.name, [st.a.loc, st.b.loc]);
          structure.push({ kind: st.part, name: st.name.name, a: st.a.name, b: st.b.name, value: 0, loc: st.loc });
        }
        declaredParts.add(st.name.name);
        if (part) parts.set(part.name, part);
        break;
      }
      case 'watch':
        watchStatements.push(st);
        break;
      default:
        analysisStatements.push(st);
    }
  }

  // Watches may name parts declared further down, so they are resolved after all parts.
  const watches = watchStatements.flatMap((st) => elaborateWatch(st, nodes, declaredParts, sink, netlist.brokenPartLines.length > 0) ?? []);
  // two watches with one label make columns of the CSV and traces of the JSON that cannot be told apart
  const firstWithLabel = new Map<string, SourceLocation>();
  for (const w of watches) {
    const first = firstWithLabel.get(w.label);
    if (first) {
      raise(sink, 'warning', w.loc, `this watch has the same label '${w.label}' as the watch on line ${first.line}`, {
        hint: 'give one of them its own label with as "…" or drop the repeated line: otherwise their CSV columns and JSON traces cannot be told apart',
      });
    } else firstWithLabel.set(w.label, w.loc);
  }
  const analysis = elaborateAnalysis(analysisStatements, ctx);

  const partsBroken = netlist.brokenPartLines.length > 0;
  if (declaredParts.size === 0 && !partsBroken) {
    raise(sink, 'error', undefined, `${file} describes no parts`, {
      expected: 'part lines such as: resistor R1 in -> out 1k',
    });
  } else if (!partsBroken) {
    // Only on a complete part list: a missing part would make every check below misfire.
    checkTopology(structure, sink, terminals);
  }
  // a watch line that failed to parse has its own error already; do not add "nothing to watch"
  const wroteWatch = /^[ \t]*watch\b/m.test(text);
  if (watchStatements.length === 0 && !wroteWatch) {
    raise(sink, 'error', undefined, `${file} has nothing to watch, so there would be nothing to report`, {
      hint: nodes.length > 0 ? `add a line such as: watch node ${nodes[nodes.length - 1]}` : 'add a line such as: watch node out',
    });
  }

  const warnings = sink.filter((d) => d.severity === 'warning');
  if (errorCount(sink) > 0) throw new InputError(sortByPlace(sink));

  const circuit: Circuit = { file, nodes, parts: [...parts.values()], watches, analysis, params: Object.fromEntries([...ctx.params].map(([k, q]) => [k, q.value])) };
  if (title !== undefined) circuit.title = title;
  if (warnings.length > 0) circuit.warnings = warnings;
  return circuit;
}

function declareParam(st: Of<'param'>, ctx: EvalContext): void {
  const name: Name = st.name;
  if (isReservedName(name.name)) {
    raise(ctx.sink, 'error', name.loc, `'${name.name}' is a built-in name and cannot be a parameter`, { hint: 'choose another name' });
    return;
  }
  if (ctx.params.has(name.name) || ctx.declaredLater.get(name.name)! < st.loc.line) {
    raise(ctx.sink, 'error', name.loc, `parameter '${name.name}' is declared twice`, {
      hint: `the first declaration is on line ${ctx.declaredLater.get(name.name)}`,
    });
    return;
  }
  const q: Quantity | undefined = evaluateValue(st.value, ctx);
  if (q) ctx.params.set(name.name, q);
}

/** Diagnostics in reading order; ones without a place (whole-file problems) come last. */
function sortByPlace(ds: DiagnosticSink): DiagnosticSink {
  const key = (d: DiagnosticSink[number]): number => (d.loc ? d.loc.line * 1e6 + d.loc.col : Infinity);
  return [...ds].sort((x, y) => key(x) - key(y));
}
