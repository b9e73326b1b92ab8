/** Report formats for a RunResult, and the pieces they are made of. */
export { formatTextReport, type TextReportOptions } from './text.js';
export { formatJSON, resultToJSONValue, JSON_SCHEMA } from './json.js';
export { formatCSV, csvNumber, csvField } from './csv.js';
export { formatCheck } from './check.js';
export { renderChart, chartWidth, type ChartTrace, type ChartOptions } from './chart.js';
export { formatSI, formatSIExact, formatPlain, type SIOptions } from './si.js';
export { formatPieces, formatTerms } from './formula.js';
export { colorEnabled } from './color.js';
export { SAFETY_NOTICE } from './safety.js';
