import type { Diagnostic } from '../diagnostics.js';
import type { SourceLocation } from './location.js';

/** Where diagnostics accumulate while a file is read; stages keep going after an error. */
export type DiagnosticSink = Diagnostic[];

export interface DiagnosticExtras {
  expected?: string;
  hint?: string;
}

/**
 * The single place a diagnostic is created, so every message has the same shape
 * (and a missing location or stray empty hint cannot sneak in).
 */
export function raise(
  sink: DiagnosticSink,
  severity: Diagnostic['severity'],
  loc: SourceLocation | undefined,
  message: string,
  extras: DiagnosticExtras = {},
): void {
  const d: Diagnostic = { severity, message };
  if (loc) d.loc = loc;
  if (extras.expected) d.expected = extras.expected;
  if (extras.hint) d.hint = extras.hint;
  sink.push(d);
}

export function errorCount(sink: DiagnosticSink): number {
  return sink.filter((d) => d.severity === 'error').length;
}

/**
 * Thrown after an error has been raised to abandon the rest of the current statement;
 * the reader resumes at the next line. Carries nothing: the diagnostic is already in the sink.
 */
export class StatementAbandoned {
  readonly abandoned = true;
}
