import type { Readout, StateSpace } from '../model/state-space.js';
import { type Vec, matvec, zeros } from '../linalg/dense.js';
import { expm } from '../linalg/expm.js';
import type { InputSchedule } from '../waveform/schedule.js';

/**
 * Independent reference values at a few times: the state is carried across each interval with the
 * matrix exponential of the augmented system  d/dt [ξ; 1; τ] = [[A, B·u0, B·s], [0, 0, 0], [0, 1, 0]]·[ξ; 1; τ],
 * which shares nothing with the eigen-decomposition used for the closed forms.
 */
export function referenceValues(ss: StateSpace, readouts: Readout[], schedule: InputSchedule, xi0: Vec, times: number[]): number[][] {
  const n = ss.n;
  const out = readouts.map(() => new Array<number>(times.length).fill(NaN));
  let xi = xi0.slice();
  for (const iv of schedule.intervals) {
    const dirac = schedule.diracs.find((d) => d.t === iv.t0);
    if (dirac && iv.t0 > 0) xi = xi.map((v, i) => v + dot(ss.B[i], dirac.area));
    const bu = ss.B.map((row) => dot(row, iv.u));
    const bs = ss.B.map((row) => dot(row, iv.slope));
    const M = zeros(n + 2, n + 2);
    for (let i = 0; i < n; i++) {
      for (let j = 0; j < n; j++) M[i][j] = ss.A[i][j];
      M[i][n] = bu[i];
      M[i][n + 1] = bs[i];
    }
    M[n + 1][n] = 1;
    const advance = (tau: number): Vec => {
      const E = expm(M.map((row) => row.map((v) => v * tau)));
      return matvec(E, [...xi, 1, 0]).slice(0, n);
    };
    times.forEach((t, k) => {
      if (t < iv.t0 || t >= iv.t1) return;
      const tau = t - iv.t0;
      const x = advance(tau);
      readouts.forEach((r, w) => {
        out[w][k] = dot(r.C, x) + r.D.reduce((s, d, j) => s + d * (iv.u[j] + iv.slope[j] * tau), 0) + dot(r.D1, iv.slope);
      });
    });
    xi = advance(iv.t1 - iv.t0);
  }
  return out;
}

/** Check times spread over the span, kept away from breakpoints (where values jump). */
export function checkTimes(span: number, schedule: InputSchedule): number[] {
  const fractions = [0.013, 0.071, 0.173, 0.311, 0.487, 0.659, 0.823, 0.967];
  const edges = schedule.intervals.map((iv) => iv.t0);
  return fractions
    .map((f) => f * span)
    .filter((t) => edges.every((e) => Math.abs(t - e) > 1e-9 * span));
}

function dot(a: Vec, b: Vec): number {
  let s = 0;
  for (let i = 0; i < a.length; i++) s += a[i] * b[i];
  return s;
}
