/**
 * Quantity literals: a number with an optional SI prefix and unit attached (`470uF`, `-5V`, `2%`),
 * or an IEC 60062 value code where the prefix letter (or R for ohms) stands in for the decimal
 * point (`4k7`, `2R2`, `R47`, `1M5`).
 */

/** Canonical unit symbols after normalizing spellings (ohm → Ω, V*s → Vs, ...). */
export type Unit = 'Ω' | 'F' | 'H' | 'V' | 'A' | 's' | 'Hz' | 'Vs' | 'As' | 'V/s' | 'A/s' | 'deg' | 'rad' | '%' | 'W' | 'J';

export interface Quantity {
  /** SI value (2% is 0.02; angles in radians, so 90deg is π/2). */
  value: number;
  unit: Unit | null;
}

/**
 * Prefix letters as powers of ten; case-sensitive (m is milli, M is mega). Both micro signs and
 * `u` are micro. Scaling is done by shifting the decimal exponent in the text, so 470n gives
 * exactly the double nearest 4.7e-7 rather than 470 × 1e-9 with its rounding error.
 */
const PREFIXES: Record<string, number> = {
  f: -15,
  p: -12,
  n: -9,
  u: -6,
  'µ': -6, // U+00B5 MICRO SIGN
  '\u03bc': -6, // U+03BC GREEK SMALL LETTER MU, which keyboards often produce instead
  m: -3,
  k: 3,
  M: 6,
  G: 9,
  T: 12,
};

const UNIT_SPELLINGS: Record<string, Unit> = {
  'Ω': 'Ω', // U+03A9 GREEK CAPITAL OMEGA
  '\u2126': 'Ω', // OHM SIGN, a distinct code point that renders the same
  ohm: 'Ω',
  F: 'F',
  H: 'H',
  V: 'V',
  A: 'A',
  s: 's',
  Hz: 'Hz',
  Vs: 'Vs',
  'V*s': 'Vs',
  'V·s': 'Vs',
  As: 'As',
  'A*s': 'As',
  'A·s': 'As',
  'V/s': 'V/s',
  'A/s': 'A/s',
  W: 'W',
  J: 'J',
  deg: 'deg',
  rad: 'rad',
  '%': '%',
};

export const PREFIX_LETTERS = Object.keys(PREFIXES);

const DECIMAL = /^(?:\d+(?:\.\d*)?|\.\d+)(?:[eE][+-]?\d+)?/;
/** IEC 60062 code: digits, a multiplier letter in place of the decimal point, digits. */
const IEC_CODE = /^(\d*)([fpnu\u00b5\u03bcmkMGTR])(\d+)/;

/** Splits a unit suffix into prefix multiplier and unit; undefined if not recognized. */
function readSuffix(suffix: string): { shift: number; unit: Unit | null } | undefined {
  if (suffix === '') return { shift: 0, unit: null };
  const whole = UNIT_SPELLINGS[suffix];
  if (whole) return { shift: whole === '%' ? -2 : 0, unit: whole };
  const prefix = [...suffix][0]!;
  const shift = PREFIXES[prefix];
  if (shift === undefined) return undefined;
  const rest = suffix.slice(prefix.length);
  if (rest === '') return { shift, unit: null };
  const unit = UNIT_SPELLINGS[rest];
  if (!unit || unit === '%') return undefined;
  return { shift, unit };
}

/**
 * Parses a literal. Returns an explanation string instead of a Quantity when the text is not a
 * valid literal, so the caller can place the diagnostic.
 */
export function parseQuantity(text: string): Quantity | string {
  let body = text;
  let sign = 1;
  if (body.startsWith('-')) {
    sign = -1;
    body = body.slice(1);
  } else if (body.startsWith('+')) {
    body = body.slice(1);
  }

  const iec = IEC_CODE.exec(body);
  if (iec && (iec[1] !== '' || iec[2] === 'R')) {
    const [whole, intPart, letter, fracPart] = iec as unknown as [string, string, string, string];
    const scale = letter === 'R' ? 0 : PREFIXES[letter]!;
    const rest = body.slice(whole.length);
    // R already says "ohms"; other codes may carry a unit but no second prefix.
    let unit: Unit | null = letter === 'R' ? 'Ω' : null;
    if (rest !== '') {
      const u = UNIT_SPELLINGS[rest];
      if (!u || u === '%' || (letter === 'R' && u !== 'Ω')) return badSuffix(text, rest);
      unit = u;
    }
    return { value: toRadians(sign * scaled(`${intPart || '0'}.${fracPart}`, scale), unit), unit };
  }

  const num = DECIMAL.exec(body);
  if (!num) return `'${text}' is not a number`;
  const suffix = body.slice(num[0].length);
  const read = readSuffix(suffix);
  if (!read) return badSuffix(text, suffix);
  const value = toRadians(sign * scaled(num[0], read.shift), read.unit);
  if (!Number.isFinite(value)) return `'${text}' is too large`;
  return { value, unit: read.unit };
}

/** Angles are kept in radians whatever they were written in; the unit records the spelling. */
function toRadians(value: number, unit: Unit | null): number {
  return unit === 'deg' ? (value * Math.PI) / 180 : value;
}

/** `digits` × 10^shift, rounded once from the decimal text. */
function scaled(digits: string, shift: number): number {
  const [mantissa, exponent] = digits.split(/[eE]/) as [string, string?];
  return Number(`${mantissa}e${Number(exponent ?? 0) + shift}`);
}

function badSuffix(text: string, suffix: string): string {
  return `'${text}' has an unknown prefix or unit '${suffix}'`;
}

/** Words that look like IEC resistor codes (`R47`) are literals unless a parameter has that name. */
export function looksLikeResistorCode(word: string): boolean {
  return /^R\d+$/.test(word);
}

/** Spelled-out names for messages. */
export const UNIT_NAMES: Record<Unit, string> = {
  'Ω': 'ohms (Ω)',
  F: 'farads (F)',
  H: 'henries (H)',
  V: 'volts (V)',
  A: 'amperes (A)',
  s: 'seconds (s)',
  Hz: 'hertz (Hz)',
  Vs: 'volt-seconds (Vs)',
  As: 'ampere-seconds (As)',
  'V/s': 'volts per second (V/s)',
  'A/s': 'amperes per second (A/s)',
  deg: 'degrees (deg)',
  rad: 'radians (rad)',
  '%': 'percent (%)',
  W: 'watts (W)',
  J: 'joules (J)',
};
