import type { Part } from '../../circuit/circuit.js';
import type { StampContext } from '../descriptor.js';
import { addBranchCurrent, addBranchVoltage } from './index.js';

/** Branch current from a to b through the source; its row: 0 = va − vb − u. */
export function stampVoltageSource(part: Part, ctx: StampContext): void {
  const a = ctx.node(part.a);
  const b = ctx.node(part.b);
  const k = ctx.branch(part);
  addBranchCurrent(ctx, a, b, k);
  addBranchVoltage(ctx, k, a, b);
  ctx.B[k][ctx.input(part)] = -1;
}
