import type { Waveform } from '../circuit/circuit.js';
import { type Component, componentDerivative, componentValue } from './component.js';
import { termModel } from './terms/index.js';

/**
 * The sources over one stretch of time as sums of exact components (see component.ts) between
 * breakpoints, plus Dirac impulses. Between consecutive breakpoints no input changes its formula,
 * which is what the closed-form interval solution needs.
 */
export interface Interval {
  t0: number;
  t1: number;
  components: Component[];
  /** derivatives of the inputs on the interval (for read-outs that follow a source's slope) */
  slopes: Component[];
}

export interface InputSchedule {
  intervals: Interval[];
  /** Dirac impulses: areas per input, at a breakpoint (t = 0 included) */
  diracs: { t: number; area: number[] }[];
  /** jumps of an input at t > 0 (from the end of one interval to the start of the next) */
  jumps: { t: number; delta: number[] }[];
  /** impulses that fall outside [0, span] and are therefore not part of the run */
  outside: { t: number; kind: 'impulse' }[];
  /** per input, the largest approximation error of its representation (0: exact) */
  approximation: number[];
}

/** Time of the last event of any waveform that should fit into an automatically chosen span. */
export function lastEventOf(waves: Waveform[]): number {
  let last = 0;
  for (const w of waves) {
    for (const t of w.terms) {
      if (t.kind === 'step') last = Math.max(last, t.at + t.rise);
      else if (t.kind === 'impulse' || t.kind === 'approach' || t.kind === 'sine') last = Math.max(last, t.at);
      else if (t.kind === 'ramp') last = Math.max(last, t.at, Number.isFinite(t.until) ? t.until : 0);
      else if (t.kind === 'table') last = Math.max(last, ...t.points.map((p) => p.t));
      else if (t.kind === 'pulse') last = Math.max(last, t.start + (Number.isFinite(t.cycles) ? t.cycles * t.period : t.period));
    }
  }
  return last;
}

/** A waveform's value just before time t (its left-hand limit), impulses excluded. */
export function valueLeftOf(w: Waveform, t: number): number {
  let v = 0;
  for (const term of w.terms) {
    if (term.kind === 'impulse') continue;
    const m = termModel(term, Math.max(t, 0));
    const before = m.breakpoints(Math.max(t, 0)).filter((b) => b < t);
    const t0 = before.length ? Math.max(...before) : t - 1;
    for (const k of m.components(t0, t)) v += componentValue({ ...k, input: 0 }, t - t0);
  }
  return v;
}

type Models = ReturnType<typeof termModel>[][];

function modelsOf(waves: Waveform[], span: number): Models {
  return waves.map((w) => w.terms.filter((t) => t.kind !== 'impulse').map((t) => termModel(t, span)));
}

/**
 * The interval boundaries buildSchedule uses over [from, span]: both ends, the extra breaks, every
 * breakpoint and impulse time of the sources inside, sorted and distinct (bit for bit the same
 * times, so that a caller can lay other pieces on them).
 */
export function breakpointTimes(waves: Waveform[], span: number, from = 0, extraBreaks: number[] = [], models: Models = modelsOf(waves, span)): number[] {
  // sorted then deduplicated (a set of 10⁴ float keys costs more); a single pulse train gives its
  // corners in order, and then nothing needs sorting; arrays of their final size (no growth)
  const lists: number[][] = [];
  for (const ms of models) for (const m of ms) lists.push(m.breakpoints(span));
  const impulses: number[] = [];
  for (const w of waves) for (const t of w.terms) if (t.kind === 'impulse') impulses.push(t.at);
  let size = 2 + extraBreaks.length + impulses.length;
  for (const l of lists) size += l.length;
  const raw = new Float64Array(size);
  let n = 0;
  raw[n++] = from;
  for (const l of lists) {
    for (let i = 0; i < l.length; i++) {
      const t = l[i];
      if (t > from && t < span) raw[n++] = t;
    }
  }
  raw[n++] = span;
  for (const t of extraBreaks) if (t > from && t < span) raw[n++] = t;
  for (const t of impulses) if (t > from && t < span) raw[n++] = t;
  let inOrder = true;
  for (let i = 1; i < n && inOrder; i++) inOrder = raw[i - 1] <= raw[i];
  const sorted = inOrder ? raw.subarray(0, n) : raw.subarray(0, n).sort();
  const times = new Array<number>(n);
  let count = 0;
  let last = NaN;
  for (let i = 0; i < n; i++) {
    const t = sorted[i];
    if (t !== last) times[count++] = t;
    last = t;
  }
  times.length = count;
  return times;
}

export function buildSchedule(waves: Waveform[], span: number, from = 0, extraBreaks: number[] = []): InputSchedule {
  const outside: InputSchedule['outside'] = [];
  const models = modelsOf(waves, span);
  const times = breakpointTimes(waves, span, from, extraBreaks, models);
  const intervals: Interval[] = [];
  for (let k = 0; k + 1 < times.length; k++) {
    const t0 = times[k];
    const t1 = times[k + 1];
    const components: Component[] = [];
    for (let input = 0; input < models.length; input++) {
      // (components() returns fresh objects: tag them with their input instead of copying)
      for (const m of models[input]) {
        for (const c of m.components(t0, t1)) {
          const k = c as Component;
          k.input = input;
          components.push(k);
        }
      }
    }
    const slopes: Component[] = [];
    for (const c of components) for (const d of componentDerivative(c)) slopes.push(d);
    intervals.push({ t0, t1, components: merge(components), slopes: merge(slopes) });
  }
  const m = waves.length;
  const diracs: InputSchedule['diracs'] = [];
  waves.forEach((w, j) => {
    for (const term of w.terms) {
      if (term.kind !== 'impulse') continue;
      if (term.at < from || term.at > span) {
        outside.push({ t: term.at, kind: 'impulse' });
        continue;
      }
      let d = diracs.find((x) => x.t === term.at);
      if (!d) diracs.push((d = { t: term.at, area: new Array<number>(m).fill(0) }));
      d.area[j] += term.area;
    }
  });
  diracs.sort((a, b) => a.t - b.t);
  const jumps: InputSchedule['jumps'] = [];
  // A jump is a change at a boundary beyond round-off of the input's own size over the schedule
  // (not of its local value: at the foot of a falling edge both sides are rounding-size, and their
  // difference is no jump). First the values at every boundary, then the comparison.
  const nb = Math.max(0, intervals.length - 1);
  const ends = new Float64Array(nb * m);
  const starts = new Float64Array(nb * m);
  const size = new Float64Array(m);
  const u = new Array<number>(m).fill(0);
  for (let k = 1; k < intervals.length; k++) {
    inputValuesInto(intervals[k - 1], intervals[k - 1].t1 - intervals[k - 1].t0, u);
    for (let j = 0; j < m; j++) {
      ends[(k - 1) * m + j] = u[j];
      size[j] = Math.max(size[j], Math.abs(u[j]));
    }
    inputValuesInto(intervals[k], 0, u);
    for (let j = 0; j < m; j++) {
      starts[(k - 1) * m + j] = u[j];
      size[j] = Math.max(size[j], Math.abs(u[j]));
    }
  }
  // ... and beyond what the rounding of the boundary's position (8 ulps of t) makes of a slope
  const slope = new Array<number>(m).fill(0);
  const slopeBefore = new Array<number>(m).fill(0);
  for (let k = 1; k < intervals.length; k++) {
    const t = intervals[k].t0;
    slopesInto(intervals[k - 1], intervals[k - 1].t1 - intervals[k - 1].t0, slopeBefore);
    slopesInto(intervals[k], 0, slope);
    let jumped = false;
    for (let j = 0; j < m; j++) {
      const blur = 8 * Number.EPSILON * Math.abs(t) * Math.max(Math.abs(slope[j]), Math.abs(slopeBefore[j]));
      if (Math.abs(starts[(k - 1) * m + j] - ends[(k - 1) * m + j]) > 1e-12 * size[j] + blur) jumped = true;
    }
    if (!jumped) continue;
    const delta = new Array<number>(m);
    for (let j = 0; j < m; j++) delta[j] = starts[(k - 1) * m + j] - ends[(k - 1) * m + j];
    jumps.push({ t: intervals[k].t0, delta });
  }
  const approximation = models.map((ms) => Math.max(0, ...ms.map((x) => x.approximationError)));
  return { intervals, diracs, jumps, outside, approximation };
}

/** The inputs' values at τ into an interval. */
export function inputValues(iv: Interval, m: number, tau: number): number[] {
  const u = new Array<number>(m).fill(0);
  for (const c of iv.components) u[c.input] += componentValue(c, tau);
  return u;
}

function slopesInto(iv: Interval, tau: number, u: number[]): void {
  u.fill(0);
  for (const c of iv.slopes) u[c.input] += componentValue(c, tau);
}

function inputValuesInto(iv: Interval, tau: number, u: number[]): void {
  u.fill(0);
  for (const c of iv.components) u[c.input] += componentValue(c, tau);
}

export function inputSlopes(iv: Interval, m: number, tau: number): number[] {
  const u = new Array<number>(m).fill(0);
  for (const c of iv.slopes) u[c.input] += componentValue(c, tau);
  return u;
}

/** Combine components that differ only in coefficient (the list's own objects when none do). */
function merge(list: Component[]): Component[] {
  let repeated = false;
  for (let i = 0; i < list.length && !repeated; i++) {
    const c = list[i];
    for (let j = 0; j < i; j++) {
      const o = list[j];
      if (o.input === c.input && o.power === c.power && o.sigma === c.sigma && o.omega === c.omega) {
        repeated = true;
        break;
      }
    }
  }
  if (!repeated) {
    let zero = false;
    for (const c of list) if (c.re === 0 && c.im === 0) zero = true;
    return zero ? list.filter((c) => c.re !== 0 || c.im !== 0) : list;
  }
  const out: Component[] = [];
  for (const c of list) {
    const same = out.find((o) => o.input === c.input && o.power === c.power && o.sigma === c.sigma && o.omega === c.omega);
    if (same) {
      same.re += c.re;
      same.im += c.im;
    } else out.push({ ...c });
  }
  return out.filter((c) => c.re !== 0 || c.im !== 0);
}
