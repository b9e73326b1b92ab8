import { Matrix, SingularValueDecomposition } from 'ml-matrix';
import { eig } from '../linalg/eig.js';
import { type Mat, identity, matmul, matvec } from '../linalg/dense.js';
import { symmetrize } from '../linalg/symmetrize.js';
import { solveSquare } from '../linalg/factor.js';
import { luFactor, luSingular, luSolve } from '../linalg/lu.js';


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
  /** W⁻¹·M: the modal coordinates of M's columns (an LU solve, or the symmetric inverse) */
  toModal(M: Mat): Mat;
  /** W⁻¹ itself, formed on first use (O(n³) unless the symmetric inverse exists) */
  readonly Winv: Mat;
  blocks: Block[];
}

const CLOSE = 1e-2; // relative eigenvalue distance below which parallel eigenvectors are merged
// sine of the angle below which two eigen-directions count as parallel: nearly defective pairs
// (critical damping) have sines of 1e-4 and less; neighbouring modes of a long ladder can be a few
// tenths apart and must stay separate (merging them squares the conditioning)
const PARALLEL = 1e-2;

export function modalDecomposition(A: Mat): Modal {
  const n = A.length;
  if (n === 0) return { n, W: [], Winv: [], toModal: (M) => M.map(() => []), blocks: [] };
  // balanced Hessenberg QR (src/linalg/eig.ts): balancing matters for circuits whose states
  // differ in scale by many orders (nanohenry currents next to millifarad voltages)
  const { re, im, V } = eig(A);
  // RC networks: D⁻¹·A·D symmetric, eigenvectors orthogonal in the D⁻²-weighted product, so no
  // pair of them is ill-conditioned: no merging into clusters, and W⁻¹ in O(n²) below
  const symScale = symmetricScale(A);
  // Eigenvalues within round-off of zero (a capacitor or inductor with nothing to discharge it)
  // are exactly zero; a conjugate pair that collapsed there gets an invariant subspace below.
  let norm = 0;
  for (const row of A) norm = Math.max(norm, row.reduce((acc, v) => acc + Math.abs(v), 0));
  const tiny = 1e-12 * norm;
  const snapped = new Set<number>();
  const slow = new Set<number>();
  // refinements cost two LU factorizations per step: a few dozen at most (zeros stop after one)
  let budget = n <= 400 ? 32 : 4;
  let zeroBudget = 4;
  for (let i = 0; i < n; i++) {
    // a real eigenvalue below ‖A‖'s round-off may still be a genuine slow mode (a 10 s time
    // constant beside a 1 ps one): kept when its eigenpair is verified to its own size
    // (an exact 0 from the solver is tried too, from just below zero: it may be a 1e5 s mode)
    const candidate = Math.hypot(re[i], im[i]) <= tiny && im[i] === 0 && (re[i] !== 0 || (n <= 64 && zeroBudget-- > 0));
    let refined = candidate && budget-- > 0 ? refineSlow(A, re[i], -1e-9 * tiny) : null;
    if (refined && re[i] === 0 && [...slow].some((j) => Math.abs(re[j] - refined!.lambda) <= 1e-6 * Math.abs(refined!.lambda))) refined = null;
    if (refined) {
      re[i] = refined.lambda;
      refined.v.forEach((x, r) => (V[r][i] = x));
      slow.add(i);
    } else if (Math.hypot(re[i], im[i]) <= tiny && im[i] !== 0 && i + 1 < n && im[i + 1] === -im[i] && re[i + 1] === re[i] && verifiedPair(A, re[i], im[i], i, V)) {
      // (the same for slow ringing, columns i, i + 1 = Re v, Im v; lossless as below)
      slow.add(i);
      slow.add(i + 1);
      if (Math.abs(re[i]) <= 1e-12 * Math.abs(im[i])) re[i] = re[i + 1] = 0;
      i++;
    } else if (Math.hypot(re[i], im[i]) <= tiny) {
      if (im[i] !== 0) snapped.add(i);
      re[i] = 0;
      im[i] = 0;
    } else if (im[i] !== 0 && Math.abs(re[i]) <= tiny && Math.abs(re[i]) <= 1e-12 * Math.abs(im[i])) {
      // ringing whose damping is round-off of both ‖A‖ and its own frequency is lossless (an LC
      // loop no resistor touches): without this a decay of 1e-13/s would stretch the span to 1e14 s
      re[i] = 0;
    }
  }
  // groups: a real eigenvalue alone, or a conjugate pair (columns i, i+1 = Re v, Im v)
  const groups: number[][] = [];
  for (let i = 0; i < n; i++) {
    if ((im[i] !== 0 && i + 1 < n && im[i + 1] === -im[i]) || (snapped.has(i) && snapped.has(i + 1))) {
      groups.push([i, i + 1]);
      i++;
    } else groups.push([i]);
  }
  const parent = groups.map((_, i) => i);
  const find = (i: number): number => (parent[i] === i ? i : (parent[i] = find(parent[i])));
  const scaleOf = (i: number) => Math.hypot(re[i], im[i]);
  const unit = unitColumns(V);
  const colSine = (a: number[], b: number[]) => subspaceSine(unit, a, b);
  // Merge (a) equal eigenvalues, whatever their eigenvectors (repeated poles of identical
  // sections, several zero poles), and (b) close eigenvalues with nearly parallel eigenvectors
  // (critical damping and its neighbourhood). Sorted by real part, only neighbours within the
  // closeness window are compared.
  const order = groups.map((_, g) => g).sort((a, b) => re[groups[a][0]] - re[groups[b][0]]);
  // per group its largest |λ| (the pair scan below is O(n²) in the worst case: no allocations in it)
  const groupScale = groups.map((G) => (G.length === 1 ? scaleOf(G[0]) : Math.max(scaleOf(G[0]), scaleOf(G[1]))));
  for (let x = 0; x < order.length && !symScale; x++) {
    const g = order[x];
    const G = groups[g];
    for (let y = x + 1; y < order.length; y++) {
      const h = order[y];
      const H = groups[h];
      const big = Math.max(groupScale[g], groupScale[h]);
      if (re[H[0]] - re[G[0]] > CLOSE * big + tiny) break;
      let dist = Infinity;
      for (const i of G) for (const j of H) dist = Math.min(dist, Math.hypot(re[i] - re[j], im[i] - im[j]));
      // (a verified slow mode is not round-off of zero: it merges only with its equals)
      const equal = dist <= 1e-9 * big + (G.some((i) => slow.has(i)) || H.some((j) => slow.has(j)) ? 0 : tiny);
      // Equal ringing pairs with independent eigenvectors (identical underdamped or lossless
      // sections) stay two pairs: a cluster's series around its real mean cannot carry the
      // ringing (N = T − μI is then not nilpotent; its series needs ω·span terms and overflows).
      if (equal && G.length === 2 && H.length === 2 && im[G[0]] !== 0 && im[H[0]] !== 0 && independentColumns(unit, [...G, ...H])) continue;
      if (equal || (dist <= CLOSE * big && colSine(G, H) < PARALLEL)) parent[find(g)] = find(h);
    }
  }
  // An RC network is symmetric under a diagonal weight, so its eigenvectors are never ill-conditioned
  // in that weight; but when the weight spans many decades (a 1 nΩ source into 1 GF beside 1 GΩ
  // into 1 nF: two equal time constants loaded by 1e-18) two neighbouring eigenvalues can lie within
  // round-off of each other with nearly parallel vectors in plain coordinates, where the closed form
  // of two separate modes loses u/√ε (2.7e-8 there). Neighbours in that state are merged into a
  // cluster like any other nearly defective pair (one pass over the sorted neighbours: O(n²)).
  if (symScale) {
    let lo = Infinity;
    let hi = 0;
    for (const d of symScale) {
      lo = Math.min(lo, Math.abs(d));
      hi = Math.max(hi, Math.abs(d));
    }
    if (hi > 1e6 * lo) {
      for (let x = 0; x + 1 < order.length; x++) {
        const g = order[x];
        const h = order[x + 1];
        const big = Math.max(groupScale[g], groupScale[h]);
        if (Math.abs(re[groups[h][0]] - re[groups[g][0]]) <= CLOSE * big && colSine(groups[g], groups[h]) < PARALLEL) parent[find(g)] = find(h);
      }
    }
  }
  const members = new Map<number, number[]>();
  groups.forEach((_, g) => {
    const r = find(g);
    members.set(r, [...(members.get(r) ?? []), g]);
  });
  const cols: number[][] = []; // columns of W, per block
  const specs: { kind: Block['kind']; eig: { re: number; im: number }[] }[] = [];
  // W's columns: a column of V (its index) or a cluster's basis vector
  const Wcols: (number | number[])[] = [];
  for (const gs of members.values()) {
    const idx = gs.flatMap((g) => groups[g]);
    const eig = idx.map((i) => ({ re: re[i], im: im[i] }));
    // a complex pair this close to the real axis has nearly parallel complex eigenvectors:
    // evaluate it as a cluster (series around its mean) rather than as two complex modes
    // (its Re v and Im v nearly parallel; close to the axis but with distinct directions, as in a
    // non-normal mesh, the pair form is exact, where the series around the mean would need
    // ω·span terms and overflow)
    const nearRealPair =
      gs.length === 1 && idx.length === 2 && (snapped.has(idx[0]) || (Math.abs(im[idx[0]]) < CLOSE * scaleOf(idx[0]) && colSine([idx[0]], [idx[1]]) < PARALLEL));
    const isCluster = gs.length > 1 || nearRealPair;
    const kind: Block['kind'] = isCluster ? 'cluster' : idx.length === 2 ? 'pair' : 'real';
    const basis: (number | number[])[] = isCluster ? invariantSubspace(A, eig) : idx;
    const start = Wcols.length;
    for (const c of basis) Wcols.push(c);
    cols.push(basis.map((_, k) => start + k));
    specs.push({ kind, eig });
  }
  // filled by rows (V is row-major)
  const W: Mat = new Array(n);
  for (let i = 0; i < n; i++) {
    const Vi = V[i];
    const row = new Array<number>(n);
    for (let j = 0; j < n; j++) {
      const c = Wcols[j];
      row[j] = typeof c === 'number' ? Vi[c] : c[i];
    }
    W[i] = row;
  }
  // W⁻¹ from a weighted orthogonality when A is self-adjoint for some diagonal weight: positive
  // (RC) or of either sign (ladders of L and C, where couplings come in opposite-sign pairs)
  const weights = symScale ? Array.from(symScale, (d) => 1 / (d * d)) : selfAdjointWeights(A);
  const inv = weights ? weightedInverse(weights, W, cols) : null;
  const sym = inv && inv.err <= 1e-12 ? inv.apply : null;
  // eigenvectors of a non-normal matrix (RLC meshes) satisfy the orthogonality only to ~1e-11:
  // then that inverse refines the solves instead of an LU of W
  const near = !sym && inv && inv.err <= 1e-6 ? inv.apply : null;
  const lu = sym || near ? null : luFactor(W);
  if (lu && luSingular(lu)) throw new Error('the eigenvectors of the state matrix do not form a basis (singular modal matrix)');
  const none = (M: Mat): Mat => M.map(() => []);
  const toModal = (M: Mat): Mat => (!M.length || !M[0].length ? none(M) : sym ? sym(M) : near ? refinedSolve(W, near, M) : luSolve(lu!, M));
  let full: Mat | null = null;
  const blocks: Block[] = cols.map((index, b) => ({
    kind: specs[b].kind,
    index,
    T: blockMatrix(A, W, toModal, index, specs[b]),
    eig: specs[b].eig,
  }));
  return {
    n,
    W,
    toModal,
    get Winv() {
      return (full ??= toModal(identity(n)));
    },
    blocks,
  };
}

/**
 * The block of T = W⁻¹·A·W on the block's own columns. A real mode or a conjugate pair has it
 * from its eigenvalues ([λ], or [[σ, ω], [−ω, σ]] for the columns Re v, Im v, as eig() returns
 * them); a cluster's comes from the product, restricted to its columns (O(n²) per column).
 */
function blockMatrix(A: Mat, W: Mat, toModal: (M: Mat) => Mat, index: number[], spec: { kind: Block['kind']; eig: { re: number; im: number }[] }): Mat {
  if (spec.kind === 'real') return [[spec.eig[0].re]];
  if (spec.kind === 'pair') {
    const { re, im } = spec.eig[0];
    return [
      [re, im],
      [-im, re],
    ];
  }
  // W⁻¹·(A·W_b), then its rows of the block
  const AWb = A.map((row) => index.map((j) => row.reduce((acc, v, k) => acc + v * W[k][j], 0)));
  const X = toModal(AWb);
  return index.map((i) => X[i].slice());
}

/** D with D⁻¹·A·D symmetric (see linalg/symmetrize.ts), or null. */
function symmetricScale(A: Mat): Float64Array | null {
  const n = A.length;
  // symmetrize's own first test, on the rows as they are (no n² copy for an RLC mesh, whose
  // L–C exchanges have opposite signs)
  for (let i = 0; i < n; i++) {
    const row = A[i];
    for (let j = 0; j < n; j++) if (row[j] !== 0 && j !== i && !(row[j] * A[j][i] > 0)) return null;
  }
  const flat = new Float64Array(n * n);
  for (let i = 0; i < n; i++) for (let j = 0; j < n; j++) flat[i * n + j] = A[i][j];
  return symmetrize(flat, n, 1e-12)?.scale ?? null;
}

/**
 * A diagonal M (entries of either sign) with M·A symmetric, or null: Mⱼⱼ/Mᵢᵢ = Aᵢⱼ/Aⱼᵢ along a
 * spanning forest of A's pattern, then verified on every nonzero pair (a cycle could contradict
 * it). A tridiagonal matrix with nonzero couplings in both directions always has one.
 */
function selfAdjointWeights(A: Mat): number[] | null {
  const n = A.length;
  const adj: number[][] = Array.from({ length: n }, () => []);
  // rows in order, the transposed entry only behind a nonzero (a one-sided pair fails from the
  // side that has it)
  for (let i = 0; i < n; i++) {
    const row = A[i];
    for (let j = 0; j < n; j++) {
      if (row[j] === 0 || j === i) continue;
      if (A[j][i] === 0) return null;
      if (j > i) {
        adj[i].push(j);
        adj[j].push(i);
      }
    }
  }
  const m = new Array<number>(n).fill(0);
  for (let root = 0; root < n; root++) {
    if (m[root] !== 0) continue;
    m[root] = 1;
    const queue = [root];
    for (let q = 0; q < queue.length; q++) {
      const i = queue[q];
      for (const j of adj[i]) {
        if (m[j] !== 0) continue;
        m[j] = (m[i] * A[i][j]) / A[j][i];
        if (!(Math.abs(m[j]) > 1e-250 && Math.abs(m[j]) < 1e250)) return null;
        queue.push(j);
      }
    }
  }
  for (let i = 0; i < n; i++) {
    for (const j of adj[i]) {
      const x = m[i] * A[i][j];
      if (Math.abs(x - m[j] * A[j][i]) > 1e-12 * Math.abs(x)) return null;
    }
  }
  return m;
}

/**
 * When M·A is symmetric for a diagonal M (RC networks: M = D⁻² positive; LC ladders: M of mixed
 * sign), eigenvectors of different blocks are orthogonal in the bilinear form xᵀ·M·y (no complex
 * conjugation: the real and imaginary parts of a pair's vector are orthogonal to every other
 * block's too), so W⁻¹ = G⁻¹·Wᵀ·M with G = Wᵀ·M·W block diagonal: W⁻¹·X in O(n²) per column
 * without an LU of W or W⁻¹ itself. Returned with its error on a random vector,
 * ‖W⁻¹·W·r − r‖/‖r‖ (the caller decides whether it is the inverse or a preconditioner); null
 * when a block is neutral in the form.
 */
function weightedInverse(w2: number[], W: Mat, cols: number[][]): { apply: (X: Mat) => Mat; err: number } | null {
  const n = W.length;
  // G_b = W_bᵀ·M·W_b, row by row of W (contiguous), each entry summed in row order (into one
  // flat array, block after block: no closure per row and block)
  const nb = cols.length;
  const at = new Int32Array(nb + 1);
  for (let b = 0; b < nb; b++) at[b + 1] = at[b] + cols[b].length * cols[b].length;
  const flat = new Float64Array(at[nb]);
  for (let k = 0; k < n; k++) {
    const row = W[k];
    const wk = w2[k];
    for (let b = 0; b < nb; b++) {
      const index = cols[b];
      const len = index.length;
      let o = at[b];
      for (let a = 0; a < len; a++) {
        const t = row[index[a]] * wk;
        for (let q = 0; q < len; q++) flat[o++] += t * row[index[q]];
      }
    }
  }
  const Gs = cols.map((index, b) => index.map((_, a) => Array.from(flat.subarray(at[b] + a * index.length, at[b] + (a + 1) * index.length))));
  const invs: Mat[] = [];
  for (const [b, index] of cols.entries()) {
    const G = Gs[b];
    try {
      invs.push(index.length === 1 ? [[1 / G[0][0]]] : solveSquare(G, identity(index.length)));
    } catch {
      return null; // a block neutral in the indefinite form: no inverse this way
    }
  }
  const apply = (X: Mat): Mat => {
    const c = X[0].length;
    // Z = Wᵀ·(M·X), by rows of W
    const Z = new Float64Array(n * c);
    for (let k = 0; k < n; k++) {
      const row = W[k];
      const xk = X[k];
      for (let q = 0; q < c; q++) {
        const u = w2[k] * xk[q];
        if (u === 0) continue;
        for (let j = 0; j < n; j++) Z[j * c + q] += row[j] * u;
      }
    }
    const out: Mat = new Array(n);
    cols.forEach((index, b) => {
      const inv = invs[b];
      index.forEach((i, a) => {
        const r = new Array<number>(c).fill(0);
        inv[a].forEach((g, q) => {
          for (let col = 0; col < c; col++) r[col] += g * Z[index[q] * c + col];
        });
        out[i] = r;
      });
    });
    return out;
  };
  // W⁻¹·(W·r) must give r back
  let seed = 12345;
  const r = Array.from({ length: n }, () => ((seed = (Math.imul(seed, 1103515245) + 12345) >>> 0) / 2 ** 32) - 0.5);
  const back = apply(matvec(W, r).map((v) => [v]));
  let err = 0;
  let size = 0;
  for (let i = 0; i < n; i++) {
    err = Math.max(err, Math.abs(back[i][0] - r[i]));
    size = Math.max(size, Math.abs(r[i]));
  }
  return { apply, err: err / size };
}

/**
 * W⁻¹·M by iterative refinement with an approximate inverse P (‖I − P·W‖ ≪ 1): X ← X + P·(M − W·X)
 * until each column's correction is round-off of that column. Every step multiplies the error by
 * ‖I − P·W‖, so two or three reach working precision, and the residual is the given W's own (as
 * with an LU solve) however inexact P is. O(n²) per column instead of the O(n³) factorization.
 */
function refinedSolve(W: Mat, P: (X: Mat) => Mat, M: Mat): Mat {
  const c = M.length ? M[0].length : 0;
  if (c === 0) return M.map(() => []);
  let X = P(M);
  for (let step = 0; step < 5; step++) {
    const WX = matmul(W, X, c);
    const D = P(M.map((row, i) => row.map((v, j) => v - WX[i][j])));
    const dMax = new Array<number>(c).fill(0);
    const xMax = new Array<number>(c).fill(0);
    X = X.map((row, i) =>
      row.map((v, j) => {
        const x = v + D[i][j];
        dMax[j] = Math.max(dMax[j], Math.abs(D[i][j]));
        xMax[j] = Math.max(xMax[j], Math.abs(x));
        return x;
      }),
    );
    if (dMax.every((d, j) => d <= 4 * Number.EPSILON * xMax[j])) break;
  }
  return X;
}

/**
 * Whether the unit columns span as many dimensions as there are of them, with room to spare:
 * their smallest singular value is at least PARALLEL (two equal ringing pairs whose Re v, Im v
 * are four independent directions, or two directions of one eigenspace nearly the same).
 */
function independentColumns(unit: (j: number) => Float64Array, cols: number[]): boolean {
  const M = new Matrix(unit(cols[0]).length, cols.length);
  cols.forEach((c, k) => unit(c).forEach((x, r) => M.set(r, k, x)));
  const sv = new SingularValueDecomposition(M, { computeLeftSingularVectors: false, computeRightSingularVectors: false, autoTranspose: true }).diagonal;
  return Math.min(...sv) >= PARALLEL;
}

/** Sine of the largest principal angle between span(V[:,a]) and span(V[:,b]), roughly. */
function subspaceSine(unit: (j: number) => Float64Array, a: number[], b: number[]): number {
  let best = 1;
  for (const i of a) {
    const u = unit(i);
    for (const j of b) {
      const w = unit(j);
      let c = 0;
      for (let k = 0; k < u.length; k++) c += u[k] * w[k];
      c = Math.abs(c);
      best = Math.min(best, Math.sqrt(Math.max(0, 1 - c * c)));
    }
  }
  return best;
}

/** Unit-length columns of V, each normalized once when first asked for. */
function unitColumns(V: Mat): (j: number) => Float64Array {
  const cache = new Map<number, Float64Array>();
  return (j) => {
    let c = cache.get(j);
    if (!c) {
      c = new Float64Array(V.length);
      for (let k = 0; k < V.length; k++) c[k] = V[k][j];
      let s = 0;
      for (const v of c) s += v * v;
      s = Math.sqrt(s) || 1;
      for (let k = 0; k < c.length; k++) c[k] /= s;
      cache.set(j, c);
    }
    return c;
  };
}

/**
 * Orthonormal basis of the invariant subspace belonging to the given eigenvalues: the null space
 * of the real polynomial Π(A − λᵢ) (conjugate pairs as A² − 2σA + |λ|²).
 */
function invariantSubspace(A: Mat, eig: { re: number; im: number }[]): number[][] {
  const n = A.length;
  const k0 = eig.length;
  if (eig.every((e) => e.im === 0 && e.re === eig[0].re)) {
    // one repeated real eigenvalue μ: the null space of the lowest power of (A − μI) that has
    // enough of it. Low powers keep the slow modes apart from the null space, which a high power
    // of a stiff matrix would squash into round-off.
    const shifted = A.map((row, r) => row.map((v, c) => v - (r === c ? eig[0].re : 0)));
    let P = shifted;
    for (let j = 1; j <= k0; j++) {
      const svd = new SingularValueDecomposition(new Matrix(P), { autoTranspose: false });
      const sv = svd.diagonal;
      const top = Math.max(...sv);
      const small = sv.map((v, i) => ({ v, i })).filter((x) => x.v <= 1e-9 * top).length;
      if (small >= k0 || j === k0) {
        const Vv = svd.rightSingularVectors.to2DArray();
        const order = sv.map((_, i) => i).sort((x, y) => sv[x] - sv[y]).slice(0, k0);
        return order.map((jj) => Vv.map((row) => row[jj]));
      }
      P = matmul(shifted, P, n);
    }
  }
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

/**
 * A real eigenvalue λ̂ far below ‖A‖, refined or found to be round-off of zero. The eigen-solver's
 * error is of ‖A‖'s size, so a 0.055/s mode beside a 7e13/s one may come out as 0.0625/s and a
 * zero as 4e-4/s. Two-sided Rayleigh-quotient iteration (inverse iteration with A − μI and its
 * transpose, μ ← wᵀ·A·v / wᵀ·v) converges to the eigenvalue nearest λ̂ with the solves' own
 * accuracy. A genuine mode settles (to 1e-6 between steps; the jitter of its iterates is that of
 * the solves, 1e-8 beside 1e12/s modes) and stays within half of λ̂; a zero
 * collapses by orders of magnitude (or makes A − μI exactly singular). A solver's exact 0 starts
 * from `below` and must settle (nothing to stay near). Returns the refined λ and its eigenvector,
 * or null (then λ is zero).
 */
function refineSlow(A: Mat, start: number, below: number): { lambda: number; v: number[] } | null {
  const n = A.length;
  let mu = start === 0 ? below : start;
  for (let it = 0; it < 6; it++) {
    const f = luFactor(A.map((row, r) => row.map((x, c) => x - (r === c ? mu : 0))));
    const ft = luFactor(A.map((_, r) => A.map((row, c) => row[r] - (r === c ? mu : 0))));
    // exactly singular at the solver's own value (a decoupled mode, or an exact cancellation):
    // step off it by 1e-8 and iterate back
    if ((luSingular(f) || luSingular(ft)) && it === 0) {
      mu *= 1 + 1e-8;
      continue;
    }
    if (luSingular(f) || luSingular(ft)) return null;
    let v = Array.from({ length: n }, (_, k) => [1 + (k % 5) / 7]);
    let w = Array.from({ length: n }, (_, k) => [1 + (k % 3) / 5]);
    for (let k = 0; k < 3; k++) {
      v = unitMax(luSolve(f, v));
      w = unitMax(luSolve(ft, w));
    }
    let num = 0;
    let den = 0;
    for (let r = 0; r < n; r++) {
      let av = 0;
      for (let c = 0; c < n; c++) av += A[r][c] * v[c][0];
      num += w[r][0] * av;
      den += w[r][0] * v[r][0];
    }
    const next = num / den;
    if (!Number.isFinite(next) || !(start === 0 || Math.abs(next - start) <= 0.5 * Math.abs(start))) return null;
    const done = Math.abs(next - mu) <= 1e-6 * Math.abs(next);
    mu = next;
    if (done) return { lambda: mu, v: v.map((r) => r[0]) };
  }
  return null;
}

function unitMax(x: number[][]): number[][] {
  let s = 0;
  for (const r of x) s = Math.max(s, Math.abs(r[0]));
  return s > 0 && Number.isFinite(s) ? x.map((r) => [r[0] / s]) : x;
}

/**
 * A conjugate pair σ ± jω far below ‖A‖ (columns i, i + 1 of V: Re v, Im v) is kept when its
 * residual is below half of |λ| (a zero computed as round-off misses that by six orders and more;
 * a 5.2e3 rad/s ring beside a 1.6e16/s mode had 0.12). Not refined: its σ may be off (the in-run
 * cross-check judges it); zeroed, the ring would be an order-one error.
 */
function verifiedPair(A: Mat, sigma: number, omega: number, i: number, V: Mat): boolean {
  const x = V.map((row) => row[i]);
  const y = V.map((row) => row[i + 1]);
  // A·[x y] = [x y]·[[σ, ω], [−ω, σ]]
  return residualRatio(A, [x, y], [[sigma, omega], [-omega, sigma]]) <= 0.5;
}

/** max |A·X − X·T| over |T|·max |X| (X given by columns). */
function residualRatio(A: Mat, X: number[][], T: Mat): number {
  const n = A.length;
  const k = X.length;
  let xmax = 0;
  let res = 0;
  for (let c = 0; c < k; c++) {
    const x = X[c];
    for (let r = 0; r < n; r++) {
      xmax = Math.max(xmax, Math.abs(x[r]));
      let acc = 0;
      for (let j = 0; j < n; j++) acc += A[r][j] * x[j];
      for (let d = 0; d < k; d++) acc -= X[d][r] * T[d][c];
      res = Math.max(res, Math.abs(acc));
    }
  }
  const size = Math.hypot(T[0][0], T[0][1] ?? 0);
  return res / (size * xmax);
}
