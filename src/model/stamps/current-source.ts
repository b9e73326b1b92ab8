import type { Part } from '../../circuit/circuit.js';
import type { StampContext } from '../descriptor.js';

/** The source carries u from a to b through itself: u leaves node a and enters node b. */
export function stampCurrentSource(part: Part, ctx: StampContext): void {
  const a = ctx.node(part.a);
  const b = ctx.node(part.b);
  const j = ctx.input(part);
  if (a >= 0) ctx.B[a][j] -= 1;
  if (b >= 0) ctx.B[b][j] += 1;
}
