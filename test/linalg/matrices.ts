/** Deterministic test matrices for the eigen-solver tests (no dependence on ringdown's model stage). */

/** Small linear congruential generator (Numerical Recipes constants, from memory), uniform in [0, 1). */
export function rng(seed: number): () => number {
  let s = seed >>> 0;
  return () => {
    s = (Math.imul(s, 1664525) + 1013904223) >>> 0;
    return s / 4294967296;
  };
}

export function randomMatrix(n: number, seed: number): number[][] {
  const r = rng(seed);
  return Array.from({ length: n }, () => Array.from({ length: n }, () => 2 * r() - 1));
}

export function zerosM(n: number): number[][] {
  return Array.from({ length: n }, () => new Array<number>(n).fill(0));
}

/** RC ladder from KCL: Ck·vk' = (v(k−1) − vk)/Rk − (vk − v(k+1))/R(k+1), v0 = 0 (grounded source). */
export function rcLadder(n: number, seed = 7): { A: number[][]; C: number[][]; G: number[][] } {
  const r = rng(seed);
  const R = Array.from({ length: n + 1 }, () => 1e3 * (1 + 9 * r()));
  const Cv = Array.from({ length: n }, () => 1e-9 * (1 + 99 * r()));
  const G = zerosM(n);
  for (let k = 0; k < n; k++) {
    G[k][k] += 1 / R[k];
    if (k + 1 < n) {
      G[k][k] += 1 / R[k + 1];
      G[k][k + 1] -= 1 / R[k + 1];
      G[k + 1][k] -= 1 / R[k + 1];
    }
  }
  const C = zerosM(n);
  for (let k = 0; k < n; k++) C[k][k] = Cv[k];
  const A = G.map((row, i) => row.map((g) => -g / Cv[i]));
  return { A, C, G };
}

/** Lossy LC ladder (states i1, v1, i2, v2, …): Lk·ik' = v(k−1) − vk − rk·ik, Ck·vk' = ik − i(k+1) − gk·vk. */
export function lcLadder(states: number, seed = 11): number[][] {
  const sections = Math.ceil(states / 2);
  const r = rng(seed);
  const n = 2 * sections;
  const A = zerosM(n);
  for (let k = 0; k < sections; k++) {
    const L = 1e-6 * (1 + 9 * r());
    const C = 1e-7 * (1 + 9 * r());
    const rs = 0.01 + r();
    const g = 1e-4 + 1e-2 * r();
    const ik = 2 * k;
    const vk = 2 * k + 1;
    if (k > 0) A[ik][vk - 2] += 1 / L;
    A[ik][vk] -= 1 / L;
    A[ik][ik] -= rs / L;
    A[vk][ik] += 1 / C;
    if (k + 1 < sections) A[vk][ik + 2] -= 1 / C;
    A[vk][vk] -= g / C;
  }
  return A;
}

/**
 * ‖A·V − V·D‖_F / ‖A‖_F with D from the ml-matrix style (re, im) convention. eig() returns unit
 * eigenvectors, so this is the plain relative residual.
 */
export function residual(A: number[][], r: { re: number[]; im: number[]; V: number[][] }): number {
  const n = A.length;
  let num = 0;
  let na = 0;
  let nv = 0;
  for (let i = 0; i < n; i++) {
    for (let j = 0; j < n; j++) {
      na += A[i][j] ** 2;
      nv += r.V[i][j] ** 2;
      let av = 0;
      for (let k = 0; k < n; k++) av += A[i][k] * r.V[k][j];
      let vd = r.V[i][j] * r.re[j];
      if (r.im[j] > 0) vd -= r.V[i][j + 1] * r.im[j];
      else if (r.im[j] < 0) vd -= r.V[i][j - 1] * r.im[j];
      num += (av - vd) ** 2;
    }
  }
  void nv;
  return Math.sqrt(num) / (Math.sqrt(na) || 1);
}

/** Pairs each eigenvalue of `a` with the nearest unused one of `b`; returns the largest distance. */
export function matchEigenvalues(a: { re: number; im: number }[], b: { re: number; im: number }[]): number {
  const used = new Array<boolean>(b.length).fill(false);
  let worst = 0;
  for (const x of a) {
    let best = -1;
    let bd = Infinity;
    b.forEach((y, k) => {
      if (used[k]) return;
      const dd = Math.hypot(x.re - y.re, x.im - y.im);
      if (dd < bd) {
        bd = dd;
        best = k;
      }
    });
    if (best >= 0) used[best] = true;
    worst = Math.max(worst, bd);
  }
  return worst;
}

export function frob(A: number[][]): number {
  return Math.sqrt(A.reduce((s, row) => s + row.reduce((t, v) => t + v * v, 0), 0));
}

export function pairs(re: number[], im: number[]): { re: number; im: number }[] {
  return re.map((x, i) => ({ re: x, im: im[i] }));
}
