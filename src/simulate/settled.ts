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
      // by a current with no discharge path) means there is no DC operating point
      const f = ss.n ? luFactor(ss.A) : null;
      if (f && (luSingular(f) || f.minPivot <= 1e-12 * f.maxPivot)) throw new Error('no DC operating point');
      // the same factors solve (one O(n³) factorization, not two)
      const xi = f ? luSolve(f, Bu).map((r) => -r[0]) : [];
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
