/**
 * The general eigen-solver with its helper thread (src/linalg/threads/): the same operations in the
 * same order as on one thread, so the results must be identical bit for bit (Object.is on every
 * entry), with aggressive early deflation on and off. The helper must actually have run (its job
 * counter), or the comparison would compare one thread with itself.
 *
 * Reference for the residual check: the defining identity A·V = V·D (textbook, from memory).
 */
import { afterEach, describe, expect, it } from 'vitest';
import { eigFlat } from '../../src/linalg/eig.js';
import { helperStats } from '../../src/linalg/threads/helper.js';
import { randomMatrix, residual, rng } from './matrices.js';

function flat(A: number[][]): Float64Array {
  const n = A.length;
  const a = new Float64Array(n * n);
  for (let i = 0; i < n; i++) for (let j = 0; j < n; j++) a[i * n + j] = A[i][j];
  return a;
}

/**
 * State matrix of a random RLC mesh: M nodes with a capacitor to ground, a random tree through
 * them plus chords; the first branches are a resistor in series with an inductor (one state
 * each), the others plain resistors. States: node voltages, then inductor currents.
 */
function rlcMesh(states: number, seed: number): number[][] {
  const r = rng(seed);
  const M = Math.ceil(0.6 * states);
  const nL = states - M;
  const edges: [number, number][] = [];
  for (let k = 1; k < M; k++) edges.push([Math.floor(r() * k), k]);
  for (let e = 0; e < Math.ceil(M / 3); e++) {
    const a = Math.floor(r() * M);
    let b = Math.floor(r() * M);
    if (b === a) b = (a + 1) % M;
    edges.push([a, b]);
  }
  const C = Array.from({ length: M }, () => 1e-8 * (1 + 99 * r()));
  const A = Array.from({ length: states }, () => new Array<number>(states).fill(0));
  const G = Array.from({ length: M }, () => new Array<number>(M).fill(0));
  G[0][0] += 1 / 10;
  G[M - 1][M - 1] += 1 / 100;
  edges.forEach(([a, b], e) => {
    if (e < nL) {
      // current i flows a → b through R and L: C_a·v_a' −= i, C_b·v_b' += i, L·i' = v_a − v_b − R·i
      const R = 1 + 99 * r();
      const L = 1e-6 * (1 + 99 * r());
      const s = M + e;
      A[a][s] -= 1 / C[a];
      A[b][s] += 1 / C[b];
      A[s][a] += 1 / L;
      A[s][b] -= 1 / L;
      A[s][s] -= R / L;
    } else {
      const g = 1 / (10 + 990 * r());
      G[a][a] += g;
      G[b][b] += g;
      G[a][b] -= g;
      G[b][a] -= g;
    }
  });
  for (let i = 0; i < M; i++) for (let j = 0; j < M; j++) A[i][j] -= G[i][j] / C[i];
  return A;
}

function expectIdentical(A: number[][], aed: boolean): void {
  const n = A.length;
  const before = helperStats().jobs;
  const one = eigFlat(flat(A), n, { aed, threads: false });
  const two = eigFlat(flat(A), n, { aed, threads: true });
  expect(helperStats().jobs).toBe(before + 1);
  for (const key of ['re', 'im', 'V'] as const) {
    const x = one[key];
    const y = two[key];
    expect(y.length).toBe(x.length);
    let diff = -1;
    for (let i = 0; i < x.length && diff < 0; i++) if (!Object.is(x[i], y[i])) diff = i;
    expect(diff, `${key} differs first at ${diff}`).toBe(-1);
  }
  const V: number[][] = [];
  for (let i = 0; i < n; i++) V.push(Array.from(two.V.subarray(i * n, (i + 1) * n)));
  expect(residual(A, { re: Array.from(two.re), im: Array.from(two.im), V })).toBeLessThan(1e-11);
}

describe('eig with the helper thread', () => {
  const saved = process.env.RINGDOWN_THREADS;
  afterEach(() => {
    if (saved === undefined) delete process.env.RINGDOWN_THREADS;
    else process.env.RINGDOWN_THREADS = saved;
  });

  for (const aed of [true, false]) {
    it(`random 250×250, aed ${aed}: identical to one thread`, () => {
      delete process.env.RINGDOWN_THREADS;
      expectIdentical(randomMatrix(250, 5), aed);
    });
    it(`RLC mesh of 260 states, aed ${aed}: identical to one thread`, () => {
      delete process.env.RINGDOWN_THREADS;
      expectIdentical(rlcMesh(260, 9), aed);
    });
  }

  it('a small matrix (forced) and several in a row reuse the helper', () => {
    delete process.env.RINGDOWN_THREADS;
    for (const n of [5, 40, 40, 131]) expectIdentical(randomMatrix(n, n), true);
  });

  it('RINGDOWN_THREADS=1 keeps everything on one thread', () => {
    process.env.RINGDOWN_THREADS = '1';
    const before = helperStats().jobs;
    const A = randomMatrix(200, 3);
    eigFlat(flat(A), 200);
    eigFlat(flat(A), 200, { threads: true });
    expect(helperStats().jobs).toBe(before);
  });
});
