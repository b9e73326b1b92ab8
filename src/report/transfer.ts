import type { Circuit } from '../circuit/circuit.js';
import { verifiedSymbolicText } from '../lti/symbolic.js';
import { evaluateRational, type PathTransfer, type Rational } from '../lti/transfer.js';

/**
 * Transfer functions for people: H(s) = 1e8 / (s² + 1e4·s + 1e8), coefficients rounded to four
 * significant digits, highest power first, denominator monic. Coefficients too small to matter at
 * the network's own frequency scale (rounding left-overs of exact cancellations) are left out.
 */

const SUPERSCRIPT = ['⁰', '¹', '²', '³', '⁴', '⁵', '⁶', '⁷', '⁸', '⁹'];

function power(k: number): string {
  if (k === 0) return '';
  if (k === 1) return 's';
  return `s${String(k)
    .split('')
    .map((d) => SUPERSCRIPT[Number(d)])
    .join('')}`;
}

/** 4 significant digits: 1000, 0.001, 1e4, 1.5e-5 (no '+' in exponents). */
export function formatCoefficient(v: number, digits = 4): string {
  if (v === 0) return '0';
  const a = Math.abs(v);
  let text: string;
  if (a >= 1e-3 && a < 1e4) {
    text = Number(v.toPrecision(digits)).toString();
    if (text.includes('e')) text = v.toExponential(digits - 1);
  } else text = v.toExponential(digits - 1);
  if (text.includes('e')) {
    let [m, e] = text.split('e') as [string, string];
    if (m.includes('.')) m = m.replace(/0+$/, '').replace(/\.$/, '');
    text = `${m}e${e.replace('+', '')}`;
    // 9.9996e3 rounds to "1e4" by toExponential already; below 1e4 a plain form reads better
    const back = Number(text);
    if (Math.abs(back) >= 1e-3 && Math.abs(back) < 1e4 && !text.startsWith('1e') && !text.startsWith('-1e')) text = String(back);
  }
  return text.replace(/^-/, '−');
}

/** The frequency scale of a denominator: the largest |den[k]|^(1/(n − k)) (a bound on the pole magnitudes). */
export function frequencyScale(den: readonly number[]): number {
  const n = den.length - 1;
  let rho = 0;
  for (let k = 0; k < n; k++) if (den[k] !== 0) rho = Math.max(rho, Math.abs(den[k]!) ** (1 / (n - k)));
  return rho > 0 ? rho : 1;
}

/** Coefficients with |aₖ|·ρᵏ below 1e-10 of the largest such product are rounding noise. */
function significant(p: readonly number[], rho: number): number[] {
  const size = p.map((v, k) => Math.abs(v) * rho ** k);
  const big = Math.max(0, ...size);
  return p.map((v, k) => (size[k]! > 1e-10 * big ? v : 0));
}

function polyText(p: readonly number[]): { text: string; terms: number } {
  const parts: string[] = [];
  for (let k = p.length - 1; k >= 0; k--) {
    const v = p[k]!;
    if (v === 0) continue;
    const mag = Math.abs(v);
    const coef = formatCoefficient(mag);
    const body = k === 0 ? coef : coef === '1' ? power(k) : `${coef}·${power(k)}`;
    if (parts.length === 0) parts.push(v < 0 ? `−${body}` : body);
    else parts.push(v < 0 ? `− ${body}` : `+ ${body}`);
  }
  return { text: parts.length ? parts.join(' ') : '0', terms: parts.length };
}

/** k when N(s) = k·D(s) to 1e-9 at the frequency scale (the poles cancel), else null. */
function proportional(h: Rational, rho: number): number | null {
  if (h.num.length !== h.den.length || h.den.length < 2) return null;
  const k = h.num[h.num.length - 1]! / h.den[h.den.length - 1]!;
  if (k === 0) return null;
  const size = Math.max(...h.den.map((v, i) => Math.abs(k * v) * rho ** i));
  return h.num.every((v, i) => Math.abs(v - k * h.den[i]!) * rho ** i <= 1e-9 * size) ? k : null;
}

/** "H(s) = N(s) / D(s)" for a rational function. */
export function formatRational(h: Rational, name = 'H(s)'): string {
  const rho = frequencyScale(h.den);
  const k = proportional(h, rho);
  if (k !== null) return `${name} = ${formatCoefficient(k)}`;
  const num = polyText(significant(h.num, rho));
  const den = polyText(significant(h.den, rho));
  if (num.text === '0') return `${name} = 0`;
  const n = num.terms > 1 && den.text !== '1' ? `(${num.text})` : num.text;
  if (den.text === '1') return `${name} = ${n}`;
  const d = den.terms > 1 ? `(${den.text})` : den.text;
  return `${name} = ${n} / ${d}`;
}

/** Unit of a path's gain: V/V, A/V (siemens), V/A (ohms) or A/A. */
export function transferUnit(t: Pick<PathTransfer, 'unit' | 'sourceUnit'>): string {
  return `${t.unit}/${t.sourceUnit}`;
}

/** One path: "v(out) from V1 (V/V): H(s) = 1000 / (s + 1000)". */
export function formatTransfer(t: PathTransfer): string {
  const head = `${t.watch} from ${t.source} (${transferUnit(t)})`;
  const coefs = [...t.h.num, ...t.h.den];
  // a network of high order has coefficients beyond floating-point range (an RC ladder of 100
  // sections: (1/RC)¹⁰⁰): say so rather than print a polynomial that rounded to 0 or ∞
  const lost = coefs.some((c) => !Number.isFinite(c)) || (t.h.num.every((c) => c === 0) && Number.isFinite(t.dcGain) && t.dcGain !== 0);
  if (lost) {
    const dc = Number.isFinite(t.dcGain) ? `; DC gain ${formatCoefficient(t.dcGain)}` : '';
    return `${head}: order ${t.h.den.length - 1}, its coefficients are beyond floating-point range${dc}`;
  }
  return `${head}: ${formatRational(t.h)}`;
}

/**
 * The same path in the part names ("in symbols: H(s) = 1 / (R1·C1·s + 1)"), only for a small circuit
 * without switches, only after it matched the numeric H(s) at random complex s to 1e-9, and only
 * while it stays readable; otherwise null.
 */
export function formatSymbolicTransfer(t: PathTransfer, circuit: Circuit): string | null {
  if (t.from !== undefined) return null;
  if ([...t.h.num, ...t.h.den].some((v) => !Number.isFinite(v)) || t.h.num.every((v) => v === 0)) return null;
  const text = verifiedSymbolicText(circuit, t.watch, t.source, (s) => evaluateRational(t.h, s), frequencyScale(t.h.den));
  // a bare number (H(s) = 1) says nothing the numeric line does not
  return text && !/^H\(s\) = [−\d.]+$/.test(text) ? `in symbols: ${text}` : null;
}

/**
 * A report section: a heading, then one line per path (grouped by switch configuration when there
 * are several); given the circuit, a verified symbolic line under each numeric one where possible.
 */
export function formatTransfers(transfers: readonly PathTransfer[], circuit?: Circuit): string[] {
  if (transfers.length === 0) return [];
  const heading = 'Transfer functions (s in rad/s, each source alone, zero initial state)';
  const lines = [heading, '─'.repeat(heading.length)];
  const froms = [...new Set(transfers.map((t) => t.from))];
  for (const from of froms) {
    if (from !== undefined) lines.push(`  switch configuration from t = ${formatCoefficient(from).replace('−', '-')} s:`);
    for (const t of transfers.filter((x) => x.from === from)) {
      lines.push(`  ${formatTransfer(t)}`);
      const sym = circuit ? formatSymbolicTransfer(t, circuit) : null;
      if (sym) lines.push(`    ${sym}`);
    }
  }
  return lines;
}
