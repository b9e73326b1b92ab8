import { describe, expect, it } from 'vitest';
import { parseQuantity } from '../../src/netlist/quantity.js';

const q = (text: string) => parseQuantity(text);

describe('parseQuantity', () => {
  it('applies SI prefixes exactly (the double nearest the written decimal)', () => {
    expect(q('470nF')).toEqual({ value: 4.7e-7, unit: 'F' });
    expect(q('10us')).toEqual({ value: 1e-5, unit: 's' });
    expect(q('1.5mH')).toEqual({ value: 1.5e-3, unit: 'H' });
    expect(q('2.2kΩ')).toEqual({ value: 2200, unit: 'Ω' });
    expect(q('10ohm')).toEqual({ value: 10, unit: 'Ω' });
    expect(q('1e-3')).toEqual({ value: 1e-3, unit: null });
    expect(q('3.3e2pF')).toEqual({ value: 3.3e-10, unit: 'F' });
    expect(q('-5V')).toEqual({ value: -5, unit: 'V' });
    expect(q('1kHz')).toEqual({ value: 1000, unit: 'Hz' });
    expect(q('2fF')).toEqual({ value: 2e-15, unit: 'F' });
    expect(q('1GΩ')).toEqual({ value: 1e9, unit: 'Ω' });
    expect(q('1T')).toEqual({ value: 1e12, unit: null });
  });

  it('treats m as milli and M as mega', () => {
    expect(q('1m')).toEqual({ value: 1e-3, unit: null });
    expect(q('1M')).toEqual({ value: 1e6, unit: null });
  });

  it('accepts u, the micro sign and the Greek mu as micro', () => {
    for (const t of ['470uF', '470\u00b5F', '470\u03bcF']) expect(q(t)).toEqual({ value: 4.7e-4, unit: 'F' });
  });

  it('accepts the ohm sign as well as the Greek capital omega', () => {
    expect(q('1k\u2126')).toEqual({ value: 1000, unit: 'Ω' });
  });

  it('normalizes impulse-area spellings and percentages', () => {
    for (const t of ['2mVs', '2mV*s', '2mV·s']) expect(q(t)).toEqual({ value: 2e-3, unit: 'Vs' });
    for (const t of ['3uAs', '3uA*s', '3uA·s']) expect(q(t)).toEqual({ value: 3e-6, unit: 'As' });
    expect(q('2%')).toEqual({ value: 0.02, unit: '%' });
    expect(q('0.5%')).toEqual({ value: 0.005, unit: '%' });
  });

  it('reads rates, and angles into radians', () => {
    expect(q('2kV/s')).toEqual({ value: 2000, unit: 'V/s' });
    expect(q('5mA/s')).toEqual({ value: 5e-3, unit: 'A/s' });
    expect(q('90deg')).toEqual({ value: (90 * Math.PI) / 180, unit: 'deg' });
    expect(q('-45deg')).toEqual({ value: (-45 * Math.PI) / 180, unit: 'deg' });
    expect(q('1.5rad')).toEqual({ value: 1.5, unit: 'rad' });
    expect(q('20mrad')).toEqual({ value: 0.02, unit: 'rad' });
    expect(q('2V/ms')).toMatch(/unknown prefix or unit 'V\/ms'/);
  });

  // Value codes as defined by IEC 60062: the multiplier letter marks the decimal point.
  it('reads IEC 60062 value codes', () => {
    expect(q('4k7')).toEqual({ value: 4700, unit: null });
    expect(q('2R2')).toEqual({ value: 2.2, unit: 'Ω' });
    expect(q('R47')).toEqual({ value: 0.47, unit: 'Ω' });
    expect(q('4n7')).toEqual({ value: 4.7e-9, unit: null });
    expect(q('1M5')).toEqual({ value: 1.5e6, unit: null });
    expect(q('4u7F')).toEqual({ value: 4.7e-6, unit: 'F' });
    expect(q('1m5H')).toEqual({ value: 1.5e-3, unit: 'H' });
  });

  it('explains malformed literals instead of guessing', () => {
    expect(q('5x')).toMatch(/unknown prefix or unit 'x'/);
    expect(q('2kk')).toMatch(/unknown prefix or unit/);
    expect(q('5k%')).toMatch(/unknown prefix or unit/);
    expect(q('2R2F')).toMatch(/unknown prefix or unit 'F'/);
  });
});
