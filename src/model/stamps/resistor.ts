import type { Part } from '../../circuit/circuit.js';
import type { StampContext } from '../descriptor.js';
import { addPair } from './index.js';

/** i = (va − vb)/R leaves node a: −G in A's KCL rows. */
export function stampResistor(part: Part, ctx: StampContext): void {
  addPair(ctx.A, ctx.node(part.a), ctx.node(part.b), -1 / part.value);
}
