import type { Mat, Vec } from '../linalg/dense.js';

/**
 * The explicit linear time-invariant model handed to the LTI stage.
 *
 *   ξ' = A·ξ + B·u          (n states, m inputs)
 *   y  = C·ξ + D·u + D1·u'   (one row per read-out)
 *   x  = ξ + Bx1·u           (the physical states: capacitor voltages, inductor currents)
 *
 * ξ differs from x only where a capacitor sits in a loop with voltage sources (or an inductor in a
 * cut-set with current sources): there x follows the source instantly, and an ideal source step
 * makes x jump while ξ stays continuous. D1 ≠ 0 means a read-out carries a Dirac impulse at an
 * ideal source step (the charging current of a capacitor switched straight onto a source).
 */
export interface StateSpace {
  n: number;
  m: number;
  A: Mat;
  B: Mat;
  Bx1: Mat;
  states: StateVariable[];
  inputs: string[];
}

export interface StateVariable {
  part: string;
  kind: 'capacitor-voltage' | 'inductor-current';
  name: string;
}

/** One read-out row of the model. */
export interface Readout {
  C: Vec;
  D: Vec;
  D1: Vec;
}
