import type { Diagnostic } from '../diagnostics.js';
import { displayLine, splitLines } from './text.js';

/**
 * Renders a diagnostic for a terminal:
 *
 *   demo.rdn:4:21: error: capacitor C1 has a value in henries (H), but needs farads (F)
 *      4 | capacitor C1 a -> b 10mH
 *        |                     ^^^^
 *     expected: a capacitance such as 470nF
 *     hint: ...
 *
 * Without a location only the first line (and expected/hint) is printed.
 */

const RESET = '\x1b[0m';
const BOLD = '\x1b[1m';
const RED = '\x1b[31m';
const YELLOW = '\x1b[33m';
const CYAN = '\x1b[36m';
const DIM = '\x1b[2m';

/**
 * Texts of files read besides the circuit file (table CSVs), so a diagnostic located in one of
 * them quotes its own line rather than the circuit file's.
 */
const otherSources = new Map<string, string>();

export function rememberSource(file: string, text: string): void {
  otherSources.set(file, text);
}

export function formatDiagnostic(d: Diagnostic, sourceText: string, color: boolean): string {
  const paint = (code: string, s: string): string => (color ? code + s + RESET : s);
  const sevColor = d.severity === 'error' ? RED : YELLOW;
  const where = d.loc ? `${d.loc.file}:${d.loc.line}:${d.loc.col}: ` : '';
  const out = [paint(BOLD, where) + paint(BOLD + sevColor, `${d.severity}:`) + ' ' + paint(BOLD, d.message)];

  const lines = splitLines((d.loc && otherSources.get(d.loc.file)) ?? sourceText);
  const text = d.loc ? lines[d.loc.line - 1] : undefined;
  if (d.loc && text !== undefined) {
    // control characters made visible (no escape sequence reaches the terminal), a long line cut
    // to a window around the marked column
    const shown = displayLine(text, d.loc.col, d.loc.length);
    const quoted = shown.text;
    const gutter = String(d.loc.line);
    const pad = ' '.repeat(gutter.length);
    // Keep tabs under tabs so the marker lines up whatever the terminal's tab width.
    const lead = [...quoted.slice(0, shown.col - 1)].map((c) => (c === '\t' ? '\t' : ' ')).join('');
    const width = Math.max(1, Math.min(shown.length, Math.max(1, quoted.length - shown.col + 1)));
    out.push(`  ${paint(DIM, gutter + ' |')} ${quoted}`);
    out.push(`  ${paint(DIM, pad + ' |')} ${lead}${paint(sevColor, '^'.repeat(width))}`);
  }
  if (d.expected) out.push(`  ${paint(CYAN, 'expected:')} ${d.expected}`);
  if (d.hint) out.push(`  ${paint(CYAN, 'hint:')} ${d.hint}`);
  return out.join('\n');
}

/** All diagnostics, separated by blank lines, in the order found. */
export function formatDiagnostics(ds: readonly Diagnostic[], sourceText: string, color: boolean): string {
  return ds.map((d) => formatDiagnostic(d, sourceText, color)).join('\n\n');
}
