import type { Circuit } from '../circuit/circuit.js';
import type { Model } from '../model/build.js';
import { bandFactor, bandMatrix, bandSolve } from '../linalg/band.js';
import { stateOrder } from './band-order.js';
import type { Waveform } from '../circuit/circuit.js';
import { valueLeftOf } from '../waveform/schedule.js';

/**
 * Capacitor voltages and inductor currents before t = 0.
 *  - 'rest': all zero.
 *  - 'settled': the DC operating point of the circuit as it is before t = 0 (switches in their
 *    initial state, sources at their t = 0− values): ξ' = 0 ⇒ ξ = −A⁻¹·B·u(0−), solved exactly.
 * A part's own `initial` value overrides either.
 */
export function valuesBeforeStart(circuit: Circuit, pre: Circuit, model: Model): { values: Map<string, number>; mode: 'settled' | 'rest'; note?: string } {
  const values = new Map<string, number>();
  let mode = circuit.analysis.start;
  let note: string | undefined;
  if (mode === 'settled') {
    const { ss } = model;
    const waves: Waveform[] = ss.inputs.map((name) => pre.parts.find((p) => p.name === name)!.waveform!);
    const u = waves.map((w) => valueLeftOf(w, 0));
    try {
      const Bu = ss.B.map((row) => [row.reduce((s, b, j) => s + b * u[j], 0)]);
      // a pole at zero within round-off (an inductor straight across a source, a capacitor fed
      // by a current with no discharge path) means there is no DC operating point. Rows and
      // columns are scaled to unit size first (powers of two: no rounding): a stiff circuit, 1 ps
      // beside 10 s, has pivots 1e13 apart without being anywhere near singular, while a zero
      // mode stays a round-off pivot (or an empty row) after scaling
      // A state with an empty row and column (a capacitor with one end left open, the middle node of
      // capacitors in series across a source) is decoupled and conserved: with no input driving it
      // (B·u = 0 in its row) it keeps its rest value (ξ = 0) and the rest is solved without it;
      // with an input driving it there is no DC operating point
      const N = ss.n;
      const used = new Uint8Array(N);
      for (let i = 0; i < N; i++) {
        const row = ss.A[i];
        for (let j = 0; j < N; j++) if (row[j] !== 0) used[i] = used[j] = 1;
      }
      const keep: number[] = [];
      for (let i = 0; i < N; i++) {
        if (used[i]) keep.push(i);
        else if (Bu[i][0] !== 0) throw new Error('no DC operating point');
      }
      const n = keep.length;
      const sub = n < N;
      const A = sub ? keep.map((i) => keep.map((j) => ss.A[i][j])) : ss.A;
      // (on the nonzeros: a 1000-state mesh has 3000 of them, not 10⁶)
      const I: number[] = [];
      const J: number[] = [];
      const V: number[] = [];
      const rs = new Array<number>(n);
      for (let i = 0; i < n; i++) {
        const row = A[i];
        let m = 0;
        for (let j = 0; j < n; j++) {
          const v = row[j];
          if (v === 0) continue;
          I.push(i);
          J.push(j);
          V.push(v);
          m = Math.max(m, Math.abs(v));
        }
        rs[i] = pow2Inverse(m);
      }
      const colMax = new Array<number>(n).fill(0);
      for (let q = 0; q < I.length; q++) {
        V[q] *= rs[I[q]];
        colMax[J[q]] = Math.max(colMax[J[q]], Math.abs(V[q]));
      }
      const cs = colMax.map(pow2Inverse);
      if (rs.some((x) => !Number.isFinite(x)) || cs.some((x) => !Number.isFinite(x))) throw new Error('no DC operating point');
      for (let q = 0; q < I.length; q++) V[q] *= cs[J[q]];
      // one LU with partial pivoting (one O(n³) factorization at most, not two): S·y = R·B·u,
      // ξ = −C·y. Above 32 states the states are renumbered to narrow the band first (a mesh's
      // A is sparse; band-order.ts); small circuits keep their own order
      const ord = n > 32 && !sub ? stateOrder(ss) : null;
      const pos = ord ? ord.pos : Int32Array.from({ length: n }, (_, i) => i);
      let kl = 0;
      let ku = 0;
      for (let q = 0; q < I.length; q++) {
        kl = Math.max(kl, pos[I[q]] - pos[J[q]]);
        ku = Math.max(ku, pos[J[q]] - pos[I[q]]);
      }
      const M = bandMatrix(n, kl, ku);
      for (let q = 0; q < I.length; q++) M.a[M.off[pos[I[q]]] + pos[J[q]]] = V[q];
      const f = bandFactor(M);
      let minPivot = Infinity;
      let maxPivot = 0;
      for (let i = 0; i < n; i++) {
        const p = Math.abs(f.lu[f.off[i] + i]);
        minPivot = Math.min(minPivot, p);
        maxPivot = Math.max(maxPivot, p);
      }
      if (n && (f.singular || minPivot === 0 || !Number.isFinite(maxPivot) || minPivot <= 1e-12 * maxPivot)) throw new Error('no DC operating point');
      const rhs = new Float64Array(n);
      for (let i = 0; i < n; i++) rhs[pos[i]] = Bu[keep[i]][0] * rs[i];
      const y = bandSolve(f, rhs);
      const xi = new Array<number>(N).fill(0);
      for (let j = 0; j < n; j++) xi[keep[j]] = -y[pos[j]] * cs[j];
      for (const st of model.storage) {
        const r = st.readout;
        let v = 0;
        for (let i = 0; i < N; i++) v += r.C[i] * xi[i];
        v += r.D.reduce((s, d, j) => s + d * u[j], 0);
        values.set(st.part.name, v);
      }
    } catch {
      mode = 'rest';
      note = 'the circuit has no DC operating point before t = 0 (a capacitor charged by a current with no path to discharge, or similar); starting from rest instead';
    }
  }
  for (const p of circuit.parts) if (p.initial !== undefined) values.set(p.name, p.initial);
  return { values, mode, note };
}

/** 1/x rounded to a power of two (Infinity for 0: an empty row or column). */
function pow2Inverse(x: number): number {
  return x > 0 ? 2 ** -Math.round(Math.log2(x)) : Infinity;
}
