/**
 * The progress line of `ringdown run` on a terminal: on standard error, one line rewritten at each
 * stage and erased before the exit; nothing when standard error is not a terminal (a pipe, a file,
 * a CI log). The expectations are this project's own interface (common practice for terminal tools).
 */
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { main } from '../../src/cli/main.js';
import { capture } from '../helpers/capture.js';

let file = '';
let dir = '';
beforeAll(() => {
  dir = mkdtempSync(join(tmpdir(), 'ringdown-progress-'));
  file = join(dir, 'rc.rdn');
  writeFileSync(file, 'voltage-source V1 in -> gnd step to 5V\nresistor R1 in -> out 2k2\ncapacitor C1 out -> gnd 470nF\nwatch node out\nsamples 301\n');
});
afterAll(() => rmSync(dir, { recursive: true, force: true }));

describe('progress line', () => {
  it('on a terminal: the stages, each over the last, then erased', async () => {
    const io = capture();
    io.stderr.isTTY = true;
    const code = await main(['node', 'ringdown', 'run', file, '--no-chart'], io);
    expect(code).toBe(0);
    const err = io.err();
    expect(err).toContain('ringdown: solving 1 state (modes, closed forms, 301 samples, cross-check)…');
    expect(err).toContain('ringdown: measuring 1 watched signal…');
    expect(err).toContain('ringdown: writing the report (stress of 3 parts)…');
    // every stage starts at the line's start and clears it; the last thing written erases the line
    expect(err.split('\r\x1b[K').filter((s) => s.length > 0).every((s) => s.startsWith('ringdown: '))).toBe(true);
    expect(err.endsWith('\r\x1b[K')).toBe(true);
    // the report itself is unchanged on standard output
    expect(io.out()).toContain('Cross-check: PASS');
  });

  it('not on a terminal: no progress at all', async () => {
    const io = capture();
    expect(await main(['node', 'ringdown', 'run', file, '--no-chart'], io)).toBe(0);
    expect(io.err()).toBe('');
  });
});
