/**
 * The SVG figure, read back as XML. Well-formedness follows the XML 1.0 rules (every element closed
 * and properly nested, attribute values quoted, only the five predefined entities or character
 * references); the checker below is our own small one.
 */
import { readFileSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { describe, expect, it } from 'vitest';
import { analyzeText } from '../../src/pipeline.js';
import { renderSVG } from '../../src/report/svg.js';

const ROOT = join(dirname(fileURLToPath(import.meta.url)), '..', '..');

interface El {
  name: string;
  attrs: Record<string, string>;
  children: El[];
  text: string;
}

/** Parses an XML document into elements; throws on anything not well-formed. */
function parseXML(src: string): El {
  let i = 0;
  const root: El = { name: '#document', attrs: {}, children: [], text: '' };
  const stack: El[] = [root];
  const entity = (s: string) => {
    for (const m of s.matchAll(/&([^;\s]*);?/g)) {
      if (!/^(amp|lt|gt|quot|apos|#\d+|#x[0-9a-fA-F]+)$/.test(m[1]!) || !m[0].endsWith(';')) throw new Error(`bad entity ${m[0]}`);
    }
    return s.replace(/&lt;/g, '<').replace(/&gt;/g, '>').replace(/&quot;/g, '"').replace(/&apos;/g, "'").replace(/&amp;/g, '&');
  };
  while (i < src.length) {
    if (src.startsWith('<?', i)) {
      i = src.indexOf('?>', i) + 2;
      continue;
    }
    if (src.startsWith('<!--', i)) {
      i = src.indexOf('-->', i) + 3;
      continue;
    }
    if (src[i] === '<') {
      const end = src.indexOf('>', i);
      if (end < 0) throw new Error('unclosed tag');
      const body = src.slice(i + 1, end);
      i = end + 1;
      if (body.startsWith('/')) {
        const name = body.slice(1).trim();
        const top = stack.pop()!;
        if (top.name !== name) throw new Error(`</${name}> closes <${top.name}>`);
        continue;
      }
      const selfClose = body.endsWith('/');
      const inner = selfClose ? body.slice(0, -1) : body;
      const nm = /^([A-Za-z_][\w:.-]*)/.exec(inner);
      if (!nm) throw new Error(`bad tag <${body}>`);
      const el: El = { name: nm[1]!, attrs: {}, children: [], text: '' };
      let rest = inner.slice(nm[1]!.length);
      const attr = /^\s+([A-Za-z_][\w:.-]*)\s*=\s*("([^"<]*)"|'([^'<]*)')/;
      for (;;) {
        const a = attr.exec(rest);
        if (!a) break;
        if (a[1]! in el.attrs) throw new Error(`duplicate attribute ${a[1]}`);
        el.attrs[a[1]!] = entity(a[3] ?? a[4] ?? '');
        rest = rest.slice(a[0].length);
      }
      if (rest.trim() !== '') throw new Error(`junk in tag <${body}>: ${rest}`);
      stack[stack.length - 1]!.children.push(el);
      if (!selfClose) stack.push(el);
      continue;
    }
    const next = src.indexOf('<', i);
    const text = src.slice(i, next < 0 ? src.length : next);
    if (text.includes('>') && stack.length === 1) throw new Error('stray text');
    stack[stack.length - 1]!.text += entity(text);
    i = next < 0 ? src.length : next;
  }
  if (stack.length !== 1) throw new Error(`unclosed <${stack[stack.length - 1]!.name}>`);
  if (root.children.length !== 1) throw new Error('not exactly one root element');
  return root.children[0]!;
}

function all(el: El, pred: (e: El) => boolean, out: El[] = []): El[] {
  if (pred(el)) out.push(el);
  for (const c of el.children) all(c, pred, out);
  return out;
}
const byClass = (root: El, cls: string) => all(root, (e) => (e.attrs.class ?? '').split(' ').includes(cls));
const textOf = (e: El): string => e.text + e.children.map(textOf).join('');

const circuit = (name: string) => {
  const p = join(ROOT, 'circuits', name);
  return analyzeText(readFileSync(p, 'utf8'), p);
};

describe('SVG figure', () => {
  it('the checker rejects what is not well-formed', () => {
    expect(() => parseXML('<a><b></a></b>')).toThrow();
    expect(() => parseXML('<a x=1/>')).toThrow();
    expect(() => parseXML('<a>&nbsp;</a>')).toThrow();
    expect(() => parseXML('<a>R&D</a>')).toThrow();
    expect(parseXML('<a x="1"><b/>t &amp; u</a>').name).toBe('a');
  });

  it('series RLC: well-formed, one path per trace, SI ticks, legend, peak and settling annotations', () => {
    const r = circuit('textbook-series-rlc.rdn');
    const svg = renderSVG(r, { width: 900, height: 420, title: 'Series RLC <step> & ring' });
    const root = parseXML(svg);
    expect(root.name).toBe('svg');
    expect(root.attrs.xmlns).toBe('http://www.w3.org/2000/svg');
    expect(root.attrs.width).toBe('900');
    expect(root.attrs.height).toBe('420');
    expect(textOf(byClass(root, 'figure-title')[0]!)).toBe('Series RLC <step> & ring');

    const paths = byClass(root, 'trace');
    expect(paths.length).toBe(r.traces.length);
    for (const p of paths) expect(p.attrs.d).toMatch(/^M[\d.-]+,[\d.-]+(L[\d.-]+,[\d.-]+)+$/);

    // time axis: 0 … 2 ms in SI-prefixed ticks ("500 µs", "1 ms", ...), never bare exponents
    const xTicks = all(byClass(root, 'axis-x')[0]!, (e) => e.attrs.class === 'tick-label').map(textOf);
    expect(xTicks.length).toBeGreaterThanOrEqual(4);
    expect(xTicks).toContain('1 ms');
    expect(xTicks.some((t) => /µs$/.test(t))).toBe(true);
    for (const t of xTicks) expect(t).toMatch(/^-?\d+(\.\d+)? (µs|ms|s)$/);
    const yTicks = all(byClass(root, 'axis-y')[0]!, (e) => e.attrs.class === 'tick-label').map(textOf);
    for (const t of yTicks) expect(t).toMatch(/^-?\d+(\.\d+)? [fpnµmkMGT]?V$/);
    expect(textOf(byClass(root, 'axis-title')[0]!)).toContain('(V)');

    expect(byClass(root, 'legend-label').map(textOf)).toEqual(r.traces.map((t) => t.label));

    // README: peak 13.96 V, overshoot 16.30 %, settling (±2 %) at 807.8 µs
    const peak = byClass(root, 'peak-label').map(textOf).join(' ');
    expect(peak).toContain('13.96 V');
    expect(peak).toContain('overshoot 16.3 %');
    expect(byClass(root, 'peak-marker').length).toBe(1);
    expect(byClass(root, 'settling-band').length).toBe(1);
    const settle = byClass(root, 'settling-time');
    expect(settle.length).toBe(1);
    expect(settle[0]!.attrs['stroke-dasharray']).toBeTruthy();
    expect(byClass(root, 'settling-label').map(textOf).join(' ')).toContain('807.8 µs');
  });

  it('volts and amperes get a panel each; labels with XML characters are escaped', () => {
    const r = circuit('lc-input-filter.rdn');
    r.traces[0]!.label = 'v(out) "converter" <in> & more';
    const root = parseXML(renderSVG(r));
    const panels = byClass(root, 'panel');
    expect(panels.map((p) => p.attrs['data-unit'])).toEqual(['V', 'A']);
    expect(byClass(panels[0]!, 'trace').length).toBe(1);
    expect(byClass(panels[1]!, 'trace').length).toBe(2);
    expect(byClass(root, 'legend-label').map(textOf)).toContain('v(out) "converter" <in> & more');
    const aTicks = all(byClass(panels[1]!, 'axis-y')[0]!, (e) => e.attrs.class === 'tick-label').map(textOf);
    for (const t of aTicks) expect(t).toMatch(/^-?\d+(\.\d+)? [fpnµmkMGT]?A$/);
  });

  it('metrics that are null draw no band and no settling line', () => {
    const r = analyzeText('current-source I1 gnd -> a 1mA\nresistor R1 a -> gnd 1k\nwatch node a\nspan 1ms', 'flat.rdn');
    r.traces[0]!.metrics.settlingTime = null;
    r.traces[0]!.metrics.overshootPct = null;
    const root = parseXML(renderSVG(r));
    expect(byClass(root, 'settling-band').length).toBe(0);
    expect(byClass(root, 'settling-time').length).toBe(0);
    expect(byClass(root, 'trace').length).toBe(1);
    expect(byClass(root, 'peak-label').map(textOf).join(' ')).not.toContain('overshoot');
  });
});
