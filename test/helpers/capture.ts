import type { CliIO } from '../../src/cli/io.js';

/** A CLI io that records what the command writes (for tests of `main`). */
export function capture(stdin = ''): CliIO & { out: () => string; err: () => string } {
  let out = '';
  let err = '';
  return {
    stdout: { write: (s: string) => (out += s), isTTY: false },
    stderr: { write: (s: string) => (err += s), isTTY: false },
    readStdin: async () => stdin,
    env: {},
    out: () => out,
    err: () => err,
  };
}
