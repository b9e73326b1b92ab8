import { Matrix, SingularValueDecomposition } from 'ml-matrix';
import { eig } from '../linalg/eig.js';
import { type Mat, identity, matmul, zeros } from '../linalg/dense.js';
import { solveSquare } from '../linalg/factor.js';


/**
 * Real block-diagonal (modal) form of a state matrix:  A = W·T·W⁻¹  with T block diagonal.
 *
 * Blocks:
 *  - 'real':    one real eigenvalue λ (1×1)
 *  - 'pair':    a complex-conjugate pair σ ± jω as a real 2×2 block
 *  - 'cluster': eigenvalues so close that their eigenvectors are nearly parallel (a critically
 *               damped pair, or nearly so). Their invariant subspace is taken as the null space of
 *               Π(A − λᵢ), which stays well conditioned when the eigenvectors do not, and the block
 *               is evaluated as e^(μτ)·Σ Nʲτʲ/j! with N = T − μI (exact t·e^(λt) terms when N is
 *               nilpotent).
 */
export interface Block {
  kind: 'real' | 'pair' | 'cluster';
  /** columns of W (and rows of W⁻¹) belonging to this block */
  index: number[];
  T: Mat;
  eig: { re: number; im: number }[];
}

export interface Modal {
  n: number;
  W: Mat;
  Winv: Mat;
  blocks: Block[];
}

const CLOSE = 1e-2; // relative eigenvalue distance below which parallel eigenvectors are merged
const PARALLEL = 0.2; // sine of the angle below which two eigen-directions count as parallel

export function modalDecomposition(A: Mat): Modal {
  const n = A.length;
  if (n === 0) return { n, W: [], Winv: [], blocks: [] };
  // balanced Hessenberg QR (src/linalg/eig.ts): balancing matters for circuits whose states
  // differ in scale by many orders (nanohenry currents next to millifarad voltages)
  const { re, im, V } = eig(A);
  // groups: a real eigenvalue alone, or a conjugate pair (columns i, i+1 = Re v, Im v)
  const groups: number[][] = [];
  for (let i = 0; i < n; i++) {
    if (im[i] !== 0 && i + 1 < n && im[i + 1] === -im[i]) {
      groups.push([i, i + 1]);
      i++;
    } else groups.push([i]);
  }
  const parent = groups.map((_, i) => i);
  const find = (i: number): number => (parent[i] === i ? i : (parent[i] = find(parent[i])));
  const scaleOf = (i: number) => Math.hypot(re[i], im[i]);
  const colSine = (a: number[], b: number[]) => subspaceSine(V, a, b);
  for (let g = 0; g < groups.length; g++) {
    const G = groups[g];
    for (let h = 0; h < g; h++) {
      const H = groups[h];
      const dist = Math.min(...G.flatMap((i) => H.map((j) => Math.hypot(re[i] - re[j], im[i] - im[j]))));
      const big = Math.max(...G.map(scaleOf), ...H.map(scaleOf));
      if (dist <= CLOSE * big && colSine(G, H) < PARALLEL) parent[find(g)] = find(h);
    }
  }
  const members = new Map<number, number[]>();
  groups.forEach((_, g) => {
    const r = find(g);
    members.set(r, [...(members.get(r) ?? []), g]);
  });
  const cols: number[][] = []; // columns of W, per block
  const specs: { kind: Block['kind']; eig: { re: number; im: number }[] }[] = [];
  const Wcols: number[][] = [];
  for (const gs of members.values()) {
    const idx = gs.flatMap((g) => groups[g]);
    const eig = idx.map((i) => ({ re: re[i], im: im[i] }));
    // a complex pair this close to the real axis has nearly parallel complex eigenvectors:
    // evaluate it as a cluster (series around its mean) rather than as two complex modes
    const nearRealPair = gs.length === 1 && idx.length === 2 && Math.abs(im[idx[0]]) < CLOSE * scaleOf(idx[0]);
    const isCluster = gs.length > 1 || nearRealPair;
    const kind: Block['kind'] = isCluster ? 'cluster' : idx.length === 2 ? 'pair' : 'real';
    const basis = isCluster ? invariantSubspace(A, eig) : idx.map((i) => V.map((row) => row[i]));
    const start = Wcols.length;
    for (const c of basis) Wcols.push(c);
    cols.push(basis.map((_, k) => start + k));
    specs.push({ kind, eig });
  }
  const W = zeros(n, n);
  Wcols.forEach((c, j) => c.forEach((v, i) => (W[i][j] = v)));
  const Winv = solveSquare(W, identity(n));
  const Tfull = matmul(matmul(Winv, A, n), W, n);
  const blocks: Block[] = cols.map((index, b) => ({
    kind: specs[b].kind,
    index,
    T: index.map((i) => index.map((j) => Tfull[i][j])),
    eig: specs[b].eig,
  }));
  return { n, W, Winv, blocks };
}

/** Sine of the largest principal angle between span(V[:,a]) and span(V[:,b]), roughly. */
function subspaceSine(V: Mat, a: number[], b: number[]): number {
  const unit = (j: number) => {
    const c = V.map((row) => row[j]);
    const s = Math.hypot(...c) || 1;
    return c.map((v) => v / s);
  };
  let best = 1;
  for (const i of a) {
    const u = unit(i);
    for (const j of b) {
      const w = unit(j);
      const c = Math.abs(u.reduce((acc, v, k) => acc + v * w[k], 0));
      best = Math.min(best, Math.sqrt(Math.max(0, 1 - c * c)));
    }
  }
  return best;
}

/**
 * Orthonormal basis of the invariant subspace belonging to the given eigenvalues: the null space
 * of the real polynomial Π(A − λᵢ) (conjugate pairs as A² − 2σA + |λ|²).
 */
function invariantSubspace(A: Mat, eig: { re: number; im: number }[]): number[][] {
  const n = A.length;
  let P = identity(n);
  const seen = new Set<number>();
  eig.forEach((l, i) => {
    if (seen.has(i)) return;
    if (l.im !== 0) {
      const j = eig.findIndex((o, k) => k !== i && !seen.has(k) && o.im === -l.im && o.re === l.re);
      if (j >= 0) seen.add(j);
      const A2 = matmul(A, A, n);
      const f = A2.map((row, r) => row.map((v, c) => v - 2 * l.re * A[r][c] + (r === c ? l.re * l.re + l.im * l.im : 0)));
      P = matmul(f, P, n);
    } else {
      P = matmul(A.map((row, r) => row.map((v, c) => v - (r === c ? l.re : 0))), P, n);
    }
    seen.add(i);
  });
  const k = eig.length;
  const svd = new SingularValueDecomposition(new Matrix(P), { autoTranspose: false });
  const s = svd.diagonal;
  const Vv = svd.rightSingularVectors.to2DArray();
  const order = s.map((_, i) => i).sort((x, y) => s[x] - s[y]).slice(0, k);
  return order.map((j) => Vv.map((row) => row[j]));
}
