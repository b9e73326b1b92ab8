import { traceTimeAbove } from '../measure/above.js';
import { energyBalance } from '../measure/energy.js';
import { runRatings } from '../measure/ratings.js';
import { runStress } from '../measure/stress.js';
import type { RunResult } from '../simulate/result.js';

/**
 * `--format numbers`: one `key=value` line per number, for scripts (grep, cut, a CI gate).
 * Values are SI without prefixes in the shortest form that reads back to the same double;
 * unbounded figures are `inf`, undefined ones `nan`; a figure that does not exist (no transition,
 * no heat in a capacitor) is left out. Keys are built from labels and part names, with every run
 * of characters other than letters, digits and `()_.,:+-` replaced by `_`.
 * See doc/OUTPUT.md for the full list of keys.
 */
export function formatNumbers(result: RunResult): string {
  const lines: string[] = [];
  const put = (key: string, value: number | boolean | null | undefined) => {
    if (value === null || value === undefined) return;
    lines.push(`${key}=${typeof value === 'boolean' ? (value ? 1 : 0) : num(value)}`);
  };

  put('span', result.span);
  put('samples', result.times.length);
  put('crosscheck.passed', result.crossCheck.passed);
  put('crosscheck.max_rel_error', result.crossCheck.maxRelError);
  put('crosscheck.tolerance', result.crossCheck.tolerance);

  for (const [i, tr] of result.traces.entries()) {
    const k = keyPart(tr.label);
    const m = tr.metrics;
    put(`${k}.initial`, m.initial);
    put(`${k}.final`, m.final);
    put(`${k}.peak`, m.peak.value);
    put(`${k}.peak.time`, m.peak.time);
    put(`${k}.valley`, m.valley.value);
    put(`${k}.valley.time`, m.valley.time);
    put(`${k}.overshoot_pct`, m.overshootPct);
    put(`${k}.undershoot_pct`, m.undershootPct);
    put(`${k}.rise_time`, m.riseTime);
    put(`${k}.settling_time`, m.settlingTime);
    put(`${k}.delay_50`, m.delay50);
    put(`${k}.ringing_hz`, m.ringingHz);
    put(`${k}.log_decrement`, m.logDecrement);
    put(`${k}.max_slope`, m.maxSlope?.value);
    put(`${k}.max_slope.time`, m.maxSlope?.time);
    put(`${k}.average`, m.average);
    put(`${k}.rms`, m.rms);
    if (m.events) {
      put(`${k}.events`, m.events.length);
      for (const [j, e] of m.events.entries()) {
        put(`${k}.event.${j + 1}.time`, e.t);
        put(`${k}.event.${j + 1}.from`, e.from);
        put(`${k}.event.${j + 1}.to`, e.to);
        put(`${k}.event.${j + 1}.overshoot_pct`, e.overshootPct);
        put(`${k}.event.${j + 1}.undershoot_pct`, e.undershootPct);
      }
    }
    const above = traceTimeAbove(result, i);
    put(`${k}.time_above.threshold`, above?.threshold);
    put(`${k}.time_above`, above?.total);
    put(`${k}.time_above.first`, above?.first);
    put(`${k}.time_above.last`, above?.last);
  }

  for (const s of runStress(result)) {
    const k = keyPart(s.part);
    put(`${k}.voltage.peak`, s.voltage.value);
    put(`${k}.voltage.peak.time`, s.voltage.time);
    put(`${k}.current.peak`, s.current.value);
    put(`${k}.current.peak.time`, s.current.time);
    put(`${k}.power.peak`, s.power.value);
    put(`${k}.power.peak.time`, s.power.time);
    put(`${k}.energy`, s.energy);
    put(`${k}.i2t`, s.i2t);
    put(`${k}.stored.peak`, s.storedPeak);
  }

  if (result.parts && result.parts.length > 0) {
    try {
      const e = energyBalance(result.circuit, result.parts);
      put('energy.delivered', e.delivered);
      put('energy.dissipated', e.dissipated);
      put('energy.stored_change', e.storedChange);
      put('energy.residual', e.residual);
    } catch {
      // no balance for this run: its lines are left out
    }
  }

  const r = runRatings(result);
  if (r.checks.length > 0) put('rating.derating', r.derating);
  for (const c of r.checks) {
    const k = `rating.${keyPart(c.part)}.${c.rating === 'pulseEnergy' ? 'pulse_energy' : c.rating}`;
    put(`${k}.rating`, c.value);
    put(`${k}.stress`, c.stress);
    put(`${k}.limit`, c.limit);
    put(`${k}.margin`, c.margin);
    put(`${k}.used`, c.usedPct);
    put(`${k}.over_limit`, c.overLimit);
    put(`${k}.over_rating`, c.overRating);
  }
  put('ratings.over_limit', r.overLimit);
  put('ratings.over_rating', r.overRating);
  return lines.join('\n') + '\n';
}

/** Shortest round-trip form; inf, -inf, nan for the rest. */
function num(x: number): string {
  if (Number.isNaN(x)) return 'nan';
  if (!Number.isFinite(x)) return x > 0 ? 'inf' : '-inf';
  return String(x);
}

/** A label or name as a key part: characters outside letters, digits and ()_.,:+- become _. */
export function keyPart(text: string): string {
  return text.replace(/[^A-Za-z0-9()_.,:+\-]+/g, '_');
}
