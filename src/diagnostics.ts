import type { SourceLocation } from './netlist/location.js';

/** One problem found in the user's input. Every stage reports input problems in this shape. */
export interface Diagnostic {
  severity: 'error' | 'warning';
  message: string;
  loc?: SourceLocation;
  /** What the place expected, e.g. "a capacitance such as 470uF". */
  expected?: string;
  /** A suggestion, e.g. "did you mean 'capacitor'?". */
  hint?: string;
}

/** Thrown by any stage when the input cannot be processed; carries every problem found. */
export class InputError extends Error {
  readonly diagnostics: Diagnostic[];
  constructor(diagnostics: Diagnostic[]) {
    super(diagnostics.map((d) => d.message).join('; '));
    this.name = 'InputError';
    this.diagnostics = diagnostics;
  }
}
