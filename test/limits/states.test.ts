import { describe, expect, it } from 'vitest';
import { MAX_STATES } from '../../src/circuit/limits.js';
import { InputError } from '../../src/diagnostics.js';
import { analyzeText } from '../../src/pipeline.js';

// The state limit is ours (src/circuit/limits.ts); the state count of an RC ladder is one per
// capacitor (no capacitor loops, Kirchhoff's laws, from memory).
function ladder(n: number): string {
  const lines = ['voltage-source V1 in -> gnd step to 1V'];
  let prev = 'in';
  for (let i = 1; i <= n; i++) {
    lines.push(`resistor R${i} ${prev} -> n${i} 1k`, `capacitor C${i} n${i} -> gnd 1nF`);
    prev = `n${i}`;
  }
  lines.push(`watch node n${n}`, 'samples 11', 'span 1us');
  return lines.join('\n') + '\n';
}

describe('state limit', () => {
  it(`a ${MAX_STATES + 1}-state ladder is refused with an input error naming the count`, () => {
    let err: unknown;
    try {
      analyzeText(ladder(MAX_STATES + 1), 'big.rdn');
    } catch (e) {
      err = e;
    }
    expect(err).toBeInstanceOf(InputError);
    expect((err as InputError).diagnostics[0].message).toContain(`${MAX_STATES + 1} states`);
  });
});
