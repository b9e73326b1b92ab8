import { readFile } from 'node:fs/promises';
import type { CliIO } from './io.js';

/** Name used in diagnostics for standard input. */
export const STDIN_NAME = '<stdin>';

/** Thrown when the circuit file cannot be read (an input error, not a bug). */
export class ReadError extends Error {
  constructor(message: string) {
    super(message);
    this.name = 'ReadError';
  }
}

/** Reads FILE, or standard input for `-`. */
export async function readCircuitText(file: string, io: CliIO): Promise<{ text: string; name: string }> {
  if (file === '-') return { text: await io.readStdin(), name: STDIN_NAME };
  try {
    return { text: await readFile(file, 'utf8'), name: file };
  } catch (e) {
    const code = (e as NodeJS.ErrnoException).code;
    const why = code === 'ENOENT' ? 'no such file' : code === 'EISDIR' ? 'it is a directory' : code === 'EACCES' ? 'permission denied' : (e as Error).message;
    throw new ReadError(`cannot read ${file}: ${why}`);
  }
}
