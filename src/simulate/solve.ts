import type { Readout, StateSpace } from '../model/state-space.js';
import { type Mat, type Vec, dot, matvec } from '../linalg/dense.js';
import { type C, c, cmul } from '../lti/complex.js';
import { type ScalarMode, scalarModes } from '../lti/scalar-modes.js';
import type { Block, Modal } from '../lti/modal.js';
import { type BlockSolution, type Forcing, type Particular, blockSolutionTerms, blockStateAt, particularOf, quasiTerm, solveBlockForced, withFree } from '../lti/response.js';
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
  /** canonical state ξ at requested interval starts (before any impulse there) */
  statesAt: Map<number, Vec>;
  /** canonical state ξ at the end of the last interval */
  final: Vec;
}

export function solveExact(ss: StateSpace, modal: Modal, readouts: Readout[], schedule: InputSchedule, xi0: Vec, span: number, recordAt: number[] = []): ExactSolution {
  const statesAt = new Map<number, Vec>();
  const wanted = new Set(recordAt);
  const beta = ss.n ? modalInputs(ss, modal) : [];
  const gammas = readouts.map((r) => (ss.n ? rowCombination(r.C, modal.W, modal.n) : []));
  let xm = ss.n ? modal.toModal(xi0.map((v) => [v])).map((r) => r[0]) : [];
  let spare = xm.slice();
  const pieces: Piece[][] = readouts.map(() => []);
  // Intervals of the same length and the same source components (the cycles of a pulse train)
  // share their particular solutions, the read-out terms those give, and their end values.
  // (keyed by the length, then compared component by component: no key string per interval)
  const shapes = new Map<number, { comps: Component[]; shape: Shape }[]>();
  let shapeCount = 0;
  const first = schedule.intervals[0]?.t0;
  // impulses and jumps by time (hashing 10⁴ float keys costs more than walking the sorted lists)
  const diracAt = new Map(schedule.diracs.map((d) => [d.t, d.area]));
  const jumpsSorted = schedule.jumps.every((j, i) => i === 0 || schedule.jumps[i - 1].t < j.t);
  const jumpAt = jumpsSorted ? null : new Map(schedule.jumps.map((j) => [j.t, j.delta]));
  let nextJump = 0;
  const modeSets = modal.blocks.map((b) => scalarModes(b));
  const nb = modal.blocks.length;
  const etaBuf = modeSets.map((modes) => modes?.map(() => c(0)) ?? null);
  const etas: (C[] | null)[] = new Array(nb).fill(null);
  const clusterSols: (BlockSolution | null)[] = new Array(nb).fill(null);
  const outModes = readouts.map((_, w) => modal.blocks.map((b, k) => modeSets[k]?.map((m) => dotRC(pick(gammas[w], b), m.right)) ?? null));
  for (const iv of schedule.intervals) {
    if (wanted.size > 0 && wanted.has(iv.t0)) statesAt.set(iv.t0, ss.n ? matvec(modal.W, xm) : []);
    const dirac = diracAt.size > 0 ? diracAt.get(iv.t0) : undefined;
    if (dirac && iv.t0 > first) xm = xm.map((v, i) => v + dot(beta[i], dirac));
    let jump: number[] | undefined;
    if (jumpAt) jump = jumpAt.get(iv.t0);
    else {
      while (nextJump < schedule.jumps.length && schedule.jumps[nextJump].t < iv.t0) nextJump++;
      if (nextJump < schedule.jumps.length && schedule.jumps[nextJump].t === iv.t0) jump = schedule.jumps[nextJump].delta;
    }
    const tau = iv.t1 - iv.t0;
    let sameLength = shapes.get(tau);
    let shape: Shape | undefined;
    if (sameLength) {
      for (const x of sameLength) {
        if (sameComponents(x.comps, iv.components)) {
          shape = x.shape;
          break;
        }
      }
    }
    if (!shape) {
      shape = makeShape(modal, beta, gammas, readouts, iv, tau, modeSets);
      if (shapeCount < 4096) {
        if (!sameLength) shapes.set(tau, (sameLength = []));
        sameLength.push({ comps: iv.components, shape });
        shapeCount++;
      }
    }
    // free part per block: scalar modes carry η − η_p(0); clusters a real vector
    // (plain loops: a long pulse train runs this tens of thousands of times)
    // (η buffers reused from interval to interval: nothing keeps them past it)
    for (let k = 0; k < nb; k++) {
      const b = modal.blocks[k];
      const modes = modeSets[k];
      const pt = shape.particulars[k];
      if (modes && pt.modes) {
        const eta = etaBuf[k]!;
        for (let l = 0; l < modes.length; l++) {
          // left·ξ_block − η_p(0)
          const left = modes[l].left;
          let re = 0;
          let im = 0;
          for (let i = 0; i < b.index.length; i++) {
            re += left[i].re * xm[b.index[i]];
            im += left[i].im * xm[b.index[i]];
          }
          const at0 = pt.modes[l].at0;
          eta[l].re = re - at0.re;
          eta[l].im = im - at0.im;
        }
        etas[k] = eta;
        clusterSols[k] = null;
      } else {
        etas[k] = null;
        clusterSols[k] = withFree(b, pt, pick(xm, b));
      }
    }
    for (let w = 0; w < readouts.length; w++) {
      const r = readouts[w];
      // the shape's terms are shared by its pieces (never changed: addFree replaces what it merges into)
      const terms = shape.readoutTerms[w].slice();
      // (a large circuit looks its terms up by exponent: a scan per block is O(n²) per interval)
      const at = nb > INDEXED ? new TermIndex(terms) : null;
      for (let k = 0; k < nb; k++) {
        const eta = etas[k];
        if (eta) addFree(terms, modeSets[k]!, outModes[w][k]!, eta, at);
        else {
          terms.push(...blockSolutionTerms(modal.blocks[k], { quasi: [], clusterFree: clusterSols[k]!.clusterFree }, pick(gammas[w], modal.blocks[k]), tau));
          at?.update();
        }
      }
      let impulseArea = 0;
      if (dirac) impulseArea += dot(r.D, dirac);
      if (jump) impulseArea += dot(r.D1, jump);
      pieces[w].push({ t0: iv.t0, t1: iv.t1, terms, impulseArea });
    }
    // state at the interval's end: particular end values (cached) plus the free parts carried over
    // (two state arrays in turn: nothing keeps xm past the interval, pick copies)
    const next = spare;
    for (let i = 0; i < next.length; i++) next[i] = shape.end[i];
    for (let k = 0; k < nb; k++) {
      const b = modal.blocks[k];
      const eta = etas[k];
      if (eta) {
        const modes = modeSets[k]!;
        const growth = shape.growth[k]!;
        for (let i = 0; i < b.index.length; i++) {
          let v = 0;
          for (let l = 0; l < modes.length; l++) {
            // Re[right_i · η_l·e^(λ_l τ)]
            const e = eta[l];
            const g = growth[l];
            const zr = e.re * g.re - e.im * g.im;
            const zi = e.re * g.im + e.im * g.re;
            v += modes[l].right[i].re * zr - modes[l].right[i].im * zi;
          }
          next[b.index[i]] += v;
        }
      } else {
        const v = blockStateAt(b, { quasi: [], clusterFree: clusterSols[k]!.clusterFree }, tau);
        b.index.forEach((col, i) => (next[col] += v[i]));
      }
    }
    spare = xm;
    xm = next;
  }
  return { pieces, statesAt, final: ss.n ? matvec(modal.W, xm) : [] };
}

function cexpT(l: C, tau: number): C {
  const m = Math.exp(l.re * tau);
  return l.im === 0 ? { re: m, im: 0 } : { re: m * Math.cos(l.im * tau), im: m * Math.sin(l.im * tau) };
}

function dotRC(g: Vec, v: C[]): C {
  let re = 0;
  let im = 0;
  for (let i = 0; i < g.length; i++) {
    re += g[i] * v[i].re;
    im += g[i] * v[i].im;
  }
  return { re, im };
}

/** above this many blocks addFree finds a term of the same exponent through a TermIndex */
const INDEXED = 16;

/**
 * Where the first 'exp' term of each λ and the first 'osc' term of each (σ, ω) of a growing term
 * list sit: the same term a scan from the start finds (a term is only replaced by one of its own
 * kind and exponent, or appended; NaN exponents match nothing, as with ===).
 */
class TermIndex {
  private readonly exps = new Map<number, number>();
  private readonly oscs = new Map<number, Map<number, number>>();
  private seen = 0;
  constructor(private readonly terms: Term[]) {
    this.update();
  }

  /** takes in the terms appended since the last call */
  update(): void {
    const { terms } = this;
    for (; this.seen < terms.length; this.seen++) {
      const t = terms[this.seen];
      if (t.kind === 'exp') {
        if (!Number.isNaN(t.lambda) && !this.exps.has(t.lambda)) this.exps.set(t.lambda, this.seen);
      } else if (t.kind === 'osc' && !Number.isNaN(t.sigma) && !Number.isNaN(t.omega)) {
        let m = this.oscs.get(t.sigma);
        if (!m) this.oscs.set(t.sigma, (m = new Map()));
        if (!m.has(t.omega)) m.set(t.omega, this.seen);
      }
    }
  }

  exp(lambda: number): number {
    return this.exps.get(lambda) ?? this.terms.length;
  }

  osc(sigma: number, omega: number): number {
    return this.oscs.get(sigma)?.get(omega) ?? this.terms.length;
  }
}

/**
 * Add the free response Re[Σ_ℓ (γ·v_ℓ)·η_ℓ·e^(λ_ℓ τ)] of one block to a term list, merging with a
 * term of the same exponent when there is one. A conjugate pair becomes one damped cosine/sine.
 */
function addFree(terms: Term[], modes: ScalarMode[], out: C[], eta: C[], index: TermIndex | null): void {
  if (modes.length === 1) {
    const coef = out[0].re * eta[0].re - out[0].im * eta[0].im;
    const lambda = modes[0].lambda.re;
    let at = 0;
    if (index) at = index.exp(lambda);
    else while (at < terms.length && !(terms[at].kind === 'exp' && (terms[at] as { lambda: number }).lambda === lambda)) at++;
    const same = terms[at];
    if (same && same.kind === 'exp') terms[at] = { kind: 'exp', lambda, coef: same.coef + coef };
    else {
      terms.push({ kind: 'exp', lambda, coef });
      index?.update();
    }
    return;
  }
  // Re[C1·e^(λτ)] + Re[C2·e^(λ̄τ)] = Re[(C1 + conj C2)·e^(λτ)], λ = μ + jω (ω > 0 for modes[0])
  const c1 = cmul(out[0], eta[0]);
  const c2 = cmul(out[1], eta[1]);
  const a = c1.re + c2.re;
  const b = c1.im - c2.im;
  const sigma = modes[0].lambda.re;
  const omega = modes[0].lambda.im;
  let at = 0;
  if (index) at = index.osc(sigma, omega);
  else {
    for (; at < terms.length; at++) {
      const t = terms[at];
      if (t.kind === 'osc' && t.sigma === sigma && t.omega === omega) break;
    }
  }
  const same = terms[at];
  if (same && same.kind === 'osc') terms[at] = { kind: 'osc', sigma, omega, cosCoef: same.cosCoef + a, sinCoef: same.sinCoef - b };
  else {
    terms.push({ kind: 'osc', sigma, omega, cosCoef: a, sinCoef: -b });
    index?.update();
  }
}

interface Shape {
  particulars: Particular[];
  /** per read-out: the terms of the particular parts and of the direct feed-through, simplified */
  readoutTerms: Term[][];
  /** modal state at the interval's end due to the particular parts alone */
  end: number[];
  /** per block of scalar modes: e^(λτ) over the interval, per mode */
  growth: (C[] | null)[];
}

function sameComponents(a: Component[], b: Component[]): boolean {
  if (a.length !== b.length) return false;
  for (let i = 0; i < a.length; i++) {
    const x = a[i];
    const y = b[i];
    if (x.input !== y.input || x.power !== y.power || x.sigma !== y.sigma || x.omega !== y.omega || x.re !== y.re || x.im !== y.im) return false;
  }
  return true;
}

function makeShape(modal: Modal, beta: Mat, gammas: Vec[], readouts: Readout[], iv: Interval, tau: number, modeSets: (ScalarMode[] | null)[]): Shape {
  // series form only where the particular and free parts would otherwise cancel beyond 1e-12 on
  // this interval (see scalarParticular)
  const particulars = modal.blocks.map((b) => particularOf(b, forcingsFor(b, beta, iv.components), tau, -1));
  const quasiOf = (pt: Particular) => (pt.modes ? pt.modes.flatMap((m) => m.quasi) : pt.cluster!.quasi);
  const readoutTerms = readouts.map((r, w) => {
    const terms: Term[] = [];
    modal.blocks.forEach((b, k) => {
      terms.push(...blockSolutionTerms(b, { quasi: quasiOf(particulars[k]), clusterFree: null }, pick(gammas[w], b), tau));
    });
    terms.push(...directTerms(r.D, iv.components), ...directTerms(r.D1, iv.slopes));
    return simplifyTerms(terms);
  });
  const end = new Array<number>(modal.n).fill(0);
  modal.blocks.forEach((b, k) => {
    const v = blockStateAt(b, { quasi: quasiOf(particulars[k]), clusterFree: null }, tau);
    b.index.forEach((col, i) => (end[col] = v[i]));
  });
  const growth = modeSets.map((modes) => modes?.map((m) => cexpT(m.lambda, tau)) ?? null);
  return { particulars, readoutTerms, end, growth };
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
  const beta = ss.n ? modalInputs(ss, modal) : [];
  const gamma = ss.n ? rowCombination(r.C, modal.W, modal.n) : [];
  return ss.inputs.map((source, j) => {
    const { impulseSols, stepSols } = pathSolutions(modal, beta, j, span);
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

// the blocks' impulse and step solutions of one source depend on neither the read-out nor its
// watch: formed once per modal form, source and span
const solutionsOf = new WeakMap<Modal, Map<string, { impulseSols: BlockSolution[]; stepSols: BlockSolution[] }>>();
function pathSolutions(modal: Modal, beta: Mat, j: number, span: number): { impulseSols: BlockSolution[]; stepSols: BlockSolution[] } {
  let byKey = solutionsOf.get(modal);
  if (!byKey) solutionsOf.set(modal, (byKey = new Map()));
  const key = `${j} ${span}`;
  let sols = byKey.get(key);
  if (!sols) {
    const bj = beta.map((row) => row[j]);
    const zero = (b: Block) => b.index.map(() => 0);
    const impulseSols = modal.blocks.map((b) => solveBlockForced(b, pick(bj, b), [], span));
    const unitStep = (b: Block): Forcing[] => [{ power: 0, s: c(0), g: b.index.map((i) => c(bj[i])) }];
    const stepSols = modal.blocks.map((b) => solveBlockForced(b, zero(b), unitStep(b), span));
    sols = { impulseSols, stepSols };
    byKey.set(key, sols);
  }
  return sols;
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

/** cᵀ·W (the read-out in modal coordinates), skipping the zeros of c: a probe touches a few states. */
function rowCombination(c: Vec, W: Mat, n: number): Vec {
  const out = new Array<number>(n).fill(0);
  for (let i = 0; i < c.length; i++) {
    const ci = c[i];
    if (ci === 0) continue;
    const row = W[i];
    for (let k = 0; k < n; k++) out[k] += ci * row[k];
  }
  return out;
}

// W⁻¹·B once per modal form (every watched path of a configuration needs it)
const inputsOf = new WeakMap<Modal, Mat>();
function modalInputs(ss: StateSpace, modal: Modal): Mat {
  let b = inputsOf.get(modal);
  if (!b) {
    b = modal.toModal(ss.B);
    inputsOf.set(modal, b);
  }
  return b;
}
