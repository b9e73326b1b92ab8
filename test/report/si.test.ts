// Prefix symbols and powers of ten: the SI prefixes (BIPM SI brochure, from memory).
import { describe, expect, it } from 'vitest';
import { formatPlain, formatSI, formatSIExact } from '../../src/report/si.js';

describe('formatSI', () => {
  it('picks the prefix and keeps significant digits', () => {
    expect(formatSI(3.628e-4, 's')).toBe('362.8 µs');
    expect(formatSI(4700, 'Ω', { digits: 3 })).toBe('4.70 kΩ');
    expect(formatSI(1e-3, 's', { digits: 3 })).toBe('1.00 ms');
    expect(formatSI(12, 'V', { digits: 3, trim: true })).toBe('12 V');
    expect(formatSI(-5, 'V')).toBe('-5.000 V');
    expect(formatSI(2.2e-9, 'F')).toBe('2.200 nF');
    expect(formatSI(1.5e6, 'Hz')).toBe('1.500 MHz');
  });

  it('carries rounding into the next prefix', () => {
    expect(formatSI(999.96, 'V')).toBe('1.000 kV');
    expect(formatSI(0.00099996, 'A')).toBe('1.000 mA');
    expect(formatSI(999.4, 'V')).toBe('999.4 V');
    expect(formatSI(9.9996, 'V')).toBe('10.00 V');
  });

  it('handles zero, non-finite values and the range ends', () => {
    expect(formatSI(0, 'V')).toBe('0 V');
    expect(formatSI(Infinity, 's')).toBe('∞ s');
    expect(formatSI(NaN, 's')).toBe('n/a');
    expect(formatSI(1.234e-18, 'V')).toBe('1.234e-18 V');
    expect(formatSI(2.5e13, 'Hz')).toBe('25.00 THz');
    expect(formatSI(2.5e16, 'Hz', { trim: true })).toBe('2.5e+16 Hz');
    expect(formatSI(1500, '')).toBe('1.500 k');
  });
});

describe('formatSIExact', () => {
  it('writes user values in their shortest exact form', () => {
    expect(formatSIExact(4700, 'Ω')).toBe('4.7 kΩ');
    expect(formatSIExact(4.7e-7, 'F')).toBe('470 nF');
    expect(formatSIExact(12, 'V')).toBe('12 V');
    expect(formatSIExact(1.2345678e-3, 'H')).toBe('1.2345678 mH');
    expect(formatSIExact(-0.5, 'A')).toBe('-500 mA');
  });
});

describe('formatPlain', () => {
  it('prints dimensionless numbers', () => {
    expect(formatPlain(0.70710678)).toBe('0.7071');
    expect(formatPlain(12)).toBe('12');
    expect(formatPlain(24469.7)).toBe('24470');
    expect(formatPlain(1.5e-7)).toBe('1.5e-7');
    expect(formatPlain(Infinity)).toBe('∞');
  });
});
