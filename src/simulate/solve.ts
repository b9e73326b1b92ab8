import type { Readout, StateSpace } from '../model/state-space.js';
import { type Mat, type Vec, matmul, matvec } from '../linalg/dense.js';
import { type C, c } from '../lti/complex.js';
import type { Block, Modal } from '../lti/modal.js';
import { type BlockSolution, type Forcing, blockSolutionTerms, blockStateAt, quasiTerm, solveBlockForced } from '../lti/response.js';
import { simplifyTerms } from '../lti/simplify.js';
import type { Component } from '../waveform/component.js';
import type { InputSchedule, Interval } from '../waveform/schedule.js';
import type { PathResponse, Piece, Term } from './result.js';

/**
 * Exact solution interval by interval in modal coordinates. On each interval every input is a sum
 * of components c·τ^p·e^(sτ), so every block's response is a particular quasi-polynomial plus its
 * free response; the state at the interval's end is handed to the next one, and Dirac impulses
 * add B·area.
 */
export interface ExactSolution {
  /** per read-out, the closed form on each interval */
  pieces: Piece[][];
  /** canonical state ξ at the end of the last interval */
  final: Vec;
}

export function solveExact(ss: StateSpace, modal: Modal, readouts: Readout[], schedule: InputSchedule, xi0: Vec, span: number): ExactSolution {
  const beta = matmul(modal.Winv, ss.B, ss.m);
  const gammas = readouts.map((r) => (ss.n ? matvec(transposeOf(modal.W), r.C) : []));
  let xm = ss.n ? matvec(modal.Winv, xi0) : [];
  const pieces: Piece[][] = readouts.map(() => []);
  for (const iv of schedule.intervals) {
    const dirac = schedule.diracs.find((d) => d.t === iv.t0);
    if (dirac && iv.t0 > schedule.intervals[0].t0) xm = xm.map((v, i) => v + dot(beta[i], dirac.area));
    const jump = schedule.jumps.find((j) => j.t === iv.t0);
    const sols = modal.blocks.map((b) => solveBlockForced(b, pick(xm, b), forcingsFor(b, beta, iv.components), span));
    readouts.forEach((r, w) => {
      const terms = collect(modal.blocks, sols, gammas[w], span);
      terms.push(...directTerms(r.D, iv.components), ...directTerms(r.D1, iv.slopes));
      let impulseArea = 0;
      if (dirac) impulseArea += dot(r.D, dirac.area);
      if (jump) impulseArea += dot(r.D1, jump.delta);
      pieces[w].push({ t0: iv.t0, t1: iv.t1, terms: simplifyTerms(terms), impulseArea });
    });
    xm = advance(modal, sols, iv);
  }
  return { pieces, final: ss.n ? matvec(modal.W, xm) : [] };
}

function advance(modal: Modal, sols: BlockSolution[], iv: Interval): Vec {
  const next = new Array<number>(modal.n).fill(0);
  modal.blocks.forEach((b, k) => {
    const v = blockStateAt(b, sols[k], iv.t1 - iv.t0);
    b.index.forEach((col, i) => (next[col] = v[i]));
  });
  return next;
}

/** Read-out terms that follow the inputs directly: Re[d·c·τ^p·e^(sτ)]. */
function directTerms(d: Vec, comps: Component[]): Term[] {
  const out: Term[] = [];
  for (const k of comps) {
    const w = d[k.input];
    if (!w) continue;
    const coefs: C[] = new Array(k.power + 1).fill(c(0));
    coefs[k.power] = c(w * k.re, w * k.im);
    out.push(quasiTerm(c(k.sigma, k.omega), coefs));
  }
  return out;
}

function forcingsFor(b: Block, beta: Mat, comps: Component[]): Forcing[] {
  return comps.map((k) => ({
    power: k.power,
    s: c(k.sigma, k.omega),
    g: b.index.map((i) => c(beta[i][k.input] * k.re, beta[i][k.input] * k.im)),
  }));
}

/** Impulse and step response of each source-to-read-out path, as closed forms in t. */
export function pathResponses(ss: StateSpace, modal: Modal, r: Readout, span: number): PathResponse[] {
  const beta = matmul(modal.Winv, ss.B, ss.m);
  const gamma = ss.n ? matvec(transposeOf(modal.W), r.C) : [];
  return ss.inputs.map((source, j) => {
    const bj = beta.map((row) => row[j]);
    const zero = (b: Block) => b.index.map(() => 0);
    const impulseSols = modal.blocks.map((b) => solveBlockForced(b, pick(bj, b), [], span));
    const unitStep = (b: Block): Forcing[] => [{ power: 0, s: c(0), g: b.index.map((i) => c(bj[i])) }];
    const stepSols = modal.blocks.map((b) => solveBlockForced(b, zero(b), unitStep(b), span));
    const stepTerms = collect(modal.blocks, stepSols, gamma, span);
    if (r.D[j]) stepTerms.push({ kind: 'exp', lambda: 0, coef: r.D[j] });
    const simplified = simplifyTerms(stepTerms);
    // H(0) = the constant of the step response, when every other term decays
    const decays = simplified.every((t) => t.kind === 'exp' && t.lambda === 0 ? true : decayRate(t) < 0);
    const constant = simplified.find((t) => t.kind === 'exp' && t.lambda === 0);
    return {
      source,
      impulse: { terms: simplifyTerms(collect(modal.blocks, impulseSols, gamma, span)), directArea: r.D[j], derivArea: r.D1[j] },
      step: { terms: simplified, stepImpulseArea: r.D1[j] },
      dcGain: decays ? (constant && constant.kind === 'exp' ? constant.coef : 0) : NaN,
    };
  });
}

function decayRate(t: Term): number {
  switch (t.kind) {
    case 'exp':
    case 'poly-exp':
      return t.lambda;
    case 'osc':
    case 'quasi':
      return t.sigma;
  }
}

function collect(blocks: Block[], sols: BlockSolution[], gamma: Vec, span: number): Term[] {
  const terms: Term[] = [];
  blocks.forEach((b, k) => terms.push(...blockSolutionTerms(b, sols[k], pick(gamma, b), span)));
  return terms;
}

function pick(v: Vec, b: Block): Vec {
  return b.index.map((i) => v[i]);
}

function dot(a: Vec, b: Vec): number {
  let s = 0;
  for (let i = 0; i < a.length; i++) s += a[i] * b[i];
  return s;
}

function transposeOf(M: Mat): Mat {
  const cc = M.length ? M[0].length : 0;
  return Array.from({ length: cc }, (_, j) => M.map((row) => row[j]));
}
