// Integer-order Bessel functions by Miller's backward recurrence (src/optics/bessel-jn.ts) against
// sources outside the project:
// - J_0 and J_1 from @stdlib/math-base-special-besselj0 / -besselj1 (a general-purpose library);
// - the power series J_n(x) = Σ_k (−1)^k (x/2)^{2k+n} / (k!(k+n)!) (Abramowitz & Stegun, Handbook
//   of Mathematical Functions, 9.1.10), summed here in a plain loop, for x ≤ 8;
// - tabulated values (Abramowitz & Stegun Table 9.1 and 9.2, to 10 decimals, from memory);
// - identities that the normalisation J_0 + 2ΣJ_2k = 1 does not imply: Σ J_n² = 1 (A&S 9.1.76) and
//   the Jacobi–Anger expansions of cos(x sin θ) and sin(x sin θ) (A&S 9.1.42–43).
import j0 from '@stdlib/math-base-special-besselj0';
import j1 from '@stdlib/math-base-special-besselj1';
import { describe, expect, it } from 'vitest';
import { besselJn, besselJnOrders, besselJnSignificant } from '../../src/optics/bessel-jn.js';
import { mulberry32 } from '../helpers.js';

const EPS = 2 ** -52;

/** A&S 9.1.10 summed term by term; also returns Σ|terms| (its rounding-error scale). */
function powerSeries(n: number, x: number): { value: number; scale: number } {
  let term = 1;
  for (let i = 1; i <= n; i++) term *= x / 2 / i; // (x/2)^n / n!
  let value = 0;
  let scale = 0;
  for (let k = 0; k < 200; k++) {
    value += term;
    scale += Math.abs(term);
    term *= -((x / 2) * (x / 2)) / ((k + 1) * (k + 1 + n));
    if (Math.abs(term) < 1e-30 * scale) break;
  }
  return { value, scale };
}

describe('J_0 and J_1 against @stdlib', () => {
  it('agree to 1e-14 (absolute) for |x| ≤ 200', () => {
    // Budget: both are accurate to a few ulp of max(|J|, 1/√x); the normalising sum of Miller's method
    // adds about ε·√x (its terms are O(1/√x), about x/2 of them): 1.4e-15 at x = 200.
    let worst = 0;
    for (let x = -200; x <= 200; x += 0.0731) {
      const j = besselJnOrders(1, x);
      worst = Math.max(worst, Math.abs(j[0]! - j0(x)), Math.abs(j[1]! - j1(x)));
    }
    expect(worst).toBeLessThan(1e-14);
  });
});

describe('higher orders', () => {
  it('agree with the power series (A&S 9.1.10) for x ≤ 8, n ≤ 25, within the series’ own rounding', () => {
    const rnd = mulberry32(9101);
    for (let i = 0; i < 200; i++) {
      const x = 8 * rnd();
      const n = Math.floor(26 * rnd());
      const s = powerSeries(n, x);
      // Tolerance: the series loses ε·Σ|terms| to cancellation (up to 1e-14 at x = 8), the recurrence
      // a few ulp.
      const tol = 8 * EPS * s.scale + 1e-16;
      expect(Math.abs(besselJn(n, x) - s.value)).toBeLessThan(tol);
    }
  });

  // A&S Table 9.1 (J_2) and Table 9.2 (J_3 … J_10), 10 decimals, from memory.
  const table: [number, number, number][] = [
    [2, 1, 0.1149034849],
    [3, 1, 0.019563354],
    [4, 1, 0.002476639],
    [5, 1, 0.0002497577],
    [2, 2, 0.3528340286],
    [3, 2, 0.1289432495],
    [2, 5, 0.0465651163],
    [3, 5, 0.3648312306],
    [4, 5, 0.3912323605],
    [5, 5, 0.2611405461],
    [2, 10, 0.2546303137],
    [3, 10, 0.0583793793],
    [5, 10, -0.2340615282],
    [10, 10, 0.2074861066],
  ];
  it.each(table)('J_%i(%d) = %d (A&S Tables 9.1–9.2, from memory) to 6e-11', (n, x, v) => {
    // Tolerance: half a unit of the 10th decimal, plus slack for the 9-decimal entries.
    expect(Math.abs(besselJn(n, x) - v)).toBeLessThan(6e-11);
  });

  it('J_0 vanishes at its first zero 2.404825557695773 and J_1 at 3.831705970207512 (A&S Table 9.5, from memory)', () => {
    // Tolerance: the slope there (|J_1| ≈ 0.52, |J_0| ≈ 0.40) times the 16-digit zero's rounding.
    expect(Math.abs(besselJn(0, 2.404825557695773))).toBeLessThan(1e-15);
    expect(Math.abs(besselJn(1, 3.831705970207512))).toBeLessThan(1e-15);
  });

  it('J_0² + 2ΣJ_n² = 1 (A&S 9.1.76) to 1e-14 for x up to 500', () => {
    for (const x of [0.3, 1, 7.5, 33, 120, 500]) {
      const j = besselJnSignificant(x, 1e-20);
      let s = 0;
      for (let n = j.length - 1; n >= 1; n--) s += j[n]! ** 2;
      expect(Math.abs(j[0]! ** 2 + 2 * s - 1)).toBeLessThan(1e-14);
    }
  });

  it('Jacobi–Anger: cos(x sin θ) = J_0 + 2ΣJ_2k cos 2kθ and sin(x sin θ) = 2ΣJ_2k+1 sin(2k+1)θ (A&S 9.1.42–43) to 1e-13', () => {
    const rnd = mulberry32(4243);
    for (let i = 0; i < 100; i++) {
      const x = 60 * rnd();
      const th = 2 * Math.PI * rnd();
      const j = besselJnSignificant(x, 1e-18);
      let c = j[0]!;
      let s = 0;
      for (let n = 1; n < j.length; n++) {
        if (n % 2 === 0) c += 2 * j[n]! * Math.cos(n * th);
        else s += 2 * j[n]! * Math.sin(n * th);
      }
      // Tolerance: about n_max terms of size ≤ 1 each rounded, n_max ≈ 100 here: 1e-13.
      expect(Math.abs(c - Math.cos(x * Math.sin(th)))).toBeLessThan(1e-13);
      expect(Math.abs(s - Math.sin(x * Math.sin(th)))).toBeLessThan(1e-13);
    }
  });

  it('a much higher start order changes no returned value (Miller’s start is high enough): 1e-13 relative past the turning point n > x, plus 1e-15 absolute below it', () => {
    // Below the turning point J_n oscillates and has zeros, where only absolute accuracy (rounding of
    // O(1) terms) is meaningful; past it J_n > 0 falls fast and is returned to relative accuracy.
    for (const x of [1e-8, 0.5, 3, 25, 200, 1500]) {
      const nMax = Math.ceil(x) + 40;
      const a = besselJnOrders(nMax, x);
      // Asking for 400 more orders starts the recurrence 400 orders higher.
      const b = besselJnOrders(nMax + 400, x);
      for (let n = 0; n <= nMax; n++) {
        if (Math.abs(b[n]!) < 1e-280) continue;
        expect(Math.abs(a[n]! - b[n]!)).toBeLessThanOrEqual(1e-13 * Math.abs(b[n]!) + (n < x ? 1e-15 : 0));
      }
    }
  });

  it('symmetries J_n(−x) = (−1)^n J_n(x) and J_−n = (−1)^n J_n (A&S 9.1.5, 9.1.35); J_n(0) = δ_n0', () => {
    for (const n of [0, 1, 2, 7, 12]) {
      const sign = n % 2 === 0 ? 1 : -1;
      expect(besselJn(n, -3.7)).toBe(sign * besselJn(n, 3.7));
      expect(besselJn(-n, 3.7)).toBe(sign * besselJn(n, 3.7));
      expect(besselJn(n, 0)).toBe(n === 0 ? 1 : 0);
    }
  });
});

describe('besselJnSignificant', () => {
  it('stops at the first order past |x| below tol, and every order before it past |x| is at or above tol', () => {
    for (const x of [0.01, 1.2, 9, 80]) {
      const tol = 1e-17;
      const j = besselJnSignificant(x, tol);
      const q = j.length - 1;
      expect(q).toBeGreaterThanOrEqual(Math.ceil(x));
      expect(Math.abs(j[q]!)).toBeLessThan(tol);
      for (let n = Math.ceil(x); n < q; n++) expect(Math.abs(j[n]!)).toBeGreaterThanOrEqual(tol);
      // The next orders are smaller still (the tail decreases past the turning point, A&S 9.3).
      const more = besselJnOrders(q + 5, x);
      for (let n = q + 1; n <= q + 5; n++) expect(Math.abs(more[n]!)).toBeLessThan(Math.abs(more[n - 1]!));
    }
  });
});
