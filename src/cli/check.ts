import { loadCircuit } from '../circuit/load.js';
import { formatCheck } from '../report/check.js';
import { EXIT_OK } from './exit.js';
import { reportFailure } from './failure.js';
import { readCircuitText } from './input.js';
import type { CliIO } from './io.js';

/** `ringdown check FILE`: read and validate the circuit, print it as understood. */
export async function checkCommand(file: string, opts: { debug?: boolean }, io: CliIO): Promise<number> {
  let source = '';
  try {
    const { text, name } = await readCircuitText(file, io);
    source = text;
    const circuit = loadCircuit(text, name);
    io.stdout.write(formatCheck(circuit));
    return EXIT_OK;
  } catch (e) {
    return reportFailure(e, source, io, opts.debug === true);
  }
}
