/**
 * The eigen-solver's dense kernels in WebAssembly with 128-bit SIMD (kernels.wat, compiled into
 * kernels-wasm.ts), and the memory they work in.
 *
 * Why: plain JavaScript does one double per instruction; these loops (Householder reduction,
 * accumulating the Schur vectors, the bulge chase and the deferred parts of the QR sweeps, the
 * final product V·X) do two, and run 2–5× faster (measured on n = 400 … 1000). Each kernel mirrors
 * a JavaScript one (threads/kernels.ts, eig.ts, schur-aed.ts); the element-wise ones give identical
 * bits, the ones with dot products differ in round-off only (two partial sums).
 *
 * The kernels can only reach the module's own memory, so the arrays of one dense decomposition are
 * allocated there: eig.ts opens an arena for the call (arenaOpen, which grows the memory once, up
 * front, and never shrinks it), every shared array of the call comes from it (arenaF64), and
 * arenaClose ends it. A kernel wrapper (threads/simd-kernels.ts) takes the WebAssembly path only
 * when all its arrays are in this memory (ownedBy) and the JavaScript one otherwise. The memory is
 * shared (a SharedArrayBuffer), so the helper thread instantiates the same module on it.
 *
 * RINGDOWN_SIMD=0 in the environment turns the kernels off (the JavaScript path throughout).
 */
import { KERNELS_WASM_BASE64 } from './kernels-wasm.js';

/** The module's exports; pointers are byte offsets into its memory, counts are in doubles. */
export interface SimdExports {
  hessCols(H: number, n: number, m: number, ort: number, f: number, h: number, j0: number, j1: number): void;
  hessStep(H: number, n: number, m: number, ort: number, f: number, h: number, c: number, i0: number, i1: number): void;
  hessLeft(H: number, n: number, m: number, ort: number, f: number, h: number, j0: number, j1: number, sp: number): void;
  hessRight(H: number, n: number, ort: number, sa: number, sb: number, h: number, j0: number, j1: number): void;
  accumulateRows(hs: number, n: number, u: number, offs: number, X: number): void;
  applyLeft(M: number, nn: number, c0: number, c1: number, m: number, n: number, rx: number, ry: number, rz: number, rq: number, rr: number, transposed: number): void;
  slideRows(H: number, nn: number, top: number, m: number, n: number, rx: number, ry: number, rz: number, rq: number, rr: number): void;
  francisSweep(H: number, nn: number, l: number, m: number, n: number, p: number, q: number, r: number, rx: number, ry: number, rz: number, rq: number, rr: number): void;
  rotatePair(M: number, ra: number, rb: number, c0: number, c1: number, p: number, q: number): void;
  leftMultiply(M: number, nn: number, k0: number, c0: number, c1: number, Ut: number, jw: number, out: number): void;
  rightMultiply(M: number, nn: number, r0: number, r1: number, k0: number, U: number, jw: number, row: number): void;
  backTransformRange(X: number, nn: number, Vt: number, i0: number, i1: number, acc: number): void;
  dots4i(h: number, xs: number, cnt: number, out: number): void;
}

/** What another thread needs to run the same kernels on the same memory. */
export interface SimdShare {
  module: WebAssembly.Module;
  memory: WebAssembly.Memory;
}

let share: SimdShare | null = null;
let kernels: SimdExports | null = null;
let failed = false;

function disabled(): boolean {
  return typeof process !== 'undefined' && process.env?.RINGDOWN_SIMD === '0';
}

/** Instantiates the module once; null when WebAssembly SIMD or shared memory is unavailable here. */
function instantiate(): SimdExports | null {
  if (kernels || failed) return kernels;
  try {
    const bytes = Uint8Array.from(atob(KERNELS_WASM_BASE64), (c) => c.charCodeAt(0));
    const module = new WebAssembly.Module(bytes);
    const memory = new WebAssembly.Memory({ initial: 1, maximum: 65536, shared: true });
    kernels = new WebAssembly.Instance(module, { env: { memory } }).exports as unknown as SimdExports;
    share = { module, memory };
  } catch {
    // no SIMD or no shared memory in this engine: the JavaScript kernels serve
    failed = true;
    kernels = null;
    share = null;
  }
  return kernels;
}

/** The kernels, or null when unavailable or turned off (RINGDOWN_SIMD=0). */
export function simdKernels(): SimdExports | null {
  return disabled() ? null : instantiate();
}

/**
 * The kernels whatever RINGDOWN_SIMD says (null only when unavailable), for wrappers that check
 * their arrays: with the kernels off no arena opens, so no array qualifies.
 */
export function simdInstance(): SimdExports | null {
  return instantiate();
}

/** The module and its memory, for the helper thread (null when the kernels are off). */
export function simdShare(): SimdShare | null {
  return simdKernels() ? share : null;
}

// ---- the arena of one decomposition ----

let arenaBuffer: ArrayBufferLike | null = null;
let at = 0;
let end = 0;
let open = false;

/**
 * Starts the arena of one decomposition with room for `doubles` doubles (the previous call's
 * arrays are overwritten). False when the kernels are off: arenaF64 then returns null.
 */
export function arenaOpen(doubles: number): boolean {
  open = false;
  if (!simdKernels() || !share) return false;
  const bytes = 8 * doubles + 64;
  const memory = share.memory;
  const have = memory.buffer.byteLength;
  if (have < bytes) {
    try {
      memory.grow(Math.ceil((bytes - have) / 65536));
    } catch {
      return false; // no room: this call takes the JavaScript path
    }
  }
  // one buffer object for the whole call: the kernels' wrappers recognise arrays by it
  arenaBuffer = memory.buffer;
  at = 0;
  end = arenaBuffer.byteLength;
  open = true;
  return true;
}

/** Ends the arena: later arenaF64 calls return null until the next arenaOpen. */
export function arenaClose(): void {
  open = false;
}

/** A zeroed Float64Array of `len` from the open arena (16-byte aligned), or null (none open, full). */
export function arenaF64(len: number): Float64Array | null {
  if (!open || !arenaBuffer || at + 8 * len > end) return null;
  const v = new Float64Array(arenaBuffer, at, len);
  v.fill(0);
  at += 8 * len;
  at = (at + 15) & ~15;
  return v;
}

/** A zeroed Int32Array of `len` from the open arena, or null. */
export function arenaI32(len: number): Int32Array | null {
  if (!open || !arenaBuffer || at + 4 * len > end) return null;
  const v = new Int32Array(arenaBuffer, at, len);
  v.fill(0);
  at += 4 * len;
  at = (at + 15) & ~15;
  return v;
}

/** The arena's fill level, to give back with arenaRelease (scratch of a nested step). */
export function arenaMark(): number {
  return at;
}

/** Gives back everything allocated since `mark` (its arrays must no longer be used). */
export function arenaRelease(mark: number): void {
  if (mark <= at) at = mark;
}

/** Whether `x` lives in the current arena's memory (the kernels can take it). */
export function ownedBy(x: ArrayBufferView): boolean {
  return arenaBuffer !== null && x.buffer === arenaBuffer;
}
