import type { Circuit, Part } from '../circuit/circuit.js';
import { GROUND } from '../circuit/circuit.js';
import { type Mat, type Vec, zeros } from '../linalg/dense.js';
import { solveSquare } from '../linalg/factor.js';
import type { Descriptor } from './descriptor.js';
import type { Reduction } from './reduce.js';
import { UnionFind } from '../circuit/union-find.js';

/**
 * State equations from the circuit graph (a normal tree), for the circuits the index-one
 * reduction cannot take: capacitor loops with voltage sources, inductor cut-sets with current
 * sources, floating capacitors. No rank decisions are made, so picofarads next to henries lose
 * nothing.
 *
 * The tree takes voltage sources first, then capacitors, resistors, inductors (current sources
 * never). The states p are the tree capacitors' voltages and the link inductors' currents. Each
 * link's voltage is the signed sum of the tree voltages on its loop (v_l = Σ D[l][t]·v_t) and each
 * tree branch's current is −Σ D[l][t]·i_l over the links. With that order, a link capacitor's loop
 * holds only sources and tree capacitors, a tree inductor's cut-set only link inductors and current
 * sources, and the resistors form a network driven by sources, capacitor voltages and inductor
 * currents alone:
 *
 *   (G_t + D_RRᵀ·G_l·D_RR)·v_R = −D_RRᵀ·G_l·(D_RV·u + D_RC·v_C) − D_LRᵀ·i_L − D_IRᵀ·u_I
 *   (C_t + D_CCᵀ·C_l·D_CC)·v_C' = −D_CCᵀ·C_l·D_CV·u' − D_RCᵀ·i_R − D_LCᵀ·i_L − D_ICᵀ·u_I
 *   (L_l + D_LL·L_t·D_LLᵀ)·i_L' = D_LV·u + D_LC·v_C + D_LR·v_R − D_LL·L_t·D_ILᵀ·u_I'
 *
 * (rows of D_XY: links of kind X; columns: tree branches of kind Y). Both mass matrices are
 * symmetric positive definite. Across an instant, the charge of each tree capacitor's cut-set and
 * the flux of each link inductor's loop are conserved, which gives the state just after it.
 * Returns null when the graph does not allow this (a node reached only through current sources,
 * an island without ground, a loop of voltage sources): the caller falls back to the general
 * reduction.
 */
export interface TreeReduction extends Reduction {
  /** the part whose own voltage (capacitor) or current (inductor), a → b, each p_k is */
  stateParts: string[];
  /** p just after an instant from each capacitor voltage / inductor current before it and u after */
  initialP(before: Map<string, number>, u0: Vec): Vec;
}

type Kind = 'V' | 'C' | 'R' | 'L' | 'I';

interface Branch {
  part: Part;
  kind: Kind;
  /** position in its own list (tree or link of its kind) */
  k: number;
}

/** A linear quantity in p, u and u'. */
interface Lin {
  p: Float64Array;
  u: Float64Array;
  u1: Float64Array;
}

export function reduceTree(circuit: Circuit, d: Descriptor): TreeReduction | null {
  const kindOf = (p: Part): Kind | null =>
    p.kind === 'voltage-source' ? 'V' : p.kind === 'capacitor' ? 'C' : p.kind === 'resistor' ? 'R' : p.kind === 'inductor' ? 'L' : p.kind === 'current-source' ? 'I' : null;
  const parts = circuit.parts;
  for (const p of parts) {
    const k = kindOf(p);
    if (k === null) return null;
    if (k !== 'V' && k !== 'I' && !(p.value > 0 && Number.isFinite(p.value))) return null;
    if (p.a === p.b) return null;
  }
  const byKind = (k: Kind) => parts.filter((p) => kindOf(p) === k);
  // Within a kind: the largest capacitors and the smallest inductors in the tree. In a loop the
  // smallest capacitor takes most of the voltage and in a cut-set the smallest inductor most of the
  // current, so a branch computed as a sum over its loop (cut-set) is the large one, and the small
  // quantities are states of their own (1 fF beside 1 kF keeps its digits). Ties: declaration order.
  const bySize = (k: Kind, sign: number) => byKind(k).map((p, i) => ({ p, i })).sort((x, y) => sign * (y.p.value - x.p.value) || x.i - y.i).map((x) => x.p);
  const order = [...byKind('V'), ...bySize('C', 1), ...byKind('R'), ...bySize('L', -1)];
  const uf = new UnionFind();
  const inTree = new Set<Part>();
  for (const p of order) {
    if (uf.union(p.a, p.b)) inTree.add(p);
    else if (kindOf(p) === 'V') return null;
  }
  const nodes = d.nodes;
  for (const n of nodes) if (!uf.connected(n, GROUND)) return null;

  const tree: Record<Kind, Part[]> = { V: [], C: [], R: [], L: [], I: [] };
  const link: Record<Kind, Part[]> = { V: [], C: [], R: [], L: [], I: [] };
  for (const p of parts) (inTree.has(p) ? tree : link)[kindOf(p)!].push(p);
  const treeBranches: Branch[] = [];
  for (const k of ['V', 'C', 'R', 'L'] as Kind[]) tree[k].forEach((part, i) => treeBranches.push({ part, kind: k, k: i }));

  // root the tree at ground: each node's parent branch
  const adj = new Map<string, Branch[]>();
  for (const b of treeBranches) {
    for (const n of [b.part.a, b.part.b]) {
      if (!adj.has(n)) adj.set(n, []);
      adj.get(n)!.push(b);
    }
  }
  const up = new Map<string, { b: Branch; parent: string }>();
  const depth = new Map<string, number>([[GROUND, 0]]);
  const visit: string[] = [GROUND];
  for (let q = 0; q < visit.length; q++) {
    const n = visit[q];
    for (const b of adj.get(n) ?? []) {
      const other = b.part.a === n ? b.part.b : b.part.a;
      if (depth.has(other)) continue;
      depth.set(other, depth.get(n)! + 1);
      up.set(other, { b, parent: n });
      visit.push(other);
    }
  }
  for (const n of nodes) if (!depth.has(n)) return null;

  /** v(a) − v(b) as signed tree branches: walking from a up, then down to b */
  const loopOf = (a: string, b: string): { b: Branch; s: number }[] => {
    const fromA: { b: Branch; s: number }[] = [];
    const fromB: { b: Branch; s: number }[] = [];
    let x = a;
    let y = b;
    // walking child → parent along branch t adds +v_t when the child is t's a-terminal
    while (x !== y) {
      if (depth.get(x)! >= depth.get(y)!) {
        const e = up.get(x)!;
        fromA.push({ b: e.b, s: e.b.part.a === x ? 1 : -1 });
        x = e.parent;
      } else {
        const e = up.get(y)!;
        fromB.push({ b: e.b, s: e.b.part.a === y ? -1 : 1 });
        y = e.parent;
      }
    }
    return [...fromA, ...fromB];
  };
  // D restricted to each (link kind, tree kind): sparse rows
  const D: Record<Kind, { b: Branch; s: number }[][]> = { V: [], C: [], R: [], L: [], I: [] };
  for (const k of ['C', 'R', 'L', 'I'] as Kind[]) D[k] = link[k].map((p) => loopOf(p.a, p.b));

  const m = d.inputs.length;
  const input = new Map(d.inputs.map((p, i) => [p.name, i]));
  const nC = tree.C.length;
  const nL = link.L.length;
  const np = nC + nL;
  const lin = (): Lin => ({ p: new Float64Array(np), u: new Float64Array(m), u1: new Float64Array(m) });
  const addLin = (to: Lin, x: Lin, w: number) => {
    if (w === 0) return;
    for (let i = 0; i < np; i++) to.p[i] += w * x.p[i];
    for (let i = 0; i < m; i++) {
      to.u[i] += w * x.u[i];
      to.u1[i] += w * x.u1[i];
    }
  };
  const sourceLin = (p: Part, deriv = false): Lin => {
    const x = lin();
    (deriv ? x.u1 : x.u)[input.get(p.name)!] = 1;
    return x;
  };
  const stateLin = (i: number): Lin => {
    const x = lin();
    x.p[i] = 1;
    return x;
  };

  // tree voltages of sources and capacitors; link currents of inductors and current sources
  const vTree = new Map<Part, Lin>();
  tree.V.forEach((p) => vTree.set(p, sourceLin(p)));
  tree.C.forEach((p, i) => vTree.set(p, stateLin(i)));
  const iLink = new Map<Part, Lin>();
  link.L.forEach((p, i) => iLink.set(p, stateLin(nC + i)));
  link.I.forEach((p) => iLink.set(p, sourceLin(p)));

  // the resistive network: K·v_R = rhs
  const nR = tree.R.length;
  const rIndex = new Map(tree.R.map((p, i) => [p, i]));
  const K = zeros(nR, nR);
  tree.R.forEach((p, i) => (K[i][i] = 1 / p.value));
  const rhsR: Lin[] = tree.R.map(() => lin());
  /** sum over the loop of the branches of the given tree kinds (known voltages) */
  const loopVoltage = (loop: { b: Branch; s: number }[], kinds: Kind[]): Lin => {
    const x = lin();
    for (const { b, s } of loop) if (kinds.includes(b.kind)) addLin(x, vTree.get(b.part)!, s);
    return x;
  };
  link.R.forEach((p, l) => {
    const g = 1 / p.value;
    const loop = D.R[l];
    const rs = loop.filter((e) => e.b.kind === 'R');
    for (const e of rs) for (const f of rs) K[rIndex.get(e.b.part)!][rIndex.get(f.b.part)!] += g * e.s * f.s;
    const known = loopVoltage(loop, ['V', 'C']);
    for (const e of rs) addLin(rhsR[rIndex.get(e.b.part)!], known, -g * e.s);
  });
  for (const k of ['L', 'I'] as Kind[]) {
    link[k].forEach((p, l) => {
      for (const e of D[k][l]) if (e.b.kind === 'R') addLin(rhsR[rIndex.get(e.b.part)!], iLink.get(p)!, -e.s);
    });
  }
  let vR: Lin[] = [];
  if (nR) {
    const width = np + 2 * m;
    const rhs = rhsR.map((x) => [...x.p, ...x.u, ...x.u1]);
    let sol: Mat;
    try {
      sol = width ? solveSquare(K, rhs) : K.map(() => []);
    } catch {
      return null;
    }
    vR = sol.map((row) => ({ p: Float64Array.from(row.slice(0, np)), u: Float64Array.from(row.slice(np, np + m)), u1: Float64Array.from(row.slice(np + m)) }));
  }
  tree.R.forEach((p, i) => vTree.set(p, vR[i]));
  // link resistor currents
  link.R.forEach((p, l) => {
    const x = loopVoltage(D.R[l], ['V', 'C', 'R']);
    const i = lin();
    addLin(i, x, 1 / p.value);
    iLink.set(p, i);
  });

  // mass matrices and right-hand sides of the state equations (p' terms kept apart)
  const M = zeros(np, np);
  const rhs: Lin[] = Array.from({ length: np }, () => lin());
  const cIndex = new Map(tree.C.map((p, i) => [p, i]));
  tree.C.forEach((p, i) => (M[i][i] = p.value));
  link.C.forEach((p, l) => {
    const loop = D.C[l];
    const cs = loop.filter((e) => e.b.kind === 'C');
    for (const e of cs) for (const f of cs) M[cIndex.get(e.b.part)!][cIndex.get(f.b.part)!] += p.value * e.s * f.s;
    const src = lin();
    for (const e of loop) if (e.b.kind === 'V') addLin(src, sourceLin(e.b.part, true), e.s);
    for (const e of cs) addLin(rhs[cIndex.get(e.b.part)!], src, -p.value * e.s);
  });
  for (const k of ['R', 'L', 'I'] as Kind[]) {
    link[k].forEach((p, l) => {
      for (const e of D[k][l]) if (e.b.kind === 'C') addLin(rhs[cIndex.get(e.b.part)!], iLink.get(p)!, -e.s);
    });
  }
  const lTree = new Map(tree.L.map((p, i) => [p, i]));
  // per tree inductor: the link inductors (state index, sign) and current sources of its cut-set
  const cutL: { i: number; s: number }[][] = tree.L.map(() => []);
  const cutI: Lin[] = tree.L.map(() => lin());
  link.L.forEach((_, l) => {
    for (const e of D.L[l]) if (e.b.kind === 'L') cutL[lTree.get(e.b.part)!].push({ i: nC + l, s: e.s });
  });
  link.I.forEach((p, l) => {
    for (const e of D.I[l]) if (e.b.kind === 'L') addLin(cutI[lTree.get(e.b.part)!], sourceLin(p, true), e.s);
  });
  link.L.forEach((p, l) => {
    const row = nC + l;
    M[row][row] += p.value;
    addLin(rhs[row], loopVoltage(D.L[l], ['V', 'C', 'R']), 1);
    for (const e of D.L[l]) {
      if (e.b.kind !== 'L') continue;
      const t = lTree.get(e.b.part)!;
      const Lt = e.b.part.value;
      for (const f of cutL[t]) M[row][f.i] += e.s * Lt * f.s;
      addLin(rhs[row], cutI[t], -e.s * Lt);
    }
  });
  // p' = F·p + G0·u + G1·u'
  let F: Mat = [];
  let G0: Mat = [];
  let G1: Mat = [];
  if (np) {
    let sol: Mat;
    try {
      sol = solveSquare(M, rhs.map((x) => [...x.p, ...x.u, ...x.u1]));
    } catch {
      return null;
    }
    F = sol.map((row) => row.slice(0, np));
    G0 = sol.map((row) => row.slice(np, np + m));
    G1 = sol.map((row) => row.slice(np + m));
  }
  if (!sol2finite(F, G0, G1)) return null;
  const derivative = (i: number): Lin => ({ p: Float64Array.from(F[i]), u: Float64Array.from(G0[i]), u1: Float64Array.from(G1[i]) });

  // tree inductor voltages L_t·i_t' with i_t = −Σ (cut-set links)
  tree.L.forEach((p, t) => {
    const v = lin();
    for (const f of cutL[t]) addLin(v, derivative(f.i), -f.s * p.value);
    addLin(v, cutI[t], -p.value);
    vTree.set(p, v);
  });
  // link capacitor currents C_l·(D_lC·v_C' + D_lV·u')
  link.C.forEach((p, l) => {
    const i = lin();
    for (const e of D.C[l]) {
      if (e.b.kind === 'C') addLin(i, derivative(cIndex.get(e.b.part)!), p.value * e.s);
      else if (e.b.kind === 'V') addLin(i, sourceLin(e.b.part, true), p.value * e.s);
    }
    iLink.set(p, i);
  });

  // the descriptor unknowns: node potentials (path sums to ground) and branch currents
  const nz = d.nz;
  const z: Lin[] = Array.from({ length: nz }, () => lin());
  const nodeIndex = new Map(nodes.map((n, i) => [n, i]));
  for (const n of visit) {
    if (n === GROUND) continue;
    const e = up.get(n)!;
    const phi = z[nodeIndex.get(n)!];
    if (e.parent !== GROUND) addLin(phi, z[nodeIndex.get(e.parent)!], 1);
    addLin(phi, vTree.get(e.b.part)!, e.b.part.a === n ? 1 : -1);
  }
  // tree branch currents −Σ_l D[l][t]·i_l, needed for inductors and voltage sources
  const iTree = new Map<Part, Lin>();
  for (const k of ['C', 'R', 'L', 'I'] as Kind[]) {
    link[k].forEach((p, l) => {
      for (const e of D[k][l]) {
        if (e.b.kind !== 'V' && e.b.kind !== 'L') continue;
        if (!iTree.has(e.b.part)) iTree.set(e.b.part, lin());
        addLin(iTree.get(e.b.part)!, iLink.get(p)!, -e.s);
      }
    });
  }
  for (const p of [...tree.V, ...tree.L]) z[d.branchIndex.get(p.name)!] = iTree.get(p) ?? lin();
  for (const p of link.L) z[d.branchIndex.get(p.name)!] = iLink.get(p)!;

  const Zp = z.map((x) => Array.from(x.p));
  const Zu = [z.map((x) => Array.from(x.u)), z.map((x) => Array.from(x.u1))];
  const G = [G0, G1];
  const anyNonzero = (X: Mat) => X.some((row) => row.some((v) => v !== 0));
  if (!anyNonzero(Zu[1])) Zu.pop();
  if (!np || !anyNonzero(G[1])) G.pop();

  const stateParts = [...tree.C, ...link.L].map((p) => p.name);
  const initialP = (before: Map<string, number>, u0: Vec): Vec => {
    const val = (p: Part) => before.get(p.name) ?? 0;
    const q = new Array<number>(np).fill(0);
    // charge of each tree capacitor's cut-set: C_t·v_t + Σ D[l][t]·C_l·v_l, with the link voltages
    // after the instant taken from the sources after it
    tree.C.forEach((p, i) => (q[i] += p.value * val(p)));
    link.C.forEach((p, l) => {
      let src = 0;
      for (const e of D.C[l]) if (e.b.kind === 'V') src += e.s * u0[input.get(e.b.part.name)!];
      for (const e of D.C[l]) if (e.b.kind === 'C') q[cIndex.get(e.b.part)!] += e.s * p.value * (val(p) - src);
    });
    // flux of each link inductor's loop: L_l·i_l − Σ D[l][t]·L_t·i_t, with the current sources'
    // share of the tree currents taken after the instant
    link.L.forEach((p, l) => {
      const row = nC + l;
      q[row] += p.value * val(p);
      for (const e of D.L[l]) {
        if (e.b.kind !== 'L') continue;
        const t = lTree.get(e.b.part)!;
        let src = 0;
        for (let j = 0; j < m; j++) src += cutI[t].u1[j] * u0[j];
        q[row] -= e.s * e.b.part.value * (val(e.b.part) + src);
      }
    });
    return np ? solveSquare(M, q.map((v) => [v])).map((r) => r[0]) : [];
  };
  return { Zp, Zu, F, G, stateParts, initialP };
}

function sol2finite(...ms: Mat[]): boolean {
  return ms.every((X) => X.every((row) => row.every(Number.isFinite)));
}
