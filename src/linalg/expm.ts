import { type Mat, add, identity, matmul, norm1, scale } from './dense.js';
import { solveSquare } from './factor.js';

/**
 * The degree-13 Padé approximant of the matrix exponential (N. J. Higham, "The scaling and
 * squaring method for the matrix exponential revisited", SIAM J. Matrix Anal. Appl. 26(4), 2005),
 * in the form e^A − I. The cross-check of the closed forms steps with it (its own scaling: steps of
 * ‖M‖·h ≤ 1; its own squaring, in the same I + F form), so it deliberately shares no code with the
 * eigen-decomposition path.
 */
const B13 = [
  64764752532480000, 32382376266240000, 7771770303897600, 1187353796428800, 129060195264000,
  10559470521600, 670442572800, 33522128640, 1323241920, 40840800, 960960, 16380, 182, 1,
];
const THETA13 = 5.371920351148152;

/**
 * e^A − I for ‖A‖₁ ≤ 5.37 (no scaling), without forming e^A: with the Padé form
 * e^A ≈ (V − U)⁻¹(V + U) it is (V − U)⁻¹·2U, whose entries keep their relative accuracy where e^A
 * is within 1e-9 of I (a slow mode over a step sized for a fast one: e^A − I would keep 7 digits).
 */
export function expmMinusIdentity(a: Mat): Mat {
  const n = a.length;
  if (n === 0) return [];
  if (!(norm1(a) <= THETA13)) throw new Error('expmMinusIdentity: ‖A‖₁ above the Padé 13 range');
  const { U, V } = pade13(a);
  return solveSquare(add(V, U, -1), scale(U, 2));
}

/** The Padé 13 numerator and denominator parts: e^A ≈ (V − U)⁻¹(V + U). */
function pade13(A: Mat): { U: Mat; V: Mat } {
  const n = A.length;
  const I = identity(n);
  const A2 = matmul(A, A);
  const A4 = matmul(A2, A2);
  const A6 = matmul(A4, A2);
  const b = B13;
  // U = A·[A6(b13 A6 + b11 A4 + b9 A2) + b7 A6 + b5 A4 + b3 A2 + b1 I]
  const u1 = add(add(scale(A6, b[13]), scale(A4, b[11])), scale(A2, b[9]));
  const u2 = add(add(add(scale(A6, b[7]), scale(A4, b[5])), scale(A2, b[3])), scale(I, b[1]));
  const U = matmul(A, add(matmul(A6, u1), u2));
  // V = A6(b12 A6 + b10 A4 + b8 A2) + b6 A6 + b4 A4 + b2 A2 + b0 I
  const v1 = add(add(scale(A6, b[12]), scale(A4, b[10])), scale(A2, b[8]));
  const v2 = add(add(add(scale(A6, b[6]), scale(A4, b[4])), scale(A2, b[2])), scale(I, b[0]));
  const V = add(matmul(A6, v1), v2);
  return { U, V };
}
