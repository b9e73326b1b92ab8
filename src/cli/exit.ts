/** Exit codes of the ringdown command. */
export const EXIT_OK = 0;
/** Something went wrong inside ringdown (a bug). */
export const EXIT_INTERNAL = 1;
/** The input (circuit file or command line) has problems; every diagnostic was printed. */
export const EXIT_INPUT = 2;
/** The report was written, but the in-run cross-check failed: do not trust the numbers. */
export const EXIT_CROSS_CHECK = 3;
