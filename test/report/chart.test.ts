import { describe, expect, it } from 'vitest';
import { chartWidth, renderChart } from '../../src/report/chart.js';
import { stripAnsi } from '../../src/report/color.js';

const ring = (t: number) => 12 - 12 * Math.exp(-t / 2e-4) * Math.cos(2 * Math.PI * 5e3 * t);
const decay = (t: number) => -0.004 * Math.exp(-t / 5e-4);

describe('renderChart', () => {
  it('fits in 80 columns with one or several traces', () => {
    const one = renderChart([{ label: 'v(out)', sample: ring }], { start: 0, end: 2e-3, unit: 'V' });
    expect(chartWidth(one)).toBeLessThanOrEqual(80);
    const two = renderChart(
      [
        { label: 'v(out)', sample: ring },
        { label: 'v(mid)', sample: (t) => ring(t) / 2 },
      ],
      { start: 0, end: 2e-3, unit: 'V', color: true },
    );
    expect(chartWidth(two)).toBeLessThanOrEqual(80);
    expect(stripAnsi(two)).toContain('v(mid)');
  });

  it('labels the value axis and the time axis with SI prefixes', () => {
    const chart = renderChart([{ label: 'i(L1)', sample: decay }], { start: 0, end: 3e-3, unit: 'A' });
    expect(chart).toMatch(/mA/);
    expect(chart).toMatch(/\b1 ms\b/);
    expect(chart).toMatch(/0 s/);
    expect(chart).toContain('└');
    expect(chart).not.toMatch(/\x1b\[/);
    expect(chartWidth(chart)).toBeLessThanOrEqual(80);
  });

  it('draws a flat signal and honours a narrower width', () => {
    const flat = renderChart([{ label: 'v(a)', sample: () => 5 }], { start: 0, end: 1, unit: 'V', width: 60 });
    expect(chartWidth(flat)).toBeLessThanOrEqual(60);
    expect(flat).toContain('5.00 V');
  });
});

describe('narrow peaks', () => {
  it('shows a peak that falls between chart columns at its height', () => {
    // a 2 µs wide spike of 10 at t = 41 µs on a 2 ms axis (about 28 µs per column)
    const spike = (t: number) => 10 * Math.exp(-(((t - 41e-6) / 2e-6) ** 2));
    const chart = renderChart([{ label: 'i', sample: spike }], { start: 0, end: 2e-3, unit: 'A' });
    const top = chart.split('\n')[0]!;
    expect(top).toMatch(/^\s*(9\.\d\d|10\.0) A/);
    expect(top).toMatch(/[╭╮┼]/);
  });
});
