import type { Diagnostic } from '../diagnostics.js';
import type { SourceLocation } from '../netlist/location.js';

/**
 * The validated circuit: every value in SI units, parameters resolved, names checked.
 * This is what the netlist and circuit stages hand to the model stage.
 */

export const GROUND = 'gnd';

export type PartKind = 'resistor' | 'capacitor' | 'inductor' | 'voltage-source' | 'current-source' | 'switch';

/** One additive term of a source waveform, all values SI. */
export type WaveTerm =
  | { kind: 'constant'; value: number }
  /** from `from` to `to`, starting at `at`, linear over `rise` seconds (0: ideal jump). */
  | { kind: 'step'; from: number; to: number; at: number; rise: number }
  /** Dirac impulse of area `area` (V·s or A·s) at time `at`. */
  | { kind: 'impulse'; area: number; at: number }
  /** 0 before `at`, then slope·(t − at) until `until` (Infinity: no end), constant after. */
  | { kind: 'ramp'; at: number; slope: number; until: number }
  /** `from` before `at`, then to + (from − to)·e^(−(t − at)/tau). */
  | { kind: 'approach'; from: number; to: number; at: number; tau: number }
  /** 0 before `at`, then amplitude·e^(−(t − at)/decay)·sin(2π·freq·(t − at) + phase); decay Infinity: none. */
  | { kind: 'sine'; amplitude: number; freq: number; phase: number; at: number; decay: number }
  /**
   * Repeating pulses: `low` before `start`; each period rises linearly over `rise`, stays at `high`
   * for `width`, falls over `fall`, stays `low` for the rest of the period. `cycles` Infinity: unending.
   */
  | { kind: 'pulse'; low: number; high: number; period: number; width: number; rise: number; fall: number; start: number; cycles: number }
  /** Linear interpolation through (t, v) points (sorted by t); first value before, last value after. */
  | { kind: 'table'; points: { t: number; v: number }[] }
  /** A function of time given as an expression (the last resort: sampled adaptively, error reported). */
  | { kind: 'expression'; text: string; fn: (t: number) => number };

export interface Waveform {
  terms: WaveTerm[];
}

/**
 * A switch: `onResistance` while closed; while open `offResistance` (Infinity: truly open).
 * It starts in `initiallyClosed` and changes state at each event (sorted by time, t > 0).
 */
export interface Switching {
  onResistance: number;
  offResistance: number;
  initiallyClosed: boolean;
  events: { t: number; closed: boolean }[];
}

/**
 * Ratings of a part: `voltage` (peak |v|, V), `current` (peak |i|, A), `power` (peak
 * instantaneous dissipation, W), `pulseEnergy` (energy dissipated over the span, J).
 */
export interface Ratings {
  voltage?: number;
  current?: number;
  power?: number;
  pulseEnergy?: number;
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
  /** Switches only: a resistor whose resistance follows a schedule. */
  switching?: Switching;
  /** What the part is rated for, where the user knows it (SI units). */
  ratings?: Ratings;
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
  /** `above LEVEL`: the level (V or A) whose time above the reports measure */
  threshold?: number;
}

export type SettleBand = { kind: 'relative'; fraction: number } | { kind: 'absolute'; value: number };

export interface Analysis {
  /** Seconds; undefined means: choose from the slowest mode. */
  span?: number;
  samples: number;
  settle: SettleBand;
  /**
   * State before t = 0: 'settled' (the DC operating point with the sources at their t = 0− values
   * and the switches in their initial state), or 'rest' (every capacitor and inductor at zero).
   * A part's own `initial` value overrides either.
   */
  start: 'settled' | 'rest';
  /** Fraction of each rating a part may use before it is flagged (default 0.8, common practice). */
  derating: number;
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
