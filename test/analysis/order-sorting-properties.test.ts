// Order sorting (analysis/order-sorting.ts) on 2000 random ranges, orders and light (fixed seed):
// every overlap it lists lands on the range (nλ' = mλ, the grating equation at one angle, Born &
// Wolf §8.6.1) and lies in the light; none is missed; and a filter window it gives passes the whole
// range while blocking every overlapping wavelength, or, where it gives none, none can.
import { describe, expect, it } from 'vitest';
import { orderSorting } from '../../src/analysis/order-sorting.js';
import { mulberry32, nm } from '../helpers.js';

describe('order sorting: properties on random cases (seed 14)', () => {
  const rand = mulberry32(14);
  const cases = Array.from({ length: 2000 }, () => {
    const M = 1 + Math.floor(rand() * 5);
    const m = rand() < 0.5 ? -M : M;
    const a = (200 + 700 * rand()) * nm;
    const b = a * (1 + 1.5 * rand() ** 2);
    const l0 = (100 + 900 * rand()) * nm;
    const l1 = l0 * (1 + 3 * rand());
    return { m, M, a, b, light: [l0, l1] as [number, number] };
  });
  it('lists exactly the other orders of the same sign that put light of the spectrum on the range, within it', () => {
    for (const { m, M, a, b, light } of cases) {
      const s = orderSorting(m, [a, b], light);
      for (const o of s.overlaps) {
        const n = Math.abs(o.order);
        expect(Math.sign(o.order)).toBe(Math.sign(m));
        // Where they land: order n of λ' at the angle of order M of nλ'/M, inside [a, b].
        for (const l of [o.from, o.to]) {
          expect((n * l) / M).toBeGreaterThanOrEqual(a * (1 - 1e-12));
          expect((n * l) / M).toBeLessThanOrEqual(b * (1 + 1e-12));
          expect(l).toBeGreaterThanOrEqual(light[0] * (1 - 1e-12));
          expect(l).toBeLessThanOrEqual(light[1] * (1 + 1e-12));
        }
      }
      for (let n = 1; n <= 20; n++) {
        if (n === M) continue;
        const meets = Math.min((M * b) / n, light[1]) >= Math.max((M * a) / n, light[0]);
        expect(s.overlaps.some((o) => Math.abs(o.order) === n)).toBe(meets);
      }
    }
  });
  it('gives a long-pass window whose every cut-on passes the range and blocks the higher orders\' light, and none only where no cut-on can', () => {
    for (const { m, M, a, b, light } of cases) {
      const s = orderSorting(m, [a, b], light);
      const higher = s.overlaps.filter((o) => Math.abs(o.order) > M);
      expect(s.longPassNeeded).toBe(higher.length > 0);
      if (!s.longPassNeeded) continue;
      const longest = Math.max(...higher.map((o) => o.to));
      if (s.longPass) {
        expect(s.longPass.high).toBe(a);
        expect(s.longPass.low).toBeGreaterThanOrEqual(longest);
        expect(s.longPass.low).toBeLessThan(a);
      } else {
        expect(longest).toBeGreaterThanOrEqual(a);
      }
    }
  });
  it('gives a short-pass window whose every edge passes the range and blocks the lower orders\' light, and none only where no edge can', () => {
    for (const { m, M, a, b, light } of cases) {
      const s = orderSorting(m, [a, b], light);
      const lower = s.overlaps.filter((o) => Math.abs(o.order) < M);
      expect(s.shortPassNeeded).toBe(lower.length > 0);
      if (M === 1) expect(s.shortPass).toBeNull();
      if (!s.shortPassNeeded) continue;
      const shortest = Math.min(...lower.map((o) => o.from));
      if (s.shortPass) {
        expect(s.shortPass.low).toBe(b);
        expect(s.shortPass.high).toBeLessThanOrEqual(shortest);
        expect(s.shortPass.high).toBeGreaterThan(b);
      } else {
        expect(shortest).toBeLessThanOrEqual(b);
      }
    }
  });
});
