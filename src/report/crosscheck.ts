import type { CrossCheck } from '../simulate/result.js';
import { BOLD, GREEN, RED, paint } from './color.js';
import { formatPlain } from './si.js';
import { wrapWords } from './wrap.js';

const sci = (x: number) => (Number.isFinite(x) ? x.toExponential(1) : formatPlain(x));

/** The in-run cross-check: one line when it passes, a loud block when it fails. */
export function crossCheckLines(c: CrossCheck, color: boolean): string[] {
  const points = [
    c.times.length ? `${c.times.length} time point${c.times.length === 1 ? '' : 's'}` : '',
    c.transformWeights?.length ? `${c.transformWeights.length} transform weight${c.transformWeights.length === 1 ? '' : 's'}` : '',
  ].filter(Boolean);
  const what = `${c.method}, ${points.join(' and ')}`;
  const numbers = `max relative error ${sci(c.maxRelError)}, limit ${sci(c.tolerance)}`;
  const scope = c.scope ? wrapWords(`  ${c.scope}`, 80, '    ') : [];
  if (c.passed) return [`Cross-check: ${paint('PASS', GREEN, color)}, ${numbers}`, ...wrapWords(`  against ${what}`, 80, '    '), ...scope];
  const bar = '!'.repeat(72);
  return [
    paint(bar, RED + BOLD, color),
    paint('CROSS-CHECK FAILED', RED + BOLD, color),
    ...wrapWords(`The closed-form answer disagrees with an independent calculation (${what}): ${numbers}.`),
    ...wrapWords('Do not rely on the numbers in this report. Please report this circuit file as a ringdown bug.'),
    paint(bar, RED + BOLD, color),
  ];
}
