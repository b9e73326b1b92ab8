/** Whether output to `stream` may carry ANSI colors: a terminal, and NO_COLOR unset or empty. */
export function colorEnabled(stream: { isTTY?: boolean }, env: NodeJS.ProcessEnv = process.env): boolean {
  if (env.NO_COLOR !== undefined && env.NO_COLOR !== '') return false;
  return stream.isTTY === true;
}

const ANSI = /\x1b\[[0-9;]*m/g;

/** Text without ANSI color sequences. */
export function stripAnsi(text: string): string {
  return text.replace(ANSI, '');
}

/** Width of a line as shown on a terminal (colors removed; one column per code point). */
export function visibleWidth(line: string): number {
  return [...stripAnsi(line)].length;
}

/** Wraps text in an ANSI sequence when `on`. */
export function paint(text: string, code: string, on: boolean): string {
  return on ? `${code}${text}\x1b[0m` : text;
}

export const BOLD = '\x1b[1m';
export const RED = '\x1b[31m';
export const GREEN = '\x1b[32m';
export const YELLOW = '\x1b[33m';
