import type { Diagnostic } from '../diagnostics.js';
import type { SourceLocation } from '../netlist/location.js';

/**
 * The validated circuit: every value in SI units, parameters resolved, names checked.
 * This is what the netlist and circuit stages hand to the model stage.
 */

export const GROUND = 'gnd';

export type PartKind = 'resistor' | 'capacitor' | 'inductor' | 'voltage-source' | 'current-source';

/** One additive term of a source waveform, all values SI. */
export type WaveTerm =
  | { kind: 'constant'; value: number }
  /** from `from` to `to`, starting at `at`, linear over `rise` seconds (0: ideal jump). */
  | { kind: 'step'; from: number; to: number; at: number; rise: number }
  /** Dirac impulse of area `area` (V·s or A·s) at time `at`. */
  | { kind: 'impulse'; area: number; at: number };

export interface Waveform {
  terms: WaveTerm[];
}

export interface Part {
  kind: PartKind;
  name: string;
  /** First terminal: positive end of the voltage, where positive current enters. */
  a: string;
  /** Second terminal. */
  b: string;
  /** Ω, F or H for passive parts; unused (0) for sources. */
  value: number;
  /** Capacitor voltage (V) or inductor current (A) at t = 0−, when given. */
  initial?: number;
  /** Sources only. */
  waveform?: Waveform;
  loc: SourceLocation;
}

export type WatchTarget =
  | { kind: 'node'; node: string }
  | { kind: 'between'; a: string; b: string }
  | { kind: 'part-voltage'; part: string }
  | { kind: 'part-current'; part: string };

export interface Watch {
  target: WatchTarget;
  /** Label shown in reports: the user's `as "..."` or a generated one such as "v(out)". */
  label: string;
  unit: 'V' | 'A';
  loc: SourceLocation;
}

export type SettleBand = { kind: 'relative'; fraction: number } | { kind: 'absolute'; value: number };

export interface Analysis {
  /** Seconds; undefined means: choose from the slowest mode. */
  span?: number;
  samples: number;
  settle: SettleBand;
}

export interface Circuit {
  title?: string;
  file: string;
  /** Node names other than ground, in order of first appearance. */
  nodes: string[];
  parts: Part[];
  watches: Watch[];
  analysis: Analysis;
  params: Record<string, number>;
  /** Problems worth mentioning that do not stop the run (e.g. a node with one connection). */
  warnings?: Diagnostic[];
}
