import { visibleWidth } from './color.js';

/** Left-aligned columns separated by two spaces; trailing blanks trimmed. */
export function table(rows: readonly (readonly string[])[], indent = '  '): string[] {
  const widths: number[] = [];
  for (const r of rows) r.forEach((cell, i) => (widths[i] = Math.max(widths[i] ?? 0, visibleWidth(cell))));
  return rows.map((r) => (indent + r.map((cell, i) => (i === r.length - 1 ? cell : cell + ' '.repeat(widths[i]! - visibleWidth(cell)))).join('  ')).trimEnd());
}

/** A heading followed by a rule of the same length. */
export function heading(text: string): string[] {
  return [text, '─'.repeat(visibleWidth(text))];
}
