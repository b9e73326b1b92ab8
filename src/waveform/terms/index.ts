import type { WaveTerm } from '../../circuit/circuit.js';
import type { Component } from '../component.js';
import { affineComponents } from './affine.js';
import { sampleExpression } from './expression.js';
import { pulseBreakpoints, pulseSlope, pulseValue } from './pulse.js';

/**
 * Per term kind: where its formula changes (breakpoints) and its components on an interval
 * between breakpoints. Impulses carry no components; they act at their instant.
 */
export interface TermModel {
  breakpoints(span: number): number[];
  components(t0: number, t1: number): Omit<Component, 'input'>[];
  /** the largest difference between the term and what the components represent (0: exact) */
  approximationError: number;
}

const clamp01 = (x: number) => Math.min(1, Math.max(0, x));

export function termModel(term: WaveTerm, span: number): TermModel {
  switch (term.kind) {
    case 'constant':
      return exact(() => [], () => (term.value === 0 ? [] : [{ power: 0, sigma: 0, omega: 0, re: term.value, im: 0 }]));
    case 'impulse':
      return exact(() => [], () => []);
    case 'step': {
      const value = (t: number) =>
        term.from + (term.to - term.from) * (term.rise > 0 ? clamp01((t - term.at) / term.rise) : t >= term.at ? 1 : 0);
      const slope = (t: number) => (term.rise > 0 && t > term.at && t < term.at + term.rise ? (term.to - term.from) / term.rise : 0);
      return exact(() => [term.at, term.at + term.rise], (a, b) => affineComponents(value, slope, a, b));
    }
    case 'ramp': {
      const value = (t: number) => term.slope * Math.max(0, Math.min(t, term.until) - term.at);
      const slope = (t: number) => (t > term.at && t < term.until ? term.slope : 0);
      return exact(() => [term.at, term.until], (a, b) => affineComponents(value, slope, a, b));
    }
    case 'approach':
      return exact(
        () => [term.at],
        (t0) => {
          if (t0 < term.at) return term.from === 0 ? [] : [{ power: 0, sigma: 0, omega: 0, re: term.from, im: 0 }];
          const out: Omit<Component, 'input'>[] = [];
          if (term.to !== 0) out.push({ power: 0, sigma: 0, omega: 0, re: term.to, im: 0 });
          const k = (term.from - term.to) * Math.exp(-(t0 - term.at) / term.tau);
          if (k !== 0) out.push({ power: 0, sigma: -1 / term.tau, omega: 0, re: k, im: 0 });
          return out;
        },
      );
    case 'sine':
      return exact(
        () => [term.at],
        (t0) => {
          if (t0 < term.at || term.amplitude === 0) return [];
          const w = 2 * Math.PI * term.freq;
          const sigma = Number.isFinite(term.decay) ? -1 / term.decay : 0;
          const d = t0 - term.at;
          // A·e^(σd)·sin(w(d+τ) + φ)·e^(στ) = Re[−j·A·e^(σd)·e^(j(wd + φ))·e^((σ + jw)τ)]
          const m = term.amplitude * Math.exp(sigma * d);
          const ang = w * d + term.phase;
          if (w === 0) return [{ power: 0, sigma, omega: 0, re: m * Math.sin(ang), im: 0 }];
          return [{ power: 0, sigma, omega: w, re: m * Math.sin(ang), im: -m * Math.cos(ang) }];
        },
      );
    case 'pulse':
      return exact(
        () => pulseBreakpoints(term, span),
        (a, b) => affineComponents((t) => pulseValue(term, t), (t) => pulseSlope(term, t), a, b),
      );
    case 'table': {
      const pts = term.points;
      const value = (t: number) => tableValue(pts, t);
      const slope = (t: number) => {
        for (let i = 0; i + 1 < pts.length; i++) {
          if (t > pts[i].t && t < pts[i + 1].t) return (pts[i + 1].v - pts[i].v) / (pts[i + 1].t - pts[i].t);
        }
        return 0;
      };
      return exact(() => pts.map((p) => p.t), (a, b) => affineComponents(value, slope, a, b));
    }
    case 'expression': {
      const s = sampleExpression(term.fn, span);
      return {
        breakpoints: () => s.points.map((p) => p.t),
        components: (a, b) => affineComponents((t) => tableValue(s.points, t), (t) => tableSlope(s.points, t), a, b),
        approximationError: s.maxError,
      };
    }
  }
}

function exact(bp: (span?: number) => number[], comps: (t0: number, t1: number) => Omit<Component, 'input'>[]): TermModel {
  return { breakpoints: bp, components: comps, approximationError: 0 };
}

export function tableValue(pts: { t: number; v: number }[], t: number): number {
  if (pts.length === 0) return 0;
  if (t <= pts[0].t) return pts[0].v;
  if (t >= pts[pts.length - 1].t) return pts[pts.length - 1].v;
  let lo = 0;
  let hi = pts.length - 1;
  while (hi - lo > 1) {
    const mid = (lo + hi) >> 1;
    if (pts[mid].t <= t) lo = mid;
    else hi = mid;
  }
  const a = pts[lo];
  const b = pts[hi];
  return a.v + ((b.v - a.v) * (t - a.t)) / (b.t - a.t);
}

function tableSlope(pts: { t: number; v: number }[], t: number): number {
  for (let i = 0; i + 1 < pts.length; i++) {
    if (t > pts[i].t && t < pts[i + 1].t) return (pts[i + 1].v - pts[i].v) / (pts[i + 1].t - pts[i].t);
  }
  return 0;
}
