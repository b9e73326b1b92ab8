/**
 * The kernels of kernels.ts with the same signatures, running as WebAssembly (simd/kernels.wat)
 * when every array they touch lives in the module's memory, and as the JavaScript otherwise.
 * Both threads build theirs with makeSimdKernels: the helper's source includes this function's
 * text, so it refers to nothing but its parameters.
 */
import * as js from './kernels.js';
import { ownedBy, simdInstance, type SimdExports } from '../simd/simd.js';

type Kernels = typeof js;

/**
 * X: the module's exports (null: the JavaScript kernels as they are); owns(a): whether a typed
 * array is in the module's memory on this thread.
 */
export function makeSimdKernels(X: SimdExports | null, jsK: Kernels, owns: (a: ArrayBufferView) => boolean): Kernels {
  if (!X) return jsK;
  return {
    ...jsK,
    hessenbergCols(H, n, m, ort, f, h, j0, j1) {
      if (owns(H) && owns(ort) && owns(f)) X.hessCols(H.byteOffset, n, m, ort.byteOffset, f.byteOffset, h, j0, j1);
      else jsK.hessenbergCols(H, n, m, ort, f, h, j0, j1);
    },
    hessenbergStep(H, n, m, ort, f, h, c, i0, i1) {
      if (owns(H) && owns(ort) && owns(f)) X.hessStep(H.byteOffset, n, m, ort.byteOffset, f.byteOffset, h, c, i0, i1);
      else jsK.hessenbergStep(H, n, m, ort, f, h, c, i0, i1);
    },
    hessenbergLeft(H, n, m, ort, f, h, j0, j1, sp) {
      if (owns(H) && owns(ort) && owns(f) && owns(sp)) X.hessLeft(H.byteOffset, n, m, ort.byteOffset, f.byteOffset, h, j0, j1, sp.byteOffset);
      else jsK.hessenbergLeft(H, n, m, ort, f, h, j0, j1, sp);
    },
    hessenbergRight(H, n, ort, sa, sb, h, j0, j1) {
      if (owns(H) && owns(ort) && owns(sa) && owns(sb)) X.hessRight(H.byteOffset, n, ort.byteOffset, sa.byteOffset, sb.byteOffset, h, j0, j1);
      else jsK.hessenbergRight(H, n, ort, sa, sb, h, j0, j1);
    },
    accumulateRows(hs, n, u, offs, Xm) {
      if (owns(hs) && owns(u) && owns(offs) && owns(Xm)) X.accumulateRows(hs.byteOffset, n, u.byteOffset, offs.byteOffset, Xm.byteOffset);
      else jsK.accumulateRows(hs, n, u, offs, Xm);
    },
    applyLeft(M, nn, c0, c1, m, n, rx, ry, rz, rq, rr, transposed) {
      if (owns(M) && owns(rx) && owns(ry) && owns(rz) && owns(rq) && owns(rr)) {
        X.applyLeft(M.byteOffset, nn, c0, c1, m, n, rx.byteOffset, ry.byteOffset, rz.byteOffset, rq.byteOffset, rr.byteOffset, transposed ? 1 : 0);
      } else jsK.applyLeft(M, nn, c0, c1, m, n, rx, ry, rz, rq, rr, transposed);
    },
    rotatePair(M, ra, rb, c0, c1, p, q) {
      if (owns(M)) X.rotatePair(M.byteOffset, ra, rb, c0, c1, p, q);
      else jsK.rotatePair(M, ra, rb, c0, c1, p, q);
    },
    leftMultiply(M, nn, k0, c0, c1, Ut, jw, out) {
      if (owns(M) && owns(Ut) && owns(out)) X.leftMultiply(M.byteOffset, nn, k0, c0, c1, Ut.byteOffset, jw, out.byteOffset);
      else jsK.leftMultiply(M, nn, k0, c0, c1, Ut, jw, out);
    },
    backTransformRange(Xm, nn, Vt, i0, i1, acc) {
      if (owns(Xm) && owns(Vt) && owns(acc)) X.backTransformRange(Xm.byteOffset, nn, Vt.byteOffset, i0, i1, acc.byteOffset);
      else jsK.backTransformRange(Xm, nn, Vt, i0, i1, acc);
    },
  };
}

let main: Kernels | null = null;

/** The main thread's kernels (the WebAssembly ones for arrays in the arena, see simd/simd.ts). */
export function mainKernels(): Kernels {
  if (!main) main = makeSimdKernels(simdInstance(), js, ownedBy);
  return main;
}
