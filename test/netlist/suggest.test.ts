import { describe, expect, it } from 'vitest';
import { closest, editDistance } from '../../src/netlist/suggest.js';
import { errors, lines, RC } from './helpers.js';

const hintFor = (...extra: string[]) => errors(lines(...RC, ...extra))[0]!.hint;

describe('did-you-mean', () => {
  it('measures edits, counting a swap of neighbours as one', () => {
    expect(editDistance('capacitor', 'capacitor')).toBe(0);
    expect(editDistance('capactior', 'capacitor')).toBe(1);
    expect(editDistance('resitor', 'resistor')).toBe(1);
    expect(editDistance('', 'abc')).toBe(3);
  });

  it('suggests only reasonably close names', () => {
    expect(closest('Watch', ['watch', 'span'])).toBe('watch');
    expect(closest('xyz', ['watch', 'span'])).toBeUndefined();
  });

  it('covers statement keywords', () => {
    expect(hintFor('indcutor L1 out -> gnd 1m')).toBe("did you mean 'inductor'?");
    expect(hintFor('voltage-sorce V2 out -> gnd 1V')).toBe("did you mean 'voltage-source'?");
    expect(hintFor('samlpes 10')).toBe("did you mean 'samples'?");
  });

  it('covers waveform keywords', () => {
    expect(hintFor('voltage-source V2 out -> gnd setp to 1V')).toBe("did you mean 'step'?");
    expect(hintFor('voltage-source V2 out -> gnd impluse 1mVs')).toBe("did you mean 'impulse'?");
    expect(hintFor('voltage-source V2 out -> gnd step to 1V rsie 1ms')).toBe("did you mean 'rise'?");
    expect(hintFor('capacitor C2 out -> gnd 1u intial 1V')).toBe("did you mean 'initial'?");
  });

  it('covers designators and node names in watches', () => {
    expect(hintFor('watch current C2')).toBe("did you mean 'C1'?");
    expect(hintFor('watch node otu')).toBe("did you mean 'out'?");
    expect(hintFor('watch between out and gdn')).toBe("did you mean 'gnd'?");
    expect(hintFor('watch voltag C1')).toBe("did you mean 'voltage'?");
  });

  it('covers parameter names, preferring the user\'s own over built-ins', () => {
    expect(errors(lines('param Rload = 1k', ...RC, 'resistor R2 out -> gnd Rlaod'))[0]!.hint).toBe("did you mean 'Rload'?");
    expect(errors(lines('param lg = 1k', ...RC, 'resistor R2 out -> gnd (lgo)'))[0]!.hint).toBe("did you mean 'lg'?");
    expect(hintFor('resistor R2 out -> gnd (sqr(4))')).toBe("did you mean 'sqrt'?");
  });
});
