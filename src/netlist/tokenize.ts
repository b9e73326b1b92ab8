import type { SourceLocation } from './location.js';
import { raise, type DiagnosticSink } from './errors.js';
import { describeUnexpected } from './text.js';

/**
 * Splits one line into tokens. Statements never span lines, so tokenizing line by line lets a
 * bad character spoil only its own line.
 */

export type TokenKind = 'word' | 'quantity' | 'arrow' | 'plus' | 'equals' | 'comma' | 'string' | 'expr';

export interface Token {
  kind: TokenKind;
  /** Exactly as written (a string keeps its quotes, an expression its parentheses). */
  text: string;
  /** String contents without quotes, or an expression's text inside the outer parentheses. */
  inner?: string;
  loc: SourceLocation;
}

const WORD_START = /[A-Za-z_]/;
/** Never inside quoted text: C0 and C1 control characters but tab, DEL, and direction overrides and isolates. */
// eslint-disable-next-line no-control-regex
const STRING_FORBIDDEN = /[\u0000-\u0008\u000a-\u001f\u007f-\u009f\u202a-\u202e\u2066-\u2069]/;
const WORD_PART = /[A-Za-z0-9_]/;
/** Characters that may follow a number to form one literal: digits, prefixes, unit symbols. */
const QUANTITY_PART = /[A-Za-z0-9_.%\u00b5\u03bc\u03a9\u2126\u00b7]/;

export function tokenizeLine(
  line: string,
  lineNo: number,
  file: string,
  sink: DiagnosticSink,
): Token[] | undefined {
  const tokens: Token[] = [];
  const at = (start: number, end: number): SourceLocation => ({
    file,
    line: lineNo,
    col: start + 1,
    length: Math.max(1, end - start),
  });
  const push = (kind: TokenKind, start: number, end: number, inner?: string): void => {
    const tok: Token = { kind, text: line.slice(start, end), loc: at(start, end) };
    if (inner !== undefined) tok.inner = inner;
    tokens.push(tok);
  };

  let i = 0;
  while (i < line.length) {
    const c = line[i]!;
    const next = line[i + 1] ?? '';
    if (c === '#') break;
    if (c === ' ' || c === '\t' || c === '\r') {
      i++;
    } else if (WORD_START.test(c)) {
      const end = scanWord(line, i);
      push('word', i, end);
      i = end;
    } else if (/[0-9]/.test(c) || (c === '.' && /[0-9]/.test(next)) || (c === '-' && /[0-9.]/.test(next))) {
      const end = scanQuantity(line, i);
      push('quantity', i, end);
      i = end;
    } else if (c === '-' && next === '>') {
      push('arrow', i, i + 2);
      i += 2;
    } else if (c === '+') {
      push('plus', i, i + 1);
      i++;
    } else if (c === '=') {
      push('equals', i, i + 1);
      i++;
    } else if (c === ',') {
      push('comma', i, i + 1);
      i++;
    } else if (c === '"') {
      const close = line.indexOf('"', i + 1);
      if (close < 0) {
        raise(sink, 'error', at(i, line.trimEnd().length), 'this text has no closing quote', {
          hint: 'put a " at the end of the text',
        });
        return undefined;
      }
      // control characters would reach the terminal from a title or label (an escape sequence can
      // clear the screen or retitle the window), and direction overrides reorder what is shown
      const inner = line.slice(i + 1, close);
      const bad = inner.search(STRING_FORBIDDEN);
      if (bad >= 0) {
        const ch = inner[bad]!;
        const { message, hint } = describeUnexpected(ch);
        raise(sink, 'error', at(i + 1 + bad, i + 2 + bad), `${message} inside quoted text`, { expected: 'printable text between the quotes', hint: hint ?? 'delete it' });
        return undefined;
      }
      push('string', i, close + 1, inner);
      i = close + 1;
    } else if (c === '(') {
      const close = matchParen(line, i);
      if (close < 0) {
        raise(sink, 'error', at(i, i + 1), "this '(' is never closed on the same line", {
          hint: 'expressions must fit on one line; add the missing )',
        });
        return undefined;
      }
      push('expr', i, close + 1, line.slice(i + 1, close));
      i = close + 1;
    } else if (c === ')') {
      raise(sink, 'error', at(i, i + 1), "this ')' has no matching '('");
      return undefined;
    } else {
      const ch = String.fromCodePoint(line.codePointAt(i)!);
      const { message, expected, hint } = describeUnexpected(ch);
      raise(sink, 'error', at(i, i + ch.length), message, { expected, hint });
      return undefined;
    }
  }
  return tokens;
}

/** Identifiers, with hyphens allowed between parts so `voltage-source` is one word. */
function scanWord(line: string, start: number): number {
  let i = start + 1;
  for (;;) {
    while (i < line.length && WORD_PART.test(line[i]!)) i++;
    if (line[i] === '-' && WORD_START.test(line[i + 1] ?? '')) {
      i++;
      continue;
    }
    return i;
  }
}

/** Number plus attached prefix/unit; takes an exponent sign, the `*` of `V*s` / `A*s` and the `/` of `V/s` / `A/s`. */
function scanQuantity(line: string, start: number): number {
  let i = start + 1;
  while (i < line.length) {
    const c = line[i]!;
    const prev = line[i - 1]!;
    const next = line[i + 1] ?? '';
    if (QUANTITY_PART.test(c)) {
      i++;
    } else if ((c === '+' || c === '-') && /[eE]/.test(prev) && /[0-9]/.test(line[i - 2] ?? '') && /[0-9]/.test(next)) {
      i++;
    } else if ((c === '*' || c === '/') && /[VA]/.test(prev) && next === 's') {
      i++;
    } else {
      break;
    }
  }
  return i;
}

/** Index of the ')' closing the '(' at `open`, or -1; stops at a comment. */
function matchParen(line: string, open: number): number {
  let depth = 0;
  for (let i = open; i < line.length; i++) {
    const c = line[i];
    if (c === '#') return -1;
    if (c === '(') depth++;
    else if (c === ')') {
      depth--;
      if (depth === 0) return i;
    }
  }
  return -1;
}
