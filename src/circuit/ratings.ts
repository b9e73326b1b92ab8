import type { RatedNode } from '../netlist/ast.js';
import { raise } from '../netlist/errors.js';
import { UNIT_NAMES, type Unit } from '../netlist/quantity.js';
import type { PartKind, Ratings } from './circuit.js';
import { evaluateValue, type EvalContext } from './evaluate.js';

type Rating = keyof Ratings;

/** The unit of a rating says which rating it is. */
const RATING_OF_UNIT: Partial<Record<Unit, Rating>> = { V: 'voltage', A: 'current', W: 'power', J: 'pulseEnergy' };
const RATING_NAME: Record<Rating, string> = { voltage: 'voltage', current: 'current', power: 'power', pulseEnergy: 'pulse energy' };
const RATING_UNIT: Record<Rating, Unit> = { voltage: 'V', current: 'A', power: 'W', pulseEnergy: 'J' };

/** Parts that dissipate: the only ones a power or pulse-energy rating means something for. */
const DISSIPATING: readonly PartKind[] = ['resistor', 'switch'];

const EXPECTED = 'a voltage (V), current (A), power (W) or pulse energy (J), such as 35V, 2A, 250mW or 1.5J';

/**
 * `rated 35V 2A 250mW 1.5J`: each value's unit tells which rating it is. Each rating at most once,
 * positive; power and pulse energy only for resistors and switches. Undefined (after raising) on error.
 */
export function elaborateRatings(node: RatedNode, kind: PartKind, name: string, ctx: EvalContext): Ratings | undefined {
  const ratings: Ratings = {};
  const firstCol = new Map<Rating, number>();
  let ok = true;
  const fail = (loc: RatedNode['keyLoc'], message: string, extras: { expected?: string; hint?: string } = {}): void => {
    raise(ctx.sink, 'error', loc, message, extras);
    ok = false;
  };
  for (const v of node.values) {
    const q = evaluateValue(v, ctx);
    if (!q) {
      ok = false;
      continue;
    }
    if (q.unit === null) {
      fail(v.loc, `a rating of ${name} needs a unit, which tells which rating it is`, {
        expected: EXPECTED,
        hint: v.kind === 'expr' ? 'an expression has no unit; write the rating as a literal such as 35V, or a parameter declared with its unit' : undefined,
      });
      continue;
    }
    const rating = RATING_OF_UNIT[q.unit];
    if (!rating) {
      fail(v.loc, `${name} cannot be rated in ${UNIT_NAMES[q.unit]}`, { expected: EXPECTED });
      continue;
    }
    if ((rating === 'power' || rating === 'pulseEnergy') && !DISSIPATING.includes(kind)) {
      fail(v.loc, `${article(kind)} ${kind} has no ${RATING_NAME[rating]} rating`, {
        hint: `${RATING_NAME[rating]} ratings (${RATING_UNIT[rating]}) are for resistors and switches, the parts that dissipate; rate ${name} by voltage (V) or current (A)`,
      });
      continue;
    }
    const first = firstCol.get(rating);
    if (first !== undefined) {
      fail(v.loc, `the ${RATING_NAME[rating]} rating of ${name} is given twice`, { hint: `the first one is at column ${first}` });
      continue;
    }
    firstCol.set(rating, v.loc.col);
    if (!(q.value > 0)) {
      fail(v.loc, `the ${RATING_NAME[rating]} rating of ${name} must be positive, got ${q.value} ${RATING_UNIT[rating]}`, { expected: EXPECTED });
      continue;
    }
    ratings[rating] = q.value;
  }
  return ok ? ratings : undefined;
}

function article(kind: PartKind): string {
  return /^[aeiou]/.test(kind) ? 'an' : 'a';
}
