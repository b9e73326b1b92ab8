/**
 * The eigen-solver's WebAssembly kernels (src/linalg/simd).
 *
 * References: the committed module is the compilation of its source (wabt, the WebAssembly Binary
 * Toolkit); each kernel does the JavaScript's operations in the JavaScript's order, so the
 * decomposition must come out bit for bit the same either way, on one thread or with the helper,
 * and meet the defining identity A·V = V·D to round-off. numpy golden data for the same route with
 * and without the kernels: eig-aed.test.ts.
 */
import { execFileSync } from 'node:child_process';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { describe, expect, it } from 'vitest';
import { eigFlat } from '../../src/linalg/eig.js';
import { analyzeText } from '../../src/pipeline.js';
import { KERNELS_WASM_BASE64 } from '../../src/linalg/simd/kernels-wasm.js';
import { arenaClose, arenaF64, arenaOpen, ownedBy, simdKernels } from '../../src/linalg/simd/simd.js';
import { randomMatrix, residual } from './matrices.js';

const ROOT = join(dirname(fileURLToPath(import.meta.url)), '..', '..');

function flat(A: number[][]): Float64Array {
  return new Float64Array(A.flat());
}

function solve(A: number[][], simd: boolean, threads: boolean): { re: number[]; im: number[]; V: number[][] } {
  const n = A.length;
  const r = eigFlat(flat(A), n, { structured: false, simd, threads });
  const V = Array.from({ length: n }, (_, i) => Array.from(r.V.subarray(i * n, (i + 1) * n)));
  return { re: Array.from(r.re), im: Array.from(r.im), V };
}

/**
 * A lossy network's state matrix in the shape the circuits give (capacitor voltages and inductor
 * currents of a random mesh, nodes to ground through capacitors, branches of R or series R–L):
 * C·v' = −G·v − Bᵀ·i, L·i' = B·v − R·i. Values spread over decades, as real parts are.
 */
function meshMatrix(nodes: number, branches: number, seed: number): number[][] {
  let s = seed >>> 0;
  const next = () => {
    s = (Math.imul(s, 1664525) + 1013904223) >>> 0;
    return s / 2 ** 32;
  };
  const n = nodes + branches;
  const A = Array.from({ length: n }, () => new Array<number>(n).fill(0));
  const C = Array.from({ length: nodes }, () => 10 ** (-9 + 3 * next()));
  for (let k = 0; k < nodes; k++) A[k][k] -= 1e-3 / C[k]; // leakage to ground
  for (let b = 0; b < branches; b++) {
    const a = Math.floor(next() * nodes);
    let c = Math.floor(next() * nodes);
    if (c === a) c = (a + 1) % nodes;
    const L = 10 ** (-7 + 3 * next());
    const R = 10 ** (-1 + 2 * next());
    const i = nodes + b;
    // branch current i flows a → c
    A[a][i] -= 1 / C[a];
    A[c][i] += 1 / C[c];
    A[i][a] += 1 / L;
    A[i][c] -= 1 / L;
    A[i][i] -= R / L;
  }
  return A;
}

describe('WebAssembly kernels of the eigen-solver', () => {
  it('are available on this Node.js (otherwise every run silently takes the slower path)', () => {
    expect(simdKernels()).not.toBeNull();
  });

  it('the committed module is the compilation of kernels.wat (npm run build:wasm)', () => {
    const script = `import { compileKernels } from './src/linalg/simd/build-wasm.mjs';
      process.stdout.write((await compileKernels()).toString('base64'));`;
    const out = execFileSync(process.execPath, ['--input-type=module', '-e', script], { cwd: ROOT, encoding: 'utf8' });
    expect(out).toBe(KERNELS_WASM_BASE64);
  });

  it('hand out zeroed, aligned arrays in their own memory while an arena is open; other arrays are not theirs', () => {
    expect(arenaOpen(1000)).toBe(true);
    const a = arenaF64(3)!;
    a.fill(7);
    const b = arenaF64(5)!;
    expect(ownedBy(a) && ownedBy(b)).toBe(true);
    expect(a.byteOffset % 16).toBe(0);
    expect(b.byteOffset % 16).toBe(0);
    expect(b.byteOffset).toBeGreaterThanOrEqual(a.byteOffset + 24);
    expect(Array.from(b)).toEqual([0, 0, 0, 0, 0]);
    expect(arenaF64(2 ** 31)).toBeNull(); // beyond the memory
    expect(ownedBy(new Float64Array(4))).toBe(false);
    expect(ownedBy(new Float64Array(new SharedArrayBuffer(32)))).toBe(false);
    arenaClose();
    expect(arenaF64(1)).toBeNull();
  });

  it('RINGDOWN_SIMD=0 turns them off', () => {
    const before = process.env.RINGDOWN_SIMD;
    process.env.RINGDOWN_SIMD = '0';
    try {
      expect(arenaOpen(1000)).toBe(false);
      expect(arenaF64(1)).toBeNull();
      expect(simdKernels()).toBeNull();
    } finally {
      if (before === undefined) delete process.env.RINGDOWN_SIMD;
      else process.env.RINGDOWN_SIMD = before;
    }
  });

  const cases: [string, number[][]][] = [
    ['random 37×37 (odd size: the vector loops\u2019 scalar tails)', randomMatrix(37, 11)],
    ['random 160×160 (aggressive early deflation)', randomMatrix(160, 5)],
    ['lossy RLC mesh, 90 nodes and 131 branches', meshMatrix(90, 131, 7)],
  ];
  for (const [name, A] of cases) {
    it(`${name}: kernels and JavaScript give the same bits, on one thread and with the helper`, () => {
      const j = solve(A, false, false);
      expect(residual(A, j)).toBeLessThan(1e-12);
      for (const threads of [false, true]) {
        const w = solve(A, true, threads);
        expect(w.re).toEqual(j.re);
        expect(w.im).toEqual(j.im);
        expect(w.V).toEqual(j.V);
      }
    });
  }

  it('when the memory cannot grow, the call takes the JavaScript path (no arena)', () => {
    expect(arenaOpen(2 ** 33)).toBe(false); // 64 GiB: beyond a WebAssembly memory
    expect(arenaF64(1)).toBeNull();
  });

  it('a whole run of a 250-state lossy mesh gives the same samples and cross-check figure with and without them', () => {
    // an RLC mesh written as a circuit (invented values, as in the benchmark's generator): nodes
    // with capacitors to ground on a random tree plus chords, some edges R–L branches
    let seed = 99;
    const r = () => ((seed = (Math.imul(seed, 1664525) + 1013904223) >>> 0) / 2 ** 32);
    const M = 150;
    const lines = ['voltage-source V1 in -> gnd step to 1V at 1u', 'resistor Rin in -> n1 10'];
    for (let k = 1; k <= M; k++) lines.push(`capacitor C${k} n${k} -> gnd ${(1 + 99 * r()).toFixed(3)}e-8`);
    const edges: [number, number][] = [];
    for (let k = 2; k <= M; k++) edges.push([1 + Math.floor(r() * (k - 1)), k]);
    for (let e = 0; e < M / 3; e++) edges.push([1 + Math.floor(r() * M), 1 + Math.floor(r() * M)]);
    edges.forEach(([a, b], e) => {
      if (a === b) return;
      if (e < 100) {
        lines.push(`resistor Re${e} n${a} -> x${e} ${(1 + 99 * r()).toFixed(3)}`);
        lines.push(`inductor Le${e} x${e} -> n${b} ${(1 + 99 * r()).toFixed(3)}e-6`);
      } else lines.push(`resistor Re${e} n${a} -> n${b} ${(10 + 990 * r()).toFixed(3)}`);
    });
    lines.push(`resistor Rload n${M} -> gnd 100`, 'watch node n1', `watch node n${M}`, 'samples 400');
    const text = lines.join('\n') + '\n';
    const before = process.env.RINGDOWN_SIMD;
    try {
      process.env.RINGDOWN_SIMD = '0';
      const js = analyzeText(text, 'mesh.rdn', { partSignals: false });
      delete process.env.RINGDOWN_SIMD;
      const w = analyzeText(text, 'mesh.rdn', { partSignals: false });
      expect(w.traces.length).toBe(2);
      for (let k = 0; k < w.traces.length; k++) expect(Array.from(w.traces[k].values)).toEqual(Array.from(js.traces[k].values));
      expect(w.crossCheck.maxRelError).toBe(js.crossCheck.maxRelError);
      expect(w.crossCheck.passed).toBe(true);
    } finally {
      if (before === undefined) delete process.env.RINGDOWN_SIMD;
      else process.env.RINGDOWN_SIMD = before;
    }
  });
});
