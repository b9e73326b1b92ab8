import { createRequire } from 'node:module';
import type { ValueNode } from '../netlist/ast.js';
import { raise, type DiagnosticSink } from '../netlist/errors.js';
import type { SourceLocation } from '../netlist/location.js';
import { looksLikeResistorCode, parseQuantity, type Quantity } from '../netlist/quantity.js';
import { didYouMean } from '../netlist/suggest.js';
import { checkUnit, type Place } from './units.js';

/**
 * mathjs, loaded on the first expression: most files have none, and loading it costs more than
 * the rest of a run (the full build ~1.3 s CPU, the number-only build ~0.6 s as ESM, ~0.45 s as
 * CommonJS, which can also be loaded synchronously here). The number-only build suffices: every
 * literal and parameter is a plain number by the time mathjs sees the text. A minimal instance
 * built with create() would not load faster, since the entry builds all its functions on import.
 */
type MathNumber = typeof import('mathjs/number');
let mathjs: MathNumber | undefined;
function math(): MathNumber {
  return (mathjs ??= createRequire(import.meta.url)('mathjs/number') as MathNumber);
}

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
      unknownName(node.name, node.loc, ctx, 'value');
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

/** Where a name was met: a plain value, a parenthesized expression, or a waveform expression of t. */
type NameSetting = 'value' | 'expression' | 'waveform';

function unknownName(name: string, loc: SourceLocation, ctx: EvalContext, setting: NameSetting): void {
  const laterLine = ctx.declaredLater.get(name);
  if (laterLine !== undefined && !ctx.params.has(name)) {
    raise(ctx.sink, 'error', loc, `parameter '${name}' is used before its declaration on line ${laterLine}`, {
      hint: `move 'param ${name} = …' above this line`,
    });
    return;
  }
  // Parameters first: a near-miss of the user's own name is likelier than of a function.
  const builtIns = setting === 'waveform' ? [TIME, ...RESERVED] : setting === 'expression' ? [...RESERVED] : [];
  const hint = didYouMean(name, ctx.params.keys()) ?? didYouMean(name, builtIns);
  raise(ctx.sink, 'error', loc, setting === 'waveform' ? `unknown name '${name}'` : `unknown parameter '${name}'`, {
    expected:
      setting === 'waveform'
        ? 't (the time in seconds), a parameter declared above, a number, pi, e, or a function such as sin'
        : setting === 'expression'
          ? 'a parameter declared above, a number, pi, e, or a function such as sqrt'
          : ANY_VALUE,
    hint,
  });
}

const PIECE = /([A-Za-z_][A-Za-z0-9_]*)|((?:\d+(?:\.\d*)?|\.\d+)(?:[eE][+-]?\d+)?[A-Za-z0-9_.%\u00b5\u03bc\u03a9\u2126\u00b7]*)|(\s+)|([-+*/^(),])|(.)/gu;

/** The variable of a waveform expression. */
export const TIME = 't';

/**
 * Rewrites the expression with every literal and parameter replaced by its SI number, so mathjs
 * sees only numbers, operators, whitelisted names (and `t` in a waveform expression). Its wider
 * language (units, assignments, imports) stays out of reach. `loc` is the token including its
 * opening bracket or quote. Undefined (after raising) on error.
 */
function rewriteExpression(text: string, loc: SourceLocation, ctx: EvalContext, setting: 'expression' | 'waveform'): string | undefined {
  const before = ctx.sink.length;
  const at = (index: number, length: number): SourceLocation => ({ ...loc, col: loc.col + 1 + index, length });
  let rewritten = '';
  for (const m of text.matchAll(PIECE)) {
    const [piece, name, literal, , op, other] = m;
    const where = at(m.index, piece.length);
    if (name !== undefined) {
      const p = ctx.params.get(name);
      // Inside a waveform expression t is the time, even if a parameter has that name.
      if (setting === 'waveform' && name === TIME) rewritten += name;
      else if (p) rewritten += `(${p.value})`;
      else if (RESERVED.has(name)) rewritten += name;
      else if (looksLikeResistorCode(name)) rewritten += `(${(parseQuantity(name) as Quantity).value})`;
      else unknownName(name, where, ctx, setting);
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
    raise(ctx.sink, 'error', loc, 'empty expression', { expected: setting === 'waveform' ? 'an expression such as "5*sin(2*pi*50*t)"' : 'an expression such as (2*R1)' });
    return undefined;
  }
  return rewritten;
}

const mathjsMessage = (e: unknown): string => (e instanceof Error ? e.message.replace(/\s*\(char \d+\)$/, '') : String(e));

function evaluateExpression(text: string, loc: SourceLocation, ctx: EvalContext): Quantity | undefined {
  const rewritten = rewriteExpression(text, loc, ctx, 'expression');
  if (rewritten === undefined) return undefined;
  let result: unknown;
  try {
    result = math().evaluate(rewritten);
  } catch (e) {
    raise(ctx.sink, 'error', loc, `cannot evaluate this expression: ${mathjsMessage(e)}`);
    return undefined;
  }
  if (typeof result !== 'number' || !Number.isFinite(result)) {
    raise(ctx.sink, 'error', loc, `this expression does not give a finite real number (got ${String(result)})`);
    return undefined;
  }
  return { value: result, unit: null };
}

/**
 * Compiles a waveform expression in `t` (seconds) once; the function returns NaN where the
 * expression has no real value. Checked by evaluating at t = 0. `loc` is the quoted string.
 */
export function compileTimeFunction(text: string, loc: SourceLocation, ctx: EvalContext): ((t: number) => number) | undefined {
  const rewritten = rewriteExpression(text, loc, ctx, 'waveform');
  if (rewritten === undefined) return undefined;
  let fn: (t: number) => number;
  try {
    const code = math().compile(rewritten);
    fn = (t: number): number => {
      const r: unknown = code.evaluate({ [TIME]: t });
      return typeof r === 'number' ? r : NaN;
    };
  } catch (e) {
    raise(ctx.sink, 'error', loc, `cannot read this expression: ${mathjsMessage(e)}`);
    return undefined;
  }
  let atZero: number;
  try {
    atZero = fn(0);
  } catch (e) {
    raise(ctx.sink, 'error', loc, `cannot evaluate this expression at t = 0: ${mathjsMessage(e)}`);
    return undefined;
  }
  if (!Number.isFinite(atZero)) {
    raise(ctx.sink, 'error', loc, `this expression does not give a finite real number at t = 0 (got ${String(atZero)})`, {
      hint: 'the source must have a value from t = 0 on; avoid dividing by t or taking the log of t',
    });
    return undefined;
  }
  return fn;
}
