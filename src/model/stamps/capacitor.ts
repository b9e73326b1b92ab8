import type { Part } from '../../circuit/circuit.js';
import type { StampContext } from '../descriptor.js';
import { addPair } from './index.js';

/** i = C·d(va − vb)/dt leaves node a: the charge term sits in E's KCL rows (moved to the left). */
export function stampCapacitor(part: Part, ctx: StampContext): void {
  addPair(ctx.E, ctx.node(part.a), ctx.node(part.b), part.value);
}
