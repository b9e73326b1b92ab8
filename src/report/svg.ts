import { scaleLinear } from 'd3-scale';
import { line } from 'd3-shape';
import { bandHalfWidth } from '../measure/settling.js';
import type { RunResult, Trace } from '../simulate/result.js';
import { formatSI } from './si.js';

/**
 * A standalone SVG figure of a run: one panel per unit (volts, amperes) sharing the time axis,
 * every watched signal as a line, SI-prefixed ticks, a light grid, a legend, and the measurements
 * drawn where they happen: the peak (with its value and the overshoot), the settling band as a
 * shaded strip and the settling time as a dashed line.
 */
export interface SVGOptions {
  width?: number;
  height?: number;
  title?: string;
}

/** Our palette: deep, distinguishable line colours on a white ground. */
const PALETTE = ['#1f5f8b', '#c2452d', '#3a7d44', '#8a5a9e', '#b8860b', '#2a8f8f', '#7a7a2a', '#a33b6b'];
const FONT = 'system-ui, -apple-system, "Segoe UI", Roboto, "Helvetica Neue", Arial, sans-serif';
const INK = '#22262a';
const MUTED = '#6b7178';
const GRID = '#e4e7ea';

const UNIT_NAMES: Record<Trace['unit'], string> = { V: 'voltage', A: 'current' };

export function escapeXML(s: string): string {
  return s.replace(/&/g, '&amp;').replace(/</g, '&lt;').replace(/>/g, '&gt;').replace(/"/g, '&quot;').replace(/'/g, '&apos;');
}

/** A number for an attribute: at most 2 decimals, no exponent. */
function n(x: number): string {
  const r = Math.round(x * 100) / 100;
  return Object.is(r, -0) ? '0' : String(r);
}

/** Tick label: SI prefix, up to 3 significant digits, trailing zeros dropped ("200 µs", "-1.5 V"). */
export function tickLabel(value: number, unit: string, step: number): string {
  if (Math.abs(value) < Math.abs(step) * 1e-9) return `0 ${unit}`;
  return formatSI(value, unit, { digits: 3, trim: true });
}

/** Approximate width of one character of the 11 px annotation font. */
const CHAR_W = 6.2;

/** A text's box: x, baseline y, width, height (above the baseline). */
interface Box {
  x: number;
  y: number;
  w: number;
  h: number;
}

function overlaps(a: Box, b: Box): boolean {
  return a.x < b.x + b.w && b.x < a.x + a.w && a.y - a.h < b.y && b.y - b.h < a.y;
}

/** Text cut to fit `width` pixels at about `charW` per character, with an ellipsis when cut. */
export function fitText(text: string, width: number, charW: number): string {
  const max = Math.max(4, Math.floor(width / charW));
  const chars = [...text];
  return chars.length <= max ? text : chars.slice(0, max - 1).join('').trimEnd() + '…';
}

export function renderSVG(result: RunResult, opts: SVGOptions = {}): string {
  const width = Math.max(320, opts.width ?? 860);
  const units = (['V', 'A'] as const).filter((u) => result.traces.some((t) => t.unit === u));
  const panelCount = Math.max(1, units.length);
  const height = Math.max(200, opts.height ?? 110 + panelCount * 280);
  const title = opts.title ?? result.circuit.title ?? result.circuit.file;

  const margin = { top: title ? 56 : 24, right: 28, bottom: 56, left: 84 };
  const gap = 44;
  const plotW = width - margin.left - margin.right;
  const panelH = (height - margin.top - margin.bottom - gap * (panelCount - 1)) / panelCount;

  const times = result.times;
  const t0 = times.length ? times[0]! : 0;
  const t1 = times.length ? times[times.length - 1]! : result.span;
  const x = scaleLinear().domain([t0, t1 > t0 ? t1 : t0 + 1]).range([0, plotW]);
  const xTicks = x.ticks(8);
  const xStep = xTicks.length > 1 ? xTicks[1]! - xTicks[0]! : 1;

  const out: string[] = [];
  out.push(
    `<svg xmlns="http://www.w3.org/2000/svg" width="${n(width)}" height="${n(height)}" viewBox="0 0 ${n(width)} ${n(height)}" font-family='${FONT}' font-size="12" role="img">`,
  );
  out.push(`<title>${escapeXML(title || 'ringdown response')}</title>`);
  out.push(`<rect class="background" x="0" y="0" width="${n(width)}" height="${n(height)}" fill="#ffffff"/>`);
  if (title) out.push(`<text class="figure-title" x="${n(margin.left)}" y="30" font-size="16" font-weight="600" fill="${INK}">${escapeXML(fitText(title, width - margin.left - margin.right, 9.2))}</text>`);

  let colourIndex = 0;
  units.forEach((unit, p) => {
    const traces = result.traces.filter((t) => t.unit === unit);
    const top = margin.top + p * (panelH + gap);
    const clipId = `plot-clip-${p}`;

    // y range: every sample, the located extrema, and the settling bands
    let lo = Infinity;
    let hi = -Infinity;
    const take = (v: number) => {
      if (Number.isFinite(v)) {
        lo = Math.min(lo, v);
        hi = Math.max(hi, v);
      }
    };
    for (const t of traces) {
      for (const v of t.values) take(v);
      take(t.metrics.peak?.value ?? NaN);
      take(t.metrics.valley?.value ?? NaN);
    }
    if (!(hi >= lo)) {
      lo = -1;
      hi = 1;
    }
    if (hi === lo) {
      const d = Math.abs(hi) * 0.1 || 1;
      lo -= d;
      hi += d;
    }
    const pad = (hi - lo) * 0.06;
    const y = scaleLinear().domain([lo - pad, hi + pad]).range([panelH, 0]).nice(6);
    const yTicks = y.ticks(6);
    const yStep = yTicks.length > 1 ? yTicks[1]! - yTicks[0]! : 1;

    out.push(`<g class="panel" data-unit="${unit}" transform="translate(${n(margin.left)},${n(top)})">`);
    out.push(`<defs><clipPath id="${clipId}"><rect x="0" y="0" width="${n(plotW)}" height="${n(panelH)}"/></clipPath></defs>`);
    out.push(`<rect class="plot-area" x="0" y="0" width="${n(plotW)}" height="${n(panelH)}" fill="#fbfcfd" stroke="none"/>`);

    // grid
    out.push(`<g class="grid" stroke="${GRID}" stroke-width="1">`);
    for (const v of xTicks) out.push(`<line x1="${n(x(v))}" y1="0" x2="${n(x(v))}" y2="${n(panelH)}"/>`);
    for (const v of yTicks) out.push(`<line x1="0" y1="${n(y(v))}" x2="${n(plotW)}" y2="${n(y(v))}"/>`);
    out.push('</g>');

    // settling bands (under the traces)
    const colours = traces.map(() => PALETTE[colourIndex++ % PALETTE.length]!);
    out.push(`<g class="annotations-under" clip-path="url(#${clipId})">`);
    traces.forEach((t, i) => {
      const m = t.metrics;
      const half = Number.isFinite(m.final) && Number.isFinite(m.initial) ? bandHalfWidth(result.circuit.analysis.settle, m.initial, m.final) : null;
      // a band the signal never leaves (settled at the start) says nothing: not drawn
      if (half === null || m.settlingTime === null || !Number.isFinite(m.settlingTime) || !(m.settlingTime > t0)) return;
      const yTop = y(m.final + half);
      const yBot = y(m.final - half);
      out.push(
        `<rect class="settling-band" data-trace="${escapeXML(t.label)}" x="0" y="${n(Math.min(yTop, yBot))}" width="${n(plotW)}" height="${n(Math.max(1, Math.abs(yBot - yTop)))}" fill="${colours[i]}" fill-opacity="0.10"/>`,
      );
    });
    out.push('</g>');

    // traces
    const draw = line<[number, number]>()
      .defined((d) => Number.isFinite(d[1]))
      .x((d) => x(d[0]))
      .y((d) => y(d[1]))
      .digits(2);
    out.push(`<g class="traces" clip-path="url(#${clipId})" fill="none" stroke-width="1.8" stroke-linejoin="round" stroke-linecap="round">`);
    traces.forEach((t, i) => {
      const pts: [number, number][] = [];
      for (let k = 0; k < times.length; k++) pts.push([times[k]!, t.values[k]!]);
      // the located extrema lie between samples: draw through them
      for (const e of [t.metrics.peak, t.metrics.valley]) if (e && Number.isFinite(e.value) && Number.isFinite(e.time)) pts.push([e.time, e.value]);
      pts.sort((a, b) => a[0] - b[0]);
      out.push(`<path class="trace" data-trace="${escapeXML(t.label)}" stroke="${colours[i]}" d="${draw(pts) ?? ''}"/>`);
    });
    out.push('</g>');

    // measurements over the traces
    out.push(`<g class="annotations" font-size="11">`);
    const placed: Box[] = [];
    traces.forEach((t, i) => {
      const m = t.metrics;
      const col = colours[i]!;
      if (m.settlingTime !== null && Number.isFinite(m.settlingTime) && m.settlingTime > t0 && m.settlingTime <= t1) {
        const sx = x(m.settlingTime);
        out.push(`<line class="settling-time" data-trace="${escapeXML(t.label)}" x1="${n(sx)}" y1="0" x2="${n(sx)}" y2="${n(panelH)}" stroke="${col}" stroke-width="1.2" stroke-dasharray="6 4"/>`);
        const right = sx < plotW - 130;
        out.push(
          `<text class="settling-label" x="${n(sx + (right ? 5 : -5))}" y="${n(panelH - 8 - 14 * i)}" text-anchor="${right ? 'start' : 'end'}" fill="${col}">settled ${escapeXML(formatSI(m.settlingTime, 's', { digits: 4 }))}</text>`,
        );
      }
      const pk = m.peak;
      if (pk && Number.isFinite(pk.value) && Number.isFinite(pk.time)) {
        const px = x(pk.time);
        const py = y(pk.value);
        out.push(`<circle class="peak-marker" data-trace="${escapeXML(t.label)}" cx="${n(px)}" cy="${n(py)}" r="3.5" fill="#ffffff" stroke="${col}" stroke-width="1.8"/>`);
        let text = `peak ${formatSI(pk.value, t.unit, { digits: 4 })}`;
        // an overshoot relative to a transition far smaller than the swing itself (a current pulse
        // that starts and ends near zero) is not a useful figure on a plot
        const swing = Math.max(Math.abs(pk.value), Math.abs(m.valley?.value ?? 0));
        const transition = Math.abs(m.final - m.initial);
        if (m.overshootPct !== null && Number.isFinite(m.overshootPct) && m.overshootPct > 0 && transition >= 0.01 * swing) text += `, overshoot ${m.overshootPct.toFixed(1)} %`;
        const right = px < plotW - 190;
        const above = py > 18;
        const w = text.length * CHAR_W;
        const box: Box = { x: right ? px + 7 : px - 7 - w, y: above ? py - 7 : py + 15, w, h: 13 };
        // move a label that would cover an earlier one (two traces peaking at nearly the same point)
        for (let tries = 0; tries < 8 && placed.some((b) => overlaps(b, box)); tries++) box.y += above ? -14 : 14;
        placed.push(box);
        out.push(
          `<text class="peak-label" x="${n(right ? box.x : box.x + w)}" y="${n(box.y)}" text-anchor="${right ? 'start' : 'end'}" fill="${col}">${escapeXML(text)}</text>`,
        );
      }
    });
    out.push('</g>');

    // axes
    out.push(`<g class="axis axis-y" fill="${MUTED}" font-size="11">`);
    out.push(`<line x1="0" y1="0" x2="0" y2="${n(panelH)}" stroke="${MUTED}"/>`);
    for (const v of yTicks) {
      out.push(`<line x1="-5" y1="${n(y(v))}" x2="0" y2="${n(y(v))}" stroke="${MUTED}"/>`);
      out.push(`<text class="tick-label" x="-8" y="${n(y(v))}" dy="0.32em" text-anchor="end">${escapeXML(tickLabel(v, unit, yStep))}</text>`);
    }
    out.push(
      `<text class="axis-title" transform="translate(${n(-margin.left + 16)},${n(panelH / 2)}) rotate(-90)" text-anchor="middle" fill="${INK}" font-size="12">${UNIT_NAMES[unit]} (${unit})</text>`,
    );
    out.push('</g>');
    out.push(`<g class="axis axis-x" fill="${MUTED}" font-size="11" transform="translate(0,${n(panelH)})">`);
    out.push(`<line x1="0" y1="0" x2="${n(plotW)}" y2="0" stroke="${MUTED}"/>`);
    for (const v of xTicks) {
      out.push(`<line x1="${n(x(v))}" y1="0" x2="${n(x(v))}" y2="5" stroke="${MUTED}"/>`);
      out.push(`<text class="tick-label" x="${n(x(v))}" y="18" text-anchor="middle">${escapeXML(tickLabel(v, 's', xStep))}</text>`);
    }
    if (p === units.length - 1) out.push(`<text class="axis-title" x="${n(plotW / 2)}" y="40" text-anchor="middle" fill="${INK}" font-size="12">time (s)</text>`);
    out.push('</g>');

    // legend: top right, on a white card
    const rowH = 16;
    const legendW = Math.min(plotW * 0.6, 24 + 7 * Math.max(...traces.map((t) => t.label.length)));
    out.push(`<g class="legend" transform="translate(${n(plotW - legendW - 8)},8)">`);
    out.push(`<rect x="0" y="0" width="${n(legendW)}" height="${n(8 + rowH * traces.length)}" rx="3" fill="#ffffff" fill-opacity="0.9" stroke="${GRID}"/>`);
    traces.forEach((t, i) => {
      const yy = 4 + rowH * i + rowH / 2;
      out.push(`<line x1="8" y1="${n(yy)}" x2="22" y2="${n(yy)}" stroke="${colours[i]}" stroke-width="2.4"/>`);
      out.push(`<text class="legend-label" x="28" y="${n(yy)}" dy="0.32em" fill="${INK}" font-size="11">${escapeXML(t.label)}</text>`);
    });
    out.push('</g>');
    out.push('</g>');
  });

  if (units.length === 0) {
    out.push(`<text x="${n(width / 2)}" y="${n(height / 2)}" text-anchor="middle" fill="${MUTED}">no watched signals</text>`);
  }
  out.push('</svg>');
  return out.join('\n') + '\n';
}
