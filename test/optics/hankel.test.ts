// H₁⁽¹⁾(x) = J₁(x) + iY₁(x): the 1-D Rayleigh–Sommerfeld kernel's special function.
import { describe, expect, it } from 'vitest';
import besselj1 from '@stdlib/math-base-special-besselj1';
import bessely1 from '@stdlib/math-base-special-bessely1';
import { HANKEL_ASYMPTOTIC_FROM, hankel1, hankel1PhaseRate } from '../../src/optics/hankel.js';

/** |H − (J₁ + iY₁)| / |J₁ + iY₁| with J₁, Y₁ from @stdlib. */
function relativeToStdlib(x: number): number {
  const [re, im] = hankel1(x);
  const j = besselj1(x);
  const y = bessely1(x);
  return Math.hypot(re - j, im - y) / Math.hypot(j, y);
}

describe('H₁⁽¹⁾ against @stdlib J₁ and Y₁ (a general-purpose reference library)', () => {
  // Error budget above the switch: the expansion's truncation, under 1e-14 relative from x = 20 on
  // (the 16th term, a₁₆/x¹⁶ ≈ 9e-15 at 20), plus a few roundings of ours and of the library's
  // (each ~1e-16 relative to |H|, whose modulus √(2/πx) has no zeros). 1e-13 leaves a margin of ten.
  it('agrees to 1e-13 across 20 ≤ x < 10⁶ (the asymptotic branch), 4000 points spaced by ratio', () => {
    let worst = 0;
    for (let i = 0; i < 4000; i++) {
      const x = HANKEL_ASYMPTOTIC_FROM * Math.pow(1e6 / HANKEL_ASYMPTOTIC_FROM, i / 4000) * (1 + 1e-7 * (i % 7));
      worst = Math.max(worst, relativeToStdlib(x));
    }
    expect(worst).toBeLessThan(1e-13);
  });

  it('agrees to 1e-13 on both sides of the switch and densely just above it, where the truncation is largest', () => {
    let worst = 0;
    for (let i = -200; i <= 2000; i++) worst = Math.max(worst, relativeToStdlib(HANKEL_ASYMPTOTIC_FROM + i * 1e-3));
    expect(worst).toBeLessThan(1e-13);
  });

  it('is J₁ + iY₁ of the library below the switch (0 < x < 20), where it takes them directly', () => {
    for (const x of [1e-6, 0.01, 0.5, 1, 3.8317, 7.0156, 12.3, 19.999]) {
      expect(hankel1(x)).toEqual([besselj1(x), bessely1(x)]);
    }
  });
});

describe('H₁⁽¹⁾ against handbook values', () => {
  // Abramowitz & Stegun, Handbook of Mathematical Functions, Table 9.1 (J₁ and Y₁ to 10 places;
  // from memory). Both are below the switch, so this checks the library the function relies on.
  it.each([
    [1, 0.4400505857, -0.7812128213],
    [2, 0.5767248078, -0.1070324315],
    [5, -0.3275791376, 0.1478631434],
    [10, 0.0434727462, 0.2490154242],
  ])('H₁⁽¹⁾(%f) = J₁ + iY₁ from Table 9.1 to 1e-9', (x, j, y) => {
    const [re, im] = hankel1(x);
    expect(Math.abs(re - j)).toBeLessThan(1e-9);
    expect(Math.abs(im - y)).toBeLessThan(1e-9);
  });

  // A&S 9.2.7–9.2.10 with μ = 4: P = 1 − (μ−1)(μ−9)/(2!(8x)²) + … = 1 + 15/(128x²) + …, Q = 3/(8x) − 105/(1024x³) + …. The
  // leading terms must come out of H·√(πx/2)·e^{−i(x − 3π/4)} = P + iQ.
  it('has the leading asymptotic terms P ≈ 1 + 15/(128x²), Q ≈ 3/(8x) (A&S 9.2.9, 9.2.10)', () => {
    for (const x of [50, 300, 4000]) {
      const [re, im] = hankel1(x);
      const a = Math.sqrt((Math.PI * x) / 2);
      const ph = -(x - (3 * Math.PI) / 4);
      const p = a * (re * Math.cos(ph) - im * Math.sin(ph));
      const q = a * (re * Math.sin(ph) + im * Math.cos(ph));
      // The next terms are O(x⁻⁴) in P and O(x⁻⁵) in Q, with coefficients below 0.15 and 0.3; undoing
      // the phase x − 3π/4 here rounds it by up to ulp(x)/2, hence the allowance x·1e-15.
      const slack = 1e-15 * x + 1e-14;
      expect(Math.abs(p - (1 + 15 / (128 * x * x)))).toBeLessThan(0.15 / x ** 4 + slack);
      expect(Math.abs(q - (3 / (8 * x) - 105 / (1024 * x ** 3)))).toBeLessThan(0.3 / x ** 5 + slack);
    }
  });
});

describe('the phase rate of H₁⁽¹⁾', () => {
  // Wronskian J₁Y₁′ − J₁′Y₁ = 2/(πx) (A&S 9.1.16) gives d(arg H)/dx = 2/(πx|H|²); checked against a
  // central difference of the library's J₁, Y₁ (step 1e-4: truncation ~1e-9, rounding ~1e-12).
  it.each([2, 7.5, 19, 25, 400])('d arg H₁⁽¹⁾/dx at x = %f matches a finite difference to 1e-8', (x) => {
    const d = 1e-4;
    const arg = (t: number) => Math.atan2(bessely1(t), besselj1(t));
    let diff = arg(x + d) - arg(x - d);
    if (diff < -Math.PI) diff += 2 * Math.PI;
    if (diff > Math.PI) diff -= 2 * Math.PI;
    const [re, im] = hankel1(x);
    expect(Math.abs(hankel1PhaseRate(x, re * re + im * im) - diff / (2 * d))).toBeLessThan(1e-8);
  });
});
