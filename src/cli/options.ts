import { InvalidArgumentError } from 'commander';
import { parseQuantity } from '../netlist/quantity.js';
import { MAX_SAMPLES, MIN_SPAN } from '../circuit/limits.js';

/** `--span 2ms`: a positive time, SI prefix allowed, unit `s` optional. */
export function parseSpanOption(text: string): number {
  const q = parseQuantity(text.trim());
  if (typeof q === 'string') throw new InvalidArgumentError(`'${text}' is not a time (${q}); write it like 2ms or 500us`);
  if (q.unit !== null && q.unit !== 's') throw new InvalidArgumentError(`'${text}' is not a time; write it like 2ms or 500us`);
  if (!(q.value > 0) || !Number.isFinite(q.value)) throw new InvalidArgumentError(`the span must be a positive time, got '${text}'`);
  if (q.value < MIN_SPAN) throw new InvalidArgumentError(`the span must be at least ${MIN_SPAN} s, got '${text}'`);
  return q.value;
}

/** `--samples N`: a whole number of at least 2. */
export function parseSamplesOption(text: string): number {
  const n = Number(text.trim());
  if (!Number.isInteger(n) || n < 2) throw new InvalidArgumentError(`the number of samples must be a whole number of at least 2, got '${text}'`);
  // the same limit as the file's `samples` line (src/circuit/limits.ts)
  if (n > MAX_SAMPLES) throw new InvalidArgumentError(`${text} samples is more than ringdown will compute (at most ${MAX_SAMPLES})`);
  return n;
}

export type Format = 'text' | 'json' | 'csv' | 'numbers';
export const FORMATS: readonly Format[] = ['text', 'json', 'csv', 'numbers'];
