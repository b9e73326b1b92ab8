import type { PartKind } from '../circuit/circuit.js';
import type { Name, Netlist, Statement, StepArg, StepKey, TermNode, ValueNode, WatchTargetNode, WaveformNode } from './ast.js';
import { raise, StatementAbandoned, type DiagnosticExtras, type DiagnosticSink } from './errors.js';
import type { SourceLocation } from './location.js';
import { looksLikeResistorCode, parseQuantity } from './quantity.js';
import { didYouMean } from './suggest.js';
import { tokenizeLine, type Token, type TokenKind } from './tokenize.js';

/** Statement keywords, in the order the language description lists them. */
export const STATEMENT_KEYWORDS = [
  'title',
  'param',
  'resistor',
  'capacitor',
  'inductor',
  'voltage-source',
  'current-source',
  'watch',
  'span',
  'samples',
  'settle',
] as const;

const PART_KINDS: readonly PartKind[] = ['resistor', 'capacitor', 'inductor', 'voltage-source', 'current-source'];
const STEP_KEYS: readonly StepKey[] = ['from', 'to', 'at', 'rise'];
const TERM_KEYWORDS = ['step', 'impulse'];
const WATCH_KINDS = ['node', 'between', 'voltage', 'current'];
const IDENTIFIER = /^[A-Za-z_][A-Za-z0-9_]*$/;

/** Parses a whole file; problems go to `sink` and the statement is skipped. */
export function parseNetlist(text: string, file: string, sink: DiagnosticSink): Netlist {
  const statements: Statement[] = [];
  const brokenPartLines: number[] = [];
  // A byte-order mark some editors add is not part of the first statement.
  const lines = text.replace(/^\uFEFF/, '').split('\n');
  lines.forEach((line, index) => {
    const lineNo = index + 1;
    const tokens = tokenizeLine(line, lineNo, file, sink);
    if (!tokens) {
      if (/^\s*(resistor|capacitor|inductor|voltage-source|current-source)\b/.test(line)) brokenPartLines.push(lineNo);
      return;
    }
    if (tokens.length === 0) return;
    try {
      statements.push(new LineParser(tokens, line, lineNo, file, sink).statement());
    } catch (e) {
      if (!(e instanceof StatementAbandoned)) throw e;
      if ((PART_KINDS as readonly string[]).includes(tokens[0]!.text)) brokenPartLines.push(lineNo);
    }
  });
  return { file, statements, brokenPartLines };
}

const DESCRIBE: Record<TokenKind, string> = {
  word: 'a word',
  quantity: 'a number',
  arrow: "'->'",
  plus: "'+'",
  equals: "'='",
  string: 'a quoted text',
  expr: 'a parenthesized expression',
};

class LineParser {
  private pos = 0;
  constructor(
    private readonly tokens: Token[],
    private readonly line: string,
    private readonly lineNo: number,
    private readonly file: string,
    private readonly sink: DiagnosticSink,
  ) {}

  statement(): Statement {
    const head = this.tokens[0]!;
    if (head.kind !== 'word') {
      this.fail(head.loc, `a line must start with a statement keyword, not ${DESCRIBE[head.kind]}`, {
        expected: 'one of: ' + STATEMENT_KEYWORDS.join(', '),
      });
    }
    this.pos = 1;
    const kw = head.text;
    let st: Statement;
    switch (kw) {
      case 'title':
        st = { kind: 'title', text: this.expect('string', 'the title in double quotes').inner!, loc: this.lineLoc() };
        break;
      case 'param':
        st = this.param();
        break;
      case 'resistor':
      case 'capacitor':
      case 'inductor':
      case 'voltage-source':
      case 'current-source':
        st = this.part(kw);
        break;
      case 'watch':
        st = this.watch();
        break;
      case 'span':
      case 'samples':
      case 'settle':
        st = { kind: kw, value: this.value(`a value after '${kw}'`), loc: this.lineLoc() };
        break;
      default:
        this.fail(head.loc, `unknown statement '${kw}'`, {
          expected: 'one of: ' + STATEMENT_KEYWORDS.join(', '),
          hint: didYouMean(kw, STATEMENT_KEYWORDS),
        });
    }
    this.end();
    return st;
  }

  private param(): Statement {
    const name = this.identifier('a parameter name');
    this.expect('equals', "'=' after the parameter name");
    const value = this.value('the parameter value');
    return { kind: 'param', name, value, loc: this.lineLoc() };
  }

  private part(kind: PartKind): Statement {
    const name = this.identifier(`the ${kind}'s designator, such as ${designatorExample(kind)}`);
    if (name.name === 'gnd') this.fail(name.loc, "'gnd' is the ground node and cannot name a part");
    const a = this.identifier('the first node name');
    this.expect('arrow', "'->' between the two node names");
    const b = this.identifier('the second node name');
    if (kind === 'voltage-source' || kind === 'current-source') {
      return { kind: 'part', part: kind, name, a, b, waveform: this.waveform(), loc: this.lineLoc() };
    }
    const value = this.value(`the ${kind}'s value`);
    const st: Statement = { kind: 'part', part: kind, name, a, b, value, loc: this.lineLoc() };
    const next = this.peek();
    if (next?.kind === 'word' && kind !== 'resistor' && (next.text === 'initial' || didYouMean(next.text, ['initial']))) {
      if (next.text !== 'initial') {
        this.fail(next.loc, `unknown keyword '${next.text}'`, { hint: "did you mean 'initial'?" });
      }
      this.pos++;
      st.initial = this.value(kind === 'capacitor' ? 'an initial voltage' : 'an initial current');
    }
    return st;
  }

  private waveform(): WaveformNode {
    const start = this.peek();
    if (!start) this.fail(this.endLoc(), 'a source needs a waveform', { expected: 'a waveform such as 12V or step to 5V at 1ms' });
    const terms: TermNode[] = [this.term()];
    while (this.peek()?.kind === 'plus') {
      this.pos++;
      terms.push(this.term());
    }
    return { terms, loc: this.spanFrom(start.loc) };
  }

  private term(): TermNode {
    const tok = this.peek();
    if (tok?.kind === 'word' && tok.text === 'step') {
      this.pos++;
      return this.step(tok.loc);
    }
    if (tok?.kind === 'word' && tok.text === 'impulse') {
      this.pos++;
      const area = this.value('the impulse area, such as 1mVs');
      let at: ValueNode | undefined;
      const key = this.peek();
      if (key?.kind === 'word' && key.text === 'at') {
        this.pos++;
        at = this.value("a time after 'at'");
      }
      const term: TermNode = { kind: 'impulse', area, loc: this.spanFrom(tok.loc) };
      if (at) term.at = at;
      return term;
    }
    // A word followed by more of the term is a misspelled term keyword, not a parameter.
    const after = this.tokens[this.pos + 1];
    if (tok?.kind === 'word' && after && after.kind !== 'plus') {
      this.fail(tok.loc, `unknown waveform term '${tok.text}'`, {
        expected: 'a value, step …, or impulse …',
        hint: didYouMean(tok.text, TERM_KEYWORDS),
      });
    }
    const value = this.value('a waveform: a value, step …, or impulse …');
    return { kind: 'constant', value, loc: value.loc };
  }

  private step(startLoc: SourceLocation): TermNode {
    const args: StepArg[] = [];
    while (this.peek() && this.peek()!.kind !== 'plus') {
      const key = this.peek()!;
      if (key.kind !== 'word' || !(STEP_KEYS as readonly string[]).includes(key.text)) {
        this.fail(key.loc, key.kind === 'word' ? `unknown step keyword '${key.text}'` : `expected a step keyword, found ${DESCRIBE[key.kind]}`, {
          expected: 'from, to, at or rise, each followed by a value',
          hint: key.kind === 'word' ? didYouMean(key.text, STEP_KEYS) : undefined,
        });
      }
      this.pos++;
      const previous = args.find((a) => a.key === key.text);
      if (previous) {
        this.fail(key.loc, `'${key.text}' is given twice in this step`, { hint: `the first one is at column ${previous.keyLoc.col}` });
      }
      args.push({ key: key.text as StepKey, keyLoc: key.loc, value: this.value(`a value after '${key.text}'`) });
    }
    if (!args.some((a) => a.key === 'to')) {
      this.fail(startLoc, "a step needs 'to': the level it ends at", { expected: 'step to 5V (from, at and rise are optional)' });
    }
    return { kind: 'step', args, loc: this.spanFrom(startLoc) };
  }

  private watch(): Statement {
    const kindTok = this.expect('word', 'node, between, voltage or current after watch');
    let target: WatchTargetNode;
    switch (kindTok.text) {
      case 'node':
        target = { kind: 'node', node: this.identifier('a node name') };
        break;
      case 'between': {
        const a = this.identifier('the first node name');
        const and = this.expect('word', "'and' between the two node names");
        if (and.text !== 'and') this.fail(and.loc, `expected 'and', found '${and.text}'`, { expected: 'watch between NODE and NODE' });
        target = { kind: 'between', a, b: this.identifier('the second node name') };
        break;
      }
      case 'voltage':
        target = { kind: 'part-voltage', part: this.identifier('a part designator') };
        break;
      case 'current':
        target = { kind: 'part-current', part: this.identifier('a part designator') };
        break;
      default:
        this.fail(kindTok.loc, `unknown watch kind '${kindTok.text}'`, {
          expected: 'watch node N, watch between N and M, watch voltage PART or watch current PART',
          hint: didYouMean(kindTok.text, WATCH_KINDS),
        });
    }
    const st: Statement = { kind: 'watch', target, loc: this.lineLoc() };
    const as = this.peek();
    if (as) {
      if (as.kind !== 'word' || as.text !== 'as') {
        this.fail(as.loc, `unexpected '${as.text}' after the watch target`, {
          expected: 'end of line, or as "label"',
          hint: as.kind === 'word' ? didYouMean(as.text, ['as']) : undefined,
        });
      }
      this.pos++;
      const label = this.expect('string', 'a label in double quotes after as');
      st.label = { text: label.inner!, loc: label.loc };
    }
    return st;
  }

  /** A quantity literal, a parameter name, or a parenthesized expression. */
  private value(what: string): ValueNode {
    const tok = this.peek();
    if (!tok) this.fail(this.endLoc(), `missing ${what}`, { expected: what });
    this.pos++;
    if (tok.kind === 'quantity') {
      const q = parseQuantity(tok.text);
      if (typeof q === 'string') this.fail(tok.loc, q, { expected: 'a number with optional prefix and unit, such as 4.7kΩ, 470nF or 4k7' });
      return { kind: 'literal', text: tok.text, value: q.value, unit: q.unit, loc: tok.loc };
    }
    if (tok.kind === 'expr') return { kind: 'expr', text: tok.inner!, loc: tok.loc };
    if (tok.kind === 'word' && IDENTIFIER.test(tok.text)) {
      const node: ValueNode = { kind: 'ref', name: tok.text, loc: tok.loc };
      if (looksLikeResistorCode(tok.text)) {
        const q = parseQuantity(tok.text);
        if (typeof q !== 'string') node.literal = q;
      }
      return node;
    }
    this.fail(tok.loc, `expected ${what}, found ${DESCRIBE[tok.kind]}`, { expected: what });
  }

  private identifier(what: string): Name {
    const tok = this.peek();
    if (!tok) this.fail(this.endLoc(), `missing ${what}`, { expected: what });
    this.pos++;
    if (tok.kind !== 'word' || !IDENTIFIER.test(tok.text)) {
      this.fail(tok.loc, `'${tok.text}' is not a valid name here`, {
        expected: `${what} (letters, digits and _, not starting with a digit)`,
      });
    }
    return { name: tok.text, loc: tok.loc };
  }

  private expect(kind: TokenKind, what: string): Token {
    const tok = this.peek();
    if (!tok) this.fail(this.endLoc(), `missing ${what}`, { expected: what });
    if (tok.kind !== kind) this.fail(tok.loc, `expected ${what}, found ${DESCRIBE[tok.kind]}`, { expected: what });
    this.pos++;
    return tok;
  }

  private end(): void {
    const extra = this.peek();
    if (extra) {
      const last = this.tokens[this.tokens.length - 1]!;
      this.fail(this.spanBetween(extra.loc, last.loc), `unexpected '${extra.text}' after the end of the statement`, {
        hint: 'each statement goes on its own line',
      });
    }
  }

  private peek(): Token | undefined {
    return this.tokens[this.pos];
  }

  private fail(loc: SourceLocation, message: string, extras?: DiagnosticExtras): never {
    raise(this.sink, 'error', loc, message, extras);
    throw new StatementAbandoned();
  }

  /** Just past the last character, for "missing …" errors. */
  private endLoc(): SourceLocation {
    return { file: this.file, line: this.lineNo, col: this.line.replace(/\s*(#.*)?$/, '').length + 1, length: 1 };
  }

  private lineLoc(): SourceLocation {
    return this.spanBetween(this.tokens[0]!.loc, this.tokens[this.tokens.length - 1]!.loc);
  }

  /** From `start` to the last token consumed so far. */
  private spanFrom(start: SourceLocation): SourceLocation {
    return this.spanBetween(start, this.tokens[this.pos - 1]!.loc);
  }

  private spanBetween(first: SourceLocation, last: SourceLocation): SourceLocation {
    return { ...first, length: last.col + last.length - first.col };
  }
}

function designatorExample(kind: PartKind): string {
  return { resistor: 'R1', capacitor: 'C1', inductor: 'L1', 'voltage-source': 'Vin', 'current-source': 'Iload', switch: 'S1' }[kind];
}
