import { pathTransfers } from '../lti/transfer.js';
import { traceTimeAbove } from '../measure/above.js';
import { runCautions } from '../measure/cautions.js';
import { runRatings } from '../measure/ratings.js';
import { runStress } from '../measure/stress.js';
import type { RunResult } from '../simulate/result.js';
import { explainSignal } from './why.js';

/** Identifies the layout of the JSON output; see doc/OUTPUT.md. */
export const JSON_SCHEMA = 'ringdown-result/1';

/** Typed arrays become plain arrays; Infinity and NaN become null. */
function replacer(_key: string, value: unknown): unknown {
  if (value instanceof Float64Array) return Array.from(value, (x) => (Number.isFinite(x) ? x : null));
  if (typeof value === 'number' && !Number.isFinite(value)) return null;
  return value;
}

/** The run result as a plain JSON-compatible value, `schema` first. */
export function resultToJSONValue(result: RunResult): Record<string, unknown> {
  return JSON.parse(formatJSON(result)) as Record<string, unknown>;
}

/**
 * The whole run result as JSON text (two-space indent, trailing newline), with the part stress
 * figures (`stress`), the rating checks (`ratings`), the safety cautions (`cautions`), the
 * transfer functions (`transfers`), each trace's one-line explanation (`traces[].why`) and its
 * time above the watch's threshold (`traces[].metrics.timeAbove`, null without one) added;
 * `discharge` and `periodic` are always present (empty list, null) so that readers need not test
 * for them.
 */
export function formatJSON(result: RunResult): string {
  const value = {
    schema: JSON_SCHEMA,
    ...result,
    traces: result.traces.map((t, i) => ({ ...t, metrics: { ...t.metrics, timeAbove: traceTimeAbove(result, i) }, why: explainSignal(t, result.modes, result.times[0] ?? 0, result.times[result.times.length - 1] ?? 0) })),
    discharge: result.discharge ?? [],
    periodic: result.periodic ?? null,
    stress: runStress(result),
    ratings: runRatings(result),
    cautions: runCautions(result),
    transfers: pathTransfers(result, { allConfigurations: true }),
  };
  const text = JSON.stringify(value, replacer, 2);
  // Arrays of plain numbers (samples, coefficients) on one line each: same JSON, far fewer lines.
  return text.replace(/\[(\s*(?:-?[\d.eE+-]+|null)(?:,\s*(?:-?[\d.eE+-]+|null))*\s*)\]/g, (_m, inner: string) => `[${inner.replace(/\s+/g, '')}]`) + '\n';
}
