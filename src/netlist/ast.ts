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

export type StepKey = 'from' | 'to' | 'at' | 'rise';

export interface StepArg {
  key: StepKey;
  keyLoc: SourceLocation;
  value: ValueNode;
}

export type TermNode =
  | { kind: 'constant'; value: ValueNode; loc: SourceLocation }
  | { kind: 'step'; args: StepArg[]; loc: SourceLocation }
  | { kind: 'impulse'; area: ValueNode; at?: ValueNode; loc: SourceLocation };

export interface WaveformNode {
  terms: TermNode[];
  loc: SourceLocation;
}

export type WatchTargetNode =
  | { kind: 'node'; node: Name }
  | { kind: 'between'; a: Name; b: Name }
  | { kind: 'part-voltage'; part: Name }
  | { kind: 'part-current'; part: Name };

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
      loc: SourceLocation;
    }
  | { kind: 'watch'; target: WatchTargetNode; label?: { text: string; loc: SourceLocation }; loc: SourceLocation }
  | { kind: 'span'; value: ValueNode; loc: SourceLocation }
  | { kind: 'samples'; value: ValueNode; loc: SourceLocation }
  | { kind: 'settle'; value: ValueNode; loc: SourceLocation };

export interface Netlist {
  file: string;
  statements: Statement[];
  /** Lines holding a part statement that could not be parsed; topology checks would mislead. */
  brokenPartLines: number[];
}
