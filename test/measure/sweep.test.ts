/**
 * The fast evaluation paths of the measurements: terms grouped by exponent (lti/term.ts), grid
 * sweeps with cached e^(κ·i·h) (measure/sweep.ts), the per-layout integrals of long pulse trains
 * (lti/integrate.ts RepeatedIntegrals), and the measurements of long trains of short pieces.
 * Expected values are closed forms written out beside each check (calculus and first-order
 * circuit responses, from memory).
 */
import { describe, expect, it } from 'vitest';
import { integrateProduct, integrateTerms, RepeatedIntegrals } from '../../src/lti/integrate.js';
import { groupsBound, groupTerms, groupsDerivative, groupsValue } from '../../src/lti/term.js';
import { computeMetrics } from '../../src/measure/metrics.js';
import { refineRoot } from '../../src/measure/root.js';
import { averageAndRms, maxSlope } from '../../src/measure/shape.js';
import { Sweeper, uniformStep } from '../../src/measure/sweep.js';
import { buildTrack, stretchesOf } from '../../src/measure/track.js';
import type { Piece, Term } from '../../src/simulate/result.js';
import { grid, piece } from './helpers.js';

const rel = (a: number, b: number) => Math.abs(a - b) / Math.abs(b);

describe('terms grouped by exponent', () => {
  // y = 2 + e^(−3t)(cos 5t − 4 sin 5t) + t·e^(−3t)·sin 5t + 0.5·e^(−t)
  const terms: Term[] = [
    { kind: 'exp', lambda: 0, coef: 2 },
    { kind: 'osc', sigma: -3, omega: 5, cosCoef: 1, sinCoef: -4 },
    { kind: 'quasi', sigma: -3, omega: 5, cosPoly: [0, 0], sinPoly: [0, 1] },
    { kind: 'exp', lambda: -1, coef: 0.5 },
  ];
  const y = (t: number) => 2 + Math.exp(-3 * t) * (Math.cos(5 * t) - 4 * Math.sin(5 * t)) + t * Math.exp(-3 * t) * Math.sin(5 * t) + 0.5 * Math.exp(-t);
  // d/dt by the product rule
  const dy = (t: number) =>
    Math.exp(-3 * t) * (-3 * (Math.cos(5 * t) - 4 * Math.sin(5 * t)) + (-5 * Math.sin(5 * t) - 20 * Math.cos(5 * t))) +
    Math.exp(-3 * t) * (Math.sin(5 * t) + t * (-3 * Math.sin(5 * t) + 5 * Math.cos(5 * t))) -
    0.5 * Math.exp(-t);

  it('the same exponent (the cosine, sine and t·sine of e^((−3 + 5j)t)) is one group', () => {
    expect(groupTerms(terms).n).toBe(3);
  });

  it('value and derivative agree with the closed form and the product rule', () => {
    const g = groupTerms(terms);
    const d = groupsDerivative(g);
    for (const t of [0, 0.1, 0.37, 1, 2.5]) {
      expect(Math.abs(groupsValue(g, t) - y(t))).toBeLessThan(1e-14 * 8);
      expect(Math.abs(groupsValue(d, t) - dy(t))).toBeLessThan(1e-14 * 40);
    }
  });

  it('the bound is at least |y| on the interval, and equals Σ|c| at τ = 0 for single terms', () => {
    const g = groupTerms(terms);
    for (let t = 0.5; t <= 1; t += 0.01) expect(groupsBound(g, 0.5, 1)).toBeGreaterThanOrEqual(Math.abs(y(t)));
    // |2| + |1 − 4j| + 0.5 at τ = 0 (the t·sin term vanishes at 0 but is bounded with b = 0 too)
    expect(groupsBound(groupTerms([terms[0]!, terms[1]!, terms[3]!]), 0, 0)).toBeCloseTo(2 + Math.hypot(1, 4) + 0.5, 14);
  });
});

describe('grid sweeps (e^(κ(τa + i·h)) = e^(κτa)·e^(κ·i·h))', () => {
  it('a damped cosine and its derivative on 1000 points match e^(σt)·cos ωt to rounding', () => {
    const g = groupTerms([{ kind: 'osc', sigma: -50, omega: 2 * Math.PI * 1e3, cosCoef: 1, sinCoef: 0 }]);
    const d = groupsDerivative(g);
    const sw = new Sweeper();
    const out = [new Float64Array(1000), new Float64Array(1000)];
    const h = 1e-5;
    sw.uniform([g, d], 0.003, h, 1000, out, 0);
    for (let i = 0; i < 1000; i++) {
      const t = 0.003 + i * h;
      const w = 2 * Math.PI * 1e3;
      // rounding: a few ulps, times ωt for the phase (cos of a rounded argument)
      const ulps = 4e-16 * (1 + w * t);
      expect(Math.abs(out[0]![i]! - Math.exp(-50 * t) * Math.cos(w * t))).toBeLessThan(ulps);
      // d/dt e^(σt) cos ωt = e^(σt)(σ cos ωt − ω sin ωt)
      expect(Math.abs(out[1]![i]! - Math.exp(-50 * t) * (-50 * Math.cos(w * t) - w * Math.sin(w * t)))).toBeLessThan(ulps * (w + 50));
    }
  });

  it('a term that has decayed below the rounding of the sum is left out without changing a digit beyond it', () => {
    // 1 + e^(−t) + 1e3·e^(−1e6·t)·cos(1e7·t): after 100 µs the fast term is 1e3·e^(−100) ≈ 4e−41
    const g = groupTerms([
      { kind: 'exp', lambda: 0, coef: 1 },
      { kind: 'exp', lambda: -1, coef: 1 },
      { kind: 'osc', sigma: -1e6, omega: 1e7, cosCoef: 1e3, sinCoef: 0 },
    ]);
    const sw = new Sweeper();
    const n = 4000;
    const out = [new Float64Array(n)];
    sw.uniform([g], 0, 1e-7, n, out, 0);
    for (let i = 0; i < n; i++) {
      const t = i * 1e-7;
      const exact = 1 + Math.exp(-t) + 1e3 * Math.exp(-1e6 * t) * Math.cos(1e7 * t);
      // rounding: a few ulps of each term, the fast one times its phase 1e7·t (cos of a rounded argument)
      expect(Math.abs(out[0]![i]! - exact)).toBeLessThan(4e-16 * (2 + 1e3 * Math.exp(-1e6 * t) * (1 + 1e7 * t)));
    }
  });

  it('equally spaced sample times are recognised, others are not', () => {
    expect(uniformStep(grid(0, 0.1, 20001))).toBeCloseTo(0.1 / 20000, 20);
    expect(uniformStep([0, 1, 2.5, 3])).toBeNaN();
  });
});

describe('track of a signal whose fast mode dies out (the grid is thinned there)', () => {
  // y = e^(−t)·sin(2π·10·t) + e^(−1e5·t)·cos(1e6·t): the fast part is gone after ~1 ms; the slow
  // part's extrema are where d/dt[e^(−t) sin ωt] = 0: tan ωt = ω (ω = 20π), t_k = (atan ω + kπ)/ω
  const w = 20 * Math.PI;
  const pieces = [
    piece(0, Infinity, [
      { kind: 'osc', sigma: -1, omega: w, cosCoef: 0, sinCoef: 1 },
      { kind: 'osc', sigma: -1e5, omega: 1e6, cosCoef: 1, sinCoef: 0 },
    ]),
  ];
  const end = 1;
  const track = buildTrack(grid(0, end, 101), new Float64Array(101), pieces);
  const ts = stretchesOf(track)[0]!.ts;

  it('every extremum of the slow oscillation after the fast mode has died is a knot', () => {
    for (let k = 0; k < 19; k++) {
      const tk = (Math.atan(w) + k * Math.PI) / w;
      if (tk < 0.01) continue;
      const nearest = ts.reduce((b, t) => (Math.abs(t - tk) < Math.abs(b - tk) ? t : b), Infinity);
      expect(Math.abs(nearest - tk)).toBeLessThan(1e-12);
    }
  });

  it('the grid is thinner once the fast oscillation (π/4 per step would be 1.3e5 points) is gone', () => {
    expect(ts.length).toBeLessThan(20000);
  });
});

describe('RC low-pass driven by a long pulse train (2000 cycles of pieces built by hand)', () => {
  // on: y = V + (y0 − V)·e^(−τ/RC); off: y = y0·e^(−τ/RC); the end of each piece starts the next
  const V = 5;
  const RC = 1e-3;
  const Ton = 3e-4;
  const Toff = 7e-4;
  const cycles = 2000;
  const pieces: Piece[] = [];
  let y0 = 0;
  let t = 0;
  for (let k = 0; k < cycles; k++) {
    pieces.push(piece(t, t + Ton, [{ kind: 'exp', lambda: 0, coef: V }, { kind: 'exp', lambda: -1 / RC, coef: y0 - V }]));
    y0 = V + (y0 - V) * Math.exp(-Ton / RC);
    t += Ton;
    pieces.push(piece(t, t + Toff, [{ kind: 'exp', lambda: -1 / RC, coef: y0 }]));
    y0 = y0 * Math.exp(-Toff / RC);
    t += Toff;
  }
  const end = t;

  it('largest slope is V/RC at t = 0 (the first on-piece starts from rest; later ones start higher)', () => {
    const s = maxSlope(pieces, 0, end, grid(0, end, 5001))!;
    expect(rel(s.value, V / RC)).toBeLessThan(1e-12);
    expect(s.time).toBe(0);
  });

  it('peak is the periodic steady-state maximum V(1 − e^(−Ton/RC))/(1 − e^(−T/RC)), reached at the end of an on-time', () => {
    const times = grid(0, end, 5001);
    const m = computeMetrics(times, new Float64Array(times.length), pieces, { kind: 'relative', fraction: 0.02 });
    const T = Ton + Toff;
    const yMax = (V * (1 - Math.exp(-Ton / RC))) / (1 - Math.exp(-T / RC));
    // after 2000 periods the train is at its steady state to rounding (e^(−2000·T/RC) = 0)
    expect(rel(m.peak.value, yMax)).toBeLessThan(1e-12);
    const phase = (m.peak.time % T) / T;
    expect(Math.min(Math.abs(phase - Ton / T), Math.abs(phase - Ton / T - 1))).toBeLessThan(1e-6);
  });

  it('average is V·Ton/T over whole periods at steady state (the capacitor passes no DC; from memory), RMS from per-piece integrals', () => {
    // average over the whole train: V·Ton/T minus what charging the capacitor took, y(end)·RC/span
    const T = Ton + Toff;
    const r = averageAndRms(pieces, 0, end)!;
    const yEnd = pieces[pieces.length - 1]!.terms[0]!.kind === 'exp' ? (pieces[pieces.length - 1]!.terms[0] as { coef: number }).coef * Math.exp(-Toff / RC) : NaN;
    expect(rel(r.average, (V * Ton) / T - (yEnd * RC) / end)).toBeLessThan(1e-9);
    // RMS: the same sum of exact per-piece integrals, each piece on its own
    let sq = 0;
    for (const p of pieces) sq += integrateProduct(p.terms, p.terms, p.t1 - p.t0);
    expect(rel(r.rms, Math.sqrt(sq / end))).toBeLessThan(1e-12);
  });
});

describe('integrals of many pieces of one layout (RepeatedIntegrals)', () => {
  // ∫0^T (A·e^(−t/τ) + B)² dt = A²τ/2·(1 − e^(−2T/τ)) + 2ABτ(1 − e^(−T/τ)) + B²T  (calculus)
  const tau = 2e-3;
  const T = 1e-3;
  const sq = (A: number, B: number) => ((A * A * tau) / 2) * (1 - Math.exp((-2 * T) / tau)) + 2 * A * B * tau * (1 - Math.exp(-T / tau)) + B * B * T;
  const lin = (A: number, B: number) => A * tau * (1 - Math.exp(-T / tau)) + B * T;
  const terms = (A: number, B: number): Term[] => [{ kind: 'exp', lambda: 0, coef: B }, { kind: 'exp', lambda: -1 / tau, coef: A }];

  it('the free part varying, then the constant too: each piece matches the closed form', () => {
    const r = new RepeatedIntegrals();
    const cases: [number, number][] = [[1, 3], [-2, 3], [0.5, 3], [7, 3], [1, -4], [1e3, 1e-3], [1e-3, 1e3], [0, 0]];
    for (const [A, B] of cases) {
      r.integrate(terms(A, B), T);
      const scale = sq(Math.abs(A), Math.abs(B));
      expect(Math.abs(r.square - sq(A, B))).toBeLessThan(1e-14 * Math.max(scale, 1e-300) + 1e-300);
      expect(Math.abs(r.sum - lin(A, B))).toBeLessThan(1e-14 * (Math.abs(A) * tau + Math.abs(B) * T) + 1e-300);
    }
  });

  it('a damped oscillation over whole periods: ∫0^(2π/ω) cos²(ωt) dt = π/ω when σ = 0', () => {
    const r = new RepeatedIntegrals();
    const w = 2 * Math.PI * 1e3;
    for (const a of [1, 2, -3]) {
      r.integrate([{ kind: 'osc', sigma: 0, omega: w, cosCoef: a, sinCoef: 0 }], (2 * Math.PI) / w);
      expect(rel(r.square, (a * a * Math.PI) / w)).toBeLessThan(1e-12);
      expect(Math.abs(r.sum)).toBeLessThan(1e-15 * Math.abs(a) / 1e3);
    }
  });

  it('pieces of other layouts in between keep their own integrals', () => {
    const r = new RepeatedIntegrals();
    for (let k = 0; k < 5; k++) {
      r.integrate(terms(k, 1), T);
      expect(Math.abs(r.square - sq(k, 1))).toBeLessThan(1e-14 * sq(k, 1));
      // (a fresh array per piece, as pieces have: an array is taken as unchanging)
      const osc: Term[] = [{ kind: 'osc', sigma: -100, omega: 3e3, cosCoef: 1 + k, sinCoef: 2 }];
      r.integrate(osc, T);
      expect(rel(r.square, integrateProduct(osc, osc, T))).toBeLessThan(1e-13);
      expect(rel(r.sum, integrateTerms(osc, T))).toBeLessThan(1e-13);
    }
  });
});

describe('large layouts (a circuit of hundreds of states under a pulse train)', () => {
  // 40 real exponentials and 20 damped oscillations (80 monomials: above the small-layout size),
  // their coefficients changing from piece to piece as a free response's do; the lengths of the
  // pieces differ in their last bits, as differences of breakpoints do. Reference: the direct
  // integrals of each piece (integrateTerms / integrateProduct, the closed forms term by term).
  const piece = (k: number): Term[] => {
    const t: Term[] = [{ kind: 'exp', lambda: 0, coef: 1 + 0.1 * k }];
    for (let i = 0; i < 40; i++) t.push({ kind: 'exp', lambda: -1e3 * (1 + i) ** 1.5, coef: Math.sin(7 * i + k) });
    for (let i = 0; i < 20; i++) t.push({ kind: 'osc', sigma: -5e3 * (1 + i), omega: 2e4 * (1 + i), cosCoef: Math.cos(3 * i + k), sinCoef: 0.5 * Math.sin(i - k) });
    return t;
  };
  const T0 = 7e-5;
  const lengths = [T0, T0 * (1 + 2 * Number.EPSILON), T0 * (1 - 3 * Number.EPSILON), T0, T0 * (1 + 6 * Number.EPSILON), 2e-5, T0 * (1 - Number.EPSILON)];

  it('each piece matches its direct integrals, whichever layout (and length within a few ulps) serves it', () => {
    const r = new RepeatedIntegrals();
    lengths.forEach((T, k) => {
      const t = piece(k);
      r.integrate(t, T);
      const sq = integrateProduct(t, t, T);
      const sum = integrateTerms(t, T);
      expect(rel(r.square, sq)).toBeLessThan(1e-13);
      expect(Math.abs(r.sum - sum)).toBeLessThan(1e-13 * Math.abs(sum) + 1e-18);
    });
  });

  it('a length a few ulps off is carried by f(T0)·(T − T0) and f(T0)²·(T − T0): a term that ends far above its mean', () => {
    // c·e^(λτ) with λT = 300: f(T)² is 600 times the mean of f² over [0, T], so 8 ulps of T
    // change ∫f² by about 1e-12 of itself, which the step carries (without it this fails)
    const T = 1e-4;
    const grow = (k: number): Term[] => {
      const t: Term[] = [{ kind: 'exp', lambda: 300 / T, coef: 1e-130 * (1 + 0.01 * k) }];
      for (let i = 0; i < 40; i++) t.push({ kind: 'exp', lambda: -1e3 * (1 + i), coef: 1e-3 * Math.sin(i + k) });
      return t;
    };
    const r = new RepeatedIntegrals();
    [T, T, T * (1 + 8 * Number.EPSILON), T * (1 - 8 * Number.EPSILON)].forEach((L, k) => {
      const t = grow(k);
      r.integrate(t, L);
      expect(rel(r.square, integrateProduct(t, t, L))).toBeLessThan(2e-13);
      expect(rel(r.sum, integrateTerms(t, L))).toBeLessThan(2e-13);
    });
  });

  it('a length 1e-9 away is not the same length (its own integrals)', () => {
    const r = new RepeatedIntegrals();
    for (const T of [T0, T0, T0 + 1e-9 * T0, T0 + 1e-9 * T0]) {
      const t = piece(3);
      r.integrate(t, T);
      expect(rel(r.square, integrateProduct(t, t, T))).toBeLessThan(1e-13);
    }
  });
});

describe('pieces sharing a term array (the periods of a steady tail)', () => {
  it('the same array over the same length gives the same integrals, over another length its own', () => {
    const r = new RepeatedIntegrals();
    const tau = 2e-3;
    const shared: Term[] = [{ kind: 'exp', lambda: 0, coef: 3 }, { kind: 'exp', lambda: -1 / tau, coef: 2 }];
    // ∫0^T (2e^(−t/τ) + 3)² dt = 2τ(1 − e^(−2T/τ)) + 12τ(1 − e^(−T/τ)) + 9T  (calculus)
    const sq = (T: number) => 2 * tau * (1 - Math.exp((-2 * T) / tau)) + 12 * tau * (1 - Math.exp(-T / tau)) + 9 * T;
    for (const T of [1e-3, 1e-3, 3e-3, 1e-3]) {
      r.integrate(shared, T);
      expect(rel(r.square, sq(T))).toBeLessThan(1e-14);
    }
  });

  it('a pulse train whose later periods share one term array: track, slope and RMS as for separate arrays', () => {
    // on: 5 + (y0 − 5)e^(−t/RC); off: y0·e^(−t/RC); from period 50 on the arrays are shared (the
    // state has reached its periodic value to rounding); the copy has every array separate
    const RC = 1e-3;
    const mk = (share: boolean) => {
      const out: Piece[] = [];
      let y0 = 0;
      let t = 0;
      let on: Term[] | null = null;
      let off: Term[] | null = null;
      for (let k = 0; k < 200; k++) {
        const a: Term[] = share && k >= 50 && on ? on : [{ kind: 'exp', lambda: 0, coef: 5 }, { kind: 'exp', lambda: -1 / RC, coef: y0 - 5 }];
        on = a;
        out.push(piece(t, t + 3e-4, a));
        y0 = 5 + (y0 - 5) * Math.exp(-3e-4 / RC);
        t += 3e-4;
        const b: Term[] = share && k >= 50 && off ? off : [{ kind: 'exp', lambda: -1 / RC, coef: y0 }];
        off = b;
        out.push(piece(t, t + 7e-4, b));
        y0 *= Math.exp(-7e-4 / RC);
        t += 7e-4;
      }
      return { out, end: t };
    };
    const shared = mk(true);
    const separate = mk(false);
    const times = grid(0, shared.end, 4001);
    const band = { kind: 'relative', fraction: 0.02 } as const;
    const m1 = computeMetrics(times, new Float64Array(times.length), shared.out, band);
    const m2 = computeMetrics(times, new Float64Array(times.length), separate.out, band);
    // the shared tail repeats period 50 exactly; the separate one converges to it within rounding
    expect(rel(m1.peak.value, m2.peak.value)).toBeLessThan(1e-12);
    expect(rel(m1.rms!, m2.rms!)).toBeLessThan(1e-12);
    expect(rel(m1.maxSlope!.value, m2.maxSlope!.value)).toBeLessThan(1e-12);
    expect(m1.events!.length).toBe(m2.events!.length);
  });
});

describe('root refinement relative to the root, not to the bracket', () => {
  it('e^(−t/τ) = ½ in [0, 1 s] with τ = 1 µs: t = τ·ln 2 to 1e-14 of itself (a bracket from 0 to far out)', () => {
    const tau = 1e-6;
    const h = (t: number) => Math.exp(-t / tau) - 0.5;
    const r = refineRoot(h, 0, 1, h(0), h(1));
    expect(rel(r, tau * Math.log(2))).toBeLessThan(4e-15);
  });
});
