import { decodeText } from './input.js';
/** Where the command line reads and writes; process streams by default, replaceable in tests. */
export interface CliIO {
  stdout: { write(text: string): unknown; isTTY?: boolean };
  stderr: { write(text: string): unknown; isTTY?: boolean };
  /** Reads all of standard input. */
  readStdin(): Promise<string>;
  env: NodeJS.ProcessEnv;
}

export function processIO(): CliIO {
  return {
    stdout: process.stdout,
    stderr: process.stderr,
    readStdin: async () => {
      const chunks: Buffer[] = [];
      for await (const chunk of process.stdin) chunks.push(typeof chunk === 'string' ? Buffer.from(chunk) : (chunk as Buffer));
      return decodeText(Buffer.concat(chunks));
    },
    env: process.env,
  };
}
