import type { Circuit, Part } from '../circuit/circuit.js';
import { GROUND } from '../circuit/circuit.js';
import { type Mat, type Vec, add, cols, matmul, matvec, pickRows, transpose, zeros } from '../linalg/dense.js';
import { pinvSolve, rankSplit, solveSquare } from '../linalg/factor.js';
import { type Descriptor, type Probe, buildDescriptor, currentProbe, voltageProbe } from './descriptor.js';
import { type Reduction, ReductionError, independentRows, reduceDescriptor } from './reduce.js';
import { type SparseRow, reduceIndexOne } from './reduce-index1.js';
import { type TreeReduction, reduceTree } from './reduce-tree.js';
import type { Readout, StateSpace, StateVariable } from './state-space.js';

/**
 * From the validated circuit to the explicit state-space model (see state-space.ts), plus what is
 * needed to turn per-part initial values into a consistent initial state.
 */
export interface Model {
  ss: StateSpace;
  /** read-out rows for arbitrary probes (watches, part stresses) */
  readout(probe: Probe): Readout;
  descriptor: Descriptor;
  /**
   * Consistent state just after an instant (t = 0, or a switching event) from every capacitor's
   * voltage and inductor's current just before it (`before`, by part name; missing: 0) and the
   * inputs (and their slopes) just after it.
   */
  initialState(before: Map<string, number>, u0: Vec, du0: Vec): InitialState;
  /** relative residual of the reduced equations in the circuit equations (0 for the index-one path) */
  reductionError: number;
  /** every capacitor voltage and inductor current, as read-outs (for state hand-over) */
  storage: { part: Part; kind: StateVariable['kind']; readout: Readout }[];
}

export interface InitialState {
  x: Vec;
  /** per capacitor/inductor: value before and after, where the state had to jump */
  jumps: { part: string; kind: StateVariable['kind']; before: number; after: number }[];
  /** residual of the charge/flux balance at t = 0 (should be ~0) */
  residual: number;
}

export { ReductionError };

export function buildModel(circuit: Circuit): Model {
  const d = buildDescriptor(circuit);
  const m = d.inputs.length;
  // the index-one Schur complement on the circuit's own variables when it applies (exact zeros
  // stay zeros), otherwise the general rank-revealing reduction on an equilibrated system. Rank
  // decisions depend on the scaling; a few are tried in turn (capacitance-based, conductance-based,
  // none) before the circuit is declared to have no unique solution.
  const direct = reduceIndexOne(d, m);
  // next the normal-tree state equations (no rank decisions: exact where capacitor loops and
  // inductor cut-sets meet parts of very different size), checked by substitution like the rest
  const tree = direct ? null : reduceTree(circuit, d);
  const treeResidual = tree ? reductionResidual(d.E, d.A, d.B, tree) : Infinity;
  let s: number[] = [];
  let Es: Mat = [];
  let As: Mat = [];
  let red: Reduction | null = null;
  let lastError: unknown = null;
  const attempts = direct || treeResidual <= 1e-12
    ? [{ scales: variableScales(d), tol: 1e-10 }]
    : [variableScales(d), conductanceScales(d), ones(d.nz)].flatMap((sc) => [1e-10, 1e-7, 1e-13].map((tol) => ({ scales: sc, tol })));
  // the attempt whose substitution best satisfies the circuit equations wins
  let best: { red: Reduction; s: number[]; Es: Mat; As: Mat; residual: number } | null = tree
    ? { red: tree, s: ones(d.nz), Es: d.E, As: d.A, residual: treeResidual }
    : null;
  for (const { scales, tol } of attempts) {
    const sc = scales;
    if (direct) {
      // on the circuit's own variables: no scaling (the scaled E and A serve only the general
      // path's consistent initialization)
      best = {
        red: direct,
        s: ones(d.nz),
        Es: [],
        As: [],
        residual: 0,
      };
      break;
    }
    if (treeResidual <= 1e-12) break;
    const EsC = d.E.map((row, i) => row.map((v, j) => v * sc[i] * sc[j]));
    const AsC = d.A.map((row, i) => row.map((v, j) => v * sc[i] * sc[j]));
    const BsC = d.B.map((row, i) => row.map((v) => v * sc[i]));
    try {
      const r = reduceDescriptor(EsC, AsC, BsC, d.nz, m, tol);
      const residual = reductionResidual(EsC, AsC, BsC, r);
      if (!best || residual < best.residual) best = { red: r, s: sc, Es: EsC, As: AsC, residual };
      if (residual <= 1e-12) break;
    } catch (e) {
      if (!(e instanceof ReductionError)) throw e;
      lastError = e;
    }
  }
  // a reduction whose substitution does not satisfy the circuit equations came from wrong rank
  // decisions: refuse it rather than compute a wrong answer
  if (!best || best.residual > 1e-6) throw lastError ?? new ReductionError('the circuit equations could not be reduced accurately');
  red = best.red;
  s = best.s;
  Es = best.Es;
  As = best.As;
  const reductionError = best.residual;
  const r = red;
  const np = direct ? direct.index1.d.length : cols(r.Zp, 0);
  // z = S·Zp·p + Σ S·Zu[j]·u^(j); the index-one path hands out Zp's rows one at a time
  const unit = s.every((v) => v === 1);
  let SZpDense: Mat | null = null;
  const SZp = (): Mat => (SZpDense ??= unit ? r.Zp : r.Zp.map((row, i) => row.map((v) => v * s[i])));
  const zpRow = direct ? direct.zpRow : (i: number) => SZp()[i];
  const SZu = unit ? red.Zu : red.Zu.map((Z) => Z.map((row, i) => row.map((v) => v * s[i])));

  const physical = physicalQuantities(circuit, d);
  // the tree's states are capacitor voltages and inductor currents themselves: X = I exactly
  const treeStates = isTree(red) ? red.stateParts.map((name) => physical.findIndex((q) => q.part.name === name)) : null;
  // X a signed permutation (the tree; the index-one path when every capacitor has a node of its
  // own to ground): X⁻¹ = Xᵀ and A = X·F·Xᵀ are exact copies, no O(n³) solve or product
  const perm = treeStates ? { col: treeStates.map((_, i) => i), sign: treeStates.map(() => 1) } : direct ? signedPermutation(physical, direct.index1.d, np) : null;
  const Xall = treeStates || perm ? [] : physical.map((q) => rowTimesSparse(q.cz, zpRow, np));
  const chosen = treeStates ?? (perm ? physical.map((_, i) => i) : independentRows(Xall, np));
  if (chosen.length !== np || chosen.some((i) => i < 0)) throw new ReductionError('could not choose independent capacitor voltages and inductor currents as states');
  const X = perm ? [] : pickRows(Xall, chosen);
  const Xu = treeStates ? SZu.map(() => zeros(np, m)) : SZu.map((Z) => chosen.map((i) => rowTimesSparse(physical[i].cz, Z, m)));
  const Xinv = np && !perm ? solveSquare(X, identityOf(np)) : [];
  const applyX = (v: Vec): Vec => (perm ? perm.col.map((c, i) => 0 + perm.sign[i] * v[c]) : matvec(X, v));
  const rows = (M: Mat, c: number): Mat => (perm ? perm.col.map((k, i) => M[k].map((v) => 0 + perm.sign[i] * v)) : matmul(X, M, c));
  // F·(row): by F's sparse rows on the index-one path
  const rowTimesF = (row: Vec): Vec => (direct ? rowTimesSparseRows(row, direct.Frows, np) : matmul([row], r.F, np)[0]);
  const Ax = !np ? [] : perm ? permutedCopy(perm, direct ? direct.Frows : r.F, np) : matmul(matmul(X, r.F, np), Xinv, np);
  // x → p: the states' own coordinates
  const toStates = (cp: Vec): Vec => (perm ? perm.col.map((c, i) => 0 + cp[c] * perm.sign[i]) : vecMat(cp, Xinv, np));
  // Bx[j] = X·G[j] − Ax·Xu[j] + Xu[j−1]
  const order = Math.max(red.G.length, Xu.length + 1);
  const Bx: Mat[] = [];
  for (let j = 0; j < order; j++) {
    let b = j < red.G.length ? rows(red.G[j], m) : zeros(np, m);
    if (j < Xu.length) b = add(b, matmul(Ax, Xu[j], m), -1);
    if (j > 0 && j - 1 < Xu.length) b = add(b, Xu[j - 1]);
    Bx.push(b);
  }
  for (let j = 2; j < Bx.length; j++) {
    if (maxAbsMat(Bx[j]) > 1e-12 * (1 + maxAbsMat(Bx[0]))) {
      throw new ReductionError('a state would depend on the second derivative of a source (not supported)');
    }
  }
  const Bx0 = Bx[0] ?? zeros(np, m);
  const Bx1 = Bx[1] ?? zeros(np, m);
  const B = add(matmul(Ax, Bx1, m), Bx0);
  const states: StateVariable[] = chosen.map((i) => ({
    part: physical[i].part.name,
    kind: physical[i].kind,
    name: physical[i].kind === 'capacitor-voltage' ? `v(${physical[i].part.name})` : `i(${physical[i].part.name})`,
  }));
  const ss: StateSpace = { n: np, m, A: Ax, B, Bx1, states, inputs: d.inputs.map((p) => p.name) };

  const readout = (probe: Probe): Readout => {
    // y = cz·z + cd·z' + du·u in p and u^(j), then p = Xinv·(x − Σ Xu[j]·u^(j)), x = ξ + Bx1·u.
    const cp = np ? addVec(rowTimesRows(probe.cz, zpRow, np), rowTimesF(rowTimesRows(probe.cd, zpRow, np))) : [];
    const dp: Vec[] = [];
    for (let j = 0; j < order + 1; j++) {
      const v = new Array<number>(m).fill(0);
      if (j < SZu.length) addInto(v, rowTimes(probe.cz, SZu[j], m));
      if (j < red.G.length) addInto(v, vecMat(rowTimesRows(probe.cd, zpRow, np), red.G[j], m));
      if (j > 0 && j - 1 < SZu.length) addInto(v, rowTimes(probe.cd, SZu[j - 1], m));
      if (j === 0) addInto(v, probe.du);
      dp.push(v);
    }
    const C = np ? toStates(cp) : [];
    const dx = dp.map((v, j) => (j < Xu.length ? addVec(v, vecMat(C, Xu[j], m), -1) : v));
    for (let j = 2; j < dx.length; j++) {
      if (dx[j].some((v) => Math.abs(v) > 1e-12 * (1 + Math.max(0, ...dx[0].map(Math.abs), ...C.map(Math.abs))))) {
        throw new ReductionError('a watched quantity would depend on the second derivative of a source (not supported)');
      }
    }
    const D = addVec(dx[0], np ? vecMat(C, Bx1, m) : new Array(m).fill(0));
    return { C, D, D1: dx[1] ?? new Array(m).fill(0) };
  };

  const init: InitContext = { circuit, d, s, zpRow: direct ? direct.zpRow : (i) => r.Zp[i], unitAt: direct?.unitAt, Zp: () => r.Zp, Zu: red.Zu, np, applyX, Xu, chosen, physical };
  const initialState = (before: Map<string, number>, u0: Vec, du0: Vec): InitialState =>
    isTree(red)
      ? treeInitial(init, red, before, u0)
      : red.index1
        ? index1Initial(init, red.index1, before, u0)
        : consistentInitial(init, Es, As, before, u0, du0);
  // a chosen state reads out as itself: x_i = ξ_i + Bx1[i]·u (the general formula gives the same,
  // up to round-off, at O(n²) per quantity)
  const position = new Map(chosen.map((i, k) => [i, k]));
  const storage = physical.map((q, i) => {
    const k = position.get(i);
    if (k === undefined) return { part: q.part, kind: q.kind, readout: readout(q.probe) };
    const C = new Array<number>(np).fill(0);
    C[k] = 1;
    return { part: q.part, kind: q.kind, readout: { C, D: Bx1[k].slice(), D1: new Array<number>(m).fill(0) } };
  });

  return { ss, readout, descriptor: d, initialState, storage, reductionError };
}

interface PhysicalQuantity {
  part: Part;
  kind: StateVariable['kind'];
  /** the probe's nonzeros in z, ascending (a node pair or a branch current) */
  cz: SparseEntry[];
  /** the full probe, formed on first use */
  readonly probe: Probe;
}

interface SparseEntry {
  i: number;
  c: number;
}

function physicalQuantities(circuit: Circuit, d: Descriptor): PhysicalQuantity[] {
  const out: PhysicalQuantity[] = [];
  const nodeIndex = new Map(d.nodes.map((n, i) => [n, i]));
  const lazy = (part: Part, kind: StateVariable['kind'], cz: SparseEntry[], make: () => Probe): PhysicalQuantity => {
    let probe: Probe | null = null;
    return {
      part,
      kind,
      cz,
      get probe() {
        return (probe ??= make());
      },
    };
  };
  for (const p of circuit.parts) {
    if (p.kind === 'capacitor') {
      // v(a) − v(b), as voltageProbe writes it
      const at = new Map<number, number>();
      const ia = p.a === GROUND ? -1 : (nodeIndex.get(p.a) ?? -1);
      const ib = p.b === GROUND ? -1 : (nodeIndex.get(p.b) ?? -1);
      if (ia >= 0) at.set(ia, (at.get(ia) ?? 0) + 1);
      if (ib >= 0) at.set(ib, (at.get(ib) ?? 0) - 1);
      const cz = [...at].filter(([, c]) => c !== 0).map(([i, c]) => ({ i, c })).sort((x, y) => x.i - y.i);
      out.push(lazy(p, 'capacitor-voltage', cz, () => voltageProbe(d, p.a, p.b)));
    }
    if (p.kind === 'inductor') out.push(lazy(p, 'inductor-current', [{ i: d.branchIndex.get(p.name)!, c: 1 }], () => currentProbe(d, p)));
  }
  return out;
}

/**
 * States = physical quantities in order when each is ± one differential unknown of its own (a
 * grounded capacitor's node, an inductor's current): X is then a signed permutation.
 */
function signedPermutation(physical: PhysicalQuantity[], diff: number[], np: number): { col: number[]; sign: number[] } | null {
  if (physical.length !== np) return null;
  const pos = new Map(diff.map((i, k) => [i, k]));
  const seen = new Uint8Array(np);
  const col: number[] = [];
  const sign: number[] = [];
  for (const q of physical) {
    if (q.cz.length !== 1 || Math.abs(q.cz[0].c) !== 1) return null;
    const k = pos.get(q.cz[0].i);
    if (k === undefined || seen[k]) return null;
    seen[k] = 1;
    col.push(k);
    sign.push(q.cz[0].c);
  }
  return { col, sign };
}

/** A = X·F·Xᵀ for a signed permutation X, from F's dense or sparse rows. */
function permutedCopy(perm: { col: number[]; sign: number[] }, F: Mat | SparseRow[], np: number): Mat {
  const inv = new Int32Array(np);
  perm.col.forEach((c, i) => (inv[c] = i));
  return perm.col.map((c, i) => {
    const out = new Array<number>(np).fill(0);
    const row = F[c];
    const si = perm.sign[i];
    if (Array.isArray(row)) {
      for (let j = 0; j < np; j++) if (row[j] !== 0) out[inv[j]] = 0 + si * row[j] * perm.sign[inv[j]];
    } else {
      const { idx, val } = row as SparseRow;
      for (let q = 0; q < idx.length; q++) out[inv[idx[q]]] = 0 + si * val[q] * perm.sign[inv[idx[q]]];
    }
    return out;
  });
}

function ones(n: number): number[] {
  return new Array<number>(n).fill(1);
}

/**
 * Symmetric scaling of the unknowns so that capacitances of picofarads and farads, or
 * conductances of nanosiemens and kilosiemens, meet rank decisions on equal terms.
 */
/**
 * How far z = Zp·p + Σ Zu[j]·u^(j) with p' = F·p + Σ G[j]·u^(j) is from satisfying E·z' = A·z + B·u:
 * the largest coefficient of E·Zp·F − A·Zp and of E·Zp·G[j] + E·Zu[j−1] − A·Zu[j] − [j = 0]·B,
 * relative to the size of the products involved.
 */
function reductionResidual(E: Mat, A: Mat, B: Mat, r: ReturnType<typeof reduceDescriptor>): number {
  const np = cols(r.Zp, 0);
  const m = cols(B, 0);
  const EZp = matmul(E, r.Zp, np);
  const AZp = matmul(A, r.Zp, np);
  // sizes as products of norms (a backward-error scale): round-off in a product that cancels to
  // nothing must not count as a residual of order one
  let worst = 0;
  const nE = maxAbsMat(E);
  const nA = maxAbsMat(A);
  const nZp = maxAbsMat(r.Zp);
  const judge = (res: Mat, size: number) => {
    worst = Math.max(worst, maxAbsMat(res) / Math.max(size, 1e-300));
  };
  if (np) {
    const EZpF = matmul(EZp, r.F, np);
    judge(add(EZpF, AZp, -1), nE * nZp * maxAbsMat(r.F) + nA * nZp);
  }
  const order = Math.max(r.G.length, r.Zu.length + 1);
  for (let j = 0; j < order; j++) {
    const parts: Mat[] = [];
    let size = 0;
    let res = zeros(E.length, m);
    if (np && j < r.G.length) {
      parts.push(matmul(EZp, r.G[j], m));
      size += nE * nZp * maxAbsMat(r.G[j]);
    }
    if (j > 0 && j - 1 < r.Zu.length) {
      parts.push(matmul(E, r.Zu[j - 1], m));
      size += nE * maxAbsMat(r.Zu[j - 1]);
    }
    if (j < r.Zu.length) {
      parts.push(matmul(A, r.Zu[j], m).map((row) => row.map((v) => -v)));
      size += nA * maxAbsMat(r.Zu[j]);
    }
    if (j === 0) {
      parts.push(B.map((row) => row.map((v) => -v)));
      size += maxAbsMat(B);
    }
    for (const q of parts) res = add(res, q);
    if (parts.length) judge(res, size);
  }
  return worst;
}

/** Scaling by the conductance at each unknown first, the capacitance (or inductance) second. */
function conductanceScales(d: Descriptor): number[] {
  return Array.from({ length: d.nz }, (_, i) => {
    const a = Math.abs(d.Arows[i].get(i) ?? 0);
    if (a > 0) return 1 / Math.sqrt(a);
    const e = Math.abs(d.Erows[i].get(i) ?? 0);
    return e > 0 ? 1 / Math.sqrt(e) : 1;
  });
}

function variableScales(d: Descriptor): number[] {
  return Array.from({ length: d.nz }, (_, i) => {
    const e = Math.abs(d.Erows[i].get(i) ?? 0);
    if (e > 0) return 1 / Math.sqrt(e);
    const a = Math.abs(d.Arows[i].get(i) ?? 0);
    return a > 0 ? 1 / Math.sqrt(a) : 1;
  });
}

/**
 * x(0+) from the stored charges and fluxes at 0−. Where the circuit forces a jump (capacitors
 * switched onto each other or onto a source), charge and flux are conserved except for what the
 * algebraic branches can carry as an impulse:  E·(z+ − z−) = A·z_imp  with z_imp in the null
 * space of E and consistent with the algebraic rows.
 */
/** What both initial-state rules need of the reduced model. */
interface InitContext {
  circuit: Circuit;
  d: Descriptor;
  s: number[];
  /** row i of Zp, and all of it (formed on first use on the index-one path) */
  zpRow(i: number): Vec;
  Zp(): Mat;
  /** k when z_i is p_k itself (index-one path), else −1 */
  unitAt?: (i: number) => number;
  Zu: Mat[];
  np: number;
  applyX(p: Vec): Vec;
  Xu: Mat[];
  chosen: number[];
  physical: PhysicalQuantity[];
}

function consistentInitial(ctx: InitContext, Es: Mat, As: Mat, beforeValues: Map<string, number>, u0: Vec, du0: Vec): InitialState {
  const { circuit, d, s, Zu, np, applyX, Xu, chosen, physical } = ctx;
  const Zp = ctx.Zp();
  const nz = d.nz;
  const q = storedCharge(circuit, d, beforeValues);
  const qs = q.map((v, i) => v * s[i]);
  const derivs = [u0, du0];
  const zu = new Array<number>(nz).fill(0);
  Zu.forEach((Z, j) => {
    if (j < derivs.length) addInto(zu, matvec(Z, derivs[j]));
  });
  const rhs = addVec(qs, matvec(Es, zu), -1);
  const eSplit = rankSplit(Es, nz);
  const NE = eSplit.nullSpace;
  const kNE = cols(NE, 0);
  const U2t = transpose(eSplit.leftNull, cols(eSplit.leftNull, 0));
  const cons = matmul(U2t, matmul(As, NE, kNE), kNE);
  const N2 = rankSplit(cons, kNE, 1e-10, 1).nullSpace;
  const imp = matmul(matmul(As, NE, kNE), N2, cols(N2, 0)).map((row) => row.map((v) => -v));
  const lhs = Es.length ? matmul(Es, Zp, np).map((row, i) => [...row, ...imp[i]]) : [];
  // columns equilibrated before the least-squares solve: the unknowns (states and impulses) differ
  // in size by many orders, and a small but genuine singular value must not be cut off
  const nc = np + cols(N2, 0);
  const colScale = Array.from({ length: nc }, (_, j) => {
    let sq = 0;
    for (const row of lhs) sq += row[j] * row[j];
    return sq > 0 ? 1 / Math.sqrt(sq) : 1;
  });
  const scaledLhs = lhs.map((row) => row.map((v, j) => v * colScale[j]));
  const sol = pinvSolve(scaledLhs, rhs.map((v) => [v]), nc, 1e-14).map((r, j) => [r[0] * colScale[j]]);
  const p = sol.slice(0, np).map((r) => r[0]);
  const fitted = matvec(lhs, sol.map((r) => r[0]));
  const residual = Math.max(0, ...fitted.map((v, i) => Math.abs(v - rhs[i]))) / Math.max(1e-300, ...rhs.map(Math.abs), 1e-300);
  const x = np ? applyX(p) : [];
  Xu.forEach((Z, j) => {
    if (j < derivs.length) addInto(x, matvec(Z, derivs[j]));
  });
  const jumps = settleJumps(physical, beforeValues, ctx.zpRow, zu, p, s, u0, chosen, x);
  return { x, jumps, residual: Number.isFinite(residual) ? residual : 0 };
}

/** Stored charge (KCL rows) and flux (inductor rows) E·z− from capacitor voltages and inductor currents. */
function storedCharge(circuit: Circuit, d: Descriptor, beforeValues: Map<string, number>): Vec {
  const q = new Array<number>(d.nz).fill(0);
  const index = new Map(d.nodes.map((n, i) => [n, i]));
  const node = (n: string) => index.get(n) ?? -1;
  for (const p of circuit.parts) {
    const v0 = beforeValues.get(p.name) ?? 0;
    if (p.kind === 'capacitor') {
      const a = node(p.a);
      const b = node(p.b);
      if (a >= 0) q[a] += p.value * v0;
      if (b >= 0) q[b] -= p.value * v0;
    } else if (p.kind === 'inductor') {
      q[d.branchIndex.get(p.name)!] += p.value * v0;
    }
  }
  return q;
}

function isTree(r: Reduction): r is TreeReduction {
  return 'stateParts' in r;
}

/** Tree case: cut-set charges and loop fluxes conserved (reduce-tree.ts). */
function treeInitial(ctx: InitContext, red: TreeReduction, beforeValues: Map<string, number>, u0: Vec): InitialState {
  const { d, s, Zu, chosen, physical } = ctx;
  const p = red.initialP(beforeValues, u0);
  const zu = new Array<number>(d.nz).fill(0);
  if (Zu[0]) addInto(zu, matvec(Zu[0], u0));
  const x = p.slice();
  const jumps = settleJumps(physical, beforeValues, ctx.zpRow, zu, p, s, u0, chosen, x);
  return { x, jumps, residual: 0 };
}

/** Index-one case: E_dd·p = q_d (charge and flux conserved; nothing else can change them). */
function index1Initial(ctx: InitContext, idx: { d: number[]; Edd: Mat; eddDiagonal?: Float64Array | null }, beforeValues: Map<string, number>, u0: Vec): InitialState {
  const { circuit, d, s, Zu, np, applyX, Xu, chosen, physical } = ctx;
  const q = storedCharge(circuit, d, beforeValues);
  const diag = idx.eddDiagonal !== undefined ? idx.eddDiagonal : idx.Edd.every((row, i) => row.every((v, j) => i === j || v === 0)) ? Float64Array.from(idx.Edd, (row, k) => row[k]) : null;
  const p = !np ? [] : diag ? idx.d.map((i, k) => q[i] / diag[k]) : solveSquare(idx.Edd, idx.d.map((i) => [q[i]])).map((r) => r[0]);
  const zu = new Array<number>(d.nz).fill(0);
  if (Zu[0]) addInto(zu, matvec(Zu[0], u0));
  const x = np ? applyX(p) : [];
  if (Xu[0]) addInto(x, matvec(Xu[0], u0));
  const jumps = settleJumps(physical, beforeValues, ctx.zpRow, zu, p, s, u0, chosen, x, ctx.unitAt);
  return { x, jumps, residual: 0 };
}

/**
 * Which capacitors/inductors changed value in the instant; a change below 1e-9 of the circuit's
 * largest stored value or source value is round-off, and then the state keeps its value exactly.
 */
function settleJumps(physical: PhysicalQuantity[], beforeValues: Map<string, number>, zpRow: (i: number) => Vec, zu: Vec, p: Vec, s: number[], u0: Vec, chosen: number[], x: Vec, unitAt?: (i: number) => number): InitialState['jumps'] {
  // z just after the instant, only where a capacitor or inductor reads it; a unit row of Zp picks
  // p_k (the sum over the row's zeros adds only zeros while p is finite)
  const finite = p.every(Number.isFinite);
  const zPlus = (i: number): number => {
    let acc = 0;
    const k = unitAt && finite ? unitAt(i) : -1;
    if (k >= 0) acc = 0 + p[k];
    else if (p.length) {
      const row = zpRow(i);
      for (let j = 0; j < p.length; j++) acc += row[j] * p[j];
    }
    return (acc + zu[i]) * s[i];
  };
  const values = physical.map((ph) => {
    let after = 0;
    for (const { i, c } of ph.cz) after += c * zPlus(i);
    return { ph, before: beforeValues.get(ph.part.name) ?? 0, after };
  });
  let scale = 0;
  for (const v of values) scale = Math.max(scale, Math.abs(v.before), Math.abs(v.after));
  for (const u of u0) scale = Math.max(scale, Math.abs(u));
  const jumps: InitialState['jumps'] = [];
  for (const v of values) {
    if (Math.abs(v.after - v.before) > 1e-9 * scale) jumps.push({ part: v.ph.part.name, kind: v.ph.kind, before: v.before, after: v.after });
  }
  chosen.forEach((q, i) => {
    const v = values[q];
    if (Math.abs(v.after - v.before) <= 1e-9 * scale) x[i] = v.before;
  });
  return jumps;
}

/** row·M where M is given by its rows */
function rowTimesRows(row: Vec, M: (i: number) => Vec, c: number): Vec {
  const out = new Array<number>(c).fill(0);
  for (let i = 0; i < row.length; i++) {
    const r = row[i];
    if (r === 0) continue;
    const Mi = M(i);
    for (let j = 0; j < c; j++) out[j] += r * Mi[j];
  }
  return out;
}

/** Σ c·M[i] over a sparse row's entries (ascending i) */
function rowTimesSparse(row: SparseEntry[], M: Mat | ((i: number) => Vec), c: number): Vec {
  const out = new Array<number>(c).fill(0);
  for (const { i, c: r } of row) {
    const Mi = typeof M === 'function' ? M(i) : M[i];
    for (let j = 0; j < c; j++) out[j] += r * Mi[j];
  }
  return out;
}

/** row·F with F by sparse rows */
function rowTimesSparseRows(row: Vec, F: SparseRow[], c: number): Vec {
  const out = new Array<number>(c).fill(0);
  for (let i = 0; i < row.length; i++) {
    const r = row[i];
    if (r === 0) continue;
    const { idx, val } = F[i];
    for (let q = 0; q < idx.length; q++) out[idx[q]] += r * val[q];
  }
  return out;
}

function rowTimes(row: Vec, M: Mat, c: number): Vec {
  const out = new Array<number>(c).fill(0);
  for (let i = 0; i < row.length; i++) {
    const r = row[i];
    if (r === 0) continue;
    for (let j = 0; j < c; j++) out[j] += r * M[i][j];
  }
  return out;
}

const vecMat = rowTimes;

function addInto(a: Vec, b: Vec): void {
  for (let i = 0; i < a.length; i++) a[i] += b[i];
}

function addVec(a: Vec, b: Vec, k = 1): Vec {
  return a.map((v, i) => v + k * b[i]);
}

function identityOf(n: number): Mat {
  const I = zeros(n, n);
  for (let i = 0; i < n; i++) I[i][i] = 1;
  return I;
}

function maxAbsMat(M: Mat): number {
  let m = 0;
  for (const row of M) for (const v of row) m = Math.max(m, Math.abs(v));
  return m;
}

