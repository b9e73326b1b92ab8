/**
 * The general eigen-solver when its helper thread fails in the middle of a decomposition: eig
 * starts over on one thread, with no visible error, and the result is the one-thread result bit
 * for bit. Its own file: the helper stays unavailable for the rest of the process afterwards.
 *
 * Reference for the residual check: the defining identity A·V = V·D (textbook, from memory).
 */
import { describe, expect, it } from 'vitest';
import { eigFlat } from '../../src/linalg/eig.js';
import { Session, helperStats } from '../../src/linalg/threads/helper.js';
import { randomMatrix, residual } from './matrices.js';

function flat(A: number[][]): Float64Array {
  const n = A.length;
  const a = new Float64Array(n * n);
  for (let i = 0; i < n; i++) for (let j = 0; j < n; j++) a[i * n + j] = A[i][j];
  return a;
}

describe('eig when the helper thread fails', () => {
  it('fails mid-job (an unknown operation in place of forming the Schur basis): one-thread result', () => {
    delete process.env.RINGDOWN_THREADS;
    const n = 250;
    const A = randomMatrix(n, 8);
    // a working helper first (it must have been in use for the failure to be mid-job)
    eigFlat(flat(A), n, { threads: true });
    expect(helperStats().unavailable).toBe(false);
    const proto = Session.prototype as unknown as Record<string, unknown>;
    const accumulate = proto.accumulate;
    proto.accumulate = function (this: { reserve(len: number): number; publish(len: number): void; job: { ring: Float64Array } }): void {
      const pos = this.reserve(1);
      this.job.ring[pos] = 99;
      this.publish(1);
      (this as unknown as { wake(): void }).wake();
    };
    let two;
    try {
      two = eigFlat(flat(A), n, { threads: true });
    } finally {
      proto.accumulate = accumulate;
    }
    expect(helperStats().unavailable).toBe(true);
    const one = eigFlat(flat(A), n, { threads: false });
    for (const key of ['re', 'im', 'V'] as const) {
      let diff = -1;
      for (let i = 0; i < one[key].length && diff < 0; i++) if (!Object.is(one[key][i], two[key][i])) diff = i;
      expect(diff, `${key} differs first at ${diff}`).toBe(-1);
    }
    const V: number[][] = [];
    for (let i = 0; i < n; i++) V.push(Array.from(two.V.subarray(i * n, (i + 1) * n)));
    expect(residual(A, { re: Array.from(two.re), im: Array.from(two.im), V })).toBeLessThan(1e-11);
    // later calls quietly stay on one thread
    const jobs = helperStats().jobs;
    eigFlat(flat(A), n, { threads: true });
    expect(helperStats().jobs).toBe(jobs);
  });
});
