import { visibleWidth } from './color.js';

/** Word-wraps text to `width` columns; continuation lines start with `indent`. */
export function wrapWords(text: string, width = 80, indent = ''): string[] {
  const lead = /^ */.exec(text)![0];
  const words = text.slice(lead.length).split(/ +/);
  const lines: string[] = [];
  let line = lead;
  let first = true;
  for (const w of words) {
    const candidate = first ? line + w : `${line} ${w}`;
    if (!first && visibleWidth(candidate) > width) {
      lines.push(line);
      line = indent + w;
    } else {
      line = candidate;
    }
    first = false;
  }
  lines.push(line);
  return lines;
}

/**
 * Splits a formula before each ` + ` / ` − ` that is outside function arguments (`cos(…)`,
 * `e^(…)`, `δ(…)`): at the top level or inside grouping parentheses such as `(1 V + 2 V·t)`.
 */
function breakableTerms(body: string): string[] {
  const parts: string[] = [];
  const stack: boolean[] = []; // true: a function's argument list
  let start = 0;
  const chars = [...body];
  for (let i = 0; i < chars.length; i++) {
    const c = chars[i]!;
    if (c === '(' || c === '[') stack.push(i > 0 && /[\p{L}^]/u.test(chars[i - 1]!));
    else if (c === ')' || c === ']') stack.pop();
    else if (c === ' ' && !stack.includes(true) && (chars[i + 1] === '+' || chars[i + 1] === '−') && chars[i + 2] === ' ' && i > start) {
      parts.push(chars.slice(start, i).join(''));
      start = i + 1; // keep "+ …" / "− …"
    }
  }
  parts.push(chars.slice(start).join(''));
  return parts;
}

/** Splits one term before each `·` that is outside parentheses: `12 V`, `·e^(…)`, `·cos(…)`. */
function factors(term: string): string[] {
  const parts: string[] = [];
  let depth = 0;
  let start = 0;
  const chars = [...term];
  for (let i = 0; i < chars.length; i++) {
    const c = chars[i]!;
    if (c === '(' || c === '[') depth++;
    else if (c === ')' || c === ']') depth--;
    else if (c === '·' && depth === 0 && i > start) {
      parts.push(chars.slice(start, i).join(''));
      start = i;
    }
  }
  parts.push(chars.slice(start).join(''));
  return parts;
}

/**
 * `head` followed by a formula, broken between terms (or, for a term too long on its own, between
 * its factors) so that lines stay within `width`; continuation lines are indented under the head.
 */
export function wrapFormula(head: string, body: string, width = 80): string[] {
  if (visibleWidth(head + body) <= width) return [head + body];
  const lead = head.length - head.trimStart().length;
  const pad = ' '.repeat(Math.min(visibleWidth(head), lead + 12));
  const lines: string[] = [];
  let line = head;
  let fresh = true; // nothing after the head / pad yet
  const add = (piece: string, glue: string) => {
    if (!fresh && visibleWidth(line + glue + piece) > width) {
      lines.push(line);
      line = pad + piece;
    } else {
      line += (fresh ? '' : glue) + piece;
    }
    fresh = false;
  };
  for (const term of breakableTerms(body)) {
    if (visibleWidth(pad + term) <= width) add(term, ' ');
    else factors(term).forEach((f, i) => add(f, i === 0 ? ' ' : ''));
  }
  lines.push(line);
  return lines;
}
