import type { Part } from '../../circuit/circuit.js';
import { type SparseRows, type StampContext, addAt } from '../descriptor.js';
import { stampCapacitor } from './capacitor.js';
import { stampCurrentSource } from './current-source.js';
import { stampInductor } from './inductor.js';
import { stampResistor } from './resistor.js';
import { stampVoltageSource } from './voltage-source.js';

/** Each part kind adds its terms to E, A and B; one small file per kind. */
export function stampPart(part: Part, ctx: StampContext): void {
  switch (part.kind) {
    case 'resistor':
      return stampResistor(part, ctx);
    case 'capacitor':
      return stampCapacitor(part, ctx);
    case 'inductor':
      return stampInductor(part, ctx);
    case 'voltage-source':
      return stampVoltageSource(part, ctx);
    case 'current-source':
      return stampCurrentSource(part, ctx);
    case 'switch':
      // switches are resolved to resistors (or removed) per switch configuration before stamping
      throw new Error(`internal: switch ${part.name} reached the stamping stage unresolved`);
  }
}

/** Add `w` times the incidence pattern of a two-terminal element between rows/cols a and b. */
export function addPair(m: SparseRows, a: number, b: number, w: number): void {
  if (a >= 0) addAt(m, a, a, w);
  if (b >= 0) addAt(m, b, b, w);
  if (a >= 0 && b >= 0) {
    addAt(m, a, b, -w);
    addAt(m, b, a, -w);
  }
}

/**
 * KCL rows: a branch current `col` leaving node a and entering node b appears as −1 in row a
 * and +1 in row b of A (E·ż = A·z + B·u collects currents into each node).
 */
export function addBranchCurrent(ctx: StampContext, a: number, b: number, col: number): void {
  if (a >= 0) addAt(ctx.A, a, col, -1);
  if (b >= 0) addAt(ctx.A, b, col, 1);
}

/** Branch row `row` gets +v(a) − v(b) in A. */
export function addBranchVoltage(ctx: StampContext, row: number, a: number, b: number): void {
  if (a >= 0) addAt(ctx.A, row, a, 1);
  if (b >= 0) addAt(ctx.A, row, b, -1);
}
