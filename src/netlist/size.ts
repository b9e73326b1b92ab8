import { InputError, type Diagnostic } from '../diagnostics.js';
import { MAX_EXPRESSION_CHARS, MAX_EXPRESSION_NESTING, MAX_FILE_BYTES, MAX_NODES, MAX_PARTS } from '../circuit/limits.js';
import { GROUND } from '../circuit/circuit.js';
import type { Statement } from './ast.js';

/** The input-size checks of the reader (limits in src/circuit/limits.ts). */

const mb = (bytes: number): string => `${(bytes / (1024 * 1024)).toFixed(bytes % (1024 * 1024) === 0 ? 0 : 1)} MB`;

/** Refuses a text larger than MAX_FILE_BYTES before any work is done on it. */
export function checkFileSize(text: string, file: string): void {
  // UTF-8 takes at most 3 bytes per UTF-16 unit: short texts need no count.
  if (text.length * 3 <= MAX_FILE_BYTES) return;
  const bytes = Buffer.byteLength(text, 'utf8');
  if (bytes <= MAX_FILE_BYTES) return;
  throw new InputError([
    {
      severity: 'error',
      message: `${file} is ${mb(bytes)}, more than the ${mb(MAX_FILE_BYTES)} a circuit file may have`,
      loc: { file, line: 1, col: 1, length: 1 },
      hint: 'is this the right file? long waveforms belong in a table file ("table file")',
    },
  ]);
}

/**
 * Why an expression is too long or too deeply nested to evaluate safely, or undefined.
 * `outer`: parentheses already around `text` (1 for a parenthesized value, whose token keeps them apart).
 */
export function expressionTooComplex(text: string, outer = 0): string | undefined {
  if (text.length > MAX_EXPRESSION_CHARS) {
    return `this expression has ${text.length} characters, more than the ${MAX_EXPRESSION_CHARS} allowed`;
  }
  let depth = outer;
  let deepest = outer;
  for (const c of text) {
    if (c === '(') deepest = Math.max(deepest, ++depth);
    else if (c === ')') depth--;
  }
  if (deepest > MAX_EXPRESSION_NESTING) {
    return `this expression nests parentheses ${deepest} deep, more than the ${MAX_EXPRESSION_NESTING} allowed`;
  }
  return undefined;
}

/**
 * Refuses a file with more part statements than MAX_PARTS or more node names than MAX_NODES,
 * pointing at the first statement past the limit. Thrown at once (with the problems the reader found)
 * because every later stage grows with the size of the circuit.
 */
export function checkCircuitSize(statements: readonly Statement[], sink: readonly Diagnostic[]): void {
  let parts = 0;
  const nodes = new Set<string>();
  for (const st of statements) {
    if (st.kind !== 'part') continue;
    parts++;
    let problem: Diagnostic | undefined;
    if (parts > MAX_PARTS) {
      problem = { severity: 'error', message: `more than ${MAX_PARTS} parts: this is part ${parts}`, loc: st.name.loc, hint: 'split the circuit, or lump repeated sections into equivalent parts' };
    } else {
      for (const n of [st.a, st.b]) {
        if (n.name === GROUND || nodes.has(n.name)) continue;
        nodes.add(n.name);
        if (nodes.size > MAX_NODES) {
          problem = { severity: 'error', message: `more than ${MAX_NODES} nodes: '${n.name}' is node ${nodes.size}`, loc: n.loc, hint: 'split the circuit, or lump repeated sections into equivalent parts' };
          break;
        }
      }
    }
    if (problem) {
      const key = (d: Diagnostic): number => (d.loc ? d.loc.line * 1e6 + d.loc.col : Infinity);
      throw new InputError([...sink, problem].sort((x, y) => key(x) - key(y)));
    }
  }
}
