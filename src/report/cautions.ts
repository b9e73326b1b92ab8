import type { Caution } from '../measure/cautions.js';
import { BOLD, RED, YELLOW, paint } from './color.js';
import { heading } from './table.js';
import { wrapWords } from './wrap.js';

const WIDTH = 80;

/** The severity mark of a caution, fixed width. */
export function severityMark(severity: Caution['severity'], color = false): string {
  switch (severity) {
    case 'danger':
      return paint('[DANGER] ', RED + BOLD, color);
    case 'warning':
      return paint('[WARNING]', YELLOW + BOLD, color);
    case 'info':
      return '[NOTE]   ';
  }
}

/**
 * "Cautions": each caution with its severity mark and title, the detail, and the threshold with
 * where it comes from; danger first. The list is given already ordered (runCautions).
 */
export function cautionsSection(list: readonly Caution[], color = false): string[] {
  const out = heading('Cautions (prompts to look closer, not a safety assessment)');
  if (list.length === 0) {
    out.push(
      ...wrapWords(
        '  none: no voltage above extra-low voltage, no hazardous stored energy, no slow discharge, no interrupted inductor current, no edge faster than 1 V/ns.',
        WIDTH,
        '    ',
      ),
    );
    return out;
  }
  list.forEach((c, i) => {
    if (i > 0) out.push('');
    out.push(...wrapWords(`  ${severityMark(c.severity, color)} ${c.title}`, WIDTH, '              '));
    out.push(...wrapWords(`    ${c.detail}`, WIDTH, '    '));
    const limit = c.threshold ? `threshold: ${c.threshold}; source: ${c.source}` : `source: ${c.source}`;
    out.push(...wrapWords(`    ${limit}`, WIDTH, '      '));
  });
  const danger = list.filter((c) => c.severity === 'danger').length;
  if (danger > 0) {
    out.push('');
    out.push(...wrapWords(`  ${danger} danger caution${danger === 1 ? '' : 's'}: the command exits with code 5 (unless the cross-check failed: 3).`, WIDTH, '    '));
  }
  return out;
}
