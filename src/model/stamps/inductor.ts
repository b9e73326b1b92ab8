import type { Part } from '../../circuit/circuit.js';
import type { StampContext } from '../descriptor.js';
import { addBranchCurrent, addBranchVoltage } from './index.js';

/** Branch current iL from a to b; its row: L·diL/dt = va − vb. */
export function stampInductor(part: Part, ctx: StampContext): void {
  const a = ctx.node(part.a);
  const b = ctx.node(part.b);
  const k = ctx.branch(part);
  addBranchCurrent(ctx, a, b, k);
  ctx.E[k].set(k, part.value);
  addBranchVoltage(ctx, k, a, b);
}
