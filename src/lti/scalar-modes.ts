import type { Mat, Vec } from '../linalg/dense.js';
import { type C, c, cdiv, csub } from './complex.js';
import type { Block } from './modal.js';

/**
 * A 'real' or 'pair' block written as decoupled complex scalar modes:
 *   ξ_block = Σ_ℓ right[ℓ]·η_ℓ,   η_ℓ = left[ℓ]·ξ_block,   η_ℓ' = λ_ℓ·η_ℓ + (forcing).
 * A pair block T (2×2 real, eigenvalues μ ± jω) is diagonalized by its two complex eigenvectors;
 * that is well conditioned because near-coalescing pairs were already made clusters.
 */
export interface ScalarMode {
  lambda: C;
  left: C[];
  right: C[];
}

// a block is read-only once formed: its modes are computed once (every path, interval shape and
// read-out asks for them)
const modesOf = new WeakMap<Block, ScalarMode[] | null>();

export function scalarModes(b: Block): ScalarMode[] | null {
  let m = modesOf.get(b);
  if (m === undefined) {
    m = modesOfBlock(b);
    modesOf.set(b, m);
  }
  return m;
}

function modesOfBlock(b: Block): ScalarMode[] | null {
  if (b.kind === 'real') return [{ lambda: c(b.T[0][0]), left: [c(1)], right: [c(1)] }];
  if (b.kind !== 'pair') return null;
  const T: Mat = b.T;
  const mu = (T[0][0] + T[1][1]) / 2;
  const det = T[0][0] * T[1][1] - T[0][1] * T[1][0];
  const omega = Math.sqrt(Math.max(det - mu * mu, 0));
  const lams = [c(mu, omega), c(mu, -omega)];
  // eigenvector of T for λ: (T01, λ − T00) or (λ − T11, T10), whichever is larger
  const vec = (l: C): C[] => {
    const a = [c(T[0][1]), csub(l, c(T[0][0]))];
    const bb = [csub(l, c(T[1][1])), c(T[1][0])];
    const size = (v: C[]) => Math.hypot(v[0].re, v[0].im, v[1].re, v[1].im);
    return size(a) >= size(bb) ? a : bb;
  };
  const v1 = vec(lams[0]);
  const v2 = vec(lams[1]);
  // inverse of [v1 v2]
  const det2 = csub(mulc(v1[0], v2[1]), mulc(v2[0], v1[1]));
  const inv = [
    [cdiv(v2[1], det2), cdiv(neg(v2[0]), det2)],
    [cdiv(neg(v1[1]), det2), cdiv(v1[0], det2)],
  ];
  return [
    { lambda: lams[0], left: inv[0], right: v1 },
    { lambda: lams[1], left: inv[1], right: v2 },
  ];
}

function mulc(a: C, b: C): C {
  return { re: a.re * b.re - a.im * b.im, im: a.re * b.im + a.im * b.re };
}

function neg(a: C): C {
  return { re: -a.re, im: -a.im };
}

/** left·v for a real vector v */
export function project(left: C[], v: Vec): C {
  let re = 0;
  let im = 0;
  for (let i = 0; i < v.length; i++) {
    re += left[i].re * v[i];
    im += left[i].im * v[i];
  }
  return { re, im };
}

/** left·v for a complex vector v */
export function projectC(left: C[], v: C[]): C {
  let re = 0;
  let im = 0;
  for (let i = 0; i < v.length; i++) {
    re += left[i].re * v[i].re - left[i].im * v[i].im;
    im += left[i].re * v[i].im + left[i].im * v[i].re;
  }
  return { re, im };
}
