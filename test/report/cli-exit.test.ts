/** Exit codes 1 (internal error) and 3 (cross-check failed), with the solver replaced by stand-ins. */
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, beforeEach, describe, expect, it, vi } from 'vitest';
import type { RunResult } from '../../src/simulate/result.js';
import { rcResult } from './fixture.js';
import { capture } from '../helpers/capture.js';

const behaviour: { next: () => RunResult } = { next: () => rcResult() };
vi.mock('../../src/pipeline.js', () => ({
  analyzeText: () => behaviour.next(),
  analyzeCircuit: () => behaviour.next(),
}));

const { main } = await import('../../src/cli/main.js');

let file = '';
let dir = '';
beforeAll(() => {
  dir = mkdtempSync(join(tmpdir(), 'ringdown-exit-'));
  file = join(dir, 'x.rdn');
  writeFileSync(file, '# stand-in\n');
});
afterAll(() => rmSync(dir, { recursive: true, force: true }));
beforeEach(() => {
  behaviour.next = () => rcResult();
});

describe('exit codes', () => {
  it('3 when the cross-check fails: the report is still written, and the failure is loud', async () => {
    behaviour.next = () => {
      const r = rcResult();
      r.crossCheck = { ...r.crossCheck, maxRelError: 4e-4, passed: false };
      return r;
    };
    for (const format of ['text', 'csv', 'json']) {
      const c = capture();
      expect(await main(['node', 'ringdown', 'run', file, '--format', format], c)).toBe(3);
      expect(c.out().length).toBeGreaterThan(0);
      expect(c.err()).toContain('CROSS-CHECK FAILED');
    }
  });

  it('1 on an internal error: a short message, the stack only with --debug', async () => {
    behaviour.next = () => {
      throw new TypeError('something broke');
    };
    const quiet = capture();
    expect(await main(['node', 'ringdown', 'run', file], quiet)).toBe(1);
    expect(quiet.err()).toContain('internal error: something broke');
    expect(quiet.err()).not.toMatch(/^\s+at /m);

    const loud = capture();
    expect(await main(['node', 'ringdown', 'run', file, '--debug'], loud)).toBe(1);
    expect(loud.err()).toMatch(/^\s+at /m);
  });

  it('0 when all is well', async () => {
    const c = capture();
    expect(await main(['node', 'ringdown', 'run', file, '--no-chart'], c)).toBe(0);
    expect(c.out()).not.toContain('└');
  });
});
