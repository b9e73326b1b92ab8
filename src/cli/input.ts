import { open } from 'node:fs/promises';
import { MAX_FILE_BYTES } from '../circuit/limits.js';
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
    return { text: decodeText(await readBounded(file)), name: file };
  } catch (e) {
    if (e instanceof ReadError) throw e;
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

/**
 * The file's bytes, reading at most one byte past MAX_FILE_BYTES: a device or pipe that never
 * ends (/dev/zero, /dev/urandom) is refused instead of filling the memory, and a larger regular
 * file is refused from its size alone. Errors are thrown as Node's (ENOENT, EISDIR, ...).
 */
async function readBounded(file: string): Promise<Buffer> {
  const fh = await open(file, 'r');
  try {
    const st = await fh.stat();
    if (st.isDirectory()) throw Object.assign(new Error('is a directory'), { code: 'EISDIR' });
    if (st.isFile() && st.size > MAX_FILE_BYTES) return tooLarge(file, `it is ${(st.size / (1024 * 1024)).toFixed(2)} MB`);
    const chunks: Buffer[] = [];
    let total = 0;
    for (;;) {
      const buf = Buffer.alloc(65536);
      const { bytesRead } = await fh.read(buf, 0, buf.length, null);
      if (bytesRead === 0) break;
      chunks.push(buf.subarray(0, bytesRead));
      total += bytesRead;
      if (total > MAX_FILE_BYTES) return tooLarge(file, 'it goes on');
    }
    return Buffer.concat(chunks, total);
  } finally {
    await fh.close();
  }
}

/** Refuses an input that passed MAX_FILE_BYTES (an input error: exit code 2, never read to its end). */
export function tooLarge(name: string, what: string): never {
  throw new ReadError(`cannot read ${name}: ${what}, more than the ${MAX_FILE_BYTES / (1024 * 1024)} MB a circuit file may have (is this the right file?)`);
}
