// Order sorting (analysis/order-sorting.ts) from the grating equation: order n of λ' lands where
// order m of λ does when nλ' = mλ (Born & Wolf §8.6.1; the free spectral range λ/m, Hecht §10.2.8).
import { describe, expect, it } from 'vitest';
import { orderSorting } from '../../src/analysis/order-sorting.js';

const nm = 1e-9;

describe('order sorting', () => {
  it('the second order of 300 nm lands on the first order of 600 nm', () => {
    const s = orderSorting(1, [600 * nm, 600 * nm]);
    const second = s.overlaps.find((o) => o.order === 2)!;
    expect(second.from).toBeCloseTo(300 * nm, 18);
    expect(second.to).toBeCloseTo(300 * nm, 18);
    // And the third order of 200 nm; nothing from the other side.
    expect(s.overlaps.find((o) => o.order === 3)!.from).toBeCloseTo(200 * nm, 18);
    expect(s.overlaps.every((o) => o.order > 0)).toBe(true);
  });

  it('400–700 nm in first order from a 350–800 nm source: the second order reaches 350 nm only; a long-pass cut-on in (350, 400] nm removes it', () => {
    const s = orderSorting(1, [400 * nm, 700 * nm], [350 * nm, 800 * nm]);
    expect(s.overlaps.map((o) => o.order)).toEqual([2]);
    expect(s.longPass!.low).toBeCloseTo(350 * nm, 18);
    expect(s.longPass!.high).toBeCloseTo(400 * nm, 18);
    expect(s.shortPass).toBeNull();
  });

  it('a range wider than the free spectral range (400–900 nm in first order) has no long-pass filter', () => {
    expect(orderSorting(1, [400 * nm, 900 * nm]).longPass).toBeNull();
  });

  it('500–600 nm in second order from 350–1300 nm light: first order 1000–1200 nm, third order 333–400 nm (350–400 in the light); filters (400, 500] and [600, 1000)', () => {
    const s = orderSorting(-2, [500 * nm, 600 * nm], [350 * nm, 1300 * nm]);
    expect(s.overlaps.map((o) => o.order)).toEqual([-1, -3]);
    expect(s.overlaps[1]!.from / nm).toBeCloseTo(350, 9);
    const first = s.overlaps[0]!;
    expect([first.from, first.to].map((v) => v / nm)).toEqual([expect.closeTo(1000, 9), expect.closeTo(1200, 9)]);
    expect(s.longPass!.low / nm).toBeCloseTo(400, 9);
    expect(s.longPass!.high / nm).toBeCloseTo(500, 9);
    expect(s.shortPass!.low / nm).toBeCloseTo(600, 9);
    expect(s.shortPass!.high / nm).toBeCloseTo(1000, 9);
  });

  it('refuses order 0 and an empty range', () => {
    expect(() => orderSorting(0, [1e-7, 2e-7])).toThrow(RangeError);
    expect(() => orderSorting(1, [2e-7, 1e-7])).toThrow(RangeError);
  });
});
