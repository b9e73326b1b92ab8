/**
 * The library face of ringdown. Each stage is importable on its own; these are the entry points
 * most callers need.
 */
export type * from './circuit/circuit.js';
export type * from './simulate/result.js';
export { InputError, type Diagnostic } from './diagnostics.js';
export { loadCircuit } from './circuit/load.js';
export { analyzeCircuit, analyzeText, type AnalyzeOptions } from './pipeline.js';
