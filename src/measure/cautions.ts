import { formatSI } from '../units/si.js';
import { ProductIntegrals, productsFor } from '../lti/gram.js';
import type { Piece, RunResult } from '../simulate/result.js';
import { evaluatePiecesBefore, pieceDerivative, pieceValue } from './evaluate.js';
import { derivativeTerms, extremaOnGrid, type Located } from './grid.js';
import { clipPieces } from './peak.js';
import { clipTable, sameEnd } from './repeat.js';
import { emptyGroups, groupsBound, groupsDerivative, groupTermsAlike } from '../lti/term.js';
import { StressGrids } from './stress.js';

/**
 * Safety cautions drawn from a run: hazardous voltages, stored energy, slow discharge, interrupted
 * inductor current and very fast edges. Every threshold names where it comes from. These are
 * prompts to look closer, not a safety assessment; the standing safety notice is printed elsewhere.
 */
export interface Caution {
  /** stable identifier, e.g. "elv-dc" */
  id: string;
  severity: 'danger' | 'warning' | 'info';
  title: string;
  detail: string;
  /** the limit that was crossed, in words, e.g. "120 V peak" */
  threshold?: string;
  /** where the limit comes from */
  source: string;
  parts?: string[];
}

/**
 * How long a capacitor takes to fall below a safe voltage once the sources are removed
 * (computed by the discharge analysis). `from` is the capacitor voltage when the sources are
 * removed (V); `time` is in seconds after that, null when it never gets there (no discharge path).
 */
export interface DischargeInfo {
  part: string;
  from: number;
  safeVoltage: number;
  time: number | null;
}

/** Thresholds, each with its source. */
export const LIMITS = {
  /** ripple-free DC, upper edge of the extra-low-voltage band */
  elvDC: { value: 120, source: 'IEC 61140 / IEC 60449 voltage bands (extra-low voltage: 120 V ripple-free DC), from memory' },
  /** AC RMS, upper edge of the extra-low-voltage band */
  elvAC: { value: 50, source: 'IEC 61140 / IEC 60449 voltage bands (extra-low voltage: 50 V AC RMS), from memory' },
  /** stored energy in a capacitor above which it counts as hazardous to touch */
  storedEnergy: { value: 0.35, source: 'IEC 61010-1 hazardous-live levels for charged capacitance (350 mJ), from memory' },
  /** DC level commonly taken as safe to touch */
  safeDC: { value: 60, source: 'common practice: 60 V DC, the touch-safe DC level of SELV/ES1 circuits (IEC 62368-1), from memory' },
  /** discharge time after the sources are removed */
  dischargeWarn: { value: 1, source: 'common practice: accessible parts below 60 V within 1 s of disconnection (as IEC 60335-1 asks of plug pins), from memory' },
  dischargeDanger: { value: 5, source: 'common practice: below 60 V within 5 s of switching off (as IEC 60204-1 asks of machinery), from memory' },
  /** slew rate above which edges couple and radiate */
  fastEdge: { value: 1e9, source: 'common practice: edges faster than about 1 V/ns couple through stray capacitance and need EMI care' },
} as const;

/** Relative drop of an inductor current above which it counts as interrupted (below: rounding). */
const INTERRUPT_REL = 1e-6;

export function cautions(result: RunResult, extra: { discharge?: DischargeInfo[] } = {}): Caution[] {
  const out: Caution[] = [];
  const parts = result.parts ?? [];
  const partOf = (name: string) => result.circuit.parts.find((p) => p.name === name);
  const span = result.span;
  const grids = searchGrids(result);
  const memo = new Map<Piece[], Extremes>();
  const track = (pieces: Piece[]) => {
    let e = memo.get(pieces);
    if (!e) memo.set(pieces, (e = extremes(pieces, result, grids)));
    return e;
  };

  // (a) voltages beyond extra-low voltage
  const dcOver: { part: string; peak: number; time: number }[] = [];
  const acOver: { part: string; rms: number }[] = [];
  const window = periodicWindow(result);
  // the parts share the run's exponents: one table of exponent integrals for all (lti/gram.ts)
  const products = productsFor(result.circuit);
  const [start, end] = spanOf(result);
  for (const p of parts) {
    if (p.voltage.length === 0) continue;
    // the extremes matter only where they could exceed 120 V: a bound of |v| at or below it
    // settles that without locating them
    if (boundOf(p.voltage, start, end, false) * (1 + BOUND_SLACK) > LIMITS.elvDC.value) {
      const { peak, valley } = track(p.voltage);
      const big = Math.abs(peak.value) >= Math.abs(valley.value) ? peak : valley;
      if (Math.abs(big.value) > LIMITS.elvDC.value) dcOver.push({ part: p.part, peak: big.value, time: big.time });
    }
    if (window) {
      const rms = rmsOver(p.voltage, window.a, window.b, products);
      if (rms > LIMITS.elvAC.value) acOver.push({ part: p.part, rms });
    }
  }
  if (dcOver.length) {
    dcOver.sort((x, y) => Math.abs(y.peak) - Math.abs(x.peak));
    out.push({
      id: 'elv-dc',
      severity: 'danger',
      title: 'Voltage above extra-low voltage',
      detail:
        `${list(dcOver.map((o) => `${o.part} reaches ${formatSI(o.peak, 'V')} at t = ${formatSI(o.time, 's')}`))}. ` +
        'Above 120 V DC, touching live parts can drive a dangerous current through the body: insulate, guard and label.',
      threshold: `|v| > ${formatSI(LIMITS.elvDC.value, 'V', { trim: true })} peak`,
      source: LIMITS.elvDC.source,
      parts: dcOver.map((o) => o.part),
    });
  }
  if (acOver.length && window) {
    acOver.sort((x, y) => y.rms - x.rms);
    out.push({
      id: 'elv-ac',
      severity: 'danger',
      title: 'AC voltage above extra-low voltage',
      detail:
        `${list(acOver.map((o) => `${o.part} has ${formatSI(o.rms, 'V')} RMS`))} ` +
        `(${window.what}). Above 50 V AC RMS, contact with live parts is dangerous: insulate, guard and label.`,
      threshold: `${formatSI(LIMITS.elvAC.value, 'V', { trim: true })} RMS`,
      source: LIMITS.elvAC.source,
      parts: acOver.map((o) => o.part),
    });
  }

  // (b) energy stored in capacitors, and charge left at the end of the span
  for (const p of parts) {
    const part = partOf(p.part);
    if (!part || part.kind !== 'capacitor' || p.voltage.length === 0) continue;
    const vmax = boundOf(p.voltage, start, end, false) * (1 + BOUND_SLACK);
    const tr = 0.5 * part.value * vmax * vmax > LIMITS.storedEnergy.value ? track(p.voltage) : undefined;
    const big = tr ? (Math.abs(tr.peak.value) >= Math.abs(tr.valley.value) ? tr.peak : tr.valley) : { value: 0, time: start };
    const energy = 0.5 * part.value * big.value * big.value;
    if (tr && energy > LIMITS.storedEnergy.value) {
      // above the touch-safe DC level the charge can shock; below it a short (a dropped tool) still sparks and burns
      const shock = Math.abs(big.value) > LIMITS.safeDC.value;
      out.push({
        id: 'stored-energy',
        severity: shock ? 'danger' : 'warning',
        title: `${p.part} stores a hazardous energy`,
        detail:
          `${p.part} (${formatSI(part.value, 'F')}) holds up to ½·C·v² = ${formatSI(energy, 'J')} at ${formatSI(big.value, 'V')} (t = ${formatSI(big.time, 's')}). ` +
          (shock
            ? 'A discharge through the body or a tool can shock or burn: provide a bleeder and measure before touching.'
            : 'Below 60 V it is not a shock hazard, but a short circuit (a dropped tool) releases it as a spark or burn.'),
        threshold: `½·C·v² > ${formatSI(LIMITS.storedEnergy.value, 'J', { trim: true })}`,
        source: LIMITS.storedEnergy.source,
        parts: [p.part],
      });
    }
    const vEnd = tr ? tr.end : endOf(p.voltage, start, end);
    if (Math.abs(vEnd) > LIMITS.safeDC.value) {
      out.push({
        id: 'charged-at-end',
        severity: 'warning',
        title: `${p.part} is still charged at the end of the span`,
        detail: `${p.part} is at ${formatSI(vEnd, 'V')} at t = ${formatSI(span, 's')} (½·C·v² = ${formatSI(0.5 * part.value * vEnd * vEnd, 'J')}). Treat it as live until measured.`,
        threshold: `|v| > ${formatSI(LIMITS.safeDC.value, 'V', { trim: true })} DC`,
        source: LIMITS.safeDC.source,
        parts: [p.part],
      });
    }
  }

  // (c) discharge after the sources are removed
  for (const d of extra.discharge ?? []) {
    const safe = formatSI(d.safeVoltage, 'V', { trim: true });
    // below the safe level with nothing to discharge it: it stays there, which is not a hazard
    if (d.time === null && Math.abs(d.from) < d.safeVoltage) continue;
    if (d.time === null) {
      out.push({
        id: 'no-discharge-path',
        severity: 'danger',
        title: `${d.part} has no discharge path`,
        detail: `With the sources removed, ${d.part} (from ${formatSI(d.from, 'V')}) never falls below ${safe}: nothing discharges it. Add a bleeder resistor.`,
        threshold: `below ${safe} within ${formatSI(LIMITS.dischargeDanger.value, 's', { trim: true })}`,
        source: LIMITS.dischargeDanger.source,
        parts: [d.part],
      });
    } else if (d.time > LIMITS.dischargeWarn.value) {
      const danger = d.time > LIMITS.dischargeDanger.value;
      const lim = danger ? LIMITS.dischargeDanger : LIMITS.dischargeWarn;
      out.push({
        id: 'slow-discharge',
        severity: danger ? 'danger' : 'warning',
        title: `${d.part} discharges slowly`,
        detail: `With the sources removed, ${d.part} takes ${formatSI(d.time, 's')} to fall from ${formatSI(d.from, 'V')} below ${safe}. A smaller bleeder resistance discharges it faster (at the cost of standing loss).`,
        threshold: `below ${safe} within ${formatSI(lim.value, 's', { trim: true })}`,
        source: lim.source,
        parts: [d.part],
      });
    }
  }

  // (d) interrupted inductor current
  for (const ev of result.events ?? []) {
    for (const j of ev.jumps) {
      if (j.kind !== 'inductor-current') continue;
      const drop = Math.abs(j.before) - Math.abs(j.after);
      if (!(drop > INTERRUPT_REL * Math.abs(j.before))) continue;
      const L = partOf(j.part)?.value ?? NaN;
      const energy = 0.5 * L * (j.before * j.before - j.after * j.after);
      out.push({
        id: 'interrupted-inductor',
        severity: 'danger',
        title: `${j.part}'s current is interrupted`,
        detail:
          `At t = ${formatSI(ev.t, 's')} the current of ${j.part} is forced from ${formatSI(j.before, 'A')} to ${formatSI(j.after, 'A')}, ` +
          `releasing ½·L·(i₁² − i₂²) = ${formatSI(energy, 'J')} at once. An ideal model has no bounded voltage for this; ` +
          'real parts arc or avalanche. Add a freewheel path or a snubber.',
        threshold: 'any sudden drop of inductor current',
        source: 'physics: v = L·di/dt is unbounded for an instant change of current',
        parts: [j.part],
      });
    }
  }

  // (e) very fast edges
  const edges: { what: string; part?: string; rate: number; time: number }[] = [];
  const consider = (what: string, pieces: Piece[], part?: string) => {
    // a bound of |dv/dt| at or below the limit settles it without locating the steepest point
    if (!(boundOf(pieces, start, end, true) * (1 + BOUND_SLACK) > LIMITS.fastEdge.value)) return;
    const e = maxSlope(result, pieces, grids);
    if (e && Math.abs(e.rate) > LIMITS.fastEdge.value) edges.push({ what, part, rate: e.rate, time: e.time });
  };
  for (const t of result.traces) if (t.unit === 'V') consider(t.label, t.pieces);
  for (const p of parts) consider(`v(${p.part})`, p.voltage, p.part);
  if (edges.length) {
    edges.sort((x, y) => Math.abs(y.rate) - Math.abs(x.rate));
    const seen = new Set<string>();
    const unique = edges.filter((e) => (seen.has(e.what) ? false : (seen.add(e.what), true)));
    out.push({
      id: 'fast-edge',
      severity: 'warning',
      title: 'Very fast voltage edges',
      detail:
        `${list(unique.map((e) => `${e.what} slews at ${formatSI(Math.abs(e.rate) * 1e-9, 'V/ns')} (t = ${formatSI(e.time, 's')})`))}. ` +
        'Fast edges couple through stray capacitance and radiate: keep loops small, consider slowing the edge or adding a snubber. ' +
        '(Ideal instant steps of the sources are not counted.)',
      threshold: '|dv/dt| > 1 V/ns',
      source: LIMITS.fastEdge.source,
      parts: [...new Set(unique.flatMap((e) => (e.part ? [e.part] : [])))],
    });
  }
  return out;
}

/** Relative slack on the bounds below: covers their own rounding. */
const BOUND_SLACK = 1e-9;

/**
 * An upper bound of |y| (or of |dy/dt|) over the span, impulses left out: per piece
 * Σ|c_k|·τᵏ·e^(Re κ·τ) at its worse end (lti/term.ts groupsBound). Infinity when a piece starts
 * after its stretch (no bound from τ ≥ 0 then). Cheap: one exponential per group and piece.
 */
function boundOf(pieces: readonly Piece[], start: number, end: number, slope: boolean): number {
  let b = 0;
  const G = emptyGroups();
  const D = emptyGroups();
  // a piece repeating an earlier one's term array over the same τ range (repeat.ts) has its bound
  // (the ulps by which the range may be longer move it by far less than BOUND_SLACK)
  const c = clipTable(pieces, start, end);
  const done = new Uint8Array(c.count);
  for (let k = 0; k < c.count; k++) {
    const piece = pieces[c.index[k]!]!;
    const a = c.lo[k]! - piece.t0;
    if (a < 0) return Infinity;
    const r = c.rep[k]!;
    if (r !== k && done[r] === 1) {
      const f = pieces[c.index[r]!]!;
      if (c.lo[r]! - f.t0 === a && sameEnd(c.hi[k]! - piece.t0, c.hi[r]! - f.t0, c.hi[k]!)) continue;
    }
    done[k] = 1;
    groupTermsAlike([piece.terms], [G]);
    const x = groupsBound(slope ? groupsDerivative(G, D) : G, a, c.hi[k]! - piece.t0);
    // NaN (a NaN coefficient): no bound
    if (Number.isNaN(x)) return Infinity;
    if (x > b) b = x;
  }
  return b;
}

/** The value at the end of the span (the last piece at its end; NaN without pieces), as `extremes` gives it. */
function endOf(pieces: readonly Piece[], start: number, end: number): number {
  const c = clipPieces(pieces, start, end);
  const last = c[c.length - 1];
  return last ? pieceValue(last.piece, last.hi) : NaN;
}

/** "a, b and 3 more" */
function list(items: string[], max = 4): string {
  const shown = items.slice(0, max);
  const more = items.length - shown.length;
  return shown.join('; ') + (more > 0 ? `; and ${more} more` : '');
}

/**
 * The window to take an AC RMS over: the last full period of the periodic sources (sine without
 * decay, unending or still running pulse trains), or the whole span when it is shorter than a period
 * or the periods differ. undefined without a periodic source.
 */
export function periodicWindow(result: RunResult): { a: number; b: number; what: string } | undefined {
  const span = result.span;
  const periods: number[] = [];
  for (const p of result.circuit.parts) {
    for (const t of p.waveform?.terms ?? []) {
      if (t.kind === 'sine' && t.decay === Infinity && t.freq > 0 && t.at < span) periods.push(1 / t.freq);
      if (t.kind === 'pulse' && t.period > 0 && t.start + t.cycles * t.period > span && t.start < span) periods.push(t.period);
    }
  }
  if (periods.length === 0) return undefined;
  const T = Math.max(...periods);
  const commensurate = periods.every((q) => Math.abs(T / q - Math.round(T / q)) < 1e-9 * (T / q));
  if (commensurate && T <= span) return { a: span - T, b: span, what: `over the last period, ${formatSI(T, 's')}` };
  return { a: 0, b: span, what: 'over the whole span' };
}

/** RMS over [a, b] from the exact ∫v² dt of the closed form (impulses left out). */
export function rmsOver(pieces: Piece[], a: number, b: number, products: ProductIntegrals = new ProductIntegrals()): number {
  if (!(b > a)) return Math.abs(evaluatePiecesBefore(pieces, b));
  let sum = 0;
  pieces.forEach((p, i) => {
    const lo = Math.max(a, p.t0);
    const end = i + 1 < pieces.length ? pieces[i + 1]!.t0 : Math.max(p.t1, b);
    const hi = Math.min(b, end);
    if (!(hi > lo)) return;
    products.pair(p.terms, p.terms, hi - p.t0);
    sum += products.gg;
    products.pair(p.terms, p.terms, lo - p.t0);
    sum -= products.gg;
  });
  return Math.sqrt(Math.max(0, sum) / (b - a));
}

interface Extremes {
  peak: Located;
  valley: Located;
  /** the value at the end of the span */
  end: number;
}

/** The search grids for the cautions: the sample times, and the time scales of every part voltage and watch. */
function searchGrids(result: RunResult): StressGrids {
  const g = new StressGrids(result.times);
  const [start, end] = spanOf(result);
  for (const p of result.parts ?? []) g.include(p.voltage, start, end);
  for (const t of result.traces) g.include(t.pieces, start, end);
  return g;
}

function spanOf(result: RunResult): [number, number] {
  const n = result.times.length;
  return n > 0 ? [result.times[0]!, result.times[n - 1]!] : [0, 0];
}

/**
 * Largest and smallest value of a closed form over the span (impulses left out), located exactly:
 * piece ends and the roots of the derivative, bracketed on a shared grid and refined by Brent's method.
 */
function extremes(pieces: readonly Piece[], result: RunResult, grids: StressGrids): Extremes {
  const [start, end] = spanOf(result);
  const peak: Located = { value: -Infinity, time: start };
  const valley: Located = { value: Infinity, time: start };
  let last = NaN;
  for (const { piece, lo, hi } of clipPieces(pieces, start, end)) {
    const g = grids.grid(piece, lo, hi);
    const f = (t: number) => pieceValue(piece, t);
    const { max, min } = extremaOnGrid(g.ts, g.sum(derivativeTerms(piece)), f, (t) => pieceDerivative(piece, t));
    if (max.value > peak.value) Object.assign(peak, max);
    if (min.value < valley.value) Object.assign(valley, min);
    last = f(hi);
  }
  if (peak.value === -Infinity) peak.value = NaN;
  if (valley.value === Infinity) valley.value = NaN;
  return { peak, valley, end: last };
}

/**
 * Largest |dv/dt| over the span, on the exact closed form: the derivative is again a closed form,
 * and its extrema are located by root-finding its own derivative (the measurement track).
 * Jumps between pieces (ideal steps) and impulses are not counted.
 */
export function maxSlope(result: RunResult, pieces: Piece[], grids?: StressGrids): { rate: number; time: number } | undefined {
  if (pieces.length === 0) return undefined;
  const d: Piece[] = pieces.map((p) => ({ t0: p.t0, t1: p.t1, impulseArea: 0, terms: derivativeTerms(p) }));
  let g = grids;
  if (!g) {
    g = new StressGrids(result.times);
    const [start, end] = spanOf(result);
    g.include(pieces, start, end);
  }
  const { peak, valley } = extremes(d, result, g);
  if (Number.isNaN(peak.value)) return undefined;
  return Math.abs(peak.value) >= Math.abs(valley.value) ? { rate: peak.value, time: peak.time } : { rate: valley.value, time: valley.time };
}

const SEVERITY_ORDER: Record<Caution['severity'], number> = { danger: 0, warning: 1, info: 2 };

const runCache = new WeakMap<RunResult, Caution[]>();

/**
 * The cautions of a run, with the run's own discharge analysis (RunResult.discharge), danger first,
 * then warnings, then notes (each group in the order found). Computed once per result.
 */
export function runCautions(result: RunResult): Caution[] {
  const hit = runCache.get(result);
  if (hit) return hit;
  const list = cautions(result, { discharge: result.discharge ?? [] });
  const out = list
    .map((c, i) => ({ c, i }))
    .sort((x, y) => SEVERITY_ORDER[x.c.severity] - SEVERITY_ORDER[y.c.severity] || x.i - y.i)
    .map((x) => x.c);
  runCache.set(result, out);
  return out;
}
