/**
 * The second thread of the general eigen-solver (eig.ts). The Schur-vector work never feeds back
 * into the QR sweeps on H, so it runs beside them: the main thread records each sweep's
 * reflectors, each window transformation of aggressive early deflation and each 2×2 standardizing
 * rotation in a ring in shared memory; the helper applies them, in the same order, to the Schur
 * vectors (after forming them from the Hessenberg reflectors), while the main thread goes on with
 * the next sweeps. At the end of the QR iteration the main thread takes half of Vt's columns of
 * whatever the helper has not started yet (Session.drainHelping). The Hessenberg reduction is
 * split by columns in lock step (eig.ts hessenberg), the back-transformation by chunks of columns
 * claimed by whichever thread is free.
 *
 * Every kernel does the same operations in the same order on each entry whichever thread runs it,
 * so the results are bit-for-bit those of one thread (tested). The helper is started lazily once
 * per process and unref()ed; when it cannot start or fails, eig.ts starts over on one thread.
 * RINGDOWN_THREADS=1 forces one thread.
 *
 * The helper's source is the text of helperLoop, vectorOp, backTransformChunks, waitAtLeast and
 * the kernels (kernels.ts), which call only each other: it works the same from src/ (transformed
 * on the fly under vitest) and from dist/. Integers read from the ring go through `| 0`: a double
 * index deoptimizes the kernels (also the main thread's, which share their type feedback).
 */

import { Worker, MessageChannel, type MessagePort } from 'node:worker_threads';
import { arenaF64, arenaI32, simdShare } from '../simd/simd.js';
import * as kernels from './kernels.js';
import { mainKernels, makeSimdKernels } from './simd-kernels.js';

type Kernels = typeof kernels;
/** The helper's kernels: bindJob tells the WebAssembly wrappers which memory is theirs. */
type HelperKernels = Kernels & { bindJob?: (job: Job) => void };

/** Indices into the shared control words and operation codes (passed to the helper as data). */
const L = {
  JOB: 0, // job counter: the main thread increments it to start a job
  HEAD: 1, // doubles written to the ring (monotonic within a job)
  TAIL: 2, // doubles the helper has consumed
  STATE: 3, // 0 starting, 1 ready, 2 failed
  SPLIT: 4, // Vt's columns below this are the main thread's from the helper's next QR operation on
  ACK: 5, // ring position of the first operation the helper ran with the new split (−1: none yet)
  BT_NEXT: 6, // back-transformation: next chunk to claim
  BT_DONE: 7, // back-transformation: chunks finished
  ASLEEP: 8, // 1 while the helper waits for operations
  HW_LEFT: 9, // Hessenberg: the last step whose left half the helper has done
  HM_LEFT: 10, // Hessenberg: the same for the main thread
  HW_RIGHT: 11, // Hessenberg: the last step whose right update the helper has done
  OP_PAD: 0,
  OP_END: 1,
  OP_SWEEP: 2,
  OP_ROT: 3,
  OP_AED: 4,
  OP_HSTEP: 5,
  OP_ACCQ: 6,
  OP_BT: 7,
};
type Layout = typeof L;

/** The buffers of one decomposition, shared with the helper. */
interface Job {
  nn: number;
  H: Float64Array;
  Vt: Float64Array;
  /** the Hessenberg step's dot products of each row with u over the first and second half of the columns */
  sa: Float64Array;
  sb: Float64Array;
  /** the packed Hessenberg reflectors (eig.ts packReflectors) */
  u: Float64Array;
  offs: Int32Array;
  hs: Float64Array;
  ring: Float64Array;
  /** the helper's scratch, when it lives in the WebAssembly kernels' memory (see simd/simd.ts) */
  scratch: Scratch | null;
}

/**
 * Waits until ctrl[idx] ≥ target: a spin (the other thread is usually microseconds away; longer
 * in the Hessenberg lock step), then blocking waits. False when the helper failed (state 2) or nothing changed for `patience`
 * tenths of a second.
 */
export function waitAtLeast(ctrl: Int32Array, idx: number, target: number, stateIdx: number, patience: number, spins = 1000): boolean {
  for (let spin = 0; spin < spins; spin++) if (Atomics.load(ctrl, idx) >= target) return true;
  let idle = 0;
  for (;;) {
    const v = Atomics.load(ctrl, idx);
    if (v >= target) return true;
    if (Atomics.load(ctrl, stateIdx) === 2) return false;
    if (Atomics.wait(ctrl, idx, v, 100) === 'timed-out') {
      if (++idle > patience) return false;
    } else idle = 0;
  }
}

/** Scratch arrays of one thread for vectorOp and the back-transformation. */
interface Scratch {
  rx: Float64Array;
  ry: Float64Array;
  rz: Float64Array;
  rq: Float64Array;
  rr: Float64Array;
  out: Float64Array;
  acc: Float64Array;
}

export function makeScratch(nn: number): Scratch {
  return {
    rx: new Float64Array(nn),
    ry: new Float64Array(nn),
    rz: new Float64Array(nn),
    rq: new Float64Array(nn),
    rr: new Float64Array(nn),
    out: new Float64Array(0),
    acc: new Float64Array(4 * nn),
  };
}

/**
 * Scratch for one thread in the kernels' arena (null when none is open): the AED product's
 * result has room for windows of up to 2·√nn + 16 rows (aggressive early deflation takes about
 * 1.5·√size).
 */
function arenaScratch(nn: number): Scratch | null {
  const rows = Math.ceil(2 * Math.sqrt(nn)) + 16;
  const rx = arenaF64(nn);
  const ry = arenaF64(nn);
  const rz = arenaF64(nn);
  const rq = arenaF64(nn);
  const rr = arenaF64(nn);
  const out = arenaF64(rows * nn);
  const acc = arenaF64(4 * nn);
  if (!rx || !ry || !rz || !rq || !rr || !out || !acc) return null;
  return { rx, ry, rz, rq, rr, out, acc };
}

/**
 * Applies the QR-phase operation at ring[pos] (a sweep, a 2×2 rotation or an AED window) to Vt's
 * columns c0..c1. Returns its length in the ring.
 */
export function vectorOp(ring: Float64Array, pos: number, job: Job, c0: number, c1: number, S: Scratch, K: Kernels, Lay: Layout): number {
  const { nn, Vt } = job;
  const op = ring[pos];
  if (op === Lay.OP_SWEEP) {
    const m = ring[pos + 1] | 0; // an int32 index (a double here would deoptimize the kernels)
    const n = ring[pos + 2] | 0;
    const len = n - m;
    const b = pos + 3 - m;
    const { rx, ry, rz, rq, rr } = S;
    for (let k = m; k < n; k++) {
      rx[k] = ring[b + k];
      ry[k] = ring[b + len + k];
      rz[k] = ring[b + 2 * len + k];
      rq[k] = ring[b + 3 * len + k];
      rr[k] = ring[b + 4 * len + k];
    }
    if (c0 <= c1) K.applyLeft(Vt, nn, c0, c1, m, n, rx, ry, rz, rq, rr, true);
    return 3 + 5 * len;
  }
  if (op === Lay.OP_ROT) {
    const n = ring[pos + 1] | 0;
    if (c0 <= c1) K.rotatePair(Vt, (n - 1) * nn, n * nn, c0, c1, ring[pos + 2], ring[pos + 3]);
    return 4;
  }
  // Lay.OP_AED
  const kwtop = ring[pos + 1] | 0;
  const jw = ring[pos + 2] | 0;
  const Ut = ring.subarray(pos + 3, pos + 3 + jw * jw);
  if (S.out.length < jw * nn) S.out = new Float64Array(jw * nn);
  if (c0 <= c1) K.leftMultiply(Vt, nn, kwtop, c0, c1, Ut, jw, S.out);
  return 3 + jw * jw;
}

/**
 * Chunks of the back-transformation's columns, claimed one at a time by both threads (whichever
 * is free takes the next: the split adapts to how much CPU each thread gets).
 */
export function backTransformChunks(job: Job, ctrl: Int32Array, width: number, chunks: number, S: Scratch, K: Kernels, Lay: Layout): void {
  const nn = job.nn;
  for (;;) {
    const c = Atomics.add(ctrl, Lay.BT_NEXT, 1);
    if (c >= chunks) return;
    K.backTransformRange(job.H, nn, job.Vt, c * width, Math.min(nn, (c + 1) * width), S.acc);
    Atomics.add(ctrl, Lay.BT_DONE, 1);
    Atomics.notify(ctrl, Lay.BT_DONE);
  }
}

/** The helper thread: waits for a job, then runs its operations from the ring until OP_END. */
export function helperLoop(port: MessagePort, ctrl: Int32Array, receive: (p: MessagePort) => { message: Job } | undefined, Lay: Layout, K: HelperKernels): void {
  let S = makeScratch(0);
  let borrowed = false; // S is a job's (in the kernels' memory, reused by the next call)
  let job = 0;
  Atomics.store(ctrl, Lay.STATE, 1);
  Atomics.notify(ctrl, Lay.STATE);
  for (;;) {
    Atomics.wait(ctrl, Lay.JOB, job);
    job = Atomics.load(ctrl, Lay.JOB);
    const msg = receive(port);
    if (msg === undefined) continue;
    const d = msg.message;
    const { nn, H, Vt, ring } = d;
    const cap = ring.length;
    if (K.bindJob) K.bindJob(d);
    if (d.scratch) {
      S = d.scratch;
      borrowed = true;
    } else if (borrowed || S.rx.length < nn) {
      S = makeScratch(nn);
      borrowed = false;
    }
    let tail = 0;
    let split = 0; // Vt's columns below split are the main thread's (see Session.drain)
    let spins = 1000;
    try {
      for (;;) {
        if (Atomics.load(ctrl, Lay.HEAD) <= tail) {
          for (let spin = 0; spin < spins && Atomics.load(ctrl, Lay.HEAD) <= tail; spin++);
          // asleep: the main thread wakes it only every few operations (a wake-up is a system call)
          for (let h = Atomics.load(ctrl, Lay.HEAD); h <= tail; h = Atomics.load(ctrl, Lay.HEAD)) {
            Atomics.store(ctrl, Lay.ASLEEP, 1);
            if (Atomics.load(ctrl, Lay.HEAD) === h) Atomics.wait(ctrl, Lay.HEAD, h);
            Atomics.store(ctrl, Lay.ASLEEP, 0);
          }
        }
        const pos = tail % cap;
        const op = ring[pos];
        spins = 1000;
        if (op === Lay.OP_PAD) tail += cap - pos;
        else if (op === Lay.OP_END) {
          tail++;
          Atomics.store(ctrl, Lay.TAIL, tail);
          Atomics.notify(ctrl, Lay.TAIL);
          break;
        } else if (op === Lay.OP_SWEEP || op === Lay.OP_ROT || op === Lay.OP_AED) {
          const want = Atomics.load(ctrl, Lay.SPLIT);
          if (want !== split) {
            split = want;
            Atomics.store(ctrl, Lay.ACK, tail);
            Atomics.notify(ctrl, Lay.ACK);
          }
          tail += vectorOp(ring, pos, d, split, nn - 1, S, K, Lay);
        } else if (op === Lay.OP_HSTEP) {
          // the second half of Hessenberg step m's columns, in lock step with eig.ts hessenberg()
          const m = ring[pos + 1] | 0;
          const h = ring[pos + 2];
          const c = ring[pos + 3] | 0;
          const b = pos + 4 - m;
          const u = S.rx;
          for (let j = m; j < nn; j++) u[j] = ring[b + j];
          K.hessenbergLeft(H, nn, m, u, S.ry, h, c, nn, d.sb);
          Atomics.store(ctrl, Lay.HW_LEFT, m);
          Atomics.notify(ctrl, Lay.HW_LEFT);
          waitAtLeast(ctrl, Lay.HM_LEFT, m, Lay.STATE, Infinity, 50000);
          K.hessenbergRight(H, nn, u, d.sa, d.sb, h, c, nn);
          Atomics.store(ctrl, Lay.HW_RIGHT, m);
          Atomics.notify(ctrl, Lay.HW_RIGHT);
          tail += 4 + nn - m;
          spins = 50000; // the next step follows within microseconds
        } else if (op === Lay.OP_ACCQ) {
          K.accumulateRows(d.hs, nn, d.u, d.offs, Vt);
          tail += 1;
        } else if (op === Lay.OP_BT) {
          backTransformChunks(d, ctrl, ring[pos + 1] | 0, ring[pos + 2] | 0, S, K, Lay);
          tail += 3;
        } else throw new Error('helper: unknown operation ' + op);
        Atomics.store(ctrl, Lay.TAIL, tail);
        Atomics.notify(ctrl, Lay.TAIL);
      }
    } catch {
      Atomics.store(ctrl, Lay.STATE, 2);
      Atomics.notify(ctrl, Lay.TAIL);
      Atomics.notify(ctrl, Lay.BT_DONE);
      Atomics.notify(ctrl, Lay.ACK);
      return;
    }
  }
}

export const L_LEFT = 0;
export const L_RIGHT = 1;

/** Thrown on the main thread when the helper failed mid-job; eig.ts then starts over on one thread. */
export class HelperFailed extends Error {}

// ------------------------------------------------------------------------------------------------
// main-thread side
// ------------------------------------------------------------------------------------------------

interface Started {
  ctrl: Int32Array;
  port: MessagePort;
  worker: Worker;
}

let started: Started | null = null;
let unavailable = false;
let jobs = 0;
let cached: Job | null = null;
let ringCache: Float64Array | null = null;
// the main thread's scratch of the current arena job (null: its own plain arrays)
let mainScratch: Scratch | null = null;

/** Counters for tests: jobs run with the helper, and whether it is unavailable. */
export function helperStats(): { jobs: number; unavailable: boolean } {
  return { jobs, unavailable };
}

function source(): string {
  const fns = [...Object.values(kernels), waitAtLeast, makeScratch, vectorOp, backTransformChunks, helperLoop, makeSimdKernels].map((f) => f.toString());
  return [
    "'use strict';",
    "const { workerData, receiveMessageOnPort } = require('node:worker_threads');",
    ...fns,
    `const Kjs = { ${Object.keys(kernels).join(', ')} };`,
    // the WebAssembly kernels on the main thread's memory; a job's arrays are theirs when they
    // share the job's buffer
    'const simd = workerData.simd;',
    'let X = null;',
    'try { if (simd) X = new WebAssembly.Instance(simd.module, { env: { memory: simd.memory } }).exports; } catch { X = null; }',
    'const ctx = { buf: null };',
    'const K = makeSimdKernels(X, Kjs, (a) => a.buffer === ctx.buf);',
    // (a job in plain shared buffers, one per array, has none of the kernels' memory)
    'K.bindJob = (job) => { ctx.buf = job.scratch ? job.H.buffer : null; };',
    'helperLoop(workerData.port, workerData.ctrl, receiveMessageOnPort, workerData.L, K);',
  ].join('\n');
}

function start(): Started | null {
  if (started) return started;
  if (unavailable) return null;
  try {
    const ctrl = new Int32Array(new SharedArrayBuffer(16 * 4));
    const { port1, port2 } = new MessageChannel();
    const worker = new Worker(source(), { eval: true, workerData: { port: port2, ctrl, L, simd: simdShare() }, transferList: [port2] });
    worker.unref();
    port1.unref();
    const fail = (): void => {
      Atomics.store(ctrl, L.STATE, 2);
      unavailable = true;
      started = null;
    };
    worker.on('error', fail);
    worker.on('exit', fail);
    started = { ctrl, port: port1, worker };
    return started;
  } catch {
    unavailable = true;
    return null;
  }
}

/** Whether the helper is to be used for an n×n matrix (force: true ignores the size threshold). */
export function helperWanted(n: number, min: number, force: boolean | undefined): boolean {
  if (force === false || unavailable) return false;
  if (process.env.RINGDOWN_THREADS === '1') return false;
  return force === true || n >= min;
}

function shared(len: number): Float64Array {
  // in the WebAssembly kernels' arena while eig.ts has one open (zeroed there too)
  return arenaF64(len) ?? new Float64Array(new SharedArrayBuffer(8 * len));
}

/**
 * A zeroed Float64Array in shared memory. The Schur-form path allocates its matrices this way on
 * one thread too: V8 compiles a loop for the kind of backing store it has seen, and loops fed both
 * kinds ran about 2× slower (measured on Node 20).
 */
export const sharedF64 = shared;

/** A copy of `a` in shared memory. */
export function sharedCopy(a: Float64Array): Float64Array {
  const c = shared(a.length);
  c.set(a);
  return c;
}

/**
 * One decomposition's session with the helper: the shared buffers and the ring. Null when the
 * helper cannot start or is still starting (not forced).
 */
export class Session {
  readonly job: Job;
  private readonly ctrl: Int32Array;
  private head = 0;
  private woken = 0;
  private readonly batch: number;
  private ended = false;

  static open(nn: number, force: boolean): Session | null {
    const s = start();
    if (!s) return null;
    // a helper still starting would join late with its loops not compiled yet: the first call
    // runs on one thread (unless forced, as by the tests), later ones get the helper
    if (Atomics.load(s.ctrl, L.STATE) === 0) {
      if (!force) return null;
      waitAtLeast(s.ctrl, L.STATE, 1, L.STATE, 100);
    }
    if (Atomics.load(s.ctrl, L.STATE) !== 1) {
      unavailable = true;
      return null;
    }
    const ring = arenaF64(Math.max(1 << 18, 16 * (5 * nn + 16)));
    let job: Job | null = cached;
    if (ring) {
      // an arena is open (simd/simd.ts): this call's arrays are there, for both threads' kernels
      const scratch = arenaScratch(nn);
      const offs = arenaI32(nn);
      job = {
        nn,
        H: shared(nn * nn),
        Vt: shared(nn * nn),
        sa: shared(nn),
        sb: shared(nn),
        u: shared(Math.max((nn * (nn - 1)) / 2, 1)),
        offs: offs ?? new Int32Array(new SharedArrayBuffer(4 * nn)),
        hs: shared(nn),
        ring,
        scratch,
      };
      mainScratch = arenaScratch(nn);
    } else if (!job || job.nn !== nn) {
      const need = Math.max(1 << 18, 16 * (5 * nn + 16));
      if (!ringCache || ringCache.length < need) ringCache = shared(need);
      job = {
        nn,
        H: shared(nn * nn),
        Vt: shared(nn * nn),
        sa: shared(nn),
        sb: shared(nn),
        u: shared(Math.max((nn * (nn - 1)) / 2, 1)),
        offs: new Int32Array(new SharedArrayBuffer(4 * nn)),
        hs: shared(nn),
        ring: ringCache,
        scratch: null,
      };
      cached = job;
    }
    if (!ring) mainScratch = null;
    return new Session(s, job);
  }

  private constructor(s: Started, job: Job) {
    this.job = job;
    this.ctrl = s.ctrl;
    this.batch = 16 * job.nn;
    const c = this.ctrl;
    Atomics.store(c, L.HEAD, 0);
    Atomics.store(c, L.TAIL, 0);
    Atomics.store(c, L.SPLIT, 0);
    Atomics.store(c, L.ACK, -1);
    Atomics.store(c, L.HW_LEFT, 0);
    Atomics.store(c, L.HM_LEFT, 0);
    Atomics.store(c, L.HW_RIGHT, 0);
    s.port.postMessage(job);
    Atomics.add(c, L.JOB, 1);
    Atomics.notify(c, L.JOB);
    jobs++;
  }

  /** Room for `len` doubles at the head of the ring (a pad fills the end when they would wrap). */
  private reserve(len: number): number {
    const ring = this.job.ring;
    const cap = ring.length;
    let pos = this.head % cap;
    if (pos + len > cap) {
      this.room(cap - pos);
      ring[pos] = L.OP_PAD;
      this.head += cap - pos;
      pos = 0;
    }
    this.room(len);
    return pos;
  }

  private room(len: number): void {
    const cap = this.job.ring.length;
    if (this.head + len - Atomics.load(this.ctrl, L.TAIL) > cap) this.await(L.TAIL, this.head + len - cap);
  }

  private publish(len: number): void {
    this.head += len;
    Atomics.store(this.ctrl, L.HEAD, this.head);
    // a sleeping helper is woken once a few operations are waiting (each wake-up is a system call;
    // notifying on every sweep took 14 % of the main thread's time, measured)
    if (this.head - this.woken >= this.batch && Atomics.load(this.ctrl, L.ASLEEP) === 1) this.wake();
  }

  private wake(): void {
    this.woken = this.head;
    Atomics.notify(this.ctrl, L.HEAD);
  }

  private await(idx: number, target: number): void {
    this.wake();
    if (!waitAtLeast(this.ctrl, idx, target, L.STATE, 300)) {
      unavailable = true;
      this.ended = true;
      throw new HelperFailed('eig: the helper thread failed');
    }
  }

  /** The Schur-vector part of one sweep (reflectors k = m..n−1): Vt := Pᵀ·Vt on rows m..n. */
  sweep(m: number, n: number, rx: Float64Array, ry: Float64Array, rz: Float64Array, rq: Float64Array, rr: Float64Array): void {
    const len = n - m;
    const size = 3 + 5 * len;
    const pos = this.reserve(size);
    const ring = this.job.ring;
    ring[pos] = L.OP_SWEEP;
    ring[pos + 1] = m;
    ring[pos + 2] = n;
    ring.set(rx.subarray(m, n), pos + 3);
    ring.set(ry.subarray(m, n), pos + 3 + len);
    ring.set(rz.subarray(m, n), pos + 3 + 2 * len);
    ring.set(rq.subarray(m, n), pos + 3 + 3 * len);
    ring.set(rr.subarray(m, n), pos + 3 + 4 * len);
    this.publish(size);
  }

  /** The 2×2 standardizing rotation of rows n−1, n of Vt. */
  rotate(n: number, p: number, q: number): void {
    const pos = this.reserve(4);
    const ring = this.job.ring;
    ring[pos] = L.OP_ROT;
    ring[pos + 1] = n;
    ring[pos + 2] = p;
    ring[pos + 3] = q;
    this.publish(4);
  }

  /** An AED window transformation (Ut, jw×jw, on rows kwtop..kwtop+jw−1) on Vt. */
  aed(kwtop: number, Ut: Float64Array, jw: number): void {
    const size = 3 + jw * jw;
    const pos = this.reserve(size);
    const ring = this.job.ring;
    ring[pos] = L.OP_AED;
    ring[pos + 1] = kwtop;
    ring[pos + 2] = jw;
    ring.set(Ut.subarray(0, jw * jw), pos + 3);
    this.publish(size);
  }

  /** Hessenberg step m (reflector ort[m..nn−1], P = I − u·uᵀ/h): the helper takes columns c..nn−1. */
  hessenbergStep(m: number, ort: Float64Array, h: number, c: number): void {
    const nn = this.job.nn;
    const size = 4 + nn - m;
    const pos = this.reserve(size);
    const ring = this.job.ring;
    ring[pos] = L.OP_HSTEP;
    ring[pos + 1] = m;
    ring[pos + 2] = h;
    ring[pos + 3] = c;
    ring.set(ort.subarray(m, nn), pos + 4);
    this.publish(size);
    this.wake();
  }

  /** The main thread's left half of step m is done (job.sa holds its dot products). */
  hessenbergMark(m: number): void {
    Atomics.store(this.ctrl, L.HM_LEFT, m);
    Atomics.notify(this.ctrl, L.HM_LEFT);
  }

  /** Waits until the helper has done step m's left half (L_LEFT) or right update (L_RIGHT); returns the wait in ms. */
  hessenbergWait(which: number, m: number): number {
    const idx = which === L_LEFT ? L.HW_LEFT : L.HW_RIGHT;
    if (Atomics.load(this.ctrl, idx) >= m) return 0;
    const t0 = performance.now();
    if (!waitAtLeast(this.ctrl, idx, m, L.STATE, 300, 50000)) this.await(idx, m);
    return performance.now() - t0;
  }

  /** Vt := Qᵀ from the packed reflectors in job.u, job.offs, job.hs, on the helper. */
  accumulate(): void {
    const pos = this.reserve(1);
    this.job.ring[pos] = L.OP_ACCQ;
    this.publish(1);
    this.wake();
  }

  /** Waits until the helper has applied everything queued so far. */
  drain(): void {
    this.await(L.TAIL, this.head);
  }

  /**
   * The end of the QR phase: the main thread takes Vt's columns 0..split−1 of the operations the
   * helper has not started yet (it asks for the split, the helper acknowledges at the start of
   * its next operation), applies them from the ring, then waits for the helper.
   */
  drainHelping(): void {
    const c = this.ctrl;
    const { nn, ring } = this.job;
    const cap = ring.length;
    const split = nn >> 1;
    Atomics.store(c, L.SPLIT, split);
    this.wake();
    let from = -1;
    for (;;) {
      from = Atomics.load(c, L.ACK);
      if (from >= 0) break;
      if (Atomics.load(c, L.TAIL) >= this.head) {
        // finished: it may have taken the split at its last operations (ACK is stored before TAIL)
        from = Atomics.load(c, L.ACK);
        break;
      }
      if (Atomics.load(c, L.STATE) === 2) this.await(L.TAIL, this.head);
      Atomics.wait(c, L.ACK, -1, 1);
    }
    if (from >= 0) {
      const S = this.scratch();
      const K = mainKernels();
      let p = from;
      while (p < this.head) {
        const pos = p % cap;
        if (ring[pos] === L.OP_PAD) p += cap - pos;
        else p += vectorOp(ring, pos, this.job, 0, split - 1, S, K, L);
      }
    }
    this.drain();
    Atomics.store(c, L.SPLIT, 0);
  }

  private scratchS: Scratch | null = null;
  private scratch(): Scratch {
    if (mainScratch) return mainScratch;
    if (!this.scratchS || this.scratchS.rx.length < this.job.nn) this.scratchS = makeScratch(this.job.nn);
    return this.scratchS;
  }

  /** V := V·X (X in H's upper triangle) by both threads, in chunks of columns. */
  backTransform(): void {
    const c = this.ctrl;
    const nn = this.job.nn;
    const width = 64;
    const chunks = Math.ceil(nn / width);
    Atomics.store(c, L.BT_NEXT, 0);
    Atomics.store(c, L.BT_DONE, 0);
    const pos = this.reserve(3);
    const ring = this.job.ring;
    ring[pos] = L.OP_BT;
    ring[pos + 1] = width;
    ring[pos + 2] = chunks;
    this.publish(3);
    this.wake();
    backTransformChunks(this.job, c, width, chunks, this.scratch(), mainKernels(), L);
    this.await(L.BT_DONE, chunks);
    this.drain();
  }

  /** Ends the job and waits for the helper (also after an exception on the main thread). */
  close(): void {
    if (this.ended) return;
    try {
      const pos = this.reserve(1);
      this.job.ring[pos] = L.OP_END;
      this.publish(1);
      this.await(L.TAIL, this.head);
    } catch {
      // a failed helper is already marked unavailable; an error of the main thread stays the one reported
    }
    this.ended = true;
  }
}
