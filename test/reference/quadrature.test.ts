// The Gauss–Legendre rule of quadrature.ts against exact integrals (calculus; the rule's exactness
// for degree 2n − 1 is Abramowitz & Stegun 25.4.29).
import { describe, expect, it } from 'vitest';
import { gaussLegendre, walkPanels } from './quadrature.js';

describe('Gauss–Legendre rule', () => {
  it.each([2, 5, 16, 24])('n = %i: weights sum to 2 and x^(2n−2) integrates to 2/(2n−1) within 1e-14', (n) => {
    const { x, w } = gaussLegendre(n);
    let s = 0;
    let m = 0;
    for (let i = 0; i < n; i++) {
      s += w[i]!;
      m += w[i]! * x[i]! ** (2 * n - 2);
    }
    expect(Math.abs(s - 2)).toBeLessThan(1e-14);
    expect(Math.abs(m - 2 / (2 * n - 1))).toBeLessThan(1e-14);
  });

  it('16 points integrate e^{iφ} over a panel of 8 rad of phase to 1e-14 (∫cos 4t dt on [−1,1] = sin 4 / 2)', () => {
    const { x, w } = gaussLegendre(16);
    let s = 0;
    for (let i = 0; i < 16; i++) s += w[i]! * Math.cos(4 * x[i]!);
    expect(Math.abs(s - Math.sin(4) / 2)).toBeLessThan(1e-14);
  });

  it('panels cover [a, b] exactly, each no longer than the local scale', () => {
    const pieces: [number, number][] = [];
    walkPanels(0, 10, (t) => 0.1 + 0.2 * t, (lo, hi) => pieces.push([lo, hi]));
    expect(pieces[0]![0]).toBe(0);
    expect(pieces.at(-1)![1]).toBe(10);
    for (let i = 1; i < pieces.length; i++) expect(pieces[i]![0]).toBe(pieces[i - 1]![1]);
    for (const [lo, hi] of pieces.slice(0, -1)) expect(hi - lo).toBeLessThanOrEqual(0.1 + 0.2 * lo + 1e-12);
  });
});
