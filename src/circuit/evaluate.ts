import { evaluate } from 'mathjs';
import type { ValueNode } from '../netlist/ast.js';
import { raise, type DiagnosticSink } from '../netlist/errors.js';
import type { SourceLocation } from '../netlist/location.js';
import { looksLikeResistorCode, parseQuantity, type Quantity } from '../netlist/quantity.js';
import { didYouMean } from '../netlist/suggest.js';
import { checkUnit, type Place } from './units.js';

/** What value evaluation needs to know: parameters so far, and where problems go. */
export interface EvalContext {
  sink: DiagnosticSink;
  /** Parameters declared so far (a value may only use earlier ones). */
  params: Map<string, Quantity>;
  /** Every parameter name in the file, to explain uses that come before the declaration. */
  declaredLater: Map<string, number>;
}

/** Names an expression may use besides parameters. Anything else is refused before mathjs sees it. */
export const EXPRESSION_FUNCTIONS = [
  'sqrt', 'exp', 'log', 'log10', 'log2', 'sin', 'cos', 'tan', 'asin', 'acos', 'atan', 'atan2',
  'sinh', 'cosh', 'tanh', 'abs', 'min', 'max', 'pow', 'floor', 'ceil', 'round',
];
export const EXPRESSION_CONSTANTS = ['pi', 'e'];
const RESERVED = new Set([...EXPRESSION_FUNCTIONS, ...EXPRESSION_CONSTANTS]);

export function isReservedName(name: string): boolean {
  return RESERVED.has(name);
}

const ANY_VALUE = 'a quantity such as 10k, a parameter declared with param, or an expression in parentheses';

/** Evaluates to SI; raises and returns undefined on error. Expressions have no unit. */
export function evaluateValue(node: ValueNode, ctx: EvalContext): Quantity | undefined {
  switch (node.kind) {
    case 'literal':
      return { value: node.value, unit: node.unit };
    case 'ref': {
      const p = ctx.params.get(node.name);
      if (p) return p;
      if (node.literal) return node.literal;
      unknownName(node.name, node.loc, ctx, false);
      return undefined;
    }
    case 'expr':
      return evaluateExpression(node.text, node.loc, ctx);
  }
}

/** Evaluates and checks the unit for a place; `subject` names the place in messages. */
export function evaluateFor(node: ValueNode, place: Place, subject: string, ctx: EvalContext): number | undefined {
  const q = evaluateValue(node, ctx);
  if (!q) return undefined;
  return checkUnit(ctx.sink, q, node.loc, place, subject) ? q.value : undefined;
}

function unknownName(name: string, loc: SourceLocation, ctx: EvalContext, inExpression: boolean): void {
  const laterLine = ctx.declaredLater.get(name);
  if (laterLine !== undefined && !ctx.params.has(name)) {
    raise(ctx.sink, 'error', loc, `parameter '${name}' is used before its declaration on line ${laterLine}`, {
      hint: `move 'param ${name} = …' above this line`,
    });
    return;
  }
  // Parameters first: a near-miss of the user's own name is likelier than of a function.
  const hint = didYouMean(name, ctx.params.keys()) ?? (inExpression ? didYouMean(name, RESERVED) : undefined);
  raise(ctx.sink, 'error', loc, `unknown parameter '${name}'`, {
    expected: inExpression ? 'a parameter declared above, a number, pi, e, or a function such as sqrt' : ANY_VALUE,
    hint,
  });
}

const PIECE = /([A-Za-z_][A-Za-z0-9_]*)|((?:\d+(?:\.\d*)?|\.\d+)(?:[eE][+-]?\d+)?[A-Za-z0-9_.%\u00b5\u03bc\u03a9\u2126\u00b7]*)|(\s+)|([-+*/^(),])|(.)/gu;

/**
 * Rewrites the expression with every literal and parameter replaced by its SI number, then lets
 * mathjs do the arithmetic. Only whitelisted names reach mathjs, so its wider language
 * (units, assignments, imports) stays out of reach.
 */
function evaluateExpression(text: string, loc: SourceLocation, ctx: EvalContext): Quantity | undefined {
  const before = ctx.sink.length;
  const at = (index: number, length: number): SourceLocation => ({ ...loc, col: loc.col + 1 + index, length });
  let rewritten = '';
  for (const m of text.matchAll(PIECE)) {
    const [piece, name, literal, , op, other] = m;
    const where = at(m.index, piece.length);
    if (name !== undefined) {
      const p = ctx.params.get(name);
      if (p) rewritten += `(${p.value})`;
      else if (RESERVED.has(name)) rewritten += name;
      else if (looksLikeResistorCode(name)) rewritten += `(${(parseQuantity(name) as Quantity).value})`;
      else unknownName(name, where, ctx, true);
    } else if (literal !== undefined) {
      const q = parseQuantity(literal);
      if (typeof q === 'string') raise(ctx.sink, 'error', where, q);
      else rewritten += `(${q.value})`;
    } else if (op !== undefined) {
      rewritten += op;
    } else if (other !== undefined) {
      raise(ctx.sink, 'error', where, `'${other}' cannot appear in an expression`, {
        expected: 'numbers, parameters, + - * / ^, parentheses and functions such as sqrt',
      });
    } else {
      rewritten += ' ';
    }
  }
  if (ctx.sink.length > before) return undefined;
  if (rewritten.trim() === '') {
    raise(ctx.sink, 'error', loc, 'empty expression', { expected: 'an expression such as (2*R1)' });
    return undefined;
  }
  let result: unknown;
  try {
    result = evaluate(rewritten);
  } catch (e) {
    const why = e instanceof Error ? e.message.replace(/\s*\(char \d+\)$/, '') : String(e);
    raise(ctx.sink, 'error', loc, `cannot evaluate this expression: ${why}`);
    return undefined;
  }
  if (typeof result !== 'number' || !Number.isFinite(result)) {
    raise(ctx.sink, 'error', loc, `this expression does not give a finite real number (got ${String(result)})`);
    return undefined;
  }
  return { value: result, unit: null };
}
