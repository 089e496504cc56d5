// Units are parsed here, once, at the edge of the program; everything past this module is SI
// (metres, radians).
import { safeEcho } from '../safe-text.js';

const LENGTH_UNITS: Record<string, number> = {
  pm: 1e-12,
  nm: 1e-9,
  um: 1e-6,
  'µm': 1e-6, // U+00B5 MICRO SIGN
  'μm': 1e-6, // U+03BC GREEK SMALL LETTER MU, which keyboards also produce
  micron: 1e-6,
  microns: 1e-6,
  mm: 1e-3,
  cm: 1e-2,
  m: 1,
};

const ANGLE_UNITS: Record<string, number> = {
  rad: 1,
  mrad: 1e-3,
  urad: 1e-6,
  'µrad': 1e-6,
  'μrad': 1e-6,
  deg: Math.PI / 180,
  '°': Math.PI / 180,
  arcmin: Math.PI / 180 / 60,
  arcsec: Math.PI / 180 / 3600,
};

const WORD_UNITS = new Set(['micron', 'microns', 'rad', 'deg', 'arcmin', 'arcsec']);

const QUANTITY = /^\s*([+-]?(?:\d+\.?\d*|\.\d+)(?:[eE][+-]?\d+)?)\s*([^\s\d.+-][^\s]*)?\s*$/;

export type UnitKind = 'length' | 'angle';

/**
 * Longest text read as a quantity. The longest sensible one ('-1.23456789012345e-10 microns') is
 * under 40 characters; the cap keeps the pattern match linear and the echo short.
 */
export const MAX_QUANTITY_TEXT = 64;

export interface ParsedQuantity {
  ok: true;
  value: number;
}
export interface QuantityError {
  ok: false;
  reason: string;
}

/** Parses a number (already SI) or a string with a unit into SI. */
export function parseQuantity(input: unknown, kind: UnitKind): ParsedQuantity | QuantityError {
  const table = kind === 'length' ? LENGTH_UNITS : ANGLE_UNITS;
  if (typeof input === 'number') {
    if (!Number.isFinite(input)) return { ok: false, reason: 'not a finite number' };
    return { ok: true, value: input };
  }
  if (typeof input !== 'string') {
    const what =
      input === null || input === undefined
        ? 'an empty value'
        : Array.isArray(input)
          ? 'a list'
          : typeof input === 'object'
            ? 'a mapping'
            : `a ${typeof input}`;
    return { ok: false, reason: `${what} is not ${kind === 'angle' ? 'an angle' : 'a length'}` };
  }
  if (input.length > MAX_QUANTITY_TEXT) {
    return { ok: false, reason: `${input.length} characters is too long for a number with a unit` };
  }
  const m = QUANTITY.exec(input);
  if (!m) return { ok: false, reason: `cannot read '${safeEcho(input)}' as a number with a unit` };
  const num = Number(m[1]);
  const unit = m[2];
  if (unit === undefined) {
    // A bare number in a string is taken as SI, like a bare number.
    if (!Number.isFinite(num)) return { ok: false, reason: `'${safeEcho(input)}' is too large a number` };
    return { ok: true, value: num };
  }
  // Unit symbols are case-sensitive, as SI has them ('Mm' is not 'mm'); only the unit words
  // (micron, deg, arcmin, ...) may be written in any case.
  const lower = unit.toLowerCase();
  const factor = table[unit] ?? (WORD_UNITS.has(lower) ? table[lower] : undefined);
  if (factor === undefined) {
    const known = Object.keys(table).filter((u) => !u.includes('μ')).join(', ');
    const hint = table[lower] !== undefined ? `; unit symbols are case-sensitive: did you mean '${lower}'?` : '';
    return { ok: false, reason: `unknown ${kind} unit '${safeEcho(unit)}' (known: ${known})${hint}` };
  }
  const value = num * factor;
  if (!Number.isFinite(value)) return { ok: false, reason: `'${safeEcho(input)}' is too large a number` };
  return { ok: true, value };
}

/**
 * A number given without a unit (42, or '42' in quotes): read as SI (metres, radians), which
 * the loader warns about, since 'wavelength: 633' meant nanometres.
 */
export function isBareNumber(input: unknown): boolean {
  if (typeof input === 'number') return true;
  if (typeof input !== 'string' || input.length > MAX_QUANTITY_TEXT) return false;
  const m = QUANTITY.exec(input);
  return m !== null && m[2] === undefined;
}

/** Formats a length for people: 6.33e-7 -> "633 nm". */
export function formatLength(metres: number, digits = 4): string {
  if (!Number.isFinite(metres)) return String(metres);
  // A hair of tolerance, so that 1 mm computed as 0.9999999999e-3 still reads "1 mm".
  const a = Math.abs(metres) * (1 + 1e-9);
  const [unit, f] =
    a === 0 ? ['m', 1] : a < 1e-6 ? ['nm', 1e-9] : a < 1e-3 ? ['µm', 1e-6] : a < 1 ? ['mm', 1e-3] : ['m', 1];
  return `${trimNumber(metres / f, digits)} ${unit}`;
}

/** Formats an angle in degrees with a milliradian value beside it when it is small. */
export function formatAngle(rad: number): string {
  const deg = (rad * 180) / Math.PI;
  if (Math.abs(rad) < 0.1 && rad !== 0) return `${trimNumber(rad * 1e3, 4)} mrad`;
  return `${trimNumber(deg, 4)}°`;
}

/** Compact, file-name-safe length token: 6.33e-7 -> "633nm", 0.0125 -> "12.5mm", 2e7 -> "2e7m". */
export function lengthToken(metres: number): string {
  return formatLength(metres, 4).replace(' ', '').replace('µ', 'u').replace('e+', 'e');
}

export function trimNumber(x: number, digits: number): string {
  if (x === 0) return '0';
  const s = Number(x.toPrecision(digits));
  const abs = Math.abs(s);
  if (abs >= 1e6 || abs < 1e-4) return s.toExponential(Math.max(0, digits - 1)).replace(/\.?0+e/, 'e');
  return String(s);
}
