/**
 * Numbers with SI prefixes for people: 362.8 µs, 4.7 kΩ, -12 V.
 *
 * Prefixes f … T (the same set the circuit language accepts). Values outside that range fall
 * back to exponent notation. Signs use the ASCII hyphen-minus so values can be pasted back into a
 * circuit file.
 */

const PREFIXES = ['f', 'p', 'n', 'µ', 'm', '', 'k', 'M', 'G', 'T'] as const;
const ZERO_INDEX = 5; // position of '' in PREFIXES

export interface SIOptions {
  /** Significant digits (default 4). */
  digits?: number;
  /** Drop trailing zeros after the decimal point (default false: 1.000 ms keeps its digits). */
  trim?: boolean;
}

interface Parts {
  mantissa: string;
  prefix: string;
  /** the value the text stands for */
  shown: number;
}

function parts(x: number, digits: number, trim: boolean): Parts {
  if (x === 0) return { mantissa: '0', prefix: '', shown: 0 };
  const ax = Math.abs(x);
  let e3 = Math.floor(Math.floor(Math.log10(ax)) / 3);
  for (let attempt = 0; attempt < 2; attempt++) {
    const idx = e3 + ZERO_INDEX;
    if (idx < 0 || idx >= PREFIXES.length) break;
    const m = x / 10 ** (3 * e3);
    const intDigits = Math.max(1, Math.floor(Math.log10(Math.abs(m))) + 1);
    let decimals = Math.max(0, digits - intDigits);
    let text = m.toFixed(decimals);
    if (decimals > 0 && Math.abs(Number(text)) >= 10 ** intDigits) text = m.toFixed(--decimals); // 9.9996 → 10.00
    if (Math.abs(Number(text)) >= 1000) {
      e3 += 1; // rounding carried into the next prefix (999.96 → 1.000 k)
      continue;
    }
    if (Math.abs(Number(text)) < 1 && e3 + ZERO_INDEX > 0 && Number(text) !== 0) {
      e3 -= 1; // log10 rounding put us one prefix too high
      continue;
    }
    if (trim && text.includes('.')) text = text.replace(/0+$/, '').replace(/\.$/, '');
    if (text === '-0') text = '0';
    return { mantissa: text, prefix: PREFIXES[idx]!, shown: Number(text) * 10 ** (3 * e3) };
  }
  // outside f … T
  let text = x.toExponential(Math.max(0, digits - 1));
  if (trim) text = text.replace(/\.?0+e/, 'e');
  return { mantissa: text, prefix: '', shown: Number(text) };
}

function join(p: Parts, unit: string): string {
  const u = p.prefix + unit;
  return u === '' ? p.mantissa : `${p.mantissa} ${u}`;
}

/** Formats `value` with an SI prefix and `unit`: formatSI(3.628e-4, 's') → "362.8 µs". */
export function formatSI(value: number, unit: string, options: SIOptions = {}): string {
  if (Number.isNaN(value)) return 'n/a';
  if (!Number.isFinite(value)) return `${value < 0 ? '-' : ''}∞${unit ? ` ${unit}` : ''}`;
  return join(parts(value, options.digits ?? 4, options.trim ?? false), unit);
}

/**
 * The shortest SI form that stands for `value` to 1e-9 relative (up to 9 digits): for values the
 * user wrote, such as part values: 4700 → "4.7 kΩ", 4.7e-7 → "470 nF".
 */
export function formatSIExact(value: number, unit: string): string {
  if (!Number.isFinite(value) || value === 0) return formatSI(value, unit);
  let p = parts(value, 9, true);
  for (let d = 1; d <= 9; d++) {
    const q = parts(value, d, true);
    if (Math.abs(q.shown - value) <= 1e-9 * Math.abs(value)) {
      p = q;
      break;
    }
  }
  return join(p, unit);
}

/** A plain number with `digits` significant digits, trailing zeros dropped (1.5, 0.0023, 1.2e-7). */
export function formatPlain(value: number, digits = 4): string {
  if (Number.isNaN(value)) return 'n/a';
  if (!Number.isFinite(value)) return value < 0 ? '-∞' : '∞';
  if (value === 0) return '0';
  const ax = Math.abs(value);
  if (ax >= 10 ** digits && ax < 1e9) return String(Math.round(value)); // 24470, not 2.447e+4
  if (ax >= 1e-3 && ax < 1e6) {
    const text = value.toPrecision(digits);
    return text.includes('e') ? text : text.includes('.') ? text.replace(/0+$/, '').replace(/\.$/, '') : text;
  }
  return value.toExponential(digits - 1).replace(/\.?0+e/, 'e');
}
