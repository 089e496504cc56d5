// Unit parsing at the edge of the program: strings with units -> SI numbers.
// Prefix factors and symbols: BIPM, The International System of Units (SI Brochure, 9th edition,
// 2019), table 7 (SI prefixes) and table 8 (degree = π/180 rad, minute, second of arc).
import { describe, expect, it } from 'vitest';
import { formatLength, lengthToken, parseQuantity } from '../../src/job/units.js';

/** Relative closeness: the parsed value is num × factor, one rounding away from the literal. */
function expectSi(input: unknown, kind: 'length' | 'angle', expected: number) {
  const r = parseQuantity(input, kind);
  expect(r, `parsing ${JSON.stringify(input)}`).toEqual({ ok: true, value: expect.any(Number) });
  if (!r.ok) return;
  // One multiplication of two correctly rounded doubles: at most a few ulp (IEEE 754), 1e-15 relative.
  expect(Math.abs(r.value - expected)).toBeLessThanOrEqual(Math.abs(expected) * 1e-15);
}

function expectError(input: unknown, kind: 'length' | 'angle', reason: RegExp) {
  const r = parseQuantity(input, kind);
  expect(r.ok, `parsing ${JSON.stringify(input)} should fail`).toBe(false);
  if (!r.ok) expect(r.reason).toMatch(reason);
}

describe('lengths (SI Brochure, table 7: nano 1e-9, micro 1e-6, milli 1e-3, centi 1e-2, pico 1e-12)', () => {
  it('reads the prefixed metre', () => {
    expectSi('633 nm', 'length', 633e-9);
    expectSi('50 um', 'length', 50e-6);
    expectSi('25 mm', 'length', 25e-3);
    expectSi('1.2 m', 'length', 1.2);
    expectSi('2.5 cm', 'length', 2.5e-2);
    expectSi('400 pm', 'length', 400e-12);
  });

  it('takes both micro characters: U+00B5 MICRO SIGN and U+03BC GREEK SMALL LETTER MU', () => {
    // Unicode: U+00B5 has the compatibility decomposition U+03BC (UnicodeData.txt), so both
    // are "micro" to a reader; keyboards produce either.
    expect('\u00b5'.normalize('NFKC')).toBe('\u03bc');
    expectSi('50 \u00b5m', 'length', 50e-6);
    expectSi('50 \u03bcm', 'length', 50e-6);
    expectSi('50 micron', 'length', 50e-6);
  });

  it('allows no space, signs, exponents and leading/trailing blanks', () => {
    expectSi('50um', 'length', 50e-6);
    expectSi('  50 um  ', 'length', 50e-6);
    expectSi('1e-3 m', 'length', 1e-3);
    expectSi('6.33E-7 m', 'length', 6.33e-7);
    expectSi('.5 mm', 'length', 0.5e-3);
    expectSi('+2 mm', 'length', 2e-3);
    // A sign is read (the schema, not the parser, decides whether negative is allowed).
    expectSi('-3 mm', 'length', -3e-3);
  });

  it('takes bare numbers, and numeric strings without a unit, as SI', () => {
    expect(parseQuantity(0.001, 'length')).toEqual({ ok: true, value: 0.001 });
    expect(parseQuantity(6.33e-7, 'length')).toEqual({ ok: true, value: 6.33e-7 });
    expect(parseQuantity('0.5', 'length')).toEqual({ ok: true, value: 0.5 });
    expect(parseQuantity(0.1, 'angle')).toEqual({ ok: true, value: 0.1 });
  });

  it('refuses unknown units and names the known ones', () => {
    expectError('50 furlongs', 'length', /unknown length unit 'furlongs' \(known: .*\bnm\b.*\bmm\b/);
    expectError('2 deg', 'length', /unknown length unit 'deg'/);
    expectError('50 in', 'length', /unknown length unit 'in'/);
  });

  it('treats unit symbols as case-sensitive (SI Brochure §3: "Mm" is megametre, not "mm")', () => {
    expectError('50 MM', 'length', /unknown length unit 'MM'.*did you mean 'mm'/);
    expectError('5 Mm', 'length', /unknown length unit 'Mm'/);
    expectError('633 NM', 'length', /did you mean 'nm'/);
    expectError('1 M', 'length', /did you mean 'm'/);
    // Unit words are not symbols: any case (common practice).
    expectSi('50 Microns', 'length', 50e-6);
    expectSi('2 DEG', 'angle', (2 * Math.PI) / 180);
  });

  it('refuses garbage and non-finite values with a reason', () => {
    for (const s of ['abc', 'nm', '', '   ', '1.5.3 mm', '50 um extra', 'Infinity', 'NaN', '--3 mm', '3 mm mm']) {
      expectError(s, 'length', /cannot read .* as a number with a unit/);
    }
    expectError(Number.POSITIVE_INFINITY, 'length', /not a finite number/);
    expectError(Number.NaN, 'length', /not a finite number/);
    expectError(true, 'length', /a boolean is not a length/);
    expectError(null, 'length', /an empty value is not a length/);
    expectError(['1 mm'], 'length', /a list is not a length/);
    expectError({ value: 1 }, 'angle', /a mapping is not an angle/);
  });

  it('refuses a number that overflows to infinity once scaled', () => {
    // 1e400 is beyond the largest double (≈1.8e308, IEEE 754 binary64).
    expectError('1e400 m', 'length', /too large/);
    expectError('1e400', 'length', /too large/);
  });

  it('keeps large but finite values', () => {
    expectSi('1e306 nm', 'length', 1e297);
  });
});

describe('angles (SI Brochure, table 8: 1° = π/180 rad, 1′ = (1/60)°, 1″ = (1/60)′)', () => {
  it('reads degrees, radians, milliradians, arc minutes and seconds', () => {
    expectSi('2 deg', 'angle', (2 * Math.PI) / 180);
    expectSi('2°', 'angle', (2 * Math.PI) / 180);
    expectSi('0.5 rad', 'angle', 0.5);
    expectSi('3 mrad', 'angle', 3e-3);
    expectSi('30 arcmin', 'angle', (0.5 * Math.PI) / 180);
    expectSi('36 arcsec', 'angle', (0.01 * Math.PI) / 180);
    expectSi('10 \u00b5rad', 'angle', 10e-6);
    expectSi('10 \u03bcrad', 'angle', 10e-6);
  });

  it('refuses lengths given for angles', () => {
    expectError('3 mm', 'angle', /unknown angle unit 'mm'/);
  });
});

describe('formatting lengths for people and for file names', () => {
  it('picks a readable unit', () => {
    expect(formatLength(6.33e-7)).toBe('633 nm');
    expect(formatLength(50e-6)).toBe('50 µm');
    expect(formatLength(0.0125)).toBe('12.5 mm');
    expect(formatLength(1.2)).toBe('1.2 m');
  });

  it('makes tokens of letters, digits, ".", "-" only (no micro sign, no "+", no space)', () => {
    expect(lengthToken(6.33e-7)).toBe('633nm');
    expect(lengthToken(50e-6)).toBe('50um');
    expect(lengthToken(0.0125)).toBe('12.5mm');
    for (const v of [1e-15, 3.3e-11, 6.33e-7, 1.5e-5, 0.1, 1, 123456.7, 2e7, 5e12]) {
      expect(lengthToken(v), `token of ${v}`).toMatch(/^[A-Za-z0-9.-]+$/);
    }
  });
});
