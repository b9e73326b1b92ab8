import type { Circuit, Part } from '../circuit/circuit.js';
import { GROUND } from '../circuit/circuit.js';
import { type C, c, cadd, cdiv, cmul } from './complex.js';

/**
 * Symbolic transfer functions of small circuits, written in the part names:
 *
 *   H(s) = 1 / (L1·C1·s² + R1·C1·s + 1)
 *
 * The MNA system Y(s)·z = b·u is built with polynomial entries in s and in the part symbols
 * (a resistor enters as its conductance G_R, a symbol of its own; a capacitor as C·s; an inductor's
 * branch row as va − vb − L·s·i = 0). For a read-out y = cᵀz + d·u,
 *
 *   det [[Y, b], [cᵀ, −d]] = −det(Y)·y/u,
 *
 * so H = −det(bordered)/det(Y): two exact determinants (expansion by minors, memoised over the
 * used columns — no division, the integer coefficients stay exact), after which G_R = 1/R is
 * substituted by multiplying numerator and denominator by the resistors' highest powers, and common
 * monomial factors are cancelled. Nothing is shown unless it matches the numeric H(s) at several
 * random complex s (see `verifySymbolic`).
 */

/** A polynomial in the variables s, p₁ … pₙ: exponent vector key ("e0,e1,…") → coefficient. */
export type Poly = Map<string, number>;

export interface SymbolicTransfer {
  /** symbol names in variable order (variable 0 is s, variable i + 1 is symbols[i]) */
  symbols: string[];
  /** the part kind of each symbol, for ordering products (R before L before C) */
  kinds: Part['kind'][];
  num: Poly;
  den: Poly;
}

const keyOf = (e: readonly number[]): string => e.join(',');
const expOf = (k: string): number[] => k.split(',').map(Number);

function padd(a: Poly, b: Poly, sign = 1): Poly {
  const out = new Map(a);
  for (const [k, v] of b) {
    const w = (out.get(k) ?? 0) + sign * v;
    if (w === 0) out.delete(k);
    else out.set(k, w);
  }
  return out;
}

function pmul(a: Poly, b: Poly): Poly {
  const out: Poly = new Map();
  for (const [ka, va] of a) {
    const ea = expOf(ka);
    for (const [kb, vb] of b) {
      const eb = expOf(kb);
      const k = keyOf(ea.map((x, i) => x + eb[i]!));
      const w = (out.get(k) ?? 0) + va * vb;
      if (w === 0) out.delete(k);
      else out.set(k, w);
    }
  }
  return out;
}

function monomial(nv: number, coef: number, vars: Record<number, number> = {}): Poly {
  const e = new Array<number>(nv).fill(0);
  for (const [i, p] of Object.entries(vars)) e[Number(i)] = p;
  return coef === 0 ? new Map() : new Map([[keyOf(e), coef]]);
}

/** Determinant by expansion along rows, memoised on the set of used columns (sparse-friendly). */
export function determinant(M: (Poly | undefined)[][], nv: number): Poly {
  const n = M.length;
  const memo = new Map<number, Poly>();
  const one = monomial(nv, 1);
  const rec = (row: number, used: number): Poly => {
    if (row === n) return one;
    const hit = memo.get(used);
    if (hit) return hit;
    let acc: Poly = new Map();
    let pos = 0;
    for (let j = 0; j < n; j++) {
      if (used & (1 << j)) continue;
      const m = M[row]![j];
      if (m && m.size > 0) {
        const minor = rec(row + 1, used | (1 << j));
        if (minor.size > 0) acc = padd(acc, pmul(m, minor), pos % 2 === 0 ? 1 : -1);
      }
      pos++;
    }
    memo.set(used, acc);
    return acc;
  };
  return rec(0, 0);
}

/** Which circuits get a symbolic line: no switches, ≤ 4 capacitors and inductors, ≤ 12 parts. */
export function symbolicEligible(circuit: Circuit): boolean {
  const parts = circuit.parts;
  if (parts.some((p) => p.kind === 'switch')) return false;
  if (parts.filter((p) => p.kind === 'capacitor' || p.kind === 'inductor').length > 4) return false;
  return parts.length <= 12;
}

/** The watch's read-out as (node/branch coefficients, feed-through per source). */
type Target = { kind: 'node'; node: string } | { kind: 'between'; a: string; b: string } | { kind: 'part-voltage'; part: string } | { kind: 'part-current'; part: string };

/**
 * H(s) from `source` to the watch `label`, symbolic, or null (no such watch or source, not
 * eligible, or a singular network).
 */
export function symbolicTransfer(circuit: Circuit, label: string, source: string): SymbolicTransfer | null {
  if (!symbolicEligible(circuit)) return null;
  const watch = circuit.watches.find((w) => w.label === label);
  const src = circuit.parts.find((p) => p.name === source && (p.kind === 'voltage-source' || p.kind === 'current-source'));
  if (!watch || !src) return null;
  const symParts = circuit.parts.filter((p) => p.kind === 'resistor' || p.kind === 'capacitor' || p.kind === 'inductor');
  const symbols = symParts.map((p) => p.name);
  const kinds = symParts.map((p) => p.kind);
  const nv = symbols.length + 1;
  const sym = (p: Part) => symParts.indexOf(p) + 1;
  const nodes = circuit.nodes.filter((n) => n !== GROUND);
  const branch = new Map<string, number>();
  let nz = nodes.length;
  for (const p of circuit.parts) if (p.kind === 'inductor' || p.kind === 'voltage-source') branch.set(p.name, nz++);
  if (nz + 1 > 24) return null;
  const node = (n: string) => (n === GROUND ? -1 : nodes.indexOf(n));
  // bordered matrix [[Y, b], [cᵀ, −d]] of size nz + 1
  const M: Poly[][] = Array.from({ length: nz + 1 }, () => Array.from({ length: nz + 1 }, () => new Map() as Poly));
  const add = (i: number, j: number, p: Poly, sign = 1) => {
    if (i >= 0 && j >= 0) M[i]![j] = padd(M[i]![j]!, p, sign);
  };
  const pair = (a: number, b: number, p: Poly) => {
    add(a, a, p);
    add(b, b, p);
    add(a, b, p, -1);
    add(b, a, p, -1);
  };
  const one = monomial(nv, 1);
  for (const p of circuit.parts) {
    const a = node(p.a);
    const b = node(p.b);
    if (a < -1 || b < -1) return null;
    switch (p.kind) {
      case 'resistor':
        pair(a, b, monomial(nv, 1, { [sym(p)]: 1 })); // G_R
        break;
      case 'capacitor':
        pair(a, b, monomial(nv, 1, { 0: 1, [sym(p)]: 1 })); // C·s
        break;
      case 'inductor':
      case 'voltage-source': {
        const k = branch.get(p.name)!;
        add(a, k, one);
        add(b, k, one, -1);
        add(k, a, one);
        add(k, b, one, -1);
        if (p.kind === 'inductor') add(k, k, monomial(nv, 1, { 0: 1, [sym(p)]: 1 }), -1); // −L·s
        else if (p === src) add(k, nz, one); // va − vb = u
        break;
      }
      case 'current-source':
        if (p === src) {
          // u leaves node a and enters node b: Σ currents leaving = 0 → b[a] = −u, b[b] = +u
          add(a, nz, one, -1);
          add(b, nz, one);
        }
        break;
      case 'switch':
        return null;
    }
  }
  // the read-out row
  const t = watch.target as Target;
  const volt = (a: string, b: string) => {
    add(nz, node(a), one);
    add(nz, node(b), one, -1);
  };
  const partOf = (n: string) => circuit.parts.find((p) => p.name === n);
  switch (t.kind) {
    case 'node':
      volt(t.node, GROUND);
      break;
    case 'between':
      volt(t.a, t.b);
      break;
    case 'part-voltage': {
      const p = partOf(t.part);
      if (!p) return null;
      volt(p.a, p.b);
      break;
    }
    case 'part-current': {
      const p = partOf(t.part);
      if (!p) return null;
      const a = node(p.a);
      const b = node(p.b);
      const w =
        p.kind === 'resistor' ? monomial(nv, 1, { [sym(p)]: 1 }) : p.kind === 'capacitor' ? monomial(nv, 1, { 0: 1, [sym(p)]: 1 }) : null;
      if (w) {
        add(nz, a, w);
        add(nz, b, w, -1);
      } else if (p.kind === 'inductor' || p.kind === 'voltage-source') add(nz, branch.get(p.name)!, one);
      else if (p.kind === 'current-source') {
        if (p === src) add(nz, nz, one, -1); // −d with d = 1
      } else return null;
      break;
    }
    default:
      return null;
  }
  const Y = M.slice(0, nz).map((row) => row.slice(0, nz));
  let den = determinant(Y, nv);
  if (den.size === 0) return null;
  let num = padd(new Map(), determinant(M, nv), -1);
  // the trivial cancellations: one of N, D divides the other exactly
  const one1 = monomial(nv, 1);
  const q = num.size > 0 ? exactDivide(num, den) : null;
  if (q) [num, den] = [q, one1];
  else {
    const r = num.size > 0 ? exactDivide(den, num) : null;
    if (r) [num, den] = [one1, r];
  }
  return simplify({ symbols, kinds, num, den });
}

/** Lexicographic comparison of exponent vectors. */
function lexCmp(a: readonly number[], b: readonly number[]): number {
  for (let i = 0; i < a.length; i++) if (a[i] !== b[i]) return a[i]! - b[i]!;
  return 0;
}

function leading(p: Poly): [number[], number] {
  let best: [number[], number] | null = null;
  for (const [k, v] of p) {
    const e = expOf(k);
    if (!best || lexCmp(e, best[0]) > 0) best = [e, v];
  }
  return best!;
}

/** a / b when b divides a exactly (multivariate long division in lex order), else null. */
export function exactDivide(a: Poly, b: Poly): Poly | null {
  if (b.size === 0) return null;
  const [eb, vb] = leading(b);
  let r: Poly = new Map(a);
  let q: Poly = new Map();
  for (let guard = 0; r.size > 0; guard++) {
    if (guard > 10000) return null;
    const [er, vr] = leading(r);
    if (er.some((x, i) => x < eb[i]!)) return null;
    const t: Poly = new Map([[keyOf(er.map((x, i) => x - eb[i]!)), vr / vb]]);
    q = padd(q, t);
    r = padd(r, pmul(t, b), -1);
    // rounding left-overs of non-integer quotients
    for (const [k, v] of r) if (Math.abs(v) <= 1e-12 * Math.abs(vr)) r.delete(k);
  }
  return q;
}

/** G_R → 1/R, then common monomial factors (symbols, s and integer content) out, sign of the lowest term positive. */
function simplify(h: SymbolicTransfer): SymbolicTransfer {
  const nv = h.symbols.length + 1;
  const all = [...h.num.keys(), ...h.den.keys()].map(expOf);
  // resistors: exponent e of G_R means R^(−e); multiply through by R^(max e), then cancel the minimum
  const shift = new Array<number>(nv).fill(0);
  for (let i = 0; i < nv; i++) {
    const es = all.map((e) => e[i]!);
    if (i > 0 && h.kinds[i - 1] === 'resistor') {
      // after R^max·G^e = R^(max − e): the common factor R^(max − max e) = R^0; to cancel, use max − e ≥ 0 whose min is 0
      shift[i] = Math.max(...es);
    } else shift[i] = Math.min(...es);
  }
  const fix = (p: Poly): Poly => {
    const out: Poly = new Map();
    for (const [k, v] of p) {
      const e = expOf(k).map((x, i) => (i > 0 && h.kinds[i - 1] === 'resistor' ? shift[i]! - x : x - shift[i]!));
      out.set(keyOf(e), v);
    }
    return out;
  };
  let num = fix(h.num);
  let den = fix(h.den);
  // integer content
  const gcd = (a: number, b: number): number => (b === 0 ? Math.abs(a) : gcd(b, a % b));
  const coefs = [...num.values(), ...den.values()];
  if (coefs.every(Number.isInteger)) {
    const g = coefs.reduce((a, b) => gcd(a, b), 0);
    if (g > 1) {
      num = new Map([...num].map(([k, v]) => [k, v / g]));
      den = new Map([...den].map(([k, v]) => [k, v / g]));
    }
  }
  // sign: the lowest power of s in the denominator with a positive leading monomial
  const lowest = [...den].sort((a, b) => expOf(a[0])[0]! - expOf(b[0])[0]!)[0]!;
  if (lowest[1] < 0) {
    num = new Map([...num].map(([k, v]) => [k, -v]));
    den = new Map([...den].map(([k, v]) => [k, -v]));
  }
  return { ...h, num, den };
}

function evalPoly(p: Poly, values: readonly number[], s: C): C {
  let out = c(0);
  for (const [k, v] of p) {
    const e = expOf(k);
    let term = c(v);
    for (let i = 1; i < e.length; i++) term = cmul(term, c(values[i - 1]! ** e[i]!));
    for (let j = 0; j < e[0]!; j++) term = cmul(term, s);
    out = cadd(out, term);
  }
  return out;
}

/** The symbolic H at complex s with the part values of `circuit` substituted. */
export function evaluateSymbolic(h: SymbolicTransfer, circuit: Circuit, s: C): C {
  const values = h.symbols.map((n) => circuit.parts.find((p) => p.name === n)?.value ?? NaN);
  return cdiv(evalPoly(h.num, values, s), evalPoly(h.den, values, s));
}

/**
 * True when the symbolic H agrees with `numeric` to `tol` (relative) at `points` pseudo-random
 * complex s of magnitude around `scale` (the network's frequency scale).
 */
export function verifySymbolic(h: SymbolicTransfer, circuit: Circuit, numeric: (s: C) => C, scale: number, points = 8, tol = 1e-9): boolean {
  let x = 0x9e3779b9;
  const rand = () => {
    x = (Math.imul(x, 1664525) + 1013904223) >>> 0;
    return x / 2 ** 32;
  };
  const sc = Number.isFinite(scale) && scale > 0 ? scale : 1;
  let checked = 0;
  for (let k = 0; k < points; k++) {
    const r = sc * (0.3 + 2.7 * rand());
    const phi = 2 * Math.PI * rand();
    const s = c(r * Math.cos(phi), r * Math.sin(phi));
    const want = numeric(s);
    const got = evaluateSymbolic(h, circuit, s);
    const size = Math.hypot(want.re, want.im);
    if (!Number.isFinite(size)) return false;
    const err = Math.hypot(got.re - want.re, got.im - want.im);
    if (size === 0) {
      if (err !== 0) return false;
    } else if (!(err <= tol * size)) return false;
    checked++;
  }
  return checked > 0;
}

const SUPERSCRIPT = ['⁰', '¹', '²', '³', '⁴', '⁵', '⁶', '⁷', '⁸', '⁹'];
const sup = (k: number) =>
  String(k)
    .split('')
    .map((d) => SUPERSCRIPT[Number(d)])
    .join('');
const KIND_RANK: Partial<Record<Part['kind'], number>> = { resistor: 0, inductor: 1, capacitor: 2 };

/** "L1·C1·s² + R1·C1·s + 1": powers of s from the highest, products of symbols (R, then L, then C). */
export function formatSymbolicPoly(p: Poly, h: Pick<SymbolicTransfer, 'symbols' | 'kinds'>): { text: string; terms: number } {
  const order = h.symbols.map((_, i) => i).sort((a, b) => KIND_RANK[h.kinds[a]!]! - KIND_RANK[h.kinds[b]!]! || h.symbols[a]!.localeCompare(h.symbols[b]!, 'en', { numeric: true }));
  const bySPower = new Map<number, [number[], number][]>();
  for (const [k, v] of p) {
    const e = expOf(k);
    const list = bySPower.get(e[0]!) ?? [];
    list.push([e, v]);
    bySPower.set(e[0]!, list);
  }
  const monoText = (e: number[]) =>
    order
      .filter((i) => e[i + 1]! > 0)
      .map((i) => h.symbols[i]! + (e[i + 1]! > 1 ? sup(e[i + 1]!) : ''))
      .join('·');
  const sText = (k: number) => (k === 0 ? '' : k === 1 ? 's' : `s${sup(k)}`);
  const parts: string[] = [];
  let terms = 0;
  for (const k of [...bySPower.keys()].sort((a, b) => b - a)) {
    const list = bySPower.get(k)!;
    // within a power: higher total degree first, then by the symbol order
    const sorted = list
      .map(([e, v]) => ({ v, text: monoText(e), deg: e.slice(1).reduce((a, b) => a + b, 0) }))
      .sort((a, b) => b.deg - a.deg || a.text.localeCompare(b.text, 'en', { numeric: true }));
    const item = (v: number, text: string) => {
      const mag = Math.abs(v);
      const body = text === '' ? String(mag) : mag === 1 ? text : `${mag}·${text}`;
      return { neg: v < 0, body };
    };
    let items = sorted.map(({ v, text }) => item(v, text));
    if (list.length > 1 && k > 0) {
      // a common monomial factor of the group comes out: (Rb + Rc)·Ls·Cb·s³; an all-negative group too
      const common = list[0]![0].map((_, i) => (i === 0 ? 0 : Math.min(...list.map(([e]) => e[i]!))));
      const allNeg = list.every(([, v]) => v < 0);
      if (common.some((x) => x > 0) || allNeg) {
        const inner = list
          .map(([e, v]) => ({ v: allNeg ? -v : v, e: e.map((x, i) => x - common[i]!) }))
          .map(({ v, e }) => ({ v, text: monoText(e), deg: e.slice(1).reduce((a, b) => a + b, 0) }))
          .sort((a, b) => b.deg - a.deg || a.text.localeCompare(b.text, 'en', { numeric: true }));
        const innerText = inner.map(({ v, text }, i) => { const x = item(v, text); return i === 0 ? (x.neg ? `−${x.body}` : x.body) : `${x.neg ? '−' : '+'} ${x.body}`; }).join(' ');
        const factor = monoText(common);
        items = [{ neg: allNeg, body: factor ? `(${innerText})·${factor}` : `(${innerText})` }];
      }
    }
    const join = (xs: { neg: boolean; body: string }[]) => xs.map((x, i) => (i === 0 ? (x.neg ? `−${x.body}` : x.body) : `${x.neg ? '−' : '+'} ${x.body}`)).join(' ');
    const st = sText(k);
    let termText: string;
    let neg = false;
    if (items.length === 1) {
      neg = items[0]!.neg;
      const b = items[0]!.body;
      termText = st === '' ? b : b === '1' ? st : `${b}·${st}`;
    } else {
      const inner = join(items);
      termText = st === '' ? inner : `(${inner})·${st}`;
      if (st === '') {
        // a bare sum: its own terms join the outer list
        terms += items.length;
        parts.push(parts.length === 0 ? inner : inner.startsWith('−') ? `− ${inner.slice(1)}` : `+ ${inner}`);
        continue;
      }
    }
    terms++;
    parts.push(parts.length === 0 ? (neg ? `−${termText}` : termText) : `${neg ? '−' : '+'} ${termText}`);
  }
  return { text: parts.length ? parts.join(' ') : '0', terms };
}

/** "H(s) = N / D" in the part names. */
export function formatSymbolic(h: SymbolicTransfer, name = 'H(s)'): string {
  const num = formatSymbolicPoly(h.num, h);
  const den = formatSymbolicPoly(h.den, h);
  if (num.text === '0') return `${name} = 0`;
  if (den.text === '1') return `${name} = ${num.text}`;
  const n = num.terms > 1 ? `(${num.text})` : num.text;
  const d = den.terms > 1 ? `(${den.text})` : den.text;
  return `${name} = ${n} / ${d}`;
}

/** Longest symbolic expression worth showing. */
export const SYMBOLIC_MAX_CHARS = 200;

/**
 * The symbolic line for one path, or null: only for eligible circuits, only when it matches the
 * numeric transfer function at random complex s to 1e-9, and only when it stays readable.
 */
export function verifiedSymbolicText(circuit: Circuit, label: string, source: string, numeric: (s: C) => C, scale: number): string | null {
  let h: SymbolicTransfer | null;
  try {
    h = symbolicTransfer(circuit, label, source);
  } catch {
    return null;
  }
  if (!h || !verifySymbolic(h, circuit, numeric, scale)) return null;
  const text = formatSymbolic(h);
  return text.length <= SYMBOLIC_MAX_CHARS ? text : null;
}
