import type { PartKind } from '../circuit/circuit.js';
import { ProductIntegrals, productsFor } from '../lti/gram.js';
import { termsValue } from '../lti/term.js';
import { JointPeaks } from './joint-peaks.js';
import type { Piece, RunResult } from '../simulate/result.js';
import { evaluatePiecesBefore, pieceDerivative, pieceValue } from './evaluate.js';
import { switchVoltagesByKVL, withJumpImpulses } from './kvl.js';
import { GridSet, derivativeTerms, peakOnGrid, type GridBasis } from './grid.js';
import { TIE, clipPieces, termsOmega, termsRate, type MagnitudePeak } from './peak.js';
import { clipTable, sameEnd } from './repeat.js';

/**
 * What each part goes through over the analysed span, from the exact closed forms of its voltage
 * and current (RunResult.parts):
 *
 * - peak |v| and peak |i|, each with its time (extrema by root-finding the derivative per piece);
 * - peak instantaneous power |v·i| with its time (root of v'·i + v·i' per piece); for resistors and
 *   switches this is the peak dissipation;
 * - heat: ∫ v·i dt over the span, resistors and switches only (closed-form integral per piece);
 * - I²t = ∫ i² dt over the span (the pulse figure of fuses and wires);
 * - peak stored energy ½·C·v² (capacitors) or ½·L·i² (inductors), at the peak |v| or |i|.
 *
 * A Dirac impulse in v or i (an ideal step straight into a capacitor, an inductor current cut with
 * no path) has no finite peak, and makes the power, heat or I²t it enters unbounded. Those figures
 * are Infinity here and listed in `unbounded`; no finite stand-in is made up.
 * Energy lost inside switching instants (RunResult.events) is not part of these figures.
 * A switch's voltage is taken by Kirchhoff's voltage law around the other parts, and the state
 * jumps of switching instants count as the impulses they are (see kvl.ts).
 */
export type StressQuantity = 'voltage' | 'current' | 'power' | 'energy' | 'i2t' | 'stored';

export interface PartStress {
  part: string;
  kind: PartKind;
  /** peak |v|, V, and when (Infinity: a Dirac impulse) */
  voltage: MagnitudePeak;
  /** peak |i|, A, and when */
  current: MagnitudePeak;
  /** peak |v·i|, W, and when */
  power: MagnitudePeak;
  /** J dissipated over the span: resistors and switches; null for other parts */
  energy: number | null;
  /** A²·s, ∫ i² dt over the span */
  i2t: number;
  /** J, ½·C·(peak |v|)² or ½·L·(peak |i|)²; null for other parts */
  storedPeak: number | null;
  /** the figures above that a Dirac impulse makes unbounded (their value is Infinity) */
  unbounded: StressQuantity[];
}

type PartForms = NonNullable<RunResult['parts']>[number];

/** Relative size below which an impulse area or a value counts as rounding noise. */
const NOISE = 1e-12;

interface Impulse {
  t: number;
  area: number;
}

function impulsesIn(pieces: readonly Piece[], start: number, end: number, scale: number): Impulse[] {
  const floor = NOISE * scale * Math.max(end - start, 0);
  const out: Impulse[] = [];
  for (const p of pieces) {
    if (p.impulseArea !== 0 && p.t0 >= start && p.t0 <= end && Math.abs(p.impulseArea) > floor) out.push({ t: p.t0, area: p.impulseArea });
  }
  return out;
}

/**
 * The grid and the time scales it must resolve for each stretch between piece boundaries: the
 * fastest oscillation and decay among all the given signals there, doubled (a product v·i holds
 * the sum of the frequencies and rates of its factors). Sharing one grid per stretch lets every
 * part reuse the same precomputed exponentials (grid.ts).
 */
export class StressGrids {
  private readonly set: GridSet;
  /**
   * The stretches of the first list included, in order (every part's forms share the run's piece
   * boundaries: looked up by bisection, no hashing of 10⁵ stretches), with the time scales of
   * every list over them; stretches of other lists that are not among them, by start time.
   */
  private ord: { t0: Float64Array; lo: Float64Array; hi: Float64Array; omega: Float64Array; rate: Float64Array; count: number } | null = null;
  private readonly scales = new Map<number, Scale[]>();

  constructor(times?: ArrayLike<number>) {
    this.set = new GridSet(times);
  }

  /** Ordinal of the stretch [lo, hi] of a piece starting at t0 among the first list's, or −1. */
  private ordinal(t0: number, lo: number, hi: number, hint = -1): number {
    const o = this.ord;
    if (!o) return -1;
    if (hint >= 0 && hint < o.count && o.lo[hint] === lo && o.hi[hint] === hi && o.t0[hint] === t0) return hint;
    let a = 0;
    let b = o.count;
    while (a < b) {
      const mid = (a + b) >> 1;
      if (o.lo[mid]! < lo) a = mid + 1;
      else b = mid;
    }
    for (let k = a; k < o.count && o.lo[k] === lo; k++) if (o.hi[k] === hi && o.t0[k] === t0) return k;
    return -1;
  }

  private find(t0: number, lo: number, hi: number, make: boolean): Scale | undefined {
    let list = this.scales.get(t0);
    if (list) {
      for (const s of list) if (s.lo === lo && s.hi === hi) return s;
    } else if (make) this.scales.set(t0, (list = []));
    if (!make) return undefined;
    const s: Scale = { lo, hi, omega: 0, rate: 0 };
    list!.push(s);
    return s;
  }

  /** Takes the time scales of these pieces into account (call for every signal before searching). */
  include(pieces: readonly Piece[], start: number, end: number): void {
    // (pieces sharing a term array share its scales: worked out once)
    const c = clipTable(pieces, start, end);
    const om = new Float64Array(c.count);
    const ra = new Float64Array(c.count);
    for (let k = 0; k < c.count; k++) {
      const piece = pieces[c.index[k]!]!;
      const r = c.rep[k]!;
      om[k] = r === k ? termsOmega(piece.terms) : om[r]!;
      ra[k] = r === k ? termsRate(piece.terms) : ra[r]!;
    }
    if (!this.ord) {
      const t0 = new Float64Array(c.count);
      for (let k = 0; k < c.count; k++) t0[k] = pieces[c.index[k]!]!.t0;
      this.ord = { t0, lo: c.lo.slice(0, c.count), hi: c.hi.slice(0, c.count), omega: om, rate: ra, count: c.count };
      return;
    }
    const o = this.ord;
    for (let k = 0; k < c.count; k++) {
      const t0 = pieces[c.index[k]!]!.t0;
      const j = this.ordinal(t0, c.lo[k]!, c.hi[k]!, k);
      if (j >= 0) {
        o.omega[j] = Math.max(o.omega[j]!, om[k]!);
        o.rate[j] = Math.max(o.rate[j]!, ra[k]!);
      } else {
        const s = this.find(t0, c.lo[k]!, c.hi[k]!, true)!;
        s.omega = Math.max(s.omega, om[k]!);
        s.rate = Math.max(s.rate, ra[k]!);
      }
    }
  }

  /** The fastest oscillation and decay of the signals over this stretch (those of the piece when not included). */
  scale(piece: Piece, lo: number, hi: number, hint = -1): { omega: number; rate: number } {
    const j = this.ordinal(piece.t0, lo, hi, hint);
    if (j >= 0) return { omega: this.ord!.omega[j]!, rate: this.ord!.rate[j]! };
    return this.find(piece.t0, lo, hi, false) ?? { omega: termsOmega(piece.terms), rate: termsRate(piece.terms) };
  }

  grid(piece: Piece, lo: number, hi: number): GridBasis {
    const s = this.scale(piece, lo, hi);
    return this.set.get(piece.t0, lo, hi, 2 * s.omega, 2 * s.rate);
  }
}

interface Scale {
  lo: number;
  hi: number;
  omega: number;
  rate: number;
}

/** A piece's value and derivative on a grid, computed once per part. */
class OnGrid {
  private readonly memo = new Map<Piece, { g: GridBasis; v?: Float64Array; d?: Float64Array }>();
  constructor(private readonly grids: StressGrids) {}
  private entry(piece: Piece, lo: number, hi: number) {
    const g = this.grids.grid(piece, lo, hi);
    let e = this.memo.get(piece);
    if (!e || e.g !== g) {
      e = { g };
      this.memo.set(piece, e);
    }
    return e;
  }
  grid(piece: Piece, lo: number, hi: number): GridBasis {
    return this.entry(piece, lo, hi).g;
  }
  value(piece: Piece, lo: number, hi: number): Float64Array {
    const e = this.entry(piece, lo, hi);
    return (e.v ??= e.g.sum(piece.terms));
  }
  derivative(piece: Piece, lo: number, hi: number): Float64Array {
    const e = this.entry(piece, lo, hi);
    return (e.d ??= e.g.sum(derivativeTerms(piece)));
  }
}

function keepLarger(best: MagnitudePeak, p: MagnitudePeak): void {
  if (p.value > best.value * (1 + TIE)) {
    best.value = p.value;
    best.time = p.time;
  }
}

function peakOn(pieces: readonly Piece[], start: number, end: number, on: OnGrid): MagnitudePeak {
  const best: MagnitudePeak = { value: 0, time: start };
  for (const { piece, lo, hi } of clipPieces(pieces, start, end)) {
    const g = on.grid(piece, lo, hi);
    keepLarger(best, peakOnGrid(g.ts, on.derivative(piece, lo, hi), (t) => pieceValue(piece, t), (t) => pieceDerivative(piece, t)));
  }
  return best;
}

/**
 * Peak |y| of the ordinary (impulse-free) part of a closed form over [start, end]: the ends of each
 * piece and every root of the derivative (bracketed on a grid, refined by Brent's method).
 */
export function peakOfPieces(pieces: readonly Piece[], start: number, end: number, times?: ArrayLike<number>, grids?: StressGrids): MagnitudePeak {
  let g = grids;
  if (!g) {
    g = new StressGrids(times);
    g.include(pieces, start, end);
  }
  return peakOn(pieces, start, end, new OnGrid(g));
}

/** Peak |v·i| of the ordinary parts, piece by piece (the two lists share their boundaries). */
function peakOfProduct(v: readonly Piece[], i: readonly Piece[], start: number, end: number, on: OnGrid): MagnitudePeak {
  const best: MagnitudePeak = { value: 0, time: start };
  for (const { piece: pv, index, lo, hi } of clipPieces(v, start, end)) {
    const pi = i[index];
    if (!pi) continue;
    const g = on.grid(pv, lo, hi);
    const V = on.value(pv, lo, hi);
    const DV = on.derivative(pv, lo, hi);
    // the lists share their boundaries, so i normally has the same grid; if not, i is summed on v's
    const same = on.grid(pi, lo, hi) === g;
    const I = same ? on.value(pi, lo, hi) : g.sum(pi.terms);
    const DI = same ? on.derivative(pi, lo, hi) : g.sum(derivativeTerms(pi));
    const DP = new Float64Array(g.length);
    for (let k = 0; k < DP.length; k++) DP[k] = DV[k]! * I[k]! + V[k]! * DI[k]!;
    keepLarger(
      best,
      peakOnGrid(
        g.ts,
        DP,
        (t) => pieceValue(pv, t) * pieceValue(pi, t),
        (t) => pieceDerivative(pv, t) * pieceValue(pi, t) + pieceValue(pv, t) * pieceDerivative(pi, t),
      ),
    );
  }
  return best;
}

/** ∫ v·i dt and ∫ i² dt over [start, end], piece by piece in closed form (the lists share their boundaries). */
function integralsOf(v: readonly Piece[], i: readonly Piece[], start: number, end: number, products: ProductIntegrals): { vi: number; ii: number } {
  let vi = 0;
  let ii = 0;
  // a pair repeating an earlier pair's term arrays from τ = 0 to an end a few ulps away (repeat.ts)
  // has its integrals plus v(b)·i(b)·d and i(b)²·d
  const c = clipTable(v, start, end);
  const VI = new Float64Array(c.count);
  const II = new Float64Array(c.count);
  const B = new Float64Array(c.count).fill(NaN);
  const VB = new Float64Array(c.count);
  const IB = new Float64Array(c.count);
  for (let k = 0; k < c.count; k++) {
    const index = c.index[k]!;
    const pv = v[index]!;
    const pi = i[index];
    const lo = c.lo[k]!;
    const hi = c.hi[k]!;
    if (!pi || !(hi > lo)) continue;
    const b = hi - pv.t0;
    const r = c.rep[k]!;
    if (r !== k && lo === pv.t0 && i[c.index[r]!]?.terms === pi.terms && sameEnd(b, B[r]!, hi)) {
      const d = b - B[r]!;
      vi += VI[r]! + VB[r]! * IB[r]! * d;
      ii += II[r]! + IB[r]! * IB[r]! * d;
      continue;
    }
    products.pair(pv.terms, pi.terms, b);
    vi += products.fg;
    ii += products.gg;
    if (lo > pv.t0) {
      products.pair(pv.terms, pi.terms, lo - pv.t0);
      vi -= products.fg;
      ii -= products.gg;
    } else if (r === k) {
      B[k] = b;
      VI[k] = products.fg;
      II[k] = products.gg;
      VB[k] = termsValue(pv.terms, b);
      IB[k] = termsValue(pi.terms, b);
    }
  }
  return { vi, ii };
}

/**
 * Peak |v|, |i| and |v·i|: when the two lists share their pieces (as the run's per-part forms
 * do), all three per piece on one grid (joint-peaks.ts); otherwise each list on its own.
 */
function peaks(forms: PartForms, start: number, end: number, g: StressGrids, joint: JointPeaks): { v: MagnitudePeak; i: MagnitudePeak; power: MagnitudePeak } {
  const vc = clipPieces(forms.voltage, start, end);
  const ic = clipPieces(forms.current, start, end);
  const aligned = vc.length === ic.length && vc.every((x, k) => x.index === ic[k]!.index && x.lo === ic[k]!.lo && x.hi === ic[k]!.hi && x.piece.t0 === ic[k]!.piece.t0);
  if (!aligned) {
    const on = new OnGrid(g);
    return { v: peakOn(forms.voltage, start, end, on), i: peakOn(forms.current, start, end, on), power: peakOfProduct(forms.voltage, forms.current, start, end, on) };
  }
  const v: MagnitudePeak = { value: 0, time: start };
  const i: MagnitudePeak = { value: 0, time: start };
  const power: MagnitudePeak = { value: 0, time: start };
  // a pair of pieces with the same term arrays over the same τ range (repeat.ts) as a pair searched
  // before has the same peaks (to rounding), which cannot beat those by 1e-12: not searched again
  const rep = clipTable(forms.voltage, start, end).rep;
  const searched = new Uint8Array(vc.length);
  vc.forEach(({ piece, lo, hi }, k) => {
    const r = rep[k]!;
    if (r !== k && searched[r] === 1 && ic[k]!.piece.terms === ic[r]!.piece.terms) {
      const f = vc[r]!;
      if (lo - piece.t0 === f.lo - f.piece.t0 && sameEnd(hi - piece.t0, f.hi - f.piece.t0, hi)) return;
    }
    searched[k] = 1;
    const s = g.scale(piece, lo, hi, k);
    joint.search(piece, ic[k]!.piece, lo, hi, s.omega, s.rate, v, i, power);
  });
  return { v, i, power };
}

/** Whether the other signal is (within noise) zero on both sides of t. */
function zeroAround(pieces: readonly Piece[], t: number, scale: number): boolean {
  const floor = NOISE * scale;
  const idx = pieces.findIndex((p) => p.t0 === t);
  const after = idx >= 0 ? pieceValue(pieces[idx]!, t) : evaluatePiecesBefore(pieces, t);
  return Math.abs(evaluatePiecesBefore(pieces, t)) <= floor && Math.abs(after) <= floor;
}

/** The stress figures of one part over [start, end]. */
export function partStress(
  forms: PartForms,
  kind: PartKind,
  value: number,
  start: number,
  end: number,
  times?: ArrayLike<number>,
  grids?: StressGrids,
  products: ProductIntegrals = new ProductIntegrals(),
  joint?: JointPeaks,
): PartStress {
  let g = grids;
  if (!g) {
    g = new StressGrids(times);
    g.include(forms.voltage, start, end);
    g.include(forms.current, start, end);
  }
  const { v, i, power } = peaks(forms, start, end, g, joint ?? new JointPeaks(times));
  const dissipative = kind === 'resistor' || kind === 'switch';
  const integrals = integralsOf(forms.voltage, forms.current, start, end, products);
  let energy: number | null = dissipative ? integrals.vi : null;
  let i2t = integrals.ii;
  const unbounded: StressQuantity[] = [];

  const vImp = impulsesIn(forms.voltage, start, end, v.value);
  const iImp = impulsesIn(forms.current, start, end, i.value);
  const firstAt = (list: Impulse[]) => Math.min(...list.map((x) => x.t));
  if (vImp.length > 0) {
    v.value = Infinity;
    v.time = firstAt(vImp);
    unbounded.push('voltage');
  }
  if (iImp.length > 0) {
    i.value = Infinity;
    i.time = firstAt(iImp);
    unbounded.push('current');
    i2t = Infinity;
    unbounded.push('i2t');
  }
  // An impulse in one signal carries power only where the other is not zero around that instant.
  const powerAt = [
    ...vImp.filter((x) => iImp.some((y) => y.t === x.t) || !zeroAround(forms.current, x.t, i.value)),
    ...iImp.filter((x) => vImp.some((y) => y.t === x.t) || !zeroAround(forms.voltage, x.t, v.value)),
  ];
  if (powerAt.length > 0) {
    power.value = Infinity;
    power.time = firstAt(powerAt);
    unbounded.push('power');
    if (energy !== null) {
      energy = Infinity;
      unbounded.push('energy');
    }
  }

  let storedPeak: number | null = null;
  if (kind === 'capacitor') storedPeak = 0.5 * value * v.value * v.value;
  if (kind === 'inductor') storedPeak = 0.5 * value * i.value * i.value;
  if (storedPeak === Infinity) unbounded.push('stored');
  return { part: forms.part, kind, voltage: v, current: i, power, energy, i2t, storedPeak, unbounded };
}

const cache = new WeakMap<RunResult, PartStress[]>();

/**
 * Stress figures of every part of a run, in circuit order; empty when the run carries no
 * per-part closed forms. Computed once per result.
 */
export function runStress(result: RunResult): PartStress[] {
  const hit = cache.get(result);
  if (hit) return hit;
  const out: PartStress[] = [];
  if (result.parts && result.times.length > 0) {
    const start = result.times[0]!;
    const end = result.times[result.times.length - 1]!;
    const all = switchVoltagesByKVL(result.circuit, withJumpImpulses(result.circuit, result.parts, result.events ?? []));
    const grids = new StressGrids(result.times);
    for (const forms of all) {
      grids.include(forms.voltage, start, end);
      grids.include(forms.current, start, end);
    }
    const byName = new Map(all.map((p) => [p.part, p]));
    // every part's terms share the run's exponents: one table of exponent integrals for all
    const products = productsFor(result.circuit);
    const joint = new JointPeaks(result.times);
    for (const part of result.circuit.parts) {
      const forms = byName.get(part.name);
      if (!forms) continue;
      const s = partStress(forms, part.kind, part.value, start, end, result.times, grids, products, joint);
      out.push(snapTimes(s, start, end));
    }
  }
  cache.set(result, out);
  return out;
}

/** A time within 1e-12 of the span from its start is reported as the start itself (rounding noise). */
export function snapTime(t: number, start: number, end: number): number {
  return Math.abs(t - start) <= 1e-12 * Math.abs(end - start) ? start : t;
}

function snapTimes(s: PartStress, start: number, end: number): PartStress {
  for (const p of [s.voltage, s.current, s.power]) p.time = snapTime(p.time, start, end);
  return s;
}
