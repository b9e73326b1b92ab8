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
/** Reserved: the report was written, and it carries a danger caution. */
export const EXIT_DANGER = 5;
