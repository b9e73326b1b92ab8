import type { SourceLocation } from './location.js';
import type { PartKind } from '../circuit/circuit.js';
import type { Unit } from './quantity.js';

/** The syntax tree: what was written, where. Values are not yet evaluated or checked. */

export interface Name {
  name: string;
  loc: SourceLocation;
}

export type ValueNode =
  /** A quantity literal, already converted to SI. */
  | { kind: 'literal'; text: string; value: number; unit: Unit | null; loc: SourceLocation }
  /** A parameter name; `literal` is set when the word is also a valid literal such as R47. */
  | { kind: 'ref'; name: string; literal?: { value: number; unit: Unit | null }; loc: SourceLocation }
  /** A parenthesized expression; `text` is the part inside the outer parentheses. */
  | { kind: 'expr'; text: string; loc: SourceLocation };

/**
 * `key value` after a term or switch keyword. `list` holds every value of a comma-separated list
 * (`toggles 1ms, 2ms`); `value` is then its first. A word argument (`starts closed`, `off open`)
 * is kept as a `ref` value.
 */
export interface KeyArg {
  key: string;
  keyLoc: SourceLocation;
  value: ValueNode;
  list?: ValueNode[];
}

/** Terms written entirely as keyword arguments. */
export type KeyedTermKind = 'step' | 'ramp' | 'approach' | 'sine' | 'pulse';

export interface TablePointNode {
  t: ValueNode;
  v: ValueNode;
}

export type TermNode =
  | { kind: 'constant'; value: ValueNode; loc: SourceLocation }
  | { kind: KeyedTermKind; args: KeyArg[]; loc: SourceLocation }
  | { kind: 'impulse'; area: ValueNode; args: KeyArg[]; loc: SourceLocation }
  /** Inline points, or `file` with the path as written (quotes removed). */
  | { kind: 'table'; points: TablePointNode[]; file?: { path: string; loc: SourceLocation }; args: KeyArg[]; loc: SourceLocation }
  | { kind: 'expression'; text: string; textLoc: SourceLocation; args: KeyArg[]; loc: SourceLocation };

export interface WaveformNode {
  terms: TermNode[];
  loc: SourceLocation;
}

export type WatchTargetNode =
  | { kind: 'node'; node: Name }
  | { kind: 'between'; a: Name; b: Name }
  | { kind: 'part-voltage'; part: Name }
  | { kind: 'part-current'; part: Name };

/** `rated V A W J`: the values in the order written; the unit of each tells which rating it is. */
export interface RatedNode {
  keyLoc: SourceLocation;
  values: ValueNode[];
}

export type Statement =
  | { kind: 'title'; text: string; loc: SourceLocation }
  | { kind: 'param'; name: Name; value: ValueNode; loc: SourceLocation }
  | {
      kind: 'part';
      part: PartKind;
      name: Name;
      a: Name;
      b: Name;
      /** Passive parts only. */
      value?: ValueNode;
      initial?: ValueNode;
      /** Sources only. */
      waveform?: WaveformNode;
      /** Switches only: on, off, starts, closes, opens, toggles. */
      switching?: KeyArg[];
      /** Any part: what it is rated for. */
      rated?: RatedNode;
      loc: SourceLocation;
    }
  | {
      kind: 'watch';
      target: WatchTargetNode;
      label?: { text: string; loc: SourceLocation };
      /** `above LEVEL`: a quantity literal; its unit is checked against the watch's in watch.ts */
      threshold?: { text: string; value: number; unit: Unit | null; loc: SourceLocation };
      loc: SourceLocation;
    }
  | { kind: 'span'; value: ValueNode; loc: SourceLocation }
  | { kind: 'samples'; value: ValueNode; loc: SourceLocation }
  | { kind: 'settle'; value: ValueNode; loc: SourceLocation }
  | { kind: 'derate'; value: ValueNode; loc: SourceLocation }
  | { kind: 'start'; mode: 'settled' | 'rest'; loc: SourceLocation };

export interface Netlist {
  file: string;
  statements: Statement[];
  /** Lines holding a part statement that could not be parsed; topology checks would mislead. */
  brokenPartLines: number[];
}
