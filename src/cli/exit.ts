/** Exit codes of the ringdown command. */
export const EXIT_OK = 0;
/** Something went wrong inside ringdown (a bug). */
export const EXIT_INTERNAL = 1;
/** The input (circuit file or command line) has problems; every diagnostic was printed. */
export const EXIT_INPUT = 2;
/** The report was written, but the in-run cross-check failed: do not trust the numbers. */
export const EXIT_CROSS_CHECK = 3;
/**
 * The report was written, and at least one part's stress is above its derated limit (derate ×
 * rating). A hardware repository's CI can gate on this code.
 */
export const EXIT_RATING = 4;
/**
 * The report was written, and at least one caution of severity "danger" fired (a hazardous
 * voltage, stored energy, no discharge path, an interrupted inductor current, ...).
 */
export const EXIT_DANGER = 5;

/**
 * When several codes apply, the one returned: a failed cross-check (3) first, since then no figure
 * can be trusted; then a danger caution (5), a hazard to people; then a rating over its derated
 * limit (4), a hazard to a part; otherwise 0.
 */
export const EXIT_PRIORITY: readonly number[] = [EXIT_CROSS_CHECK, EXIT_DANGER, EXIT_RATING];

export function exitPriority(codes: readonly number[]): number {
  for (const c of EXIT_PRIORITY) if (codes.includes(c)) return c;
  return EXIT_OK;
}
