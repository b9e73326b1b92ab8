import type { Ratings } from '../circuit/circuit.js';
import type { RunResult } from '../simulate/result.js';
import { runStress, type PartStress } from './stress.js';

/**
 * Each rating of each rated part against the stress found over the span:
 *
 * | rating       | stress compared                        |
 * | ------------ | -------------------------------------- |
 * | voltage (V)  | peak |v|                               |
 * | current (A)  | peak |i|                               |
 * | power (W)    | peak instantaneous |v·i|               |
 * | pulse (J)    | energy dissipated over the span        |
 *
 * The derated limit is derating × rating (`derate`, default 80 %: a common-practice margin). A
 * stress above the limit is flagged (`overLimit`); a stress above the rating itself is flagged
 * separately (`overRating`). Equal counts as within.
 */
export type RatingKind = keyof Ratings;

export interface RatingCheck {
  part: string;
  rating: RatingKind;
  unit: 'V' | 'A' | 'W' | 'J';
  /** the part's rating, SI */
  value: number;
  /** the stress found (Infinity: unbounded, a Dirac impulse) */
  stress: number;
  /** when the peak stress happens; null for the pulse energy (a total over the span) */
  time: number | null;
  derating: number;
  /** derating × value */
  limit: number;
  /** limit − stress (negative: over the limit) */
  margin: number;
  /** stress as a percentage of the rating itself */
  usedPct: number;
  overLimit: boolean;
  overRating: boolean;
}

export interface RatingsReport {
  derating: number;
  checks: RatingCheck[];
  /** number of checks over the derated limit */
  overLimit: number;
  /** number of checks over the rating itself */
  overRating: number;
}

export const RATING_UNITS: Record<RatingKind, 'V' | 'A' | 'W' | 'J'> = { voltage: 'V', current: 'A', power: 'W', pulseEnergy: 'J' };
const ORDER: RatingKind[] = ['voltage', 'current', 'power', 'pulseEnergy'];

function stressFor(s: PartStress, kind: RatingKind): { stress: number; time: number | null } | null {
  switch (kind) {
    case 'voltage':
      return { stress: s.voltage.value, time: s.voltage.time };
    case 'current':
      return { stress: s.current.value, time: s.current.time };
    case 'power':
      return { stress: s.power.value, time: s.power.time };
    case 'pulseEnergy':
      return s.energy === null ? null : { stress: s.energy, time: null };
  }
}

/** One check of a stress against a rating with the given derating. */
export function checkRating(part: string, kind: RatingKind, value: number, stress: number, time: number | null, derating: number): RatingCheck {
  const limit = derating * value;
  return {
    part,
    rating: kind,
    unit: RATING_UNITS[kind],
    value,
    stress,
    time,
    derating,
    limit,
    margin: limit - stress,
    usedPct: (stress / value) * 100,
    overLimit: !(stress <= limit),
    overRating: !(stress <= value),
  };
}

/** Every rating of every rated part, in circuit order, against the run's stress figures. */
export function checkRatings(stress: readonly PartStress[], parts: RunResult['circuit']['parts'], derating: number): RatingsReport {
  const checks: RatingCheck[] = [];
  for (const part of parts) {
    const r = part.ratings;
    if (!r) continue;
    const s = stress.find((x) => x.part === part.name);
    if (!s) continue;
    for (const kind of ORDER) {
      const value = r[kind];
      if (value === undefined) continue;
      const found = stressFor(s, kind);
      if (!found) continue;
      checks.push(checkRating(part.name, kind, value, found.stress, found.time, derating));
    }
  }
  return {
    derating,
    checks,
    overLimit: checks.filter((c) => c.overLimit).length,
    overRating: checks.filter((c) => c.overRating).length,
  };
}

const cache = new WeakMap<RunResult, RatingsReport>();

/** The ratings report of a run (computed once per result). */
export function runRatings(result: RunResult): RatingsReport {
  const hit = cache.get(result);
  if (hit) return hit;
  const report = checkRatings(runStress(result), result.circuit.parts, result.circuit.analysis.derating ?? DEFAULT_DERATING);
  cache.set(result, report);
  return report;
}

/** Fraction of a rating a part may use when the file says nothing (common practice). */
export const DEFAULT_DERATING = 0.8;
