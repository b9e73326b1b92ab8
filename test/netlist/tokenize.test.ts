import { describe, expect, it } from 'vitest';
import type { Diagnostic } from '../../src/diagnostics.js';
import { tokenizeLine } from '../../src/netlist/tokenize.js';

function tokens(line: string) {
  const sink: Diagnostic[] = [];
  const toks = tokenizeLine(line, 3, 'f.rdn', sink);
  return { toks: toks ?? [], sink };
}

describe('tokenizeLine', () => {
  it('splits a part statement into kinds with exact columns and lengths', () => {
    const { toks, sink } = tokens('voltage-source V1 in -> gnd step to 12V + 5V  # comment');
    expect(sink).toEqual([]);
    expect(toks.map((t) => [t.kind, t.text, t.loc.col, t.loc.length])).toEqual([
      ['word', 'voltage-source', 1, 14],
      ['word', 'V1', 16, 2],
      ['word', 'in', 19, 2],
      ['arrow', '->', 22, 2],
      ['word', 'gnd', 25, 3],
      ['word', 'step', 29, 4],
      ['word', 'to', 34, 2],
      ['quantity', '12V', 37, 3],
      ['plus', '+', 41, 1],
      ['quantity', '5V', 43, 2],
    ]);
    expect(toks.every((t) => t.loc.line === 3 && t.loc.file === 'f.rdn')).toBe(true);
  });

  it('needs no spaces around the arrow', () => {
    expect(tokens('a->b').toks.map((t) => t.kind)).toEqual(['word', 'arrow', 'word']);
  });

  it('keeps negative numbers, exponents and compound units in one literal', () => {
    const texts = tokens('-5V 1e-3 2.5E+3s 1mV*s 2A·s 470µF 2% .5').toks.map((t) => [t.kind, t.text]);
    expect(texts).toEqual([
      ['quantity', '-5V'],
      ['quantity', '1e-3'],
      ['quantity', '2.5E+3s'],
      ['quantity', '1mV*s'],
      ['quantity', '2A·s'],
      ['quantity', '470µF'],
      ['quantity', '2%'],
      ['quantity', '.5'],
    ]);
  });

  it('stops a literal at + so terms can be joined without spaces', () => {
    expect(tokens('5V+step').toks.map((t) => t.text)).toEqual(['5V', '+', 'step']);
  });

  it('keeps a parenthesized expression as one token with its inner text', () => {
    const [, eq, expr] = tokens('x = (1/(2*pi*fc))  # why').toks;
    expect(eq!.kind).toBe('equals');
    expect(expr).toMatchObject({ kind: 'expr', text: '(1/(2*pi*fc))', inner: '1/(2*pi*fc)', loc: { col: 5, length: 13 } });
  });

  it('reads strings, including a # inside them', () => {
    const [, s] = tokens('title "RC #1 demo" # real comment').toks;
    expect(s).toMatchObject({ kind: 'string', inner: 'RC #1 demo', loc: { col: 7, length: 12 } });
  });

  it('reports an unclosed string, an unclosed parenthesis and a stray character', () => {
    expect(tokens('title "oops').sink[0]).toMatchObject({ message: expect.stringMatching(/closing quote/), loc: { col: 7 } });
    expect(tokens('span (2*(3)').sink[0]).toMatchObject({ message: expect.stringMatching(/never closed/), loc: { col: 6, length: 1 } });
    expect(tokens('resistor R1 a -> b 1k ;').sink[0]).toMatchObject({ message: "unexpected character ';'", loc: { col: 23 } });
  });

  it('keeps V/s and A/s inside a quantity and reads commas as separators', () => {
    expect(tokens('rate 2kV/s, 1A/s').toks.map((t) => [t.kind, t.text, t.loc.col])).toEqual([
      ['word', 'rate', 1],
      ['quantity', '2kV/s', 6],
      ['comma', ',', 11],
      ['quantity', '1A/s', 13],
    ]);
    expect(tokens('toggles 1ms,2ms').toks.map((t) => t.text)).toEqual(['toggles', '1ms', ',', '2ms']);
  });
});
