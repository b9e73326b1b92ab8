import type { Mode } from '../simulate/result.js';
import { formatPlain, formatSI } from './si.js';
import { heading, table } from './table.js';

/** The natural-modes table: time constants of real modes, wn / ringing / zeta / Q of oscillatory ones. */
export function modesSection(modes: readonly Mode[], title = 'Natural modes'): string[] {
  const out = heading(title);
  if (modes.length === 0) return [...out, '  none (the network has no energy-storing states)'];
  const rows: string[][] = [['#', 'kind', 'time constant', 'natural freq wn', 'ringing freq', 'damping zeta', 'Q']];
  modes.forEach((m, i) => {
    const n = String(i + 1);
    switch (m.kind) {
      case 'real':
        rows.push([n, m.lambda === 0 ? 'constant' : 'decaying', formatSI(m.tau, 's'), '', '', '', '']);
        break;
      case 'oscillatory':
        rows.push([
          n,
          'ringing',
          m.sigma === 0 ? '∞ (undamped)' : formatSI(-1 / m.sigma, 's'),
          formatSI(m.wn, 'rad/s'),
          formatSI(m.ringingHz, 'Hz'),
          formatPlain(m.zeta, 4),
          formatPlain(m.q, 4),
        ]);
        break;
      case 'repeated':
        rows.push([n, `repeated ×${m.multiplicity}`, formatSI(m.tau, 's'), '', '', '', '']);
        break;
    }
  });
  const lines = [...out, ...table(rows)];
  if (modes.some((m) => m.kind === 'oscillatory')) lines.push('  (for ringing modes the time constant is that of the decay envelope)');
  return lines;
}
