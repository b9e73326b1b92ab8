/**
 * Shared helpers for the scenario checks. The expected numbers always come from the sources named
 * beside each check (closed forms, physics, committed golden data), never from ringdown's output.
 */
import { readFileSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { expect } from 'vitest';
import type { Piece, RunResult, Term } from '../../src/simulate/result.js';

export const ROOT = join(dirname(fileURLToPath(import.meta.url)), '..', '..');
export const REL_TOL = 1e-9;

/** Imported lazily so a broken solver fails each test with its own message. */
export async function runText(text: string, file = 'inline.rdn', opts?: { samples?: number; span?: number }): Promise<RunResult> {
  const { analyzeText } = await import('../../src/pipeline.js');
  return analyzeText(text, file, opts);
}

export async function runFile(rel: string, opts?: { samples?: number; span?: number }): Promise<RunResult> {
  const file = join(ROOT, rel);
  return runText(readFileSync(file, 'utf8'), file, opts);
}

export function trace(result: RunResult, label: string) {
  const t = result.traces.find((x) => x.label === label);
  expect(t, `no trace labelled ${label}`).toBeDefined();
  return t!;
}

/** Worst |got − want| relative to `peak` (default: the larger of both peaks) over the given sample indices. */
export function assertClose(
  values: ArrayLike<number>,
  times: ArrayLike<number>,
  want: (t: number, i: number) => number,
  what: string,
  opts: { peak?: number; from?: number; to?: number; tol?: number } = {},
) {
  const from = opts.from ?? 0;
  const to = opts.to ?? times.length;
  const w: number[] = [];
  for (let i = from; i < to; i++) w.push(want(times[i]!, i));
  let peak = opts.peak ?? 0;
  if (opts.peak === undefined) {
    for (let i = from; i < to; i++) peak = Math.max(peak, Math.abs(values[i]!), Math.abs(w[i - from]!));
  }
  let worst = 0;
  let at = from;
  for (let i = from; i < to; i++) {
    const e = Math.abs(values[i]! - w[i - from]!) / peak;
    if (!(e <= worst)) {
      worst = e;
      at = i;
    }
  }
  expect(
    worst,
    `${what}: worst ${worst.toExponential(3)} (rel. to peak ${peak}) at t = ${times[at]}: got ${values[at]}, expected ${w[at - from]}`,
  ).toBeLessThanOrEqual(opts.tol ?? REL_TOL);
}

export interface Golden {
  name: string;
  rdn: string;
  times: number[];
  span?: number;
  samples?: number;
  signals: { label: string; peak: number; values: number[] }[];
}

export function loadGolden(name: string): Golden {
  return JSON.parse(readFileSync(join(ROOT, 'test', 'golden', `${name}.json`), 'utf8')) as Golden;
}

/** Every sample of every golden signal (matched by label), 1e-9 relative to the golden peak. */
export function compareGolden(result: RunResult, golden: Golden, firstIndex = 0) {
  for (const sig of golden.signals) {
    const tr = trace(result, sig.label);
    const n = golden.times.length;
    for (let i = 0; i < n; i++) {
      expect(Math.abs(result.times[firstIndex + i]! - golden.times[i]!)).toBeLessThanOrEqual(1e-12 * result.span);
    }
    assertClose(
      Array.from({ length: n }, (_, i) => tr.values[firstIndex + i]!),
      golden.times,
      (_t, i) => sig.values[i]!,
      `${golden.name} ${sig.label}`,
      { peak: sig.peak },
    );
  }
}

/** Evaluates one closed-form term at τ = t − t0 (the Term definitions in src/simulate/result.ts). */
function term(tm: Term, tau: number): number {
  const poly = (c: number[]) => c.reduce((acc, ck, k) => acc + ck * tau ** k, 0);
  switch (tm.kind) {
    case 'exp':
      return tm.coef * Math.exp(tm.lambda * tau);
    case 'osc':
      return Math.exp(tm.sigma * tau) * (tm.cosCoef * Math.cos(tm.omega * tau) + tm.sinCoef * Math.sin(tm.omega * tau));
    case 'poly-exp':
      return poly(tm.polyCoefs) * Math.exp(tm.lambda * tau);
    case 'quasi':
      return Math.exp(tm.sigma * tau) * (poly(tm.cosPoly) * Math.cos(tm.omega * tau) + poly(tm.sinPoly) * Math.sin(tm.omega * tau));
  }
}

/** A closed-form signal (pieces) at any time t, for checks between the samples. */
export function evalPieces(pieces: Piece[], t: number): number {
  const p = pieces.find((q) => q.t0 <= t && t < q.t1) ?? pieces[pieces.length - 1]!;
  return p.terms.reduce((acc, tm) => acc + term(tm, t - p.t0), 0);
}
