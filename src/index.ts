/**
 * The library face of ringdown. Each stage is importable on its own; these are the entry points
 * most callers need.
 */
export type * from './circuit/circuit.js';
export type * from './simulate/result.js';
export { InputError, type Diagnostic } from './diagnostics.js';
export { loadCircuit } from './circuit/load.js';
export { analyzeCircuit, analyzeText, type AnalyzeOptions } from './pipeline.js';
export { runStress, partStress, type PartStress, type StressQuantity } from './measure/stress.js';
export { runRatings, checkRatings, checkRating, type RatingCheck, type RatingsReport, type RatingKind } from './measure/ratings.js';
export { formatNumbers } from './report/numbers.js';
