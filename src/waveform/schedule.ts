import type { Waveform } from '../circuit/circuit.js';

/**
 * The sources over the analysis span as piecewise-affine functions plus Dirac impulses.
 * Between consecutive breakpoints every input is a + s·(t − t0) exactly, which is what the
 * closed-form interval solution needs.
 */
export interface Interval {
  t0: number;
  t1: number;
  /** input values at t0+ */
  u: number[];
  /** input slopes on the interval */
  slope: number[];
}

export interface InputSchedule {
  intervals: Interval[];
  /** Dirac impulses: areas per input, at a breakpoint (t = 0 included) */
  diracs: { t: number; area: number[] }[];
  /** ideal (zero rise time) jumps of an input at t > 0 */
  jumps: { t: number; delta: number[] }[];
  /** impulses or jumps that fall outside [0, span] and are therefore not part of the run */
  outside: { t: number; kind: 'impulse' | 'step' }[];
}

export function valueAt(w: Waveform, t: number): number {
  let v = 0;
  for (const term of w.terms) {
    if (term.kind === 'constant') v += term.value;
    else if (term.kind === 'step') {
      const frac = term.rise > 0 ? Math.min(1, Math.max(0, (t - term.at) / term.rise)) : t >= term.at ? 1 : 0;
      v += term.from + (term.to - term.from) * frac;
    }
  }
  return v;
}

function slopeAt(w: Waveform, t: number): number {
  let s = 0;
  for (const term of w.terms) {
    if (term.kind === 'step' && term.rise > 0 && t > term.at && t < term.at + term.rise) {
      s += (term.to - term.from) / term.rise;
    }
  }
  return s;
}

/** Times at which some input changes its formula. */
export function breakpointsOf(w: Waveform): number[] {
  const out: number[] = [];
  for (const term of w.terms) {
    if (term.kind === 'step') out.push(term.at, term.at + term.rise);
    if (term.kind === 'impulse') out.push(term.at);
  }
  return out;
}

export function buildSchedule(waves: Waveform[], span: number): InputSchedule {
  const m = waves.length;
  const outside: InputSchedule['outside'] = [];
  const raw = new Set<number>([0, span]);
  for (const w of waves) for (const t of breakpointsOf(w)) if (t > 0 && t < span) raw.add(t);
  const times = [...raw].sort((a, b) => a - b);
  const intervals: Interval[] = [];
  for (let k = 0; k + 1 < times.length; k++) {
    const t0 = times[k];
    const t1 = times[k + 1];
    const mid = (t0 + t1) / 2;
    const slope = waves.map((w) => slopeAt(w, mid));
    // value at t0+: the affine function through the midpoint, extrapolated (exact, and it picks the
    // right-hand limit at an ideal jump)
    const u = waves.map((w, j) => valueAt(w, mid) - slope[j] * (mid - t0));
    intervals.push({ t0, t1, u, slope });
  }
  const diracs: InputSchedule['diracs'] = [];
  const jumps: InputSchedule['jumps'] = [];
  waves.forEach((w, j) => {
    for (const term of w.terms) {
      if (term.kind === 'impulse') {
        if (term.at < 0 || term.at > span) {
          outside.push({ t: term.at, kind: 'impulse' });
          continue;
        }
        let d = diracs.find((x) => x.t === term.at);
        if (!d) diracs.push((d = { t: term.at, area: new Array<number>(m).fill(0) }));
        d.area[j] += term.area;
      }
      if (term.kind === 'step' && term.rise === 0 && term.to !== term.from) {
        if (term.at <= 0) continue; // already in the value at 0+
        if (term.at > span) {
          outside.push({ t: term.at, kind: 'step' });
          continue;
        }
        let d = jumps.find((x) => x.t === term.at);
        if (!d) jumps.push((d = { t: term.at, delta: new Array<number>(m).fill(0) }));
        d.delta[j] += term.to - term.from;
      }
    }
  });
  diracs.sort((a, b) => a.t - b.t);
  jumps.sort((a, b) => a.t - b.t);
  return { intervals, diracs, jumps, outside };
}
