import type { Readout, StateSpace } from '../model/state-space.js';
import { type Mat, type Vec, matmul, matvec } from '../linalg/dense.js';
import { blockExp, blockTerms, solveBlock } from '../lti/block.js';
import type { Block, Modal } from '../lti/modal.js';
import type { InputSchedule } from '../waveform/schedule.js';
import type { PathResponse, Piece, Term } from './result.js';

/**
 * Exact solution interval by interval in modal coordinates. On each interval the inputs are
 * affine in time, so every block's response is a particular polynomial plus its free response;
 * the state at the interval's end is handed to the next one, and Dirac impulses add B·area.
 */
export interface ExactSolution {
  /** per read-out, the closed form on each interval */
  pieces: Piece[][];
  /** canonical state ξ at each interval start (after impulses), for the cross-check's use */
  starts: Vec[];
}

export function solveExact(ss: StateSpace, modal: Modal, readouts: Readout[], schedule: InputSchedule, xi0: Vec, span: number): ExactSolution {
  const beta = matmul(modal.Winv, ss.B, ss.m);
  const gammas = readouts.map((r) => (ss.n ? matvec(transposeOf(modal.W), r.C) : []));
  let xm = ss.n ? matvec(modal.Winv, xi0) : [];
  const pieces: Piece[][] = readouts.map(() => []);
  const starts: Vec[] = [];
  for (const iv of schedule.intervals) {
    const dirac = schedule.diracs.find((d) => d.t === iv.t0);
    if (dirac && iv.t0 > 0) xm = xm.map((v, i) => v + dot(beta[i], dirac.area));
    starts.push(ss.n ? matvec(modal.W, xm) : []);
    const jump = schedule.jumps.find((j) => j.t === iv.t0);
    const sols = modal.blocks.map((b) =>
      solveBlock(b, pick(xm, b), pickRows(beta, b).map((row) => dot(row, iv.u)), pickRows(beta, b).map((row) => dot(row, iv.slope)), span),
    );
    readouts.forEach((r, w) => {
      const terms = collectTerms(modal.blocks, sols, gammas[w], span);
      const direct = dot(r.D, iv.u) + dot(r.D1, iv.slope);
      addPoly(terms, [direct, dot(r.D, iv.slope)]);
      let impulseArea = 0;
      if (dirac) impulseArea += dot(r.D, dirac.area);
      if (jump) impulseArea += dot(r.D1, jump.delta);
      pieces[w].push({ t0: iv.t0, t1: iv.t1, terms: tidy(terms), impulseArea });
    });
    const tau = iv.t1 - iv.t0;
    const next = new Array<number>(ss.n).fill(0);
    modal.blocks.forEach((b, k) => {
      const s = sols[k];
      const free = s.w ? blockExp(b, tau, s.w) : b.index.map(() => 0);
      b.index.forEach((col, i) => {
        let v = free[i];
        let p = 1;
        for (const c of s.poly) {
          v += c[i] * p;
          p *= tau;
        }
        next[col] = v;
      });
    });
    xm = next;
  }
  return { pieces, starts };
}

/** Impulse and step response of each source-to-read-out path, as closed forms in t. */
export function pathResponses(ss: StateSpace, modal: Modal, r: Readout, span: number): PathResponse[] {
  const beta = matmul(modal.Winv, ss.B, ss.m);
  const gamma = ss.n ? matvec(transposeOf(modal.W), r.C) : [];
  return ss.inputs.map((source, j) => {
    const bj = beta.map((row) => row[j]);
    const zero = (b: Block) => b.index.map(() => 0);
    const impulseTerms = collectTerms(modal.blocks, modal.blocks.map((b) => ({ poly: [], w: pick(bj, b) })), gamma, span);
    const stepSols = modal.blocks.map((b) => solveBlock(b, zero(b), pick(bj, b), zero(b), span));
    const stepTerms = collectTerms(modal.blocks, stepSols, gamma, span);
    addPoly(stepTerms, [r.D[j]]);
    // H(0) = D − C·A⁻¹·B: the constant of the step response when every block has a particular solution
    const integrates = stepSols.some((s) => s.w === null);
    let dc = r.D[j];
    modal.blocks.forEach((b, k) => {
      const p0 = stepSols[k].poly[0];
      if (p0) dc += dot(pick(gamma, b), p0);
    });
    return {
      source,
      impulse: { terms: tidy(impulseTerms), directArea: r.D[j], derivArea: r.D1[j] },
      step: { terms: tidy(stepTerms), stepImpulseArea: r.D1[j] },
      dcGain: integrates ? NaN : dc,
    };
  });
}

function collectTerms(blocks: Block[], sols: { poly: Vec[]; w: Vec | null }[], gamma: Vec, span: number): Term[] {
  const terms: Term[] = [];
  const poly: number[] = [];
  blocks.forEach((b, k) => {
    const g = pick(gamma, b);
    const s = sols[k];
    s.poly.forEach((c, j) => {
      poly[j] = (poly[j] ?? 0) + dot(g, c);
    });
    if (s.w) terms.push(...blockTerms(b, g, s.w, span));
  });
  if (poly.length) terms.unshift({ kind: 'poly-exp', lambda: 0, polyCoefs: poly.map((v) => v ?? 0) });
  return terms;
}

function addPoly(terms: Term[], coefs: number[]): void {
  let p = terms.find((t): t is Extract<Term, { kind: 'poly-exp' }> => t.kind === 'poly-exp' && t.lambda === 0);
  if (!p) {
    p = { kind: 'poly-exp', lambda: 0, polyCoefs: [] };
    terms.unshift(p);
  }
  coefs.forEach((c, j) => {
    p!.polyCoefs[j] = (p!.polyCoefs[j] ?? 0) + c;
  });
}

/** Drop trailing zero polynomial coefficients and terms that are exactly zero. */
function tidy(terms: Term[]): Term[] {
  return terms.filter((t) => {
    if (t.kind === 'poly-exp') {
      while (t.polyCoefs.length > 1 && t.polyCoefs[t.polyCoefs.length - 1] === 0) t.polyCoefs.pop();
      return t.polyCoefs.some((c) => c !== 0);
    }
    if (t.kind === 'exp') return t.coef !== 0;
    return t.cosCoef !== 0 || t.sinCoef !== 0;
  });
}

function pick(v: Vec, b: Block): Vec {
  return b.index.map((i) => v[i]);
}

function pickRows(m: Mat, b: Block): Mat {
  return b.index.map((i) => m[i]);
}

function dot(a: Vec, b: Vec): number {
  let s = 0;
  for (let i = 0; i < a.length; i++) s += a[i] * b[i];
  return s;
}

function transposeOf(M: Mat): Mat {
  const c = M.length ? M[0].length : 0;
  return Array.from({ length: c }, (_, j) => M.map((row) => row[j]));
}
