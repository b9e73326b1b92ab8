import { MAX_FILE_BYTES } from '../circuit/limits.js';
import { decodeText, tooLarge } from './input.js';
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
      let total = 0;
      for await (const chunk of process.stdin) {
        const b = typeof chunk === 'string' ? Buffer.from(chunk) : (chunk as Buffer);
        chunks.push(b);
        total += b.length;
        // an endless pipe (yes | ringdown run -) is refused, not read to its end
        if (total > MAX_FILE_BYTES) {
          process.stdin.destroy();
          tooLarge('standard input', 'it goes on');
        }
      }
      return decodeText(Buffer.concat(chunks));
    },
    env: process.env,
  };
}
