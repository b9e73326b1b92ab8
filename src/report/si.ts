/** SI formatting lives in src/units/si.ts (measure uses it too); the report re-exports it. */
export { formatSI, formatSIExact, formatPlain, type SIOptions } from '../units/si.js';
