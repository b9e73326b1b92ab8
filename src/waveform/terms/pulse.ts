import type { WaveTerm } from '../../circuit/circuit.js';

type Pulse = Extract<WaveTerm, { kind: 'pulse' }>;

/** Position within the pulse train: cycle index and time into that cycle (null before/after). */
function phaseOf(p: Pulse, t: number): number | null {
  if (t < p.start) return null;
  const k = Math.floor((t - p.start) / p.period);
  if (k >= p.cycles) return null;
  return t - p.start - k * p.period;
}

export function pulseValue(p: Pulse, t: number): number {
  const x = phaseOf(p, t);
  if (x === null) return p.low;
  const d = p.high - p.low;
  if (x < p.rise) return p.low + (d * x) / p.rise;
  if (x < p.rise + p.width) return p.high;
  if (x < p.rise + p.width + p.fall) return p.high - (d * (x - p.rise - p.width)) / p.fall;
  return p.low;
}

export function pulseSlope(p: Pulse, t: number): number {
  const x = phaseOf(p, t);
  if (x === null) return 0;
  const d = p.high - p.low;
  if (x < p.rise) return d / p.rise;
  if (x < p.rise + p.width) return 0;
  if (x < p.rise + p.width + p.fall) return -d / p.fall;
  return 0;
}

/** Corners of every cycle that starts within the span. */
export function pulseBreakpoints(p: Pulse, span: number): number[] {
  const last = Math.max(0, Math.min(p.cycles, Math.ceil((span - p.start) / p.period) + 1));
  // (of its final size: a long train has 10⁴ cycles)
  const out: number[] = Number.isFinite(last) && last < 1e7 ? new Array<number>(4 * last + 1) : [];
  let n = 0;
  for (let k = 0; k < last; k++) {
    const c = p.start + k * p.period;
    if (c > span) break;
    out[n++] = c;
    out[n++] = c + p.rise;
    out[n++] = c + p.rise + p.width;
    out[n++] = c + p.rise + p.width + p.fall;
  }
  if (Number.isFinite(p.cycles)) out[n++] = p.start + p.cycles * p.period;
  out.length = n;
  return out;
}
