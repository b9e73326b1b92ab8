import { InputError } from '../diagnostics.js';

/**
 * The circuit text as lines, and the checks that it is text at all. Shared by the parser and the
 * diagnostic display so that both count lines the same way.
 */

/**
 * Lines of a circuit text: a leading byte-order mark dropped, and any of CR LF (Windows), LF and a
 * lone CR (classic Mac OS) ending a line.
 */
export function splitLines(text: string): string[] {
  return text.replace(/^\uFEFF/, '').split(/\r\n|\r|\n/);
}

/** Characters that are never part of circuit text: C0 controls but tab and form feed, DEL, C1 controls. */
const CONTROL = /[\u0000-\u0008\u000b\u000e-\u001f\u007f-\u009f]/;
/** What a decoder puts where the bytes were not valid UTF-8. */
const REPLACEMENT = '\uFFFD';

/** 1-based line and column (UTF-16 units, like the tokenizer's) of index `at` in `text`. */
function lineCol(text: string, at: number): { line: number; col: number } {
  const lines = splitLines(text.slice(0, at + 1));
  return { line: lines.length, col: lines[lines.length - 1]!.length };
}

/**
 * Refuses a text that is not circuit text: one with a NUL byte (a binary file, or UTF-16 read as
 * UTF-8), or one in which control characters and undecodable bytes are more than an occasional
 * slip (a compressed or executable file). One error for the whole file instead of one per line
 * of garbage, pointing at the first offending character.
 */
export function checkIsText(text: string, file: string): void {
  const nul = text.indexOf('\u0000');
  let bad = 0;
  let first = nul;
  if (nul < 0) {
    // the first 64 KB decide (garbage is garbage from its start)
    const head = Math.min(text.length, 65536);
    for (let i = 0; i < head; i++) {
      const c = text[i]!;
      if (c === REPLACEMENT || CONTROL.test(c)) {
        if (first < 0) first = i;
        bad++;
      }
    }
    // an occasional stray byte stays a located error on its own line (the tokenizer's)
    if (bad < 8 || bad * 100 < head) return;
  }
  const { line, col } = lineCol(text, first);
  const utf16 = nul >= 0 && /^(\uFFFD\uFFFD|[\x20-\x7e]\u0000|\u0000[\x20-\x7e])/.test(text);
  throw new InputError([
    {
      severity: 'error',
      message: nul >= 0 ? `${file} contains binary data (a NUL byte), not circuit text` : `${file} does not look like circuit text: ${bad} control characters or bytes that are not UTF-8 in its first ${Math.min(text.length, 65536)} characters`,
      loc: { file, line, col: Math.max(1, col), length: 1 },
      expected: 'plain text in UTF-8 (or ASCII), one statement per line',
      hint: utf16 ? 'it looks like UTF-16 text: save it as UTF-8' : 'is this the right file? a circuit file is written by hand or by a script, such as: resistor R1 in -> out 1k',
    },
  ]);
}

/** Unicode names of characters people paste by accident, for the "unexpected character" message. */
const NAMED: Record<string, string> = {
  '\u00a0': 'no-break space',
  '\u200b': 'zero-width space',
  '\u200c': 'zero-width non-joiner',
  '\u200d': 'zero-width joiner',
  '\u200e': 'left-to-right mark',
  '\u200f': 'right-to-left mark',
  '\u2028': 'line separator',
  '\u2029': 'paragraph separator',
  '\u202a': 'left-to-right embedding',
  '\u202b': 'right-to-left embedding',
  '\u202c': 'pop directional formatting',
  '\u202d': 'left-to-right override',
  '\u202e': 'right-to-left override',
  '\u2066': 'left-to-right isolate',
  '\u2067': 'right-to-left isolate',
  '\u2068': 'first strong isolate',
  '\u2069': 'pop directional isolate',
  '\u2060': 'word joiner',
  '\ufeff': 'zero-width no-break space (byte-order mark)',
  '\ufffd': 'replacement character: bytes that are not valid UTF-8',
  '\u001b': 'escape',
  '\u0000': 'NUL',
  '\u007f': 'delete',
};

/** ASCII a look-alike character stands for. */
const LOOKALIKE: Record<string, string> = {
  '\u2212': '-', // minus sign
  '\u2010': '-',
  '\u2011': '-',
  '\u2012': '-',
  '\u2013': '-',
  '\u2014': '-',
  '\u2192': '->', // rightwards arrow
  '\u201c': '"',
  '\u201d': '"',
  '\u201e': '"',
  '\u00ab': '"',
  '\u00bb': '"',
  '\u2018': "'",
  '\u2019': "'",
  '\u00a0': ' ',
  '\u2009': ' ',
  '\u202f': ' ',
  '\u3000': ' ',
  '\uff08': '(',
  '\uff09': ')',
  '\uff1d': '=',
  '\uff0c': ',',
  '\u00d7': '*',
};

const hex = (ch: string): string => 'U+' + ch.codePointAt(0)!.toString(16).toUpperCase().padStart(4, '0');

/** Whether a character shows nothing (or moves the cursor) when printed. */
export function isInvisible(ch: string): boolean {
  return CONTROL.test(ch) || /[\u00ad\u200b-\u200f\u2028-\u202e\u2060-\u2069\ufeff]/.test(ch);
}

/** The message, expected and hint for a character the tokenizer does not know. */
export function describeUnexpected(ch: string): { message: string; expected: string; hint?: string } {
  const name = NAMED[ch];
  // printable ASCII as itself; anything else with its code point (and its name where it has one)
  const shown = isInvisible(ch) || ch === '\ufffd' ? `${hex(ch)}${name ? ` (${name})` : ''}` : /[\x20-\x7e]/.test(ch) ? `'${ch}'` : `'${ch}' (${hex(ch)}${name ? `, ${name}` : ''})`;
  const expected = 'names of ASCII letters, digits and _, numbers with a unit, ->, +, =, commas, "quoted text" or (expressions)';
  const ascii = LOOKALIKE[ch];
  if (ascii !== undefined) {
    return { message: `unexpected character ${shown}`, expected, hint: `it looks like ${ascii === ' ' ? 'a space' : `'${ascii}'`} but is not: type ${ascii === ' ' ? 'an ordinary space' : `'${ascii}'`} instead (text pasted from a word processor or web page often has these)` };
  }
  if (ch === '\ufffd') return { message: `unexpected character ${shown}`, expected, hint: 'the file has bytes that are not UTF-8 here: save it as UTF-8' };
  if (isInvisible(ch)) return { message: `unexpected invisible character ${shown}`, expected, hint: 'delete it (it does not show in most editors: retype the text around the caret)' };
  if (/\p{L}/u.test(ch)) return { message: `unexpected character ${shown}`, expected, hint: 'names (of parts, nodes and parameters) use ASCII letters, digits and _ only; the unit symbols Ω and µ are accepted after a number' };
  if (ch === '/') return { message: `unexpected character ${shown}`, expected, hint: 'a rate is written in one piece, number, prefix and unit together, such as 2kV/s' };
  return { message: `unexpected character ${shown}`, expected };
}

/**
 * A line as shown under a diagnostic: control and invisible characters replaced by a visible mark
 * of one column (so the caret stays under its character and no escape sequence reaches the
 * terminal), and a long line cut to a window around the marked column.
 */
export function displayLine(line: string, col: number, length: number, width = 160): { text: string; col: number; length: number } {
  let text = '';
  for (let i = 0; i < line.length; i++) {
    const c = line[i]!;
    text += c === '\t' ? '\t' : isInvisible(c) || c === '\ufffd' ? '\u00bf' : c;
  }
  if (text.length <= width) return { text, col, length };
  const from = Math.max(0, Math.min(col - 1 - Math.floor(width / 3), text.length - width));
  const to = Math.min(text.length, from + width);
  const lead = from > 0 ? '…' : '';
  const shown = lead + text.slice(from, to) + (to < text.length ? '…' : '');
  const c = col - from + lead.length;
  return { text: shown, col: c, length: Math.max(1, Math.min(length, to - (col - 1))) };
}
