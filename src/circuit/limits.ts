/**
 * The sizes ringdown accepts, in one place. Each limit is checked where the input is first seen
 * and refused with an input error (exit code 2) that says which limit was passed; none of them
 * is close to what a hand-written or generated board-level circuit needs.
 */

/** Bytes of circuit text (UTF-8). Checked before anything is parsed, so a wrong file is refused at once. */
export const MAX_FILE_BYTES = 5 * 1024 * 1024;

/** Characters on one line. A statement fits on one line; long inline tables belong in a table file. */
export const MAX_LINE_CHARS = 100_000;

/**
 * Characters inside one parenthesized value or one `expression "…"`. The expression evaluator
 * works recursively, so a very long chain of operators would exhaust the call stack.
 */
export const MAX_EXPRESSION_CHARS = 1_000;

/** Parentheses nested inside one expression, for the same reason. */
export const MAX_EXPRESSION_NESTING = 64;

/** Part statements in one file. */
export const MAX_PARTS = 5_000;

/** Distinct node names (gnd excepted) in one file. */
export const MAX_NODES = 5_000;

/** Sample points of a run (`samples`, `--samples`). Enforced in src/circuit/analysis.ts, which has the same number. */
export const MAX_SAMPLES = 1_000_000;

/**
 * States (independent capacitor voltages and inductor currents) of one switch configuration.
 * Enforced by the solver, after the model is built; describeStructure (src/circuit/structure.ts)
 * predicts the count from the graph alone.
 */
export const MAX_STATES = 2_000;

/**
 * Source corners (the times where a source's formula changes: pulse edges, table points) and switch
 * events within the span of one run. Each one starts a new interval of closed forms for every
 * signal; measured on a 3-part RC, 2·10⁴ intervals take 3 s and 0.3 GB, 2·10⁵ take 19 s and 2.3 GB,
 * and 10¹² (a 1 ns pulse train over 1000 s) exhausted the memory. Checked once the span is known
 * (src/circuit/workload.ts).
 */
export const MAX_SOURCE_CORNERS = 100_000;

/**
 * The shortest span (seconds). Far below anything physical (a femtofarad through a milliohm is
 * 1e-18 s), and far enough above the floating-point range that sample spacings and time constants
 * stay normal numbers: a span of 5e-324 s failed the cross-check with an infinite error.
 */
export const MIN_SPAN = 1e-100;

/**
 * Resistances, capacitances and inductances (SI) lie within [MIN_PART_VALUE, MAX_PART_VALUE], and
 * initial values are at most MAX_PART_VALUE in size. 24 decades each way hold anything on a board
 * (fF to kF, mΩ to GΩ) with a dozen decades to spare; beyond, the circuit equations' scales pass
 * the floating-point range (a 1e-300 Ω resistor beside a 1e300 F capacitor never finished;
 * 1e-200 Ω with 1e-200 F was reported as having no unique solution; an initial 1e300 V gave an
 * infinite stored energy and a NaN energy balance).
 */
export const MIN_PART_VALUE = 1e-24;
export const MAX_PART_VALUE = 1e24;
