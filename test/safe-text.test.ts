// Echoing input safely (common practice: escape terminal control sequences; the spreadsheet
// formula-injection guard of a leading apostrophe for cells starting with = + - @).
import { describe, expect, it } from 'vitest';
import { ECHO_MAX, escapeControl, guardFormula, safeEcho } from '../src/safe-text.js';

describe('safe echo of input values', () => {
  it('escapes ESC, BEL, NUL, DEL, C1 and bidi controls, and keeps ordinary text and non-ASCII letters', () => {
    expect(escapeControl('a\u001b[2Jb\u0007\u0000\u007f\u009b\u202e')).toBe('a\\x1b[2Jb\\x07\\x00\\x7f\\x9b\\u202e');
    expect(escapeControl('pinhole 50 µm, λ = 633 nm')).toBe('pinhole 50 µm, λ = 633 nm');
    expect(escapeControl('two\nlines\ttab')).toBe('two\\x0alines\\x09tab');
  });
  it('cuts long values and says how long they were; the echo stays bounded', () => {
    const long = 'x'.repeat(100_000);
    const e = safeEcho(long);
    expect(e.length).toBeLessThan(ECHO_MAX + 40);
    expect(e).toMatch(/…\(100000 characters\)$/);
    // Escaping after the cut: a value of control characters grows at most fourfold.
    expect(safeEcho('\u0007'.repeat(10_000)).length).toBeLessThan(4 * ECHO_MAX + 40);
    expect(safeEcho('short')).toBe('short');
    expect(safeEcho(42)).toBe('42');
  });
  it('never splits a surrogate pair', () => {
    const s = 'a'.repeat(ECHO_MAX - 1) + '😀' + 'b';
    expect(safeEcho(s)).toBe('a'.repeat(ECHO_MAX - 1) + '…(' + s.length + ' characters)');
  });
  it('guards CSV cells that a spreadsheet would run as formulas', () => {
    for (const c of ['=1+1', '+A1', '-2+3', '@SUM(A1)', '\t=1', '\r=1']) expect(guardFormula(c)).toBe(`'${c}`);
    for (const c of ['pinhole', '1e-3', 'a=b']) expect(guardFormula(c)).toBe(c);
  });
});
