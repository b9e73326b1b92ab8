import type { PartKind } from '../circuit/circuit.js';
import type { KeyArg, KeyedTermKind, Name, Netlist, RatedNode, Statement, TablePointNode, TermNode, ValueNode, WatchTargetNode, WaveformNode } from './ast.js';
import { raise, StatementAbandoned, type DiagnosticExtras, type DiagnosticSink } from './errors.js';
import type { SourceLocation } from './location.js';
import { looksLikeResistorCode, parseQuantity } from './quantity.js';
import { didYouMean } from './suggest.js';
import { checkCircuitSize, checkFileSize, expressionTooComplex } from './size.js';
import { checkIsText, splitLines } from './text.js';
import { tokenizeLine, type Token, type TokenKind } from './tokenize.js';
import { MAX_LINE_CHARS } from '../circuit/limits.js';

/** Statement keywords, in the order the language description lists them. */
export const STATEMENT_KEYWORDS = [
  'title',
  'param',
  'resistor',
  'capacitor',
  'inductor',
  'voltage-source',
  'current-source',
  'switch',
  'watch',
  'span',
  'samples',
  'settle',
  'derate',
  'start',
] as const;

const PART_KINDS: readonly PartKind[] = ['resistor', 'capacitor', 'inductor', 'voltage-source', 'current-source', 'switch'];
export const TERM_KEYWORDS = ['step', 'impulse', 'ramp', 'approach', 'sine', 'pulse', 'table', 'expression'] as const;

/** What each term accepts after its keyword, and which arguments it cannot do without. */
interface KeySpec {
  keys: readonly string[];
  /** Each entry: exactly one of these keys must be given. */
  required: readonly (readonly string[])[];
  /** Shown when a required key is missing. */
  example: string;
}

export const TERM_KEYS: Record<KeyedTermKind | 'impulse' | 'table' | 'expression', KeySpec> = {
  step: { keys: ['from', 'to', 'at', 'rise', 'delay'], required: [['to']], example: 'step to 5V (from, at and rise are optional)' },
  ramp: { keys: ['at', 'rate', 'until', 'delay'], required: [['rate']], example: 'ramp at 1ms rate 2kV/s (until is optional)' },
  approach: { keys: ['from', 'to', 'at', 'tau', 'delay'], required: [['to'], ['tau']], example: 'approach to 5V tau 1ms (from and at are optional)' },
  sine: {
    keys: ['amplitude', 'rms', 'freq', 'period', 'phase', 'at', 'decay', 'delay'],
    required: [['amplitude', 'rms'], ['freq', 'period']],
    example: 'sine amplitude 1V freq 50Hz (phase, at and decay are optional)',
  },
  pulse: {
    keys: ['from', 'to', 'period', 'freq', 'width', 'duty', 'rise', 'fall', 'start', 'cycles', 'delay'],
    required: [['to'], ['period', 'freq'], ['width', 'duty']],
    example: 'pulse to 5V period 1ms width 200us',
  },
  impulse: { keys: ['at', 'delay'], required: [], example: 'impulse 2mVs at 1ms' },
  table: { keys: ['delay'], required: [], example: 'table 0 0V, 1ms 5V' },
  expression: { keys: ['delay'], required: [], example: 'expression "5*sin(2*pi*50*t)"' },
};

const SWITCH_SPEC: KeySpec = {
  keys: ['on', 'off', 'starts', 'closes', 'opens', 'toggles'],
  required: [['on']],
  example: 'switch S1 a -> b on 10mohm closes 1ms',
};
const SWITCH_STATES = ['closed', 'open'];
/** The keyword of the ratings clause, which any part line may end with (a switch: among its keywords). */
export const RATED = 'rated';
const RATED_EXAMPLE = "rated followed by one or more of a voltage, current, power and pulse energy, such as rated 35V 2A or rated 250mW 1.5J";
const START_MODES = ['settled', 'rest'] as const;
const WATCH_KINDS = ['node', 'between', 'voltage', 'current'];
/** The optional clauses after a watch target. */
const WATCH_CLAUSES = ['above', 'as'] as const;
const WATCH_CLAUSE_EXAMPLE: Record<(typeof WATCH_CLAUSES)[number], string> = { above: 'above LEVEL', as: 'as "label"' };
const IDENTIFIER = /^[A-Za-z_][A-Za-z0-9_]*$/;

/** Parses a whole file; problems go to `sink` and the statement is skipped. */
export function parseNetlist(text: string, file: string, sink: DiagnosticSink): Netlist {
  checkFileSize(text, file);
  checkIsText(text, file);
  const statements: Statement[] = [];
  const brokenPartLines: number[] = [];
  // A byte-order mark some editors add is not part of the first statement; CR LF, LF and a lone
  // CR each end a line.
  const lines = splitLines(text);
  lines.forEach((line, index) => {
    const lineNo = index + 1;
    if (line.length > MAX_LINE_CHARS) {
      raise(sink, 'error', { file, line: lineNo, col: MAX_LINE_CHARS + 1, length: 1 }, `this line has ${line.length} characters, more than the ${MAX_LINE_CHARS} allowed`, {
        hint: 'a statement fits on one line of reasonable length; put long waveforms in a table file',
      });
      if (/^\s*(resistor|capacitor|inductor|voltage-source|current-source|switch)\b/.test(line)) brokenPartLines.push(lineNo);
      return;
    }
    const tokens = tokenizeLine(line, lineNo, file, sink);
    if (!tokens) {
      if (/^\s*(resistor|capacitor|inductor|voltage-source|current-source|switch)\b/.test(line)) brokenPartLines.push(lineNo);
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
  checkCircuitSize(statements, sink);
  return { file, statements, brokenPartLines };
}

const DESCRIBE: Record<TokenKind, string> = {
  word: 'a word',
  quantity: 'a number',
  arrow: "'->'",
  plus: "'+'",
  equals: "'='",
  comma: "','",
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
      case 'switch':
        st = this.part(kw);
        break;
      case 'watch':
        st = this.watch();
        break;
      case 'span':
      case 'samples':
      case 'settle':
      case 'derate':
        st = { kind: kw, value: this.value(`a value after '${kw}'`), loc: this.lineLoc() };
        break;
      case 'start': {
        const mode = this.expect('word', 'settled or rest after start');
        if (!(START_MODES as readonly string[]).includes(mode.text)) {
          this.fail(mode.loc, `unknown start '${mode.text}'`, {
            expected: 'start settled (the DC state before t = 0, the default) or start rest (every capacitor and inductor empty)',
            hint: didYouMean(mode.text, START_MODES),
          });
        }
        st = { kind: 'start', mode: mode.text as (typeof START_MODES)[number], loc: this.lineLoc() };
        break;
      }
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
      const st: PartStatement = { kind: 'part', part: kind, name, a, b, waveform: this.waveform(), loc: this.lineLoc() };
      // The ratings follow the whole waveform.
      while (this.peek()?.kind === 'word' && this.peek()!.text === RATED) this.rated(st, []);
      this.nearRated();
      return st;
    }
    if (kind === 'switch') {
      if (!this.peek()) this.fail(this.endLoc(), "a switch needs 'on' and its resistance while closed", { expected: SWITCH_SPEC.example });
      const st: PartStatement = { kind: 'part', part: kind, name, a, b, loc: this.lineLoc() };
      st.switching = this.keyArgs('switch', SWITCH_SPEC, name.loc, () => this.rated(st, SWITCH_SPEC.keys));
      return st;
    }
    const value = this.value(`the ${kind}'s value`);
    const st: PartStatement = { kind: 'part', part: kind, name, a, b, value, loc: this.lineLoc() };
    // `initial` and `rated`, in either order.
    for (let next = this.peek(); next?.kind === 'word'; next = this.peek()) {
      if (next.text === RATED) {
        this.rated(st, ['initial']);
      } else if (kind !== 'resistor' && (next.text === 'initial' || didYouMean(next.text, ['initial']))) {
        if (next.text !== 'initial') {
          this.fail(next.loc, `unknown keyword '${next.text}'`, { hint: "did you mean 'initial'?" });
        }
        if (st.initial) this.fail(next.loc, "'initial' is given twice", { hint: `the first one is at column ${this.initialCol}` });
        this.initialCol = next.loc.col;
        this.pos++;
        st.initial = this.value(kind === 'capacitor' ? 'an initial voltage' : 'an initial current');
      } else {
        break;
      }
    }
    this.nearRated();
    return st;
  }

  private initialCol = 0;

  /**
   * `rated Q Q …` with the `rated` keyword next. A word is a parameter holding a rating unless it
   * is one of `stop` (the part's other keywords), or looks like a misspelling of one and has a
   * value after it.
   */
  private rated(st: PartStatement, stop: readonly string[]): void {
    const key = this.peek()!;
    if (st.rated) {
      this.fail(key.loc, `'${RATED}' is given twice`, {
        hint: `the first '${RATED}' is at column ${st.rated.keyLoc.col}; list every rating after it, such as rated 35V 2A`,
      });
    }
    this.pos++;
    const values: ValueNode[] = [];
    for (let tok = this.peek(); tok; tok = this.peek()) {
      if (tok.kind === 'word') {
        if (tok.text === RATED || stop.includes(tok.text) || !IDENTIFIER.test(tok.text)) break;
        const keyword = this.tokens[this.pos + 1] ? didYouMean(tok.text, stop) : undefined;
        if (keyword) this.fail(tok.loc, `unknown keyword '${tok.text}'`, { hint: keyword });
      } else if (tok.kind !== 'quantity' && tok.kind !== 'expr') {
        break;
      }
      values.push(this.value('a rating'));
    }
    if (values.length === 0) {
      const tok = this.peek();
      this.fail(tok ? tok.loc : this.endLoc(), `missing a rating after '${RATED}'`, { expected: RATED_EXAMPLE });
    }
    st.rated = { keyLoc: key.loc, values } satisfies RatedNode;
  }

  /**
   * A word left at the end of a part line that is a near miss of `rated`, or another form of the
   * word (rating, ratings, rate: what an engineer writes first)
   */
  private nearRated(): void {
    const next = this.peek();
    if (next?.kind === 'word' && next.text !== RATED && (didYouMean(next.text, [RATED]) || /^ratings?$/i.test(next.text))) {
      this.fail(next.loc, `unknown keyword '${next.text}'`, { hint: `did you mean '${RATED}'?`, expected: RATED_EXAMPLE });
    }
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
    if (tok?.kind === 'word' && (TERM_KEYWORDS as readonly string[]).includes(tok.text)) {
      this.pos++;
      const kw = tok.text as (typeof TERM_KEYWORDS)[number];
      switch (kw) {
        case 'impulse': {
          const area = this.value('the impulse area, such as 1mVs');
          return { kind: 'impulse', area, args: this.keyArgs('impulse', TERM_KEYS.impulse, tok.loc), loc: this.spanFrom(tok.loc) };
        }
        case 'table':
          return this.table(tok.loc);
        case 'expression': {
          const text = this.expect('string', 'the expression in double quotes, such as "5*sin(2*pi*50*t)"');
          const tooComplex = expressionTooComplex(text.inner!);
          if (tooComplex) this.fail(text.loc, tooComplex, { hint: 'move constant parts into param lines' });
          return { kind: 'expression', text: text.inner!, textLoc: text.loc, args: this.keyArgs('expression', TERM_KEYS.expression, tok.loc), loc: this.spanFrom(tok.loc) };
        }
        default:
          return { kind: kw, args: this.keyArgs(kw, TERM_KEYS[kw], tok.loc), loc: this.spanFrom(tok.loc) };
      }
    }
    // A word followed by more of the term is a misspelled term keyword, not a parameter.
    const after = this.tokens[this.pos + 1];
    if (tok?.kind === 'word' && after && after.kind !== 'plus' && !(after.kind === 'word' && after.text === RATED)) {
      this.fail(tok.loc, `unknown waveform term '${tok.text}'`, {
        expected: 'a value, or one of: ' + TERM_KEYWORDS.join(', '),
        hint: didYouMean(tok.text, TERM_KEYWORDS),
      });
    }
    const value = this.value('a waveform: a value, or a term such as step …');
    const next = this.peek();
    if (next?.kind === 'word' && next.text === 'delay') {
      this.fail(next.loc, 'a constant level does not change in time, so it cannot be delayed', {
        hint: `to switch it on later, write step to ${value.kind === 'literal' ? value.text : 'LEVEL'} at TIME`,
      });
    }
    return { kind: 'constant', value, loc: value.loc };
  }

  /** `table T V, T V, …` or `table file "path"`, then keyword arguments. */
  private table(startLoc: SourceLocation): TermNode {
    const next = this.peek();
    if (next?.kind === 'word' && next.text === 'file') {
      this.pos++;
      const path = this.expect('string', 'the file name in double quotes, such as "drive.csv"');
      const file = { path: path.inner!, loc: path.loc };
      return { kind: 'table', points: [], file, args: this.keyArgs('table', TERM_KEYS.table, startLoc), loc: this.spanFrom(startLoc) };
    }
    const points: TablePointNode[] = [];
    for (;;) {
      const t = this.value('a time in the table, such as 1ms');
      const v = this.value('the value after the time, such as 5V');
      points.push({ t, v });
      if (this.peek()?.kind !== 'comma') break;
      this.pos++;
    }
    return { kind: 'table', points, args: this.keyArgs('table', TERM_KEYS.table, startLoc), loc: this.spanFrom(startLoc) };
  }

  /**
   * Keyword arguments in any order up to the end of the term (a `+` or the end of the line).
   * `what` names the term in messages; `startLoc` is its keyword, where a missing argument is reported.
   */
  private keyArgs(what: string, spec: KeySpec, startLoc: SourceLocation, onRated?: () => void): KeyArg[] {
    const args: KeyArg[] = [];
    const keys = spec.keys.join(', ');
    while (this.peek() && this.peek()!.kind !== 'plus') {
      const key = this.peek()!;
      if (key.kind === 'word' && key.text === RATED) {
        // A term ends at `rated`; a switch takes its ratings among its keywords.
        if (!onRated) break;
        onRated();
        continue;
      }
      if (key.kind !== 'word' || !spec.keys.includes(key.text)) {
        this.fail(key.loc, key.kind === 'word' ? `unknown ${what} keyword '${key.text}'` : `expected ${/^[aeiou]/.test(what) ? 'an' : 'a'} ${what} keyword, found ${DESCRIBE[key.kind]}`, {
          expected: `${keys}, each followed by a value`,
          hint: key.kind === 'word' ? didYouMean(key.text, [...spec.keys, RATED]) : undefined,
        });
      }
      this.pos++;
      const previous = args.find((a) => a.key === key.text);
      if (previous) {
        this.fail(key.loc, `'${key.text}' is given twice in this ${what}`, { hint: `the first one is at column ${previous.keyLoc.col}` });
      }
      const rival = spec.required.find((group) => group.length > 1 && group.includes(key.text))?.map((k) => args.find((a) => a.key === k)).find((a) => a);
      if (rival) {
        this.fail(key.loc, `'${key.text}' and '${rival.key}' cannot both be given`, { hint: `give only one of ${alternatives(spec.required.find((g) => g.includes(key.text))!)}` });
      }
      // A keyword where the value should be means the value was left out.
      const valueTok = this.peek();
      if (!valueTok || valueTok.kind === 'plus' || (valueTok.kind === 'word' && (spec.keys.includes(valueTok.text) || valueTok.text === RATED) && valueTok.text !== key.text)) {
        this.fail(valueTok && valueTok.kind !== 'plus' ? valueTok.loc : { ...key.loc, col: key.loc.col + key.loc.length, length: 1 }, `missing a value after '${key.text}'`, {
          expected: spec.example,
        });
      }
      args.push(this.keyArg(what, key));
    }
    for (const group of spec.required) {
      if (group.some((k) => args.some((a) => a.key === k))) continue;
      this.fail(startLoc, `${/^[aeiou]/.test(what) ? 'an' : 'a'} ${what} needs ${alternatives(group)}`, { expected: spec.example });
    }
    return args;
  }

  private keyArg(what: string, key: Token): KeyArg {
    if (what === 'switch' && key.text === 'starts') {
      const state = this.expect('word', 'closed or open after starts');
      if (!SWITCH_STATES.includes(state.text)) {
        this.fail(state.loc, `a switch starts either closed or open, not '${state.text}'`, { hint: didYouMean(state.text, SWITCH_STATES) });
      }
      return { key: key.text, keyLoc: key.loc, value: { kind: 'ref', name: state.text, loc: state.loc } };
    }
    const value = this.value(`a value after '${key.text}'`);
    if (!(what === 'switch' && key.text === 'toggles')) return { key: key.text, keyLoc: key.loc, value };
    const list = [value];
    while (this.peek()?.kind === 'comma') {
      this.pos++;
      list.push(this.value('another time after the comma'));
    }
    return { key: key.text, keyLoc: key.loc, value, list };
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
    const st: Extract<Statement, { kind: 'watch' }> = { kind: 'watch', target, loc: this.lineLoc() };
    // optional clauses, each at most once, in either order: above LEVEL, as "label"
    for (let tok = this.peek(); tok; tok = this.peek()) {
      const left = WATCH_CLAUSES.filter((c) => (c === 'above' ? !st.threshold : !st.label));
      if (tok.kind !== 'word' || !(left as readonly string[]).includes(tok.text)) {
        const again = tok.kind === 'word' && (WATCH_CLAUSES as readonly string[]).includes(tok.text);
        this.fail(tok.loc, again ? `'${tok.text}' is given twice on this watch line` : `unexpected '${tok.text}' after the watch target`, {
          expected: left.length === 0 ? 'end of line' : `end of line, or ${left.map((c) => WATCH_CLAUSE_EXAMPLE[c]).join(' or ')}`,
          hint: tok.kind === 'word' && !again ? didYouMean(tok.text, left) : undefined,
        });
      }
      this.pos++;
      if (tok.text === 'as') {
        const label = this.expect('string', 'a label in double quotes after as');
        st.label = { text: label.inner!, loc: label.loc };
      } else {
        const what = 'a threshold level after above, such as 3V or 2A';
        const q = this.peek();
        if (!q) this.fail(this.endLoc(), `missing ${what}`, { expected: what });
        if (q.kind !== 'quantity') {
          this.fail(q.loc, `expected ${what}, found ${DESCRIBE[q.kind]}`, {
            expected: what,
            hint: q.kind === 'word' || q.kind === 'expr' ? 'the level is a number with its unit; parameters and expressions are not accepted here' : undefined,
          });
        }
        this.pos++;
        const value = parseQuantity(q.text);
        if (typeof value === 'string') this.fail(q.loc, value, { expected: what });
        if (!Number.isFinite(value.value)) this.fail(q.loc, `the threshold level must be a finite number`, { expected: what });
        st.threshold = { text: q.text, value: value.value, unit: value.unit, loc: q.loc };
      }
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
    if (tok.kind === 'expr') {
      const tooComplex = expressionTooComplex(tok.inner!, 1);
      if (tooComplex) this.fail(tok.loc, tooComplex, { hint: 'split it into several param lines' });
      return { kind: 'expr', text: tok.inner!, loc: tok.loc };
    }
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

/** 'rate', or 'amplitude' or 'rms'. */
type PartStatement = Extract<Statement, { kind: 'part' }>;

function alternatives(group: readonly string[]): string {
  const quoted = group.map((k) => `'${k}'`);
  return quoted.length === 1 ? quoted[0]! : `${quoted.slice(0, -1).join(', ')} or ${quoted[quoted.length - 1]}`;
}

function designatorExample(kind: PartKind): string {
  return { resistor: 'R1', capacitor: 'C1', inductor: 'L1', 'voltage-source': 'Vin', 'current-source': 'Iload', switch: 'S1' }[kind];
}
