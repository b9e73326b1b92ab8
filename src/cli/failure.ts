import { InputError, type Diagnostic } from '../diagnostics.js';
import { formatDiagnostic } from '../netlist/format.js';
import { colorEnabled } from '../report/color.js';
import { EXIT_INPUT, EXIT_INTERNAL } from './exit.js';
import { ReadError } from './input.js';
import type { CliIO } from './io.js';

/** Diagnostics printed at most per run; the count of the rest is given. */
export const MAX_SHOWN = 50;

/**
 * Reports a failure on standard error and gives the exit code: input problems (every diagnostic,
 * no stack trace) → 2; anything else is an internal error → 1, with the stack only under --debug.
 */
export function reportFailure(error: unknown, sourceText: string, io: CliIO, debug: boolean): number {
  const color = colorEnabled(io.stderr, io.env);
  if (error instanceof InputError) {
    // Errors first: they are why nothing was computed; warnings follow.
    const ordered = [...error.diagnostics.filter((d) => d.severity === 'error'), ...error.diagnostics.filter((d) => d.severity !== 'error')];
    // a wholly wrong file (thousands of bad lines) shows the first MAX_SHOWN, not a megabyte of them
    const parts = ordered.slice(0, MAX_SHOWN).map((d) => formatDiagnostic(d, sourceText, color));
    const errors = error.diagnostics.filter((d) => d.severity === 'error').length;
    if (ordered.length > MAX_SHOWN) parts.push(`… and ${ordered.length - MAX_SHOWN} more problems not shown (fix the ones above first)`);
    io.stderr.write(parts.join('\n\n') + '\n');
    io.stderr.write(`ringdown: ${errors} error${errors === 1 ? '' : 's'} in the input; nothing was computed\n`);
    return EXIT_INPUT;
  }
  if (error instanceof ReadError) {
    io.stderr.write(`ringdown: ${error.message}\n`);
    return EXIT_INPUT;
  }
  const message = error instanceof Error ? error.message : String(error);
  io.stderr.write(`ringdown: internal error: ${message}\n`);
  if (debug && error instanceof Error && error.stack) io.stderr.write(error.stack + '\n');
  else io.stderr.write('This is a bug in ringdown. Run again with --debug to see where it happened, and please report it with the circuit file.\n');
  return EXIT_INTERNAL;
}

/** Prints warnings (diagnostics of severity warning) to standard error. */
export function printWarnings(warnings: readonly Diagnostic[], sourceText: string, io: CliIO): void {
  if (warnings.length === 0) return;
  const color = colorEnabled(io.stderr, io.env);
  io.stderr.write(warnings.map((d) => formatDiagnostic(d, sourceText, color)).join('\n\n') + '\n');
}
