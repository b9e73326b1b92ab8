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
    return { text: decodeText(await readFile(file)), name: file };
  } catch (e) {
    const code = (e as NodeJS.ErrnoException).code;
    const why = code === 'ENOENT' ? 'no such file' : code === 'EISDIR' ? 'it is a directory' : code === 'EACCES' ? 'permission denied' : (e as Error).message;
    throw new ReadError(`cannot read ${file}: ${why}`);
  }
}

/**
 * Bytes to text: UTF-8, or UTF-16 when the file starts with its byte-order mark (some editors on
 * Windows save that way); anything else is read as UTF-8 and judged by the reader.
 */
export function decodeText(bytes: Buffer): string {
  if (bytes.length >= 2 && bytes[0] === 0xff && bytes[1] === 0xfe) return bytes.subarray(2).toString('utf16le');
  if (bytes.length >= 2 && bytes[0] === 0xfe && bytes[1] === 0xff) {
    const swapped = Buffer.from(bytes.subarray(2, 2 + ((bytes.length - 2) & ~1)));
    return swapped.swap16().toString('utf16le');
  }
  return bytes.toString('utf8');
}
