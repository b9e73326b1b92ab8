/**
 * Tables against scipy.signal.lsim golden data (first-order hold, exact for piecewise-linear input
 * with every table corner on a grid point; cross-checked against scipy.linalg.expm to 1e-12 inside
 * the script), produced by test/golden/make_table_golden.py from state-space models written by
 * hand from Kirchhoff's laws. Tolerance: 1e-9 relative to the signal's peak.
 */
import { describe, expect, it } from 'vitest';
import { compareGolden, loadGolden, runFile } from './helpers.js';

describe('tables: scipy.signal.lsim golden data', () => {
  for (const name of ['table-rc-ladder', 'table-scope-current']) {
    it(`${name}: every sample within 1e-9 of the peak`, async () => {
      const g = loadGolden(name);
      const r = await runFile(g.rdn, { span: g.span, samples: g.samples });
      expect(r.times.length).toBe(g.samples);
      compareGolden(r, g);
    });
  }
});
