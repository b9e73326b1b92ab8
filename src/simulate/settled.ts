import type { Circuit } from '../circuit/circuit.js';
import type { Model } from '../model/build.js';
import { luFactor, luSingular, luSolve } from '../linalg/lu.js';
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
      const n = ss.n;
      const rs = ss.A.map((row) => pow2Inverse(row.reduce((m, v) => Math.max(m, Math.abs(v)), 0)));
      const S = ss.A.map((row, i) => row.map((v) => v * rs[i]));
      const cs = Array.from({ length: n }, (_, j) => pow2Inverse(S.reduce((m, row) => Math.max(m, Math.abs(row[j])), 0)));
      for (const row of S) for (let j = 0; j < n; j++) row[j] *= cs[j];
      if (rs.some((x) => !Number.isFinite(x)) || cs.some((x) => !Number.isFinite(x))) throw new Error('no DC operating point');
      const f = n ? luFactor(S) : null;
      if (f && (luSingular(f) || f.minPivot <= 1e-12 * f.maxPivot)) throw new Error('no DC operating point');
      // the same factors solve (one O(n³) factorization, not two): S·y = R·B·u, ξ = −C·y
      const xi = f ? luSolve(f, Bu.map((r, i) => [r[0] * rs[i]])).map((r, j) => -r[0] * cs[j]) : [];
      for (const st of model.storage) {
        const r = st.readout;
        const v = r.C.reduce((s, cc, i) => s + cc * xi[i], 0) + r.D.reduce((s, d, j) => s + d * u[j], 0);
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
